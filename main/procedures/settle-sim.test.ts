/**
 * Automatic settling against a known settling lag, on the simulated bench:
 * the relaxation DUT with its tuning port slowed to τ = 50 ms (first-order
 * lag), counter gate 10 ms (one count = 100 Hz). The reference is the same
 * sweep with a fixed 0.5 s settle (10 τ: e^−10 of the step left, common
 * practice for "settled").
 */
import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { assembleBench } from '../bench/assemble.ts';
import { builtinDut } from '../sim/builtin-duts.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runSweep } from './sweep.ts';
import { MemorySink } from './testing/fake-bench.ts';

async function sweep(settle: { mode: 'auto'; maxS: number } | { mode: 'fixed'; seconds: number }) {
  const dut = builtinDut('relaxation');
  const slow = { ...dut, tuning: { ...dut.tuning, settleTauS: 0.05 } };
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: slow, seed: 5 } });
  const sink = new MemorySink();
  const plan = sweepPlanSchema.parse({
    start: 2,
    stop: 3.5,
    step: 0.05,
    readingsPerPoint: 3,
    gateS: 0.01,
    settle,
    refineEdgeV: 0,
    limits: { maxControlV: 5, currentLimitA: 0.02 },
  });
  await runSweep({ bench, plan, clock, sink });
  await bench.close();
  const means = new Map<number, number>();
  const groups = new Map<number, number[]>();
  for (const row of sink.rows) {
    const v = Math.round((row.control_v as number) * 1e6) / 1e6;
    const list = groups.get(v) ?? [];
    list.push(row.frequency_hz as number);
    groups.set(v, list);
  }
  for (const [v, list] of groups) means.set(v, list.reduce((a, b) => a + b, 0) / list.length);
  return { means, durationS: clock.now(), sink };
}

describe('automatic settling on the simulated bench (τ = 50 ms, gate 10 ms)', () => {
  it(
    'learns τ, agrees with a fixed 0.5 s settle within 2 counts, and takes well under half the time',
    { timeout: 60_000 },
    async () => {
      const auto = await sweep({ mode: 'auto', maxS: 2 });
      const fixed = await sweep({ mode: 'fixed', seconds: 0.5 });
      // τ is learned from the probe or, when the sweep starts below the stall edge, from the first step that shows it.
      const learned = auto.sink.events.find((e) => e.type === 'settle-probe' || e.type === 'settle-tau');
      expect(learned?.tauS as number).toBeGreaterThan(0.035);
      expect(learned?.tauS as number).toBeLessThan(0.065);
      let worstHz = 0;
      for (const [v, fAuto] of auto.means)
        worstHz = Math.max(worstHz, Math.abs(fAuto - (fixed.means.get(v) as number)));
      expect(worstHz).toBeLessThanOrEqual(200);
      expect(auto.durationS / fixed.durationS).toBeLessThan(0.5);
    },
  );
});
