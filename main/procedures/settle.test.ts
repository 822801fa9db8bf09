import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runSweep } from './sweep.ts';
import { MemorySink, TOY_DUT, fakeBench } from './testing/fake-bench.ts';

/**
 * Toy DUT (200 kHz/V above 1 V) behind a first-order tuning-port lag of
 * known time constant; counter gate 10 ms, so one count is 100 Hz. A first-
 * order lag leaves e^(−t/τ) of a step (common practice).
 */
async function sweepWith(
  tauS: number,
  settle: { mode: 'auto'; maxS: number } | { mode: 'fixed'; seconds: number },
  step = 0.01,
) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock, { ...TOY_DUT, tauS });
  const sink = new MemorySink();
  const plan = sweepPlanSchema.parse({
    start: 1.5,
    stop: 2,
    step,
    readingsPerPoint: 3,
    gateS: 0.01,
    settle,
    refineEdgeV: 0,
    limits: { maxControlV: 5, currentLimitA: 0.05 },
  });
  const outcome = await clock.runUntil(runSweep({ bench, plan, clock, sink }));
  return { outcome, rows: sink.rows, elapsedS: clock.now(), sink };
}

function worstErrorHz(rows: Record<string, number | string>[]): number {
  let worst = 0;
  for (const row of rows)
    worst = Math.max(worst, Math.abs((row.frequency_hz as number) - TOY_DUT.frequencyAtV(row.control_v as number)));
  return worst;
}

describe('automatic settling against a known settling lag', () => {
  it('does not read a slow DUT (τ = 50 ms) early: every reading within tolerance of the settled value', async () => {
    // Step 10 mV = 2 kHz = 20 counts; tolerance 2 counts (200 Hz) plus one count of quantisation.
    const { outcome, rows } = await sweepWith(0.05, { mode: 'auto', maxS: 2 });
    expect(outcome.status).toBe('complete');
    expect(worstErrorHz(rows)).toBeLessThanOrEqual(300);
    // 2 kHz must decay below the 200 Hz tolerance: at least τ·ln(10) ≈ 115 ms after each step.
    // Point 0 has no step (its voltage was set before the output went on).
    const settleS = rows.filter((r) => r.point_index !== 0).map((r) => r.settle_s as number);
    expect(Math.min(...settleS)).toBeGreaterThanOrEqual(0.05 * Math.log(10));
  });

  it('does not hold back a fast DUT (τ = 0.5 ms): released after two readings', async () => {
    const { rows } = await sweepWith(0.0005, { mode: 'auto', maxS: 2 });
    expect(worstErrorHz(rows)).toBeLessThanOrEqual(100);
    expect(Math.max(...rows.map((r) => r.settle_s as number))).toBeLessThanOrEqual(0.0201);
  });

  it('flags a DUT still moving at maxS as not settled', async () => {
    // τ = 1 s, 0.5 V steps (100 kHz): still 80 kHz away after maxS = 0.2 s.
    const { sink } = await sweepWith(1, { mode: 'auto', maxS: 0.2 }, 0.5);
    // Two points: point 0 has no step; point 1, the one 0.5 V step, runs out of time and says so.
    const timeouts = sink.eventsOfType('settle-timeout');
    expect(timeouts).toHaveLength(1);
    expect(timeouts[0]).toMatchObject({ point_index: 1, control_v: 2 });
    expect(timeouts[0]?.waited_s as number).toBeGreaterThanOrEqual(0.2);
  });

  it('beats a fixed 0.5 s settle on time and agrees with it within tolerance', async () => {
    const auto = await sweepWith(0.05, { mode: 'auto', maxS: 2 });
    const fixed = await sweepWith(0.05, { mode: 'fixed', seconds: 0.5 });
    expect(auto.elapsedS / fixed.elapsedS).toBeLessThan(0.6);
    expect(worstErrorHz(fixed.rows)).toBeLessThanOrEqual(100);
  });
});
