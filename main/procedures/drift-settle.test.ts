/**
 * The drift log settles at its control voltage before the first logged
 * reading, on the simulated bench (sensor-interface relaxation DUT, tuning
 * port τ = 4 ms behind a step from 0 V at switch-on, counter gate 0.1 s so
 * one count is 10 Hz). The DUT itself keeps warming up (450 ppm decaying
 * with τ = 480 s from power-on, resources/duts/): that is drift the log is
 * there to see, so the first readings must agree with the next ones within
 * the warm-up change between them plus the counter's quantisation and noise
 * — not sit off them by the unfinished part of the port's step.
 */
import { describe, expect, it } from 'vitest';
import { driftPlanSchema, type DriftPlan } from '../../app/contract/plans.ts';
import { assembleBench } from '../bench/assemble.ts';
import { builtinDut } from '../sim/builtin-duts.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runDrift } from './drift.ts';
import { MemorySink } from './testing/fake-bench.ts';

const DUT = builtinDut('relaxation');

async function driftOnSim(extra: Partial<DriftPlan> = {}, tauS = DUT.tuning.settleTauS) {
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', {
    clock,
    sim: { dut: { ...DUT, tuning: { ...DUT.tuning, settleTauS: tauS } }, seed: 3 },
  });
  const sink = new MemorySink();
  const plan = driftPlanSchema.parse({
    controlV: 3,
    intervalS: 1,
    durationS: 120,
    gateS: 0.1,
    limits: { maxControlV: 5, currentLimitA: 0.02 },
    ...extra,
  });
  const outcome = await runDrift({ bench, plan, clock, sink });
  await bench.close();
  return { outcome, sink, plan };
}

/** Fractional warm-up offset of the DUT model at `tS` after power-on (resources/duts/sensor-interface-relaxation.json). */
function warmupFraction(tS: number): number {
  return DUT.warmup.offsetPpm * 1e-6 * Math.exp(-tS / DUT.warmup.tauS);
}

function checkFirstReadings(sink: MemorySink, gateS: number): void {
  const f = sink.rows.map((r) => r.frequency_hz as number);
  const t = sink.rows.map((r) => r.time_s as number);
  expect(sink.rows.slice(0, 20).every((r) => r.status === 'ok')).toBe(true);
  // Reference: mean of readings 5..19; the DUT is powered from the bench's creation, about run time 0.
  const ref = f.slice(5, 20);
  const refMeanHz = ref.reduce((a, b) => a + b, 0) / ref.length;
  const refTimeS = t.slice(5, 20).reduce((a, b) => a + b, 0) / ref.length;
  for (let i = 0; i < 3; i++) {
    const warmupHz = refMeanHz * Math.abs(warmupFraction(t[i] as number) - warmupFraction(refTimeS));
    // ±1 count of quantisation on each side (common practice) plus one count for the DUT's own noise.
    const allowedHz = warmupHz + 3 / gateS;
    expect(Math.abs((f[i] as number) - refMeanHz)).toBeLessThanOrEqual(allowedHz);
  }
}

describe('drift log settling before the first reading (simulated bench)', () => {
  it(
    'settles automatically, records how long it took, and the first readings agree with the next',
    { timeout: 60_000 },
    async () => {
      const { outcome, sink, plan } = await driftOnSim();
      expect(outcome.status).toBe('complete');
      const settled = sink.eventsOfType('settled');
      expect(settled).toHaveLength(1);
      expect(settled[0]).toMatchObject({ mode: 'auto', settled: true });
      expect(settled[0]?.waited_s as number).toBeGreaterThan(0);
      expect(settled[0]?.waited_s as number).toBeLessThan(2);
      // The event comes before the first row: the first row is timed after it.
      expect(sink.rows[0]?.time_s as number).toBeGreaterThan(settled[0]?.time_s as number);
      expect(sink.rows).toHaveLength(120);
      checkFirstReadings(sink, plan.gateS);
    },
  );

  it('waits out a slow tuning port (τ = 0.5 s) before logging', { timeout: 60_000 }, async () => {
    const { sink, plan } = await driftOnSim({}, 0.5);
    const settled = sink.eventsOfType('settled')[0];
    // A step of about 12 kHz (from the stall at 0 V) decays to 2 counts (20 Hz) after about τ·ln(600) ≈ 3.2 s.
    expect(settled?.waited_s as number).toBeGreaterThan(0.5 * Math.log(12e3 / 20) * 0.8);
    expect(settled?.settled).toBe(true);
    checkFirstReadings(sink, plan.gateS);
  });

  it("uses the plan's fixed settle when it gives one", { timeout: 60_000 }, async () => {
    const { sink, plan } = await driftOnSim({ settle: { mode: 'fixed', seconds: 0.3 } });
    const settled = sink.eventsOfType('settled')[0];
    expect(settled).toMatchObject({ mode: 'fixed', settled: true, readings: 0 });
    expect(settled?.waited_s as number).toBeCloseTo(0.3, 6);
    checkFirstReadings(sink, plan.gateS);
  });
});
