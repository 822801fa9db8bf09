/**
 * Analysis as a message: the columns a job needs (copied, so they can be
 * transferred to a worker) and the plain-data result. The same function runs
 * in the worker and, where there is no Worker (tests), in the page.
 */
import { analyzeDrift, type DriftAnalysis } from '../analysis/drift-analysis.ts';
import { analyzeSweep } from '../analysis/sweep-analysis.ts';
import type { SweepAnalysis } from '../analysis/sweep-types.ts';
import { DIRECTION_CODE, STATUS_CODE, type ColumnSet } from '../state/columns.ts';

export type AnalysisJob =
  | { kind: 'sweep'; controlV: Float64Array; frequencyHz: Float64Array; direction: Int8Array; gateS: number | null }
  | { kind: 'drift'; timeS: Float64Array; frequencyHz: Float64Array; temperatureC: Float64Array | null };

export type AnalysisOutcome<T> = { ok: true; analysis: T } | { ok: false; message: string };
export type JobResult = AnalysisOutcome<SweepAnalysis> | AnalysisOutcome<DriftAnalysis>;

/** Frequency with non-ok readings as NaN (the analysis's "no oscillation"). */
function okFrequency(columns: ColumnSet, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 1) out[i] = columns.status.at(i) === STATUS_CODE.ok ? columns.frequency_hz.at(i) : Number.NaN;
  return out;
}

export function sweepJob(columns: ColumnSet, n: number, gateS: number | undefined): AnalysisJob {
  const direction = new Int8Array(n);
  for (let i = 0; i < n; i += 1) direction[i] = columns.direction.at(i) === DIRECTION_CODE.down ? -1 : 1;
  return { kind: 'sweep', controlV: columns.control_v.view().slice(0, n), frequencyHz: okFrequency(columns, n), direction, gateS: gateS ?? null };
}

export function driftJob(columns: ColumnSet, n: number): AnalysisJob {
  const temperatureC = columns.temperature_c.view().slice(0, n);
  let anyTemperature = false;
  for (let i = 0; i < n && !anyTemperature; i += 1) anyTemperature = Number.isFinite(temperatureC[i] ?? Number.NaN);
  return { kind: 'drift', timeS: columns.time_s.view().slice(0, n), frequencyHz: okFrequency(columns, n), temperatureC: anyTemperature ? temperatureC : null };
}

function message(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

export function runJob(job: AnalysisJob): JobResult {
  try {
    if (job.kind === 'sweep') {
      const input = { controlV: job.controlV, frequencyHz: job.frequencyHz, direction: job.direction, ...(job.gateS !== null ? { gateS: job.gateS } : {}) };
      return { ok: true, analysis: analyzeSweep(input) };
    }
    if (job.timeS.length < 3) return { ok: false, message: 'fewer than 3 readings' };
    return { ok: true, analysis: analyzeDrift(job.temperatureC ? { timeS: job.timeS, frequencyHz: job.frequencyHz, temperatureC: job.temperatureC } : { timeS: job.timeS, frequencyHz: job.frequencyHz }) };
  } catch (error) {
    return { ok: false, message: message(error) };
  }
}
