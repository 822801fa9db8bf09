/**
 * Learning the tuning port's time constant, and rule 1 of automatic
 * settling, on synthetic first-order steps: f(t) = f∞ − A·e^(−t/τ) (a
 * first-order lag, common practice), read as a counter would — each reading
 * whole counts over a 10 ms gate (±1 count, resolution 100 Hz).
 */
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import type { CounterReading } from './read-counter.ts';
import { TimeConstantEstimate, settleAuto } from './settle.ts';

const GATE_S = 0.01;

function step(endHz: number, stepHz: number, tauS: number) {
  return (t: number): number => endHz - stepHz * Math.exp(-t / tauS);
}

describe('TimeConstantEstimate.fitStep (end value free)', () => {
  it('recovers τ without being told the end value, where a fixed end value still carrying part of the step biases the log-linear fit short', () => {
    const f = step(20_000, 3000, 0.05);
    const times = Float64Array.from([0.005, 0.015, 0.03, 0.05, 0.08, 0.12, 0.2, 0.21, 0.22]);
    const values = times.map(f);
    const free = new TimeConstantEstimate();
    expect(free.fitStep(times, values, times.length, 1000)).toBeCloseTo(0.05, 4);
    // The mean of the last three readings is still 3000·e^(−4.2) ≈ 45 Hz short of 20 kHz.
    const endGuess = (values[6]! + values[7]! + values[8]!) / 3;
    const fixed = new TimeConstantEstimate();
    fixed.fitPoint(times, values, times.length, endGuess, 10);
    expect(fixed.tauS as number).toBeLessThan(0.048);
  });

  it('refuses steps the readings did not show (too small, or one reading on the way)', () => {
    const est = new TimeConstantEstimate();
    const small = step(20_000, 600, 0.05);
    const times = Float64Array.from([0.005, 0.015, 0.03, 0.05, 0.08, 0.12]);
    // 600 Hz is 6 counts at a 10 ms gate: below the 10-count minimum.
    expect(est.fitStep(times, times.map(small), times.length, 1000)).toBeNull();
    // A big step seen by one early reading and a settled tail: any τ fits it.
    const big = step(20_000, 3000, 0.05);
    const sparse = Float64Array.from([0.005, 0.3, 0.31, 0.32]);
    expect(est.fitStep(sparse, sparse.map(big), sparse.length, 1000)).toBeNull();
    expect(est.tauS).toBeNull();
  });
});

describe('settleAuto rule 1 (τ and the value before the step known)', () => {
  async function settleOnStep(stepHz: number, expectedStepHz: number) {
    const clock = new VirtualClock();
    const tau = new TimeConstantEstimate();
    const times = Float64Array.from([0.005, 0.015, 0.03, 0.05, 0.08, 0.12, 0.2, 0.21, 0.22]);
    tau.fitStep(times, times.map(step(20_000, 3000, 0.05)), times.length, 1000);
    const beforeHz = 10_000;
    const f = step(beforeHz + stepHz, stepHz, 0.05);
    const stepAtS = clock.now();
    let phase = 0.482; // the first reading rounds down: a 45 Hz start of the step reads as none
    const read = async (): Promise<CounterReading> => {
      await clock.sleep(GATE_S);
      const centre = clock.now() - GATE_S / 2 - stepAtS;
      phase = (phase + 0.618) % 1; // counts are whole: the gate's start phase decides the rounding
      const counts = Math.floor(f(centre) * GATE_S + phase);
      return { status: 'ok', frequencyHz: counts / GATE_S, detail: null, errorName: null };
    };
    const outcome = await clock.runUntil(
      settleAuto(
        clock,
        stepAtS,
        read,
        { gateS: GATE_S, maxS: 2, toleranceCounts: 2, scatterHz: 0, expectedStepHz },
        tau,
        undefined,
        beforeHz,
      ),
    );
    return { outcome, remainingHz: stepHz * Math.exp(-(outcome.elapsedS - GATE_S / 2) / 0.05) };
  }

  it('waits out a step the first reading cannot see (no expected step): not settled at once', async () => {
    // 500 Hz step: 5 ms after it, 9 % done = 45 Hz, lost in the counts; the step's own readings decide later.
    const { outcome, remainingHz } = await settleOnStep(500, 0);
    expect(outcome.settled).toBe(true);
    expect(outcome.elapsedS).toBeGreaterThan(0.05 * Math.log(2)); // at least half the step done (by τ)
    expect(remainingHz).toBeLessThanOrEqual(200);
    expect(outcome.last?.reading.status).toBe('ok');
  });

  it('jumps straight to the expected settling time for a known step: few readings, remainder within tolerance', async () => {
    const { outcome, remainingHz } = await settleOnStep(2000, 2000);
    expect(outcome.settled).toBe(true);
    expect(outcome.readings).toBeLessThanOrEqual(3);
    expect(remainingHz).toBeLessThanOrEqual(200);
    // τ·ln(2000/200) ≈ 0.115 s is the least any rule could wait for 2 counts (common practice for a first-order lag).
    expect(outcome.elapsedS).toBeGreaterThan(0.05 * Math.log(10));
  });
});
