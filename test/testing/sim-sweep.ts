/**
 * One gain sweep on the in-process simulated bench in virtual time, returned
 * as the analysis input plus the procedure's events: what the fit tests feed
 * analyzeSweep with, through the real procedures and SCPI drivers.
 */
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import type { SweepInput } from '../../app/analysis/sweep-points.ts';
import { assembleBench } from '../../main/bench/assemble.ts';
import type { BuiltinDutName } from '../../main/sim/builtin-duts.ts';
import { runSweep } from '../../main/procedures/sweep.ts';
import { MemorySink } from '../../main/procedures/testing/fake-bench.ts';
import type { ProcedureEvent, SampleRow } from '../../main/procedures/types.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';

export interface SimSweep {
  input: SweepInput;
  rows: SampleRow[];
  events: ProcedureEvent[];
  status: string;
  /** How long the sweep took on the virtual clock, s. */
  durationS: number;
}

/** Each point's readings in the order taken (NaN where a reading gave no frequency), by point_index. */
export function readingsByPoint(rows: readonly SampleRow[]): Map<number, number[]> {
  const byPoint = new Map<number, number[]>();
  for (const row of rows) {
    const list = byPoint.get(row.point_index as number) ?? [];
    list.push(row.status === 'ok' ? (row.frequency_hz as number) : Number.NaN);
    byPoint.set(row.point_index as number, list);
  }
  return byPoint;
}

export async function simSweep(dut: BuiltinDutName, seed: number, plan: Record<string, unknown>): Promise<SimSweep> {
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut, seed } });
  const sink = new MemorySink();
  try {
    const t0 = clock.now();
    const outcome = await runSweep({ bench, plan: sweepPlanSchema.parse(plan), clock, sink });
    const durationS = clock.now() - t0;
    const rows = sink.rows;
    // Failed readings (timeout, error) carry no frequency; "no-signal" means no oscillation.
    const read = rows.filter((r) => r.status === 'ok' || r.status === 'no-signal');
    const input: SweepInput = {
      controlV: Float64Array.from(read, (r) => Number(r.control_v)),
      frequencyHz: Float64Array.from(read, (r) => (r.status === 'ok' ? Number(r.frequency_hz) : NaN)),
      direction: Int8Array.from(read, (r) => (r.direction === 'down' ? -1 : 1)),
      gateS: Number(plan.gateS),
    };
    return { input, rows, events: sink.events, status: outcome.status, durationS };
  } finally {
    await bench.close();
  }
}
