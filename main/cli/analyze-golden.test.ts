import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { runCliCaptured as cli } from '../../test/testing/run-cli-captured.ts';

const golden = (name: string): string =>
  fileURLToPath(new URL(`../../test/fixtures/analyze-golden/${name}`, import.meta.url));

describe('analyze --json of a sweep: the text it printed when points and local Kvco were objects', () => {
  // Goldens written at commit fc7cda0 (test/fixtures/analyze-golden/README.md); the
  // analysis now keeps those parts as columns and the writer makes rows per block.
  for (const [csv, json, flags] of [
    ['sim-relaxation-sweep.csv', 'sim-relaxation-sweep.json', []],
    ['plateau-sweep.csv', 'plateau-sweep.json', []],
    ['plateau-sweep.csv', 'plateau-sweep-window-poly3.json', ['--window', '0.8:4.2', '--fit', 'poly:3']],
  ] as const) {
    it(`${csv} ${flags.join(' ')}: byte for byte`, async () => {
      const { code, out, err } = await cli('analyze', golden(csv), '--json', ...flags);
      expect(err).toBe('');
      expect(code).toBe(0);
      const want = readFileSync(golden(json), 'utf8');
      expect(out.length).toBe(want.length);
      expect(out === want).toBe(true); // one comparison: a diff of 100 kB helps nobody
    });
  }

  it('the goldens hold what the columns must reproduce: unstable, edge-zone, unfitted and flat-within-uncertainty rows', () => {
    const poly = JSON.parse(readFileSync(golden('plateau-sweep-window-poly3.json'), 'utf8')) as {
      points: { unstable: boolean; edgeZone: boolean; fitHz: number | null }[];
      kvco: { local: { source: string; fitDisagrees: boolean; flatWithinUncertainty?: boolean }[] };
    };
    expect(poly.points.filter((p) => p.unstable).length).toBeGreaterThan(0);
    expect(poly.points.filter((p) => p.edgeZone).length).toBeGreaterThan(0);
    expect(poly.points.filter((p) => p.fitHz === null).length).toBeGreaterThan(0);
    expect(poly.kvco.local.filter((e) => e.flatWithinUncertainty === true)).toHaveLength(2);
    expect(poly.kvco.local.filter((e) => e.source === 'finite-difference' && e.fitDisagrees).length).toBeGreaterThan(0);
  });
});
