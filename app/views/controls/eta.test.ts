import { describe, expect, it } from 'vitest';
import { estimateS, nextEta, planPointS } from './eta.ts';

describe('time left from the plan, kept steady', () => {
  it('a 47-point sweep with 3 readings at a 0.1 s gate and auto settling (τ learned 20 ms) is about 25 s, not 3 min', () => {
    const plan = { readingsPerPoint: 3, gateS: 0.1, settle: { mode: 'auto', maxS: 2 } };
    // 3 × (0.1 + 0.05) + ln 50 × 0.02 = 0.45 + 0.0782 = 0.528 s per point.
    expect(planPointS(plan, 0.02)).toBeCloseTo(0.45 + Math.log(50) * 0.02, 12);
    expect(estimateS(47, 0, null, planPointS(plan, 0.02))).toBeCloseTo(47 * (0.45 + Math.log(50) * 0.02), 9);
    // Before τ is known: half the longest wait.
    expect(planPointS(plan, null)).toBeCloseTo(1.45, 12);
    expect(planPointS({ readingsPerPoint: 2, gateS: 1, settle: { mode: 'fixed', seconds: 0.5 } }, null)).toBeCloseTo(
      2.6,
      12,
    );
    expect(planPointS({ intervalS: 1, gateS: 0.1 }, null)).toBe(1);
  });

  it("takes main's measured ETA after three points", () => {
    expect(estimateS(40, 2, 208, 0.5)).toBe(20);
    expect(estimateS(40, 3, 30, 0.5)).toBe(30);
    expect(estimateS(0, 47, 5, 0.5)).toBe(0);
  });

  it('counts down with the run clock and moves a quarter of the way to a new estimate', () => {
    const first = nextEta(null, 40, 10);
    expect(first).toEqual({ etaS: 40, atS: 10 });
    // 2 s later it shows 38 s; a new estimate of 58 s moves it to 38 + 5 = 43 s, not 58.
    const second = nextEta(first, 58, 12);
    expect(second?.etaS).toBeCloseTo(43, 12);
    expect(nextEta(second, null, 14)?.etaS).toBeCloseTo(41, 12);
    expect(nextEta(second, 0, 13)).toEqual({ etaS: 0, atS: 13 });
  });
});

describe('the time left shown from the first frame of a run', () => {
  const plan = { readingsPerPoint: 3, gateS: 0.1, settle: { mode: 'auto', maxS: 2 } };
  it('is unknown until the run says how many points it plans, then the plan estimate, not 0 s', async () => {
    const { shownEta } = await import('./eta.ts');
    // The first frame: no progress yet (total 0). Showing 0 s here used to stick (seen: "3 of 47 points · about 0 s left").
    const first = shownEta(null, { total: 0, done: 0, measuredEtaS: null, plan, tauS: null, runClockS: 0 });
    expect(first).toBeNull();
    // Progress arrives before any reading (run clock still 0): 47 × (3 × 0.15 s + 1 s) = 68.15 s from the plan.
    const second = shownEta(first, { total: 47, done: 0, measuredEtaS: null, plan, tauS: null, runClockS: 0 });
    expect(second?.etaS).toBeCloseTo(47 * 1.45, 9);
    // Three points in, 2 s later, τ learned as 20 ms: counts down and moves a quarter toward the new plan figure.
    const third = shownEta(second, { total: 47, done: 3, measuredEtaS: null, plan, tauS: 0.02, runClockS: 2 });
    const counted = 47 * 1.45 - 2;
    expect(third?.etaS).toBeCloseTo(counted + 0.25 * (44 * (0.45 + Math.log(50) * 0.02) - counted), 9);
    // A finished run shows 0 at once.
    expect(shownEta(third, { total: 47, done: 47, measuredEtaS: 5, plan, tauS: 0.02, runClockS: 2 })?.etaS).toBe(0);
  });
});
