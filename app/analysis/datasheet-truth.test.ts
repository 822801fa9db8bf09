/**
 * Issue 9 item 7 reproductions: the gain table mixed an aborted 13-point run
 * into min/typ/max, mixed a 400 MHz varactor DUT with a 30 kHz relaxation DUT,
 * never said the runs came from the simulated bench, and dropped the ± of the
 * drift and pushing rows.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDrift } from './drift-analysis.ts';
import { analyzePushing } from './pushing-analysis.ts';
import { buildDatasheet, DatasheetInputError, dutStem, type DatasheetRun, type RunOrigin } from './datasheet.ts';
import { displayRow, renderDatasheetCsv, renderDatasheetHtml, renderDatasheetMarkdown } from './datasheet-render.ts';
import { analyzeSweep } from './sweep-analysis.ts';

const conditions = { temperatureC: 25, supplyV: 5, gateS: 0.1 };
const origin = (o: Partial<RunOrigin>): RunOrigin => ({
  status: 'complete',
  dutId: 'relax-1',
  dutKind: null,
  simulated: true,
  ...o,
});

/** Relaxation-like unit: 8–29 kHz over 1.6–4.2 V (a parabola), points every `step` V up to `topV`. */
function relaxRun(label: string, topV: number, o: Partial<RunOrigin> = {}): DatasheetRun {
  const v: number[] = [];
  for (let x = 1.6; x <= topV + 1e-9; x += 0.2) v.push(Number(x.toFixed(3)));
  const analysis = analyzeSweep({
    controlV: Float64Array.from(v),
    frequencyHz: Float64Array.from(v, (x) => 8e3 + 9e3 * (x - 1.6) - 300 * (x - 1.6) ** 2),
  });
  return { label, analysis, conditions, origin: origin(o) };
}

function varactorRun(label: string): DatasheetRun {
  const v = Array.from({ length: 21 }, (_, i) => 0.5 + 0.2 * i);
  const analysis = analyzeSweep({
    controlV: Float64Array.from(v),
    frequencyHz: Float64Array.from(v, (x) => 360e6 + 46e6 * x),
  });
  return { label, analysis, conditions, origin: origin({ dutId: 'radio-lo-3' }) };
}

describe('the gain table refuses bad input', () => {
  it('leaves an aborted run out of min/typ/max and names it in the notes', () => {
    const full = [relaxRun('run-1', 4.2), relaxRun('run-2', 4.2, { dutId: 'relax-2' })];
    const aborted = relaxRun('run-3 (13 points)', 1.6 + 0.2 * 4, { status: 'aborted', dutId: 'relax-3' });
    const sheet = buildDatasheet([...full, aborted]);
    const fMax = sheet.rows.find((r) => r.key === 'fMax');
    expect(fMax?.runs).toBe(2);
    expect(fMax?.min).toBeCloseTo(fMax?.max ?? NaN, 6);
    expect(sheet.notes.some((n) => n.startsWith('run-3 (13 points) left out: the run is aborted'))).toBe(true);
    // Kept on request.
    expect(
      buildDatasheet([...full, aborted], 't', { includeIncomplete: true }).rows.find((r) => r.key === 'fMax')?.runs,
    ).toBe(3);
  });
  it('refuses a varactor and a relaxation DUT in one table unless allowed', () => {
    const mixed = [relaxRun('relax-run', 4.2), varactorRun('lo-run')];
    expect(() => buildDatasheet(mixed)).toThrow(DatasheetInputError);
    expect(() => buildDatasheet(mixed)).toThrow(
      /different DUT ids \(relax-1, radio-lo-3\).*tuning ranges that do not overlap/,
    );
    expect(buildDatasheet(mixed, 't', { allowMixed: true }).rows.find((r) => r.key === 'fMax')?.runs).toBe(2);
    expect(dutStem('lo-7')).toBe(dutStem('LO_12'));
  });
  it('says in md, csv and html that the runs came from the simulated bench', () => {
    const sheet = buildDatasheet([relaxRun('run-1', 4.2)]);
    expect(sheet.simulated).toBe(true);
    expect(renderDatasheetMarkdown(sheet)).toMatch(/SIMULATED BENCH/);
    expect(renderDatasheetMarkdown(sheet)).toMatch(/run-1 \(sweep, simulated\)/);
    expect(renderDatasheetHtml(sheet)).toMatch(/SIMULATED BENCH/);
    expect(renderDatasheetCsv(sheet).split('\n')[1]).toMatch(/,simulated$/);
    const measured = buildDatasheet([relaxRun('run-1', 4.2, { simulated: false })]);
    expect(renderDatasheetMarkdown(measured)).not.toMatch(/SIMULATED/);
  });
  it('keeps the ± of the drift and pushing rows; an insignificant figure says so', () => {
    const t = Float64Array.from({ length: 200 }, (_, i) => i * 60);
    const drift = analyzeDrift({
      timeS: t,
      frequencyHz: t.map((x, i) => 1e6 * (1 + 2e-6 * (x / 3600)) + ((i * 7919) % 13) - 6),
      temperatureC: t.map((x) => 25 + x / 3600),
    });
    const pushing = analyzePushing({
      supplyV: new Float64Array([4.5, 5, 5.5]),
      frequencyHz: new Float64Array([20e3 - 61, 20e3 + 2, 20e3 + 59]),
    });
    const sheet = buildDatasheet([
      { label: 'log', analysis: drift, conditions },
      { label: 'push', analysis: pushing, conditions },
    ]);
    const driftRow = sheet.rows.find((r) => r.key === 'drift');
    if (drift.kind !== 'drift') throw new Error('expected a drift analysis');
    // The row carries the analysis' own ± unchanged, and the 2 ppm/h the data were built with lies within 2σ of it.
    const sigma = drift.driftUncertaintyPpmPerHour ?? Number.NaN;
    expect(driftRow?.uncertainty).toBe(sigma);
    expect(sigma).toBeGreaterThan(0);
    expect(Math.abs((driftRow?.typ ?? Number.NaN) - 2)).toBeLessThanOrEqual(2 * sigma);
    expect(displayRow(driftRow ?? sheet.rows[0]!).typ).toMatch(/ ± /);
    const pushRow = sheet.rows.find((r) => r.key === 'pushing');
    expect(displayRow(pushRow ?? sheet.rows[0]!).typ).toMatch(/^120\.0 ± 3\.5$/);
    const flat = analyzePushing({
      supplyV: new Float64Array([4.5, 5, 5.5]),
      frequencyHz: new Float64Array([20e3 + 3, 20e3 - 4, 20e3 + 2]),
    });
    const flatRow = buildDatasheet([{ label: 'flat', analysis: flat, conditions }]).rows.find(
      (r) => r.key === 'pushing',
    );
    expect(flatRow?.significant).toBe(false);
    expect(displayRow(flatRow ?? sheet.rows[0]!).typ).toMatch(/^not significant \(±/);
  });
});
