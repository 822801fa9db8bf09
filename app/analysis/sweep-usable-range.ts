/**
 * The automatic usable range of a tuning curve: the stable part of the
 * oscillating block, ended where the curve turns back or goes flat (a PLL's
 * loop gain changes sign or vanishes there).
 */
import { AnalysisError } from './analysis-error.ts';
import { formatFigure } from './format-figure.ts';
import { bendEnd, edgeZone, type EdgeZone } from './sweep-edge-zone.ts';
import type { Edges } from './sweep-edges.ts';
import type { PointSet } from './sweep-points.ts';
import { sortedAtInPlace } from './select-kth.ts';
import { scratchColumn } from './scratch-columns.ts';

/**
 * Index of the extreme point where a tuning curve turns back, or null when it
 * is monotonic within noise. The curve's sense is taken from its two ends;
 * the turn counts only when the frequency past the extreme falls back by
 * more than 3σ of the two points' uncertainties.
 */
export function turningPoint(meanHz: Float64Array, u: Float64Array, i0: number, i1: number): number | null {
  if (i1 - i0 < 3) return null;
  const rising = (meanHz[i1 - 1] as number) >= (meanHz[i0] as number);
  let iExt = i0;
  for (let i = i0 + 1; i < i1; i++) {
    const f = meanHz[i] as number;
    if (rising ? f > (meanHz[iExt] as number) : f < (meanHz[iExt] as number)) iExt = i;
  }
  if (iExt >= i1 - 1) return null;
  let worstBack = 0;
  let iWorst = iExt;
  for (let i = iExt + 1; i < i1; i++) {
    const back = rising
      ? (meanHz[iExt] as number) - (meanHz[i] as number)
      : (meanHz[i] as number) - (meanHz[iExt] as number);
    if (back > worstBack) [worstBack, iWorst] = [back, i];
  }
  const noise = 3 * Math.hypot(u[iExt] as number, u[iWorst] as number);
  return worstBack > noise ? iExt : null;
}

/**
 * End (exclusive) of the usable range after trimming a flat top: trailing
 * steps whose slope, in the curve's sense, stays below `fraction` of the
 * median step slope by more than 3σ. A saturated tuning port gives Kvco ≈ 0
 * there, and a loop's gain vanishes with it. The 10 % default is tunebench's
 * own rule, not a published one.
 */
export function flatTopEnd(
  v: Float64Array,
  meanHz: Float64Array,
  u: Float64Array,
  i0: number,
  i1: number,
  fraction: number,
): number {
  const steps = i1 - i0 - 1;
  if (steps < 3 || !(fraction > 0)) return i1;
  const sense = (meanHz[i1 - 1] as number) >= (meanHz[i0] as number) ? 1 : -1;
  const slopes = scratchColumn(0, steps); // slot 0, and slot 1 for the copy the median sorts
  for (let i = i0; i < i1 - 1; i++) {
    slopes[i - i0] =
      (sense * ((meanHz[i + 1] as number) - (meanHz[i] as number))) / ((v[i + 1] as number) - (v[i] as number));
  }
  const sorted = scratchColumn(1, steps);
  sorted.set(slopes);
  const median = sortedAtInPlace(sorted, steps >> 1);
  if (!(median > 0)) return i1;
  let end = i1;
  while (end - i0 > 2) {
    const a = end - 2;
    const dv = (v[a + 1] as number) - (v[a] as number);
    const slopeSd = Math.hypot(u[a] as number, u[a + 1] as number) / dv;
    if ((slopes[a - i0] as number) + 3 * slopeSd < fraction * median) end--;
    else break;
  }
  return end;
}

/**
 * Where a flat top begins: between the last usable point and the first flat
 * one, ± half that step. When the last usable step is itself already below half
 * the median step slope, the bend lies somewhere in it too, and the interval
 * starts one point lower (the edge is quoted with the interval it can be in).
 */
function saturationEdge(
  v: Float64Array,
  f: Float64Array,
  i0: number,
  i1: number,
): { edgeV: number; uncertaintyV: number } {
  const slopes: number[] = [];
  for (let i = i0; i < i1 - 1; i++)
    slopes.push(Math.abs(((f[i + 1] as number) - (f[i] as number)) / ((v[i + 1] as number) - (v[i] as number))));
  const sorted = [...slopes].sort((a, b) => a - b);
  const median = sorted[sorted.length >> 1] ?? 0;
  const last = slopes[slopes.length - 1] ?? Infinity;
  const lo = last < 0.5 * median && i1 - 2 >= i0 ? (v[i1 - 2] as number) : (v[i1 - 1] as number);
  const hi = v[i1] as number;
  return { edgeV: (lo + hi) / 2, uncertaintyV: (hi - lo) / 2 };
}

export interface UsableRange {
  /** Points [i0, i1) of the usable range. */
  i0: number;
  i1: number;
  /** Index of the extreme where the curve turns back, or null. */
  turn: number | null;
  /** End of the range before the flat-top trim (exclusive). */
  afterTurn: number;
  saturation: { edgeV: number; uncertaintyV: number } | null;
  /** The stall edge's zone left out below i0 (see sweep-edge-zone.ts). */
  zone: EdgeZone;
}

/** The usable range of the primary curve; its warnings go onto `warnings`. */
export function usableRange(
  points: PointSet,
  edges: Edges,
  u: Float64Array,
  flatFraction: number,
  edgeSlopeChange: number | undefined,
  warnings: string[],
): UsableRange {
  const zone = edgeZone(points, edges, u, edgeSlopeChange);
  const i0 = zone.startI;
  const turn = turningPoint(points.meanHz, u, i0, edges.blockI1);
  const afterTurn = turn === null ? edges.blockI1 : turn + 1;
  const flatEnd = flatTopEnd(points.v, points.meanHz, u, i0, afterTurn, flatFraction);
  // Past a flat top's bend too: a last point already on the flat side of the kink leaves (sweep-edge-zone.ts).
  const i1 = flatEnd < afterTurn ? bendEnd(points, u, i0, flatEnd, edgeSlopeChange) : flatEnd;
  let saturation: UsableRange['saturation'] = null;
  if (i1 < afterTurn) {
    saturation = saturationEdge(points.v, points.meanHz, i0, i1);
    const below = points.v[i1 - 1] as number;
    warnings.push(
      `the tuning curve flattens above ${formatFigure(below, 'V', { digits: 4 })} (Kvco below ${flatFraction * 100} % of its median; edge ${formatFigure(saturation.edgeV, 'V', { uncertainty: saturation.uncertaintyV })}); ` +
        'the usable range ends there',
    );
  }
  const n = i1 - i0;
  if (n < 2) throw new AnalysisError(`only ${n} oscillating point in the usable range; need at least 2`, true);
  if (turn !== null) {
    warnings.push(
      `the tuning curve turns back above ${points.v[turn] as number} V (frequency falls again toward ${points.v[edges.blockI1 - 1] as number} V); ` +
        'the usable range ends at the turn',
    );
  }
  return { i0, i1, turn, afterTurn, saturation, zone };
}
