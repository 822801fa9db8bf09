import { describe, expect, it } from 'vitest';
import { splitCsvLine } from '../../main/store/csv-cells.ts';
import { analyzeDrift } from './drift-analysis.ts';
import { analyzePushing } from './pushing-analysis.ts';
import { buildDatasheet, type DatasheetRun } from './datasheet.ts';
import { displayRow, renderDatasheetCsv, renderDatasheetHtml, renderDatasheetMarkdown } from './datasheet-render.ts';
import { analyzeSweep } from './sweep-analysis.ts';

/** Straight-line sweep f = f0 + k·V over 1..3 V, stalled at 0.5 V (edge 0.75 V). */
function sweepRun(label: string, kHzPerV: number, temperatureC: number): DatasheetRun {
  const v = [0.5, 1, 1.5, 2, 2.5, 3];
  const analysis = analyzeSweep({
    controlV: Float64Array.from(v),
    frequencyHz: Float64Array.from(v, (x) => (x < 1 ? NaN : 1e6 + kHzPerV * 1e3 * x)),
  });
  return { label, analysis, conditions: { temperatureC, supplyV: 3.3, gateS: 0.1 } };
}

const runs: DatasheetRun[] = [sweepRun('run-a', 100, 25), sweepRun('run-b', 110, 25), sweepRun('run-c', 130, 26)];
const drift = analyzeDrift({
  timeS: Float64Array.from({ length: 100 }, (_, i) => i),
  frequencyHz: Float64Array.from({ length: 100 }, (_, i) => 1e6 + 2 * (20 + i / 10 - 25)),
  temperatureC: Float64Array.from({ length: 100 }, (_, i) => 20 + i / 10),
});
runs.push({ label: 'log-1', analysis: drift, conditions: { temperatureC: 24.95, supplyV: 3.3, gateS: 1 } });
const pushing = analyzePushing({
  supplyV: new Float64Array([3, 3.3, 3.6]),
  frequencyHz: new Float64Array([1.2e6 - 300, 1.2e6, 1.2e6 + 300]),
});
runs.push({ label: 'push-1', analysis: pushing, conditions: { temperatureC: 25, supplyV: null, gateS: 0.1 } });
const sheet = buildDatasheet(runs, 'Clock-multiplier VCO');

describe('buildDatasheet', () => {
  it('gives min / typ (median) / max over runs', () => {
    const row = sheet.rows.find((r) => r.key === 'kvcoLine');
    expect(row?.min).toBeCloseTo(100e3, 4);
    expect(row?.typ).toBeCloseTo(110e3, 4);
    expect(row?.max).toBeCloseTo(130e3, 4);
    expect(row?.runs).toBe(3);
    expect(row?.conditions).toBe(
      'T 25.0 … 26.0 °C; supply 3.30 V; gate 100 ms; window 1.000 V … 3.000 V (usable range)',
    );
  });
  it('has the rows a designer looks for, each with its unit', () => {
    const keys = sheet.rows.map((r) => r.key);
    expect(keys).toEqual(
      expect.arrayContaining([
        'fMin',
        'fMax',
        'kvcoNominal',
        'kvcoLow',
        'kvcoHigh',
        'linearity',
        'stall',
        'tempco',
        'drift',
        'pushing',
      ]),
    );
    expect(sheet.rows.find((r) => r.key === 'stall')?.typ).toBeCloseTo(0.75, 12);
    // 2 Hz/°C on a mean of 1 MHz − 0.1 Hz = 2.0000002 ppm/°C; one run → typ only.
    const tempco = sheet.rows.find((r) => r.key === 'tempco');
    expect(tempco?.typ).toBeCloseTo(2 / (1 - 1e-7), 9);
    expect(tempco?.min).toBeNull();
    expect(tempco?.unit).toBe('ppm/°C');
    expect(sheet.rows.find((r) => r.key === 'pushingPpm')?.typ).toBeCloseTo(1000 / 1.2, 6);
    expect(sheet.rows.find((r) => r.key === 'unstable')).toBeUndefined(); // no run shows one
  });
});

describe('datasheet exports', () => {
  it('scales each row to one prefix', () => {
    const row = sheet.rows.find((r) => r.key === 'kvcoLine');
    if (!row) throw new Error('row missing');
    expect(displayRow(row)).toEqual({ min: '100.0', typ: '110.0', max: '130.0', unit: 'kHz/V' });
  });
  it('Markdown table', () => {
    const md = renderDatasheetMarkdown(sheet);
    expect(md).toContain('# Clock-multiplier VCO');
    expect(md).toContain(
      '| Kvco, best straight line | T 25.0 … 26.0 °C; supply 3.30 V; gate 100 ms; window 1.000 V … 3.000 V (usable range) | 100.0 | 110.0 | 130.0 | kHz/V |',
    );
  });
  it('CSV in SI base units', () => {
    const text = renderDatasheetCsv(sheet);
    expect(text.split('\n')[0]).toBe('key,parameter,conditions,min,typ,max,unit,runs,uncertainty,significant,bench');
    // The one CSV line splitter handles the quoted "Kvco, best straight line".
    const cells =
      text
        .trim()
        .split('\n')
        .map((line) => splitCsvLine(line) ?? [])
        .find((r) => r[0] === 'kvcoLine') ?? [];
    expect(cells[1]).toBe('Kvco, best straight line');
    expect(Number(cells[3])).toBeCloseTo(100e3, 4);
    expect(cells[6]).toBe('Hz/V');
  });
  it('standalone HTML: escaped, printable, no external assets', () => {
    const page = renderDatasheetHtml({ ...sheet, title: 'VCO <A&B>' });
    expect(page.startsWith('<!doctype html>')).toBe(true);
    expect(page).toContain('<title>VCO &lt;A&amp;B&gt;</title>');
    expect(page).toContain('@media print');
    expect(page).not.toMatch(/<link|<script|src=|url\(|https?:/);
    expect(page).toContain('<td class="num">110.0</td>');
  });
});
