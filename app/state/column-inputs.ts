/**
 * Run columns → analysis inputs, by the one set of reading-status rules
 * (app/contract/reading-status.ts, as the CLI uses): `no-signal` is evidence
 * of no oscillation (frequency NaN); `timeout` and `error` rows say nothing
 * either way, so they are dropped (their voltage becomes NaN, which grouping
 * skips). One module for the worker jobs, the after-run figures and the gain
 * table, so every screen and `tunebench datasheet` agree. Copies, never views:
 * the store's columns grow under them.
 */
import { meanOfFinite } from '../analysis/mean-finite.ts';
import type { DriftInput } from '../analysis/drift-analysis.ts';
import type { PushingInput } from '../analysis/pushing-analysis.ts';
import type { SweepInput } from '../analysis/sweep-points.ts';
import { STATUS_EFFECT, type StatusEffect } from '../contract/reading-status.ts';
import { DIRECTION_CODE, STATUS_CODE, type ColumnSet } from './columns.ts';

/** Status codes of the store's columns whose readings have `effect`. */
function codesWith(effect: StatusEffect): ReadonlySet<number> {
  return new Set(
    Object.entries(STATUS_CODE)
      .filter(([name]) => STATUS_EFFECT[name as keyof typeof STATUS_CODE] === effect)
      .map(([, code]) => code),
  );
}
const MEASURED = codesWith('measured');
const DROPPED = codesWith('dropped');

/** Frequency with every reading that is not `ok` as NaN. */
export function okFrequency(columns: ColumnSet, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 1) out[i] = MEASURED.has(columns.status.at(i)) ? columns.frequency_hz.at(i) : Number.NaN;
  return out;
}

/** A copy of `values` with the rows of timeout/error readings set to NaN. */
function withoutFailedRows(columns: ColumnSet, values: Float64Array): Float64Array {
  const out = values.slice();
  for (let i = 0; i < out.length; i += 1) {
    if (DROPPED.has(columns.status.at(i))) out[i] = Number.NaN;
  }
  return out;
}

export function sweepInputFromColumns(
  columns: ColumnSet,
  n: number,
  gateS: number | undefined,
): SweepInput & { direction: Int8Array } {
  const controlV = withoutFailedRows(columns, columns.control_v.view().subarray(0, n));
  const direction = new Int8Array(n);
  for (let i = 0; i < n; i += 1) direction[i] = columns.direction.at(i) === DIRECTION_CODE.down ? -1 : 1;
  const frequencyHz = okFrequency(columns, n);
  return gateS !== undefined ? { controlV, frequencyHz, direction, gateS } : { controlV, frequencyHz, direction };
}

/** Temperature is passed only when at least one reading has one. */
export function driftInputFromColumns(columns: ColumnSet, n: number): DriftInput {
  const timeS = columns.time_s.view().slice(0, n);
  const frequencyHz = okFrequency(columns, n);
  const temperatureC = columns.temperature_c.view().slice(0, n);
  let anyTemperature = false;
  for (let i = 0; i < n && !anyTemperature; i += 1) anyTemperature = Number.isFinite(temperatureC[i] ?? Number.NaN);
  return anyTemperature ? { timeS, frequencyHz, temperatureC } : { timeS, frequencyHz };
}

/** The held control voltage is the mean of the logged setpoints, as for a plain CSV. */
export function pushingInputFromColumns(columns: ColumnSet, n: number): PushingInput {
  const supplyV = withoutFailedRows(columns, columns.supply_v.view().subarray(0, n));
  const controlV = meanOfFinite(columns.control_v.view().subarray(0, n));
  return controlV !== null
    ? { supplyV, frequencyHz: okFrequency(columns, n), controlV }
    : { supplyV, frequencyHz: okFrequency(columns, n) };
}
