import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { splitCsvLine } from '../store/csv-cells.ts';
import { runCliCaptured as cli } from '../../test/testing/run-cli-captured.ts';

const fixture = fileURLToPath(new URL('../../test/fixtures/sweep-sensor-osc.csv', import.meta.url));

let dir = '';
let second = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tunebench-datasheet-'));
  // A second unit of the same design, 10 % more gain: straight line 25 kHz + 33 kHz/V.
  const rows = ['control_v,frequency_hz'];
  for (let k = 0; k <= 20; k++) rows.push(`${(k * 0.15).toFixed(2)},${k === 0 ? '' : 25000 + 33000 * k * 0.15}`);
  second = join(dir, 'unit-2.csv');
  await writeFile(second, rows.join('\n'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('tunebench datasheet', () => {
  it('writes a self-contained HTML page with -o', async () => {
    const file = join(dir, 'sheet.html');
    const r = await cli(
      'datasheet',
      fixture,
      second,
      '--format',
      'html',
      '-o',
      file,
      '--title',
      'Sensor-interface oscillator',
    );
    expect(r.code).toBe(0);
    expect(r.err).toContain(`wrote ${file}`);
    const page = await readFile(file, 'utf8');
    expect(page).toContain('<h1>Sensor-interface oscillator</h1>');
    expect(page).not.toMatch(/<link|<script|https?:/);
  });
  it('CSV: min/typ/max of the line slope over the two units', async () => {
    const r = await cli('datasheet', fixture, second, '--format', 'csv');
    expect(r.code).toBe(0);
    const row = r.out
      .trim()
      .split('\n')
      .map((line) => splitCsvLine(line) ?? [])
      .find((x) => x[0] === 'kvcoLine');
    expect(Number(row?.[3])).toBeCloseTo(30.75e3, -2); // fixture's best line (see cmd-analyze test)
    expect(Number(row?.[5])).toBeCloseTo(33e3, 6);
    expect(row?.[7]).toBe('2');
  });
  it('Markdown by default; bad format and missing runs are usage errors', async () => {
    expect((await cli('datasheet', fixture)).out).toMatch(/^# VCO gain table/);
    expect((await cli('datasheet', fixture, '--format', 'pdf')).code).toBe(2);
    expect((await cli('datasheet')).code).toBe(2);
    expect((await cli('datasheet', join(dir, 'missing'))).err).toMatch(/no such file or run folder/);
  });
});
