/** Soak judgement and condition order, pure. */
import { describe, expect, it } from 'vitest';
import { orderConditions, orderCost } from './condition-order.ts';
import { SoakDetector, slopePerS } from './soak-detector.ts';

describe('SoakDetector', () => {
  const criteria = { setpointC: -20, toleranceC: 0.5, maxSlopeCPerMin: 0.1, dwellS: 300 };

  it('needs the whole dwell inside the band, and restarts it on a reading outside', () => {
    const d = new SoakDetector(criteria);
    expect(d.add({ timeS: 0, dutC: -20.2 }).soaked).toBe(false);
    expect(d.add({ timeS: 200, dutC: -20.1 }).soaked).toBe(false);
    expect(d.add({ timeS: 250, dutC: -20.8 }).inBandS).toBe(0);
    expect(d.add({ timeS: 300, dutC: -20.1 }).soaked).toBe(false);
    expect(d.add({ timeS: 599, dutC: -20.1 }).soaked).toBe(false);
    expect(d.add({ timeS: 600, dutC: -20.1 }).soaked).toBe(true);
  });

  it('refuses a DUT still moving faster than the slope limit', () => {
    const d = new SoakDetector({ ...criteria, toleranceC: 1 });
    // 0.15 °C/min for 6 min, inside ±1 °C all along.
    let v = { soaked: false, slopeCPerMin: null as number | null };
    for (let t = 0; t <= 360; t += 10) v = d.add({ timeS: t, dutC: -20.45 + (0.15 * t) / 60 });
    expect(v.slopeCPerMin).toBeCloseTo(0.15, 6);
    expect(v.soaked).toBe(false);
  });

  it('applies the optional ppm/min drift limit on the frequency', () => {
    const d = new SoakDetector({ ...criteria, maxDriftPpmPerMin: 1 });
    let v = { soaked: false, driftPpmPerMin: null as number | null };
    // 2 ppm/min drift at 10 kHz: 0.02 Hz/min.
    for (let t = 0; t <= 400; t += 10) v = d.add({ timeS: t, dutC: -20, frequencyHz: 10_000 + (0.02 * t) / 60 });
    expect(v.driftPpmPerMin).toBeCloseTo(2, 3);
    expect(v.soaked).toBe(false);
  });

  it('least-squares slope of a straight line is exact', () => {
    expect(slopePerS([0, 1, 2, 3], [1, 3, 5, 7])).toBe(2);
    expect(slopePerS([1], [1])).toBeNull();
  });
});

describe('orderConditions', () => {
  it('keeps unit changes to the minimum and walks the chamber one way from the end nearer safeC', () => {
    const order = orderConditions({
      units: ['a', 'b'],
      temperaturesC: [85, -40, 25],
      supplyV: [3.1, 3.3, 3.5],
      safeC: 25,
    });
    expect(order).toHaveLength(18);
    expect(order.slice(0, 9).every((c) => c.unit === 'a')).toBe(true);
    // 85 is 60 °C from safeC, −40 is 65: start hot.
    expect([...new Set(order.slice(0, 9).map((c) => c.temperatureC))]).toEqual([85, 25, -40]);
    expect(order.slice(0, 3).map((c) => c.supplyV)).toEqual([3.1, 3.3, 3.5]);
    const cost = orderCost(order, 25);
    expect(cost.unitChanges).toBe(1);
    // Each unit: 25→85→25→−40 (60 + 60 + 65), the door at 25 (65 back), and again.
    expect(cost.chamberTravelC).toBe(2 * 185 + 65);
    expect(order.map((c) => c.index)).toEqual([...order.keys()]);
  });
});
