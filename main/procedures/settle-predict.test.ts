import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { gateAverageFactor, predictedStartS, readingErrorHz, STEP_MARGIN, TARGET_FRACTION } from './settle-predict.ts';
import { runSweep } from './sweep.ts';
import { MemorySink, TOY_DUT, fakeBench } from './testing/fake-bench.ts';

/** Mean of e^(−s/τ) over [0, g] by the midpoint rule with many slices (independent of the closed form). */
function numericFactor(tauS: number, gateS: number): number {
  const n = 100_000;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += Math.exp(-((i + 0.5) * gateS) / n / tauS);
  return sum / n;
}

describe('settling by prediction (first-order lag, common practice)', () => {
  it('averages the remaining error over the gate as the integral of e^(−s/τ) does', () => {
    for (const [tau, gate] of [
      [0.05, 0.1],
      [0.05, 0.01],
      [0.004, 1],
      [1, 1e-6],
    ] as const) {
      expect(gateAverageFactor(tau, gate)).toBeCloseTo(numericFactor(tau, gate), 6);
    }
    // A gate of 2τ keeps 0.432 of the error at its start: (1 − e^−2)/2.
    expect(gateAverageFactor(0.05, 0.1)).toBeCloseTo((1 - Math.exp(-2)) / 2, 12);
  });

  it('starts the first reading where its mean error is the target fraction of the tolerance', () => {
    const tau = 0.05;
    const gate = 0.1;
    const stepHz = 2000;
    const tolHz = 10;
    const startS = predictedStartS(tau, gate, stepHz, tolHz);
    // The reading's mean error with the predicted step (margin included) is exactly target × tolerance there.
    expect(STEP_MARGIN * stepHz * gateAverageFactor(tau, gate) * Math.exp(-startS / tau)).toBeCloseTo(
      TARGET_FRACTION * tolHz,
      9,
    );
    // Shorter than the settle-to-the-gate-start rule τ·ln(step/tol), since the gate averages the tail.
    expect(startS).toBeLessThan(tau * Math.log(stepHz / tolHz));
    expect(predictedStartS(tau, gate, 1, tolHz)).toBe(0);
  });

  it('reads its own error back from a reading of the model', () => {
    const tau = 0.05;
    const gate = 0.1;
    const beforeHz = 10_000;
    const stepHz = 1500;
    const startS = 0.2;
    const left = gateAverageFactor(tau, gate) * Math.exp(-startS / tau);
    const readingHz = beforeHz + stepHz * (1 - left);
    expect(readingErrorHz(tau, gate, startS, readingHz, beforeHz)).toBeCloseTo(stepHz * left, 9);
    // Downward steps alike.
    expect(readingErrorHz(tau, gate, startS, beforeHz - stepHz * (1 - left), beforeHz)).toBeCloseTo(stepHz * left, 9);
  });

  it('spends no readings watching once τ is learned: one wait, then the point’s own readings, all within tolerance', async () => {
    // Toy DUT, 200 kHz/V, τ = 50 ms; 10 mV steps = 2 kHz = 20 counts at a 10 ms gate; tolerance 2 counts.
    const clock = new VirtualClock();
    const bench = fakeBench(clock, { ...TOY_DUT, tauS: 0.05 });
    const sink = new MemorySink();
    const plan = sweepPlanSchema.parse({
      start: 1.5,
      stop: 2,
      step: 0.01,
      readingsPerPoint: 3,
      gateS: 0.01,
      settle: { mode: 'auto', maxS: 2 },
      refineEdgeV: 0,
      limits: { maxControlV: 5, currentLimitA: 0.05 },
    });
    const outcome = await clock.runUntil(runSweep({ bench, plan, clock, sink }));
    expect(outcome.status).toBe('complete');
    expect(sink.rows).toHaveLength(51 * 3);
    // Reads beyond the recorded ones: the τ probe and the first points only (watching would cost ≥ 1 per point).
    expect(bench.counter.reads - sink.rows.length).toBeLessThanOrEqual(20);
    let worstHz = 0;
    for (const row of sink.rows)
      worstHz = Math.max(
        worstHz,
        Math.abs((row.frequency_hz as number) - TOY_DUT.frequencyAtV(row.control_v as number)),
      );
    expect(worstHz).toBeLessThanOrEqual(200 + 100); // tolerance plus the ±1-count quantisation
  });
});
