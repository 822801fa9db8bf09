import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { FirstOrderLag } from '../sim/first-order-lag.ts';
import type { CounterReading } from './read-counter.ts';
import {
  gateAverageFactor,
  meanErrorHz,
  predictedStartS,
  readingErrorHz,
  STEP_MARGIN,
  TARGET_FRACTION,
  takenMeanErrorHz,
} from './settle-predict.ts';
import { settleAuto } from './settle.ts';
import { tauLearnedFromExactLag } from './testing/learned-tau.ts';
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

/**
 * The tolerance on the recorded mean (issue 12 item 3): a step of a tuning port through the
 * simulator's own first-order lag (main/sim/first-order-lag.ts, advanced in 0.1 ms slices), counted
 * over gates as a counter does, with the numbers of the sweep-floor bench: τ = 50 ms, gate 100 ms,
 * 3 readings, 1 count = 10 Hz, a 200 mV step of 8 kHz/V = 1600 Hz.
 */
describe('settling by prediction, tolerance on the mean of the recorded readings', () => {
  const tauS = 0.05;
  const gateS = 0.1;
  const beforeHz = 20_000;
  const kHzPerV = 8000;
  const stepV = 0.2;
  const stepHz = kHzPerV * stepV;
  const countHz = 1 / gateS;

  /** A port that steps at t = 0 and a counter reading it: exact gate means (no counts) and counted readings. */
  function portAndCounter(clock: VirtualClock, phase = 0.5, gate = gateS) {
    const lag = new FirstOrderLag(tauS, 0);
    let atS = 0;
    const sliceS = 1e-4;
    const advance = (toS: number): number => {
      let integral = 0;
      while (atS < toS - 1e-12) {
        const dt = Math.min(sliceS, toS - atS);
        const before = lag.value;
        lag.step(dt, stepV);
        integral += ((before + lag.value) / 2) * dt;
        atS += dt;
      }
      return integral;
    };
    const means: number[] = [];
    const read = async (): Promise<CounterReading> => {
      const startS = clock.now();
      advance(startS);
      await clock.sleep(gate);
      const meanHz = beforeHz + (kHzPerV * advance(startS + gate)) / gate;
      means.push(meanHz);
      const counted = Math.floor(meanHz * gate + phase) / gate;
      return { status: 'ok', frequencyHz: counted, detail: null, errorName: null };
    };
    return { read, means, endHz: beforeHz + stepHz };
  }

  it('the mean of n back-to-back gates keeps F(τ, n·g) of the error at the first gate’s start, as the simulator’s lag integrates it', async () => {
    for (const [gate, n, factor] of [
      [0.1, 3, 0.1663],
      [0.01, 3, 0.752],
      [0.1, 1, 0.4323],
    ] as const) {
      const clock = new VirtualClock();
      const { read, means } = portAndCounter(clock, 0.5, gate);
      const startS = 0.1;
      await clock.runUntil(clock.sleep(startS));
      for (let k = 0; k < n; k++) await clock.runUntil(read());
      const missHz = beforeHz + stepHz - means.reduce((a, b) => a + b, 0) / n;
      // Simulator's integral against the closed form (τ/(n·g))·(1 − e^(−n·g/τ)), and that to the digits quoted.
      expect(missHz).toBeCloseTo(stepHz * Math.exp(-startS / tauS) * gateAverageFactor(tauS, n * gate), 1);
      expect(gateAverageFactor(tauS, n * gate)).toBeCloseTo(factor, 3);
    }
  });

  it('judges readings already taken (a trial point’s) by the lag once τ is known', () => {
    const f = gateAverageFactor(tauS, gateS);
    const starts = [0.25, 0.35, 0.45];
    const values = starts.map((s) => beforeHz + stepHz * (1 - f * Math.exp(-s / tauS)));
    const meanLeft = starts.reduce((a, s) => a + f * Math.exp(-s / tauS), 0) / starts.length;
    expect(takenMeanErrorHz(tauS, gateS, starts, values, beforeHz)).toBeCloseTo(stepHz * meanLeft, 6);
    // 0.25 s = 5τ after a 1600 Hz step the mean of three 100 ms gates misses by about 0.3 Hz; a reading at 0 s cannot tell.
    expect(takenMeanErrorHz(tauS, gateS, starts, values, beforeHz)).toBeLessThan(countHz);
    expect(takenMeanErrorHz(tauS, 1e-12, [0], [beforeHz], beforeHz)).toBe(Number.POSITIVE_INFINITY);
  });

  it('reads the mean’s error back from the first reading alone', () => {
    const startS = 0.15;
    const left = gateAverageFactor(tauS, gateS) * Math.exp(-startS / tauS);
    const firstHz = beforeHz + stepHz * (1 - left);
    expect(meanErrorHz(tauS, gateS, 3, startS, firstHz, beforeHz)).toBeCloseTo(
      stepHz * Math.exp(-startS / tauS) * gateAverageFactor(tauS, 3 * gateS),
      9,
    );
    expect(meanErrorHz(tauS, gateS, 1, startS, firstHz, beforeHz)).toBeCloseTo(
      readingErrorHz(tauS, gateS, startS, firstHz, beforeHz),
      9,
    );
  });

  async function settleThenRecord(recordedReadings: number, phase: number) {
    const clock = new VirtualClock();
    const { read, means, endHz } = portAndCounter(clock, phase);
    // τ as a sweep learns it: fitted from a step's readings (here the exact lag, 50 ms).
    const tau = tauLearnedFromExactLag(tauS);
    const outcome = await clock.runUntil(
      settleAuto(
        clock,
        0,
        read,
        { gateS, maxS: 2, toleranceCounts: 1, scatterHz: 0, expectedStepHz: stepHz, recordedReadings },
        tau,
        undefined,
        beforeHz,
      ),
    );
    // The point's other readings follow at once, as the sweep takes them.
    const recorded = [outcome.last?.reading.frequencyHz as number];
    const firstMean = means.length - 1;
    for (let k = 1; k < 3; k++) recorded.push((await clock.runUntil(read())).frequencyHz);
    const exact = means.slice(firstMean, firstMean + 3);
    return {
      outcome,
      firstStartS: outcome.elapsedS - gateS,
      exactMissHz: endHz - exact.reduce((a, b) => a + b, 0) / 3,
      countedMissHz: endHz - recorded.reduce((a, b) => a + b, 0) / 3,
      firstMissHz: endHz - (exact[0] as number),
    };
  }

  it('opens the first gate earlier than the one-reading rule, and the recorded mean of 3 is still within 1 count', async () => {
    for (const phase of [0.05, 0.3, 0.5, 0.7, 0.95]) {
      const mean = await settleThenRecord(3, phase);
      const single = await settleThenRecord(1, phase);
      expect(mean.outcome.settled && single.outcome.settled).toBe(true);
      expect(mean.outcome.readings).toBe(1); // no reading spent watching
      // τ·ln(F(g)/F(3g)) = 50 ms · ln(0.4323/0.1663) ≈ 48 ms earlier.
      expect(single.firstStartS - mean.firstStartS).toBeCloseTo(tauS * Math.log(0.4323 / 0.1663), 3);
      // The settling error of the recorded mean (exact gate means): within 1 count, with the prediction's margin.
      expect(Math.abs(mean.exactMissHz)).toBeLessThanOrEqual(countHz);
      // The first reading alone misses by more than a count: the mean, not each reading, is what is held to it.
      expect(Math.abs(mean.firstMissHz)).toBeGreaterThan(countHz);
      // Counted as a counter counts: the mean of 3 whole-count readings within 1 count of settled, plus its ±½-count rounding.
      expect(Math.abs(mean.countedMissHz)).toBeLessThanOrEqual(1.5 * countHz);
      // Beats the floor's rule, τ·ln(step/resolution) to the first gate (instantaneous frequency within 1 count).
      expect(mean.firstStartS).toBeLessThan(tauS * Math.log(stepHz / countHz));
    }
  });
});
