import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../../state/columns.ts';
import { analyzePushingColumns, pushingPlotColumns } from './pushing-figures.ts';

describe('pushing figures', () => {
  it('a made-up 400 MHz varactor VCO pushed 1.5 kHz/V: plot columns on the fitted line, failed readings dropped', () => {
    // f = 400 MHz + 1.5 kHz/V·(V − 5 V) exactly: 1.5 kHz/V on 400 MHz is 3.75 ppm/V (arithmetic).
    const set = createColumnSet();
    const rows = [];
    for (const supplyV of [4.5, 5, 5.5, 4.75, 5.25]) {
      for (let r = 0; r < 3; r += 1)
        rows.push({
          time_s: rows.length,
          supply_v: supplyV,
          control_v: 2,
          frequency_hz: 4e8 + 1500 * (supplyV - 5),
          status: 'ok',
        });
    }
    // A timeout says nothing (dropped); its bogus frequency must not move the mean.
    rows.push({ time_s: rows.length, supply_v: 5, control_v: 2, frequency_hz: 1, status: 'timeout' });
    appendRows(set, rows);
    const outcome = analyzePushingColumns(set, rows.length);
    expect(outcome.ok).toBe(true);
    if (!outcome.ok) return;
    const a = outcome.analysis;
    expect(a.pushingHzPerV).toBeCloseTo(1500, 6);
    expect(a.pushingPpmPerV).toBeCloseTo(3.75, 9);
    expect(a.controlV).toBe(2);
    const plot = pushingPlotColumns(a);
    expect(plot.supplyV).toEqual([4.5, 4.75, 5, 5.25, 5.5]);
    for (let i = 0; i < plot.supplyV.length; i += 1) {
      expect(plot.meanHz[i]).toBeCloseTo(4e8 + 1500 * ((plot.supplyV[i] ?? 0) - 5), 4);
      expect(plot.lineHz[i]).toBeCloseTo(plot.meanHz[i] ?? 0, 4);
    }
  });

  it('reports a run with one supply step instead of throwing', () => {
    const set = createColumnSet();
    appendRows(set, [
      { time_s: 0, supply_v: 5, frequency_hz: 1e6, status: 'ok' },
      { time_s: 1, supply_v: 5, frequency_hz: 1e6, status: 'ok' },
    ]);
    const outcome = analyzePushingColumns(set, 2);
    expect(outcome.ok).toBe(false);
    if (!outcome.ok) expect(outcome.message).toMatch(/≥ 2 supply voltages/);
  });
});
