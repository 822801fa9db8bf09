import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../../state/columns.ts';
import { analyzeDriftColumns, tempcoColumns } from './drift-figures.ts';

describe('drift figures', () => {
  it('finds a tempco from columns and reduces the f–T view without losing the line', () => {
    // A made-up sensor-interface oscillator: 1 MHz, −50 Hz/°C (−50 ppm/°C), temperature ramping 20 → 30 °C.
    const set = createColumnSet();
    const rows = [];
    for (let i = 0; i < 1000; i += 1) {
      const temperatureC = 20 + (10 * i) / 999;
      rows.push({ time_s: i, frequency_hz: 1e6 - 50 * (temperatureC - 25), temperature_c: temperatureC, status: 'ok' });
    }
    rows[500] = { time_s: 500, frequency_hz: '', temperature_c: 25, status: 'no-signal' };
    appendRows(set, rows);
    const outcome = analyzeDriftColumns(set, 1000);
    expect(outcome.ok).toBe(true);
    if (!outcome.ok) return;
    expect(outcome.analysis.tempcoHzPerC).toBeCloseTo(-50, 6);
    expect(outcome.analysis.tempcoPpmPerC).toBeCloseTo(-50, 3);
    const view = tempcoColumns(set, 1000, outcome.analysis, 100);
    expect(view.temperatureC.length).toBe(100);
    for (let k = 1; k < view.temperatureC.length; k += 1)
      expect(view.temperatureC[k]).toBeGreaterThanOrEqual(view.temperatureC[k - 1] ?? 0);
    // Chunk means of a straight line lie on the line.
    for (let k = 0; k < view.temperatureC.length; k += 1)
      expect(view.frequencyHz[k]).toBeCloseTo(view.lineHz[k] ?? 0, 3);
  });

  it('reports too few readings instead of throwing', () => {
    expect(analyzeDriftColumns(createColumnSet(), 0)).toEqual({ ok: false, message: 'fewer than 3 readings' });
  });
});
