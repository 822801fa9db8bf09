/**
 * Which points the figures are taken over: the tuning window (the plan's or
 * the flag's, else the automatic usable range) and the fit range.
 */
import { AnalysisError } from './analysis-error.ts';
import type { Edges } from './sweep-edges.ts';
import type { PointSet } from './sweep-points.ts';
import type { SweepAnalysis } from './sweep-types.ts';

export type WindowRequest = { fromV: number; toV: number; source: 'plan' | 'flag' };
export type FitRangeRequest = 'usable' | 'all' | { fromV: number; toV: number };

/** Indices [a, b) of the points with fromV ≤ v ≤ toV inside [lo, hi). */
export function indexRange(v: Float64Array, lo: number, hi: number, fromV: number, toV: number): [number, number] {
  const tol = 1e-9 * Math.max(1, Math.abs(fromV), Math.abs(toV));
  let a = lo;
  while (a < hi && (v[a] as number) < fromV - tol) a++;
  let b = a;
  while (b < hi && (v[b] as number) <= toV + tol) b++;
  return [a, b];
}

/**
 * The tuning window and its point indices [w0, w1). A requested window must lie
 * inside the measured oscillating range and hold two points; one reaching past
 * the usable range is kept with a warning.
 */
export function tuningWindow(
  points: PointSet,
  edges: Edges,
  usable: { fromV: number; toV: number },
  request: WindowRequest | undefined,
  warnings: string[],
): { window: SweepAnalysis['window']; w0: number; w1: number } {
  const measuredFromV = points.v[edges.blockI0] as number;
  const measuredToV = points.v[edges.blockI1 - 1] as number;
  let window: SweepAnalysis['window'];
  if (request) {
    const w = request;
    if (!(w.toV > w.fromV)) throw new AnalysisError(`window ${w.fromV}–${w.toV} V: fromV must be below toV`);
    const tol = 1e-9 * Math.max(1, Math.abs(measuredToV));
    if (w.fromV < measuredFromV - tol || w.toV > measuredToV + tol) {
      throw new AnalysisError(
        `window ${w.fromV}–${w.toV} V (${w.source}) reaches outside the measured oscillating range ${measuredFromV}–${measuredToV} V; choose a window inside it`,
      );
    }
    window = { fromV: w.fromV, toV: w.toV, source: w.source };
  } else {
    window = { fromV: usable.fromV, toV: usable.toV, source: 'auto' };
  }
  const [w0, w1] = indexRange(points.v, edges.blockI0, edges.blockI1, window.fromV, window.toV);
  if (w1 - w0 < 2)
    throw new AnalysisError(
      `window ${window.fromV}–${window.toV} V holds ${w1 - w0} measured point(s); need at least 2`,
    );
  if (window.source !== 'auto' && (window.fromV < usable.fromV - 1e-9 || window.toV > usable.toV + 1e-9)) {
    warnings.push(
      `the tuning window ${window.fromV}–${window.toV} V reaches beyond the usable range ${usable.fromV}–${usable.toV} V`,
    );
  }
  return { window, w0, w1 };
}

/** Indices [f0, f1) of the fit range: the user's choice, else the window when one was given, else the usable range. */
export function fitRangeIndices(
  points: PointSet,
  edges: Edges,
  usable: { i0: number; i1: number },
  request: FitRangeRequest | undefined,
  window: SweepAnalysis['window'],
): [number, number] {
  const range = request ?? (window.source !== 'auto' ? { fromV: window.fromV, toV: window.toV } : 'usable');
  if (range === 'usable') return [usable.i0, usable.i1];
  if (range === 'all') return [edges.blockI0, edges.blockI1];
  return indexRange(points.v, edges.blockI0, edges.blockI1, range.fromV, range.toV);
}
