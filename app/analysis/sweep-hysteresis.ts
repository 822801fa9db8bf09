/**
 * Up/down comparison of a sweep: hysteresis of the stall edge and of the curve.
 */
import type { Edges } from './sweep-edges.ts';
import type { PointSet } from './sweep-points.ts';

export interface Hysteresis {
  /** thresholdV(up) − thresholdV(down); null unless both directions have an edge. */
  thresholdDeltaV: number | null;
  /** Sum of the two edges' half-step uncertainties (worst case): an edge refined in one direction only is not hysteresis. */
  thresholdDeltaUncertaintyV: number | null;
  upThresholdV: number | null;
  downThresholdV: number | null;
  /** Largest |f_up − f_down| at voltages both directions measured, oscillating. */
  curveMaxDeltaHz: number | null;
  curveMaxDeltaPctOfSpan: number | null;
  curveMaxDeltaAtV: number | null;
  commonPoints: number;
}

export function compareDirections(up: PointSet, upEdges: Edges, down: PointSet, downEdges: Edges): Hysteresis {
  let worst = -1;
  let worstV = NaN;
  let fMin = Infinity;
  let fMax = -Infinity;
  let common = 0;
  let j = 0;
  // Both point sets ascend in voltage: merge walk.
  for (let i = 0; i < up.count; i++) {
    const v = up.v[i] as number;
    while (j < down.count && (down.v[j] as number) < v - 1e-9 * Math.max(1, Math.abs(v))) j++;
    if (j >= down.count) break;
    if (Math.abs((down.v[j] as number) - v) > 1e-9 * Math.max(1, Math.abs(v))) continue;
    const a = up.meanHz[i] as number;
    const b = down.meanHz[j] as number;
    if (!Number.isFinite(a) || !Number.isFinite(b)) continue;
    common++;
    fMin = Math.min(fMin, a, b);
    fMax = Math.max(fMax, a, b);
    const d = Math.abs(a - b);
    if (d > worst) {
      worst = d;
      worstV = v;
    }
  }
  const t1 = upEdges.thresholdV;
  const t2 = downEdges.thresholdV;
  return {
    thresholdDeltaV: t1 !== null && t2 !== null ? t1 - t2 : null,
    thresholdDeltaUncertaintyV:
      t1 !== null && t2 !== null ? (upEdges.thresholdUncertaintyV ?? 0) + (downEdges.thresholdUncertaintyV ?? 0) : null,
    upThresholdV: t1,
    downThresholdV: t2,
    curveMaxDeltaHz: common > 0 ? worst : null,
    curveMaxDeltaPctOfSpan: common > 0 && fMax > fMin ? (100 * worst) / (fMax - fMin) : null,
    curveMaxDeltaAtV: common > 0 ? worstV : null,
    commonPoints: common,
  };
}
