import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { readingsByPoint, simSweep } from '../../test/testing/sim-sweep.ts';
import { enoughReadings, standardErrorHz } from './point-readings.ts';

describe('adaptive readings per point', () => {
  it('computes the standard error of the mean, s/√n, never below the quantisation floor', () => {
    // 10, 12, 14, 16: mean 13, s = √(20/3) (sample SD, n − 1), SE = s/2.
    const values = new Float64Array([10, 12, 14, 16, Number.NaN]);
    expect(standardErrorHz(values, 5, 0.001)).toBeCloseTo(Math.sqrt(20 / 3) / 2, 12);
    // Identical counts: the ±½-count error stays, SD resolution/√12.
    expect(standardErrorHz(new Float64Array([100, 100, 100]), 3, 10)).toBeCloseTo(
      10 / Math.sqrt(12) / Math.sqrt(3),
      12,
    );
    expect(standardErrorHz(new Float64Array([100]), 1, 10)).toBe(Number.POSITIVE_INFINITY);
  });

  it('stops at min, at max, or once the target is met; a stalled point stops at min', () => {
    const rule = { min: 3, max: 6, targetHz: 1 };
    const quiet = new Float64Array([100, 100.5, 100, 100.5, 100, 100]);
    expect(enoughReadings(rule, quiet, 2, 0.01)).toBe(false);
    expect(enoughReadings(rule, quiet, 3, 0.01)).toBe(true);
    const noisy = new Float64Array([100, 130, 70, 120, 80, 110]);
    expect(enoughReadings(rule, noisy, 5, 0.01)).toBe(false);
    expect(enoughReadings(rule, noisy, 6, 0.01)).toBe(true);
    expect(enoughReadings(rule, new Float64Array([Number.NaN, Number.NaN, Number.NaN]), 3, 0.01)).toBe(true);
  });

  it('refuses a plan whose min exceeds its max, naming the field', () => {
    const result = sweepPlanSchema.safeParse({
      start: 1,
      stop: 2,
      step: 0.1,
      readings: { min: 5, max: 3, targetHz: 1 },
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.path).toEqual(['readings', 'min']);
    expect(
      sweepPlanSchema.safeParse({
        start: 1,
        stop: 2,
        step: 0.1,
        readings: { min: 2, max: 3, targetHz: 1, n: 4 },
        limits: { maxControlV: 5, currentLimitA: 0.02 },
      }).success,
    ).toBe(false);
  });

  it('on the simulated relaxation DUT reads the noisy points near the stall edge longer, each to its target or max', async () => {
    const { rows } = await simSweep('relaxation', 3, {
      start: 1.56,
      stop: 3,
      step: 0.08,
      gateS: 0.01,
      readings: { min: 3, max: 40, targetHz: 30 },
      refineEdgeV: 0,
      settle: { mode: 'fixed', seconds: 0.05 },
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    });
    const byPoint = readingsByPoint(rows);
    const counts = [...byPoint.values()].map((v) => v.length);
    for (const values of byPoint.values()) {
      expect(values.length).toBeGreaterThanOrEqual(3);
      expect(values.length).toBeLessThanOrEqual(40);
      if (values.length < 40 && values.filter((v) => !Number.isNaN(v)).length >= 2) {
        expect(standardErrorHz(new Float64Array(values), values.length, 100)).toBeLessThanOrEqual(30);
      }
    }
    // Jitter grows toward the stall edge (DEVELOPERS.md, the relaxation model): more readings there.
    expect(Math.max(...counts.slice(0, 3))).toBeGreaterThan(Math.min(...counts.slice(-5)));
  });
});
