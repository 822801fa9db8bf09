/**
 * Display arrays for a sweep plot. uPlot wants one ascending x column; a
 * sweep's readings arrive in run order (down passes, edge refinement), so the
 * rows are ordered by setpoint for display, with up and down readings as two
 * series on that one x column and null where a row belongs to the other
 * series or did not oscillate. Display only: the store keeps run order.
 */
import type { ColumnSet } from '../state/columns.ts';
import { DIRECTION_CODE, STATUS_CODE } from '../state/columns.ts';

export interface SweepDisplay {
  x: number[];
  up: (number | null)[];
  down: (number | null)[];
  /** Original row index of each display row. */
  order: Uint32Array;
  /** Setpoints of readings that found no oscillation (drawn as marks, not points). */
  deadX: number[];
}

export function buildSweepDisplay(columns: ColumnSet, n: number): SweepDisplay {
  const controlV = columns.control_v.view();
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i += 1) order[i] = i;
  order.sort((a, b) => (controlV[a] ?? 0) - (controlV[b] ?? 0));
  const x: number[] = new Array<number>(n);
  const up: (number | null)[] = new Array<number | null>(n);
  const down: (number | null)[] = new Array<number | null>(n);
  const deadX: number[] = [];
  for (let k = 0; k < n; k += 1) {
    const i = order[k] ?? 0;
    const frequencyHz = columns.frequency_hz.at(i);
    const shown =
      columns.status.at(i) === STATUS_CODE.ok && Number.isFinite(frequencyHz) && frequencyHz > 0 ? frequencyHz : null;
    const isDown = columns.direction.at(i) === DIRECTION_CODE.down;
    x[k] = controlV[i] ?? 0;
    up[k] = isDown ? null : shown;
    down[k] = isDown ? shown : null;
    if (shown === null) deadX.push(x[k] ?? 0);
  }
  return { x, up, down, order, deadX };
}

/** Lowest and highest setpoint where nothing oscillated below the first oscillating one (live estimate). */
export function liveStallEstimateV(columns: ColumnSet, n: number): number | null {
  let lowestOkV = Number.POSITIVE_INFINITY;
  let highestDeadBelowV = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i += 1) {
    const v = columns.control_v.at(i);
    if (columns.status.at(i) === STATUS_CODE.ok && columns.frequency_hz.at(i) > 0) lowestOkV = Math.min(lowestOkV, v);
  }
  for (let i = 0; i < n; i += 1) {
    const v = columns.control_v.at(i);
    if (columns.status.at(i) !== STATUS_CODE.ok && v < lowestOkV) highestDeadBelowV = Math.max(highestDeadBelowV, v);
  }
  if (!Number.isFinite(highestDeadBelowV)) return null;
  // The edge lies between the last dead setpoint and the first live one.
  return Number.isFinite(lowestOkV) ? (highestDeadBelowV + lowestOkV) / 2 : highestDeadBelowV;
}
