import { join, relative, resolve, sep } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { assertRunId, dutSlug, makeRunId } from './run-id.ts';
import { runFolder } from './store-path.ts';

describe('run ids', () => {
  it('are the UTC start stamp plus a slug of the DUT id', () => {
    expect(makeRunId('2026-12-02T01:45:12.345Z', 'Sensor osc A')).toBe('20261202-014512-sensor-osc-a');
    expect(makeRunId('2026-12-02T02:45:12+01:00', '400 MHz varactor VCO #2')).toBe(
      '20261202-014512-400-mhz-varactor-vco-2',
    );
    expect(dutSlug('../../etc')).toBe('etc');
    expect(dutSlug('°°°')).toBe('dut');
  });

  it('rejects separators, "..", empty ids, control characters and dot-names', () => {
    for (const bad of [
      '',
      '.',
      '..',
      '../x',
      'a/b',
      'a\\b',
      'x/../y',
      'a..b',
      '.trash',
      'a\u0000b',
      'a\nb',
      ' a',
      'C:x',
      '/abs',
    ]) {
      expect(() => assertRunId(bad), JSON.stringify(bad)).toThrow(/run id/);
    }
    expect(() => assertRunId(42)).toThrow(/run id/);
    expect(assertRunId('20261202-014512-sensor-osc-a-2')).toBe('20261202-014512-sensor-osc-a-2');
  });

  it('never resolve to a path outside the runs folder, whatever the id (property)', () => {
    const runsDir = resolve('/srv/tunebench/runs');
    const hostile = fc.oneof(
      fc.string({ unit: 'binary', maxLength: 40 }),
      fc
        .array(fc.constantFrom('..', '.', '/', '\\', 'a', '%2e', '\u0000', ':', 'C:', '~'), { maxLength: 8 })
        .map((parts) => parts.join('')),
    );
    fc.assert(
      fc.property(hostile, (id) => {
        let dir: string;
        try {
          dir = runFolder(runsDir, id);
        } catch (error) {
          expect((error as Error).message).toMatch(/run id/);
          return;
        }
        // Accepted: it must be exactly one folder below the runs folder.
        const rel = relative(runsDir, resolve(dir));
        expect(rel).toBe(id);
        expect(rel.includes(sep) || rel.startsWith('..') || rel === '').toBe(false);
        expect(resolve(dir)).toBe(join(runsDir, id));
      }),
      { numRuns: 2000 },
    );
  });
});
