/**
 * A sweep of the shipped relaxation DUT with its tuning port slowed to
 * τ = 50 ms, on the simulated bench and a virtual clock: what the settling
 * tests measure against (a fixed 0.5 s settle, 10 τ, is their reference).
 * Readings are grouped by point index.
 */
import { expect } from 'vitest';
import { sweepPlanSchema, type SweepPlanInput } from '../../../app/contract/plans.ts';
import { assembleBench } from '../../bench/assemble.ts';
import { builtinDut } from '../../sim/builtin-duts.ts';
import { VirtualClock } from '../../time/virtual-clock.ts';
import { runSweep } from '../sweep.ts';
import { MemorySink } from './fake-bench.ts';

export interface SlowPortPoint {
  statuses: string[];
  /** Row times, s from the run's start. */
  timesS: number[];
  frequenciesHz: number[];
  /** Mean of the ok readings (NaN when none). */
  meanHz: number;
}

export async function slowPortSweep(
  plan: Pick<SweepPlanInput, 'start' | 'stop' | 'step' | 'gateS' | 'settle'>,
  seed: number,
): Promise<{ sink: MemorySink; points: Map<number, SlowPortPoint>; outputOnS: number }> {
  const dut = builtinDut('relaxation');
  const slow = { ...dut, tuning: { ...dut.tuning, settleTauS: 0.05 } };
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: slow, seed } });
  const sink = new MemorySink();
  const parsed = sweepPlanSchema.parse({
    ...plan,
    readingsPerPoint: 3,
    refineEdgeV: 0,
    limits: { maxControlV: 5, currentLimitA: 0.02 },
  });
  const outcome = await runSweep({ bench, plan: parsed, clock, sink });
  await bench.close();
  expect(outcome.status).toBe('complete');
  const points = new Map<number, SlowPortPoint>();
  for (const row of sink.rows) {
    const i = row.point_index as number;
    const p = points.get(i) ?? { statuses: [], timesS: [], frequenciesHz: [], meanHz: Number.NaN };
    p.statuses.push(row.status as string);
    p.timesS.push(row.time_s as number);
    p.frequenciesHz.push(row.frequency_hz as number);
    points.set(i, p);
  }
  for (const p of points.values()) {
    const ok = p.frequenciesHz.filter((f, k) => p.statuses[k] === 'ok');
    p.meanHz = ok.length > 0 ? ok.reduce((a, b) => a + b, 0) / ok.length : Number.NaN;
  }
  const outputOnS = sink.events.find((e) => e.type === 'output-on')?.time_s as number;
  return { sink, points, outputOnS };
}

/** The run's τ (settle-tau event) was learned at `pointIndex` and lies within 40–65 ms of the simulator's 50 ms. */
export function expectTauLearnedAt(sink: MemorySink, pointIndex: number): void {
  const learned = sink.eventsOfType('settle-tau')[0];
  expect(learned?.point_index).toBe(pointIndex);
  expect(learned?.tauS as number).toBeGreaterThan(0.04);
  expect(learned?.tauS as number).toBeLessThan(0.065);
}

/** Every point of `auto` within `limitHz` of the same point of `fixed`. */
export function expectCurveWithin(
  auto: Map<number, SlowPortPoint>,
  fixed: Map<number, SlowPortPoint>,
  limitHz: number,
): void {
  for (const [i, p] of auto)
    expect(Math.abs(p.meanHz - (fixed.get(i)?.meanHz ?? Number.NaN)), `point ${i}`).toBeLessThanOrEqual(limitHz);
}
