import { describe, expect, it } from 'vitest';
import type { ProgressInfo } from '../../app/contract/bench-api.ts';
import { driftPlanSchema, pushingPlanSchema, sweepPlanSchema, type SweepPlanInput } from '../../app/contract/plans.ts';
import { InstrumentError } from '../instruments/errors.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runDrift } from './drift.ts';
import { ProgressReporter } from './progress.ts';
import { runPushing } from './pushing.ts';
import { runSweep } from './sweep.ts';
import { MemorySink, TOY_DUT, fakeBench } from './testing/fake-bench.ts';

/** Toy DUT stalls below 1 V: 0.5..2.0 V by 0.1 V is 16 points; the edge bracket 0.9..1.0 V needs 7 bisections to 1 mV. */
const PLAN: SweepPlanInput = {
  start: 0.5,
  stop: 2,
  step: 0.1,
  readingsPerPoint: 2,
  gateS: 0.01,
  settle: { mode: 'fixed', seconds: 0.05 },
  refineEdgeV: 0.001,
  limits: { maxControlV: 5, currentLimitA: 0.05 },
};

async function sweepProgress(
  overrides: Partial<SweepPlanInput> = {},
  failFromRead: number | null = null,
  tauS = 0.005,
) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock, { ...TOY_DUT, tauS });
  if (failFromRead !== null)
    bench.counter.override = (i) =>
      i >= failFromRead ? new InstrumentError([{ code: -230, message: 'Data corrupt or stale' }]) : null;
  const reports: (ProgressInfo & { atS: number })[] = [];
  const plan = sweepPlanSchema.parse({ ...PLAN, ...overrides });
  const outcome = await clock.runUntil(
    runSweep({
      bench,
      plan,
      clock,
      sink: new MemorySink(),
      onProgress: (p) => reports.push({ ...p, atS: clock.now() }),
    }),
    { limitS: 1e5 },
  );
  return { outcome, reports, endS: clock.now() };
}

function expectConsistent(reports: ProgressInfo[]): void {
  for (const p of reports) {
    expect(p.pointsDone).toBeLessThanOrEqual(p.pointsTotal);
    if (p.etaS !== null) expect(p.etaS).toBeGreaterThanOrEqual(0);
  }
}

describe('progress of a sweep', () => {
  it('a completed sweep with edge refinement ends at n of n with an ETA of 0', async () => {
    const { outcome, reports } = await sweepProgress();
    expect(outcome.status).toBe('complete');
    expect(outcome.refinedPoints).toBe(7);
    expectConsistent(reports);
    const last = reports.at(-1) as ProgressInfo;
    expect(last.phase).toBe('finishing');
    expect(last.pointsDone).toBe(16 + 7);
    expect(last.pointsTotal).toBe(16 + 7);
    expect(last.etaS).toBe(0);
    // Refinement points join the total when the refinement starts, not before.
    expect(reports.find((p) => p.phase === 'reading')?.pointsTotal).toBe(16);
    expect(reports.find((p) => p.phase === 'refining')?.pointsTotal).toBe(23);
  });

  it('a bisection that stops early (failed readings) still ends at n of n', async () => {
    // 16 coarse points × 2 readings = reads 0..31; the third refinement point's readings fail.
    const { outcome, reports } = await sweepProgress({}, 32 + 4);
    expect(outcome.status).toBe('complete');
    expect(outcome.refinedPoints).toBe(3);
    expectConsistent(reports);
    const last = reports.at(-1) as ProgressInfo;
    expect(last).toMatchObject({ pointsDone: 19, pointsTotal: 19, etaS: 0 });
  });

  it('an aborted sweep keeps its planned total (how far it got)', async () => {
    const { outcome, reports } = await sweepProgress({ refineEdgeV: 0 }, 10);
    expect(outcome.status).toBe('aborted'); // 20 failed readings in a row end the run
    const last = reports.at(-1) as ProgressInfo;
    expect(last.pointsTotal).toBe(16);
    expect(last.pointsDone).toBeLessThan(16);
  });

  it('the ETA is honest: with equal points it predicts when the coarse pass ends', async () => {
    const { reports } = await sweepProgress({ refineEdgeV: 0 });
    const coarse = reports.filter((p) => p.phase === 'reading');
    const endS = (coarse.at(-1) as { atS: number }).atS;
    for (const p of coarse.slice(1)) {
      // Fixed settle, same readings per point: time per point is constant, so the ETA is exact to rounding.
      expect(p.etaS as number).toBeCloseTo(endS - p.atS, 6);
    }
  });

  it('with automatic settling the τ probe and the first point are left out of the time per point', async () => {
    // τ = 50 ms: the probe (a quarter-range step, waited out) takes longer than a point; point 0 (no step) far less.
    const { outcome, reports } = await sweepProgress(
      { settle: { mode: 'auto', maxS: 2 }, refineEdgeV: 0, start: 1.5, stop: 2, step: 0.05 },
      null,
      0.05,
    );
    expect(outcome.status).toBe('complete');
    const coarse = reports.filter((p) => p.phase === 'reading');
    expect(reports.at(-1)).toMatchObject({ pointsDone: 11, pointsTotal: 11, etaS: 0 });
    const endS = (coarse.at(-1) as { atS: number }).atS;
    // From the third point on, the ETA is within 10 % of the time the sweep really took to finish
    // (counting the probe as a point would put the ETA at point 2 about 2.5 times too long). The
    // second point steps back from the probe voltage, one-off work too: no rate is known there yet.
    expect(coarse[1]?.etaS).toBeNull();
    for (const p of coarse.slice(2, -1)) {
      const actual = endS - p.atS;
      expect(Math.abs((p.etaS as number) - actual)).toBeLessThanOrEqual(0.1 * actual);
    }
  });
});

describe('ProgressReporter', () => {
  it('leaves excluded one-off work out of the time per point', async () => {
    const clock = new VirtualClock();
    const seen: ProgressInfo[] = [];
    const reporter = new ProgressReporter(clock, 'sweep', 'r', 10, (p) => seen.push(p));
    await clock.advance(2);
    reporter.report('reading', 1, null);
    await clock.runUntil(reporter.excluding(() => clock.sleep(30)));
    await clock.advance(2);
    reporter.report('reading', 2, null);
    // 4 s over 2 points = 2 s per point, 8 points left → 16 s (the 30 s probe is not a point).
    expect(seen.at(-1)?.etaS).toBeCloseTo(16, 9);
    reporter.finish(true);
    expect(seen.at(-1)).toMatchObject({ phase: 'finishing', pointsDone: 2, pointsTotal: 2, etaS: 0 });
  });
});

describe('progress of a drift log and a pushing run', () => {
  it('a completed drift log ends at n of n', async () => {
    const clock = new VirtualClock();
    const bench = fakeBench(clock);
    const seen: ProgressInfo[] = [];
    const plan = driftPlanSchema.parse({
      controlV: 1.5,
      intervalS: 1,
      durationS: 60,
      gateS: 0.1,
      limits: { maxControlV: 5, currentLimitA: 0.05 },
    });
    const outcome = await clock.runUntil(
      runDrift({ bench, plan, clock, sink: new MemorySink(), onProgress: (p) => seen.push(p) }),
    );
    expect(outcome.status).toBe('complete');
    expect(seen[0]?.phase).toBe('settling');
    expect(seen.at(-1)).toMatchObject({ phase: 'finishing', pointsDone: 60, pointsTotal: 60, etaS: 0 });
  });

  it('a completed pushing run ends at n of n', async () => {
    const clock = new VirtualClock();
    const bench = fakeBench(clock);
    bench.supply.channel(2).voltageV = 3.3;
    bench.supply.channel(2).output = true;
    const seen: ProgressInfo[] = [];
    const plan = pushingPlanSchema.parse({
      controlV: 1.5,
      supplyStartV: 3,
      supplyStopV: 3.6,
      supplyStepV: 0.1,
      gateS: 0.1,
      settleS: 0.2,
      maxSupplyV: 3.6,
      limits: { maxControlV: 5, currentLimitA: 0.05 },
    });
    await clock.runUntil(runPushing({ bench, plan, clock, sink: new MemorySink(), onProgress: (p) => seen.push(p) }));
    expect(seen.at(-1)).toMatchObject({ phase: 'finishing', pointsDone: 7, pointsTotal: 7, etaS: 0 });
  });
});
