/**
 * Analysis as a message: the columns a job needs (copied, so they can be
 * transferred to a worker) and the plain-data result. The same function runs
 * in the worker and, where there is no Worker (tests), in the page.
 */
import { analyzeDrift, type DriftAnalysis } from '../analysis/drift-analysis.ts';
import { analyzeSweep } from '../analysis/sweep-analysis.ts';
import type { SweepAnalysis } from '../analysis/sweep-types.ts';
import { outcomeOf, type AnalysisOutcome } from '../state/analysis-outcome.ts';
import { driftInputFromColumns, sweepInputFromColumns } from '../state/column-inputs.ts';
import type { ColumnSet } from '../state/columns.ts';

export type AnalysisJob =
  | { kind: 'sweep'; controlV: Float64Array; frequencyHz: Float64Array; direction: Int8Array; gateS: number | null }
  | {
      kind: 'drift';
      timeS: Float64Array;
      frequencyHz: Float64Array;
      temperatureC: Float64Array | null;
      /** Counter gate: ADEV points at the ±1-count floor 1/(gate·f) are marked resolution-limited. */
      gateS: number | null;
    };

export type { AnalysisOutcome };
export type JobResult = AnalysisOutcome<SweepAnalysis> | AnalysisOutcome<DriftAnalysis>;

export function sweepJob(columns: ColumnSet, n: number, gateS: number | undefined): AnalysisJob {
  const input = sweepInputFromColumns(columns, n, gateS);
  return {
    kind: 'sweep',
    controlV: input.controlV,
    frequencyHz: input.frequencyHz,
    direction: input.direction,
    gateS: gateS ?? null,
  };
}

export function driftJob(columns: ColumnSet, n: number, gateS?: number): AnalysisJob {
  const input = driftInputFromColumns(columns, n);
  return {
    kind: 'drift',
    timeS: input.timeS,
    frequencyHz: input.frequencyHz,
    temperatureC: input.temperatureC ?? null,
    gateS: gateS ?? null,
  };
}

export function runJob(job: AnalysisJob): JobResult {
  if (job.kind === 'sweep') {
    const input = {
      controlV: job.controlV,
      frequencyHz: job.frequencyHz,
      direction: job.direction,
      ...(job.gateS !== null ? { gateS: job.gateS } : {}),
    };
    return outcomeOf(() => analyzeSweep(input));
  }
  if (job.timeS.length < 3) return { ok: false, message: 'fewer than 3 readings' };
  const input = job.temperatureC
    ? { timeS: job.timeS, frequencyHz: job.frequencyHz, temperatureC: job.temperatureC }
    : { timeS: job.timeS, frequencyHz: job.frequencyHz };
  return outcomeOf(() => analyzeDrift(input, job.gateS !== null ? { gateS: job.gateS } : {}));
}
