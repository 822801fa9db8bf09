import { describe, expect, it } from 'vitest';
import { buildDatasheet } from './datasheet.ts';
import { runConditions, runHints } from './datasheet-run.ts';
import { analyzeSweep } from './sweep-analysis.ts';

/** run.json `conditions` of a sweep: DUT supply and temperature read at its start and end. */
const recorded = { dutSupplyV: { start: 4.998, end: 5.002 }, temperatureC: { start: 23.0, end: 23.2 } };

describe('runHints: run.json conditions', () => {
  it('takes the mean of start and end, next to the plan hints', () => {
    const hints = runHints({ plan: { gateS: 0.05 }, conditions: recorded });
    expect(hints.gateS).toBe(0.05);
    expect(hints.recordedDutSupplyV).toBeCloseTo(5, 12);
    expect(hints.recordedTemperatureC).toBeCloseTo(23.1, 12);
  });

  it('uses the one reading there is when the other is null, and none when both are', () => {
    const hints = runHints({
      plan: {},
      conditions: { dutSupplyV: { start: 5.01, end: null }, temperatureC: { start: null, end: null } },
    });
    expect(hints.recordedDutSupplyV).toBe(5.01);
    expect(hints.recordedTemperatureC).toBeUndefined();
  });

  it('an old run.json without the key, or a malformed one, gives the plan hints alone', () => {
    expect(runHints({ plan: { gateS: 0.1, supplyV: 3.3 } })).toEqual({ gateS: 0.1, supplyV: 3.3 });
    expect(runHints({ plan: { gateS: 0.1 }, conditions: 'warm' })).toEqual({ gateS: 0.1 });
    expect(runHints({ plan: { gateS: 0.1 }, conditions: { dutSupplyV: { start: 'five' }, temperatureC: [] } })).toEqual(
      { gateS: 0.1 },
    );
  });
});

describe('runConditions with recorded conditions', () => {
  const hints = runHints({ plan: { gateS: 0.05, dutSupplyV: 4.5 }, conditions: recorded });

  it('fill in a sweep that logged neither temperature nor supply; the measured supply beats the plan', () => {
    expect(runConditions('sweep', {}, hints)).toEqual({
      temperatureC: expect.closeTo(23.1, 12) as number,
      supplyV: expect.closeTo(5, 12) as number,
      gateS: 0.05,
    });
  });

  it('logged columns still come first', () => {
    const c = runConditions('sweep', { temperatureC: [24, 26], supplyV: [3.3] }, hints);
    expect(c.temperatureC).toBe(25);
    expect(c.supplyV).toBe(3.3);
  });

  it('a sweep row of the gain table shows temperature, DUT supply and gate', () => {
    // Straight line f = 1 MHz + 100 kHz/V · V over 1..3 V (exact by construction).
    const v = [1, 1.5, 2, 2.5, 3];
    const analysis = analyzeSweep({
      controlV: Float64Array.from(v),
      frequencyHz: Float64Array.from(v, (x) => 1e6 + 1e5 * x),
    });
    const sheet = buildDatasheet([{ label: 'sweep-1', analysis, conditions: runConditions('sweep', {}, hints) }]);
    expect(sheet.rows.find((r) => r.key === 'kvcoLine')?.conditions).toMatch(
      /^T 23.1 °C; supply 5.00 V; gate 50.0 ms; window /,
    );
  });
});
