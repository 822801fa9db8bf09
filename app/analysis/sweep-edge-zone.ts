/**
 * The stall edge's zone: the points just above a stall edge where the tuning
 * slope changes faster than the sweep's step lets any smooth model resolve.
 *
 * Why: at a stall edge the slope of the tuning curve is singular. A relaxation
 * oscillator charging toward Vc stops when Vc reaches its upper threshold V1;
 * by the RC charging law its period RC·ln((Vc − V0)/(Vc − V1)) grows without
 * bound there and df/dV goes to infinity (the same physics makes the jitter
 * grow, since threshold noise becomes frequency noise through the slope).
 * Kvco quoted from those points is neither measurable to its stated accuracy
 * nor a place a loop would be set to work, so the automatic usable range starts
 * above them, and they stay in the points with `edgeZone` set.
 *
 * The rule (tunebench's own): walking up from the first usable point of a block
 * that begins at a stall edge, a point is in the zone while the chord slopes
 * one regular step h below and above it (each chord at least h long, so
 * refinement points a millivolt apart do not turn noise into slope) differ by
 * more than `maxSlopeChange` beyond 2σ of their noise. Why 5 %: at the start
 * of the fit range the spline's slope rests on about w = 4–5 steps on one side;
 * for a slope that changes by ρ per step, a local fit over w steps is off by
 * about (w·ρ)²/3 (the centred-difference bias of a curve whose slope varies as
 * 1/x, ρ = h/x — common practice), which stays within the 2 % issue 9 asks of
 * local Kvco for ρ ≤ 0.05.
 * Checked on the RC charging law and the simulated relaxation DUT
 * (test/gain-truth.test.ts). A block with no stall below it has no zone.
 *
 * The same test ends the range at a flat top (`bendEnd`): where a drive clamps
 * (the sim's at 4.25 V) the slope drops to zero within one step, and the last
 * point before the flat steps can already sit past the bend (4.3 V in 0.1 V
 * steps); it leaves while its chord slope misses the trend of the chords below
 * by more than the limit, so the fit never has to bend round the kink.
 */
import type { Edges } from './sweep-edges.ts';
import type { PointSet } from './sweep-points.ts';
import { sortedAtInPlace } from './select-kth.ts';
import { scratchColumn } from './scratch-columns.ts';

export interface EdgeZone {
  /** First point of the usable range after the zone (= edges.usableI0 when there is none). */
  startI: number;
  /** Largest chord-slope change per step seen inside the zone (fraction), null without a zone. */
  slopeChange: number | null;
  /** The sweep's regular step the rule used (V). */
  stepV: number;
  /** The limit on the chord-slope change per step that was applied (fraction). */
  limit: number;
}

/** Default `maxSlopeChange`: a 10 % change of chord slope per regular step. */
export const EDGE_ZONE_SLOPE_CHANGE = 0.05;

/** The median spacing of the block's points: the sweep's regular step (refinement points are few). */
function regularStep(v: Float64Array, i0: number, i1: number): number {
  if (i1 - i0 < 2) return NaN;
  const gaps = scratchColumn(0, i1 - i0 - 1); // slot 0
  for (let i = i0 + 1; i < i1; i++) gaps[i - i0 - 1] = (v[i] as number) - (v[i - 1] as number);
  return sortedAtInPlace(gaps, gaps.length >> 1); // the points ascend: every gap is > 0
}

/** Chord slope between points a and b and its SD. */
function chord(points: PointSet, u: Float64Array, a: number, b: number): { s: number; sd: number } {
  const dv = (points.v[b] as number) - (points.v[a] as number);
  return {
    s: ((points.meanHz[b] as number) - (points.meanHz[a] as number)) / dv,
    sd: Math.hypot(u[a] as number, u[b] as number) / Math.abs(dv),
  };
}

export function edgeZone(
  points: PointSet,
  edges: Edges,
  u: Float64Array,
  maxSlopeChange = EDGE_ZONE_SLOPE_CHANGE,
): EdgeZone {
  const i0 = edges.blockI0;
  const i1 = edges.blockI1;
  const h = regularStep(points.v, i0, i1);
  const none: EdgeZone = { startI: edges.usableI0, slopeChange: null, stepV: h, limit: maxSlopeChange };
  if (edges.thresholdV === null || !(maxSlopeChange > 0) || !(h > 0) || i1 - i0 < 4) return none;
  const v = points.v;
  const reach = h * (1 - 1e-6);
  const limit = Math.log1p(maxSlopeChange);
  let worst: number | null = null;
  // Leave at least three points above the zone: the range needs two, the rule one more.
  for (let j = edges.usableI0; j < i1 - 3; j++) {
    // Unsteady points below the usable range scatter too much to anchor a chord.
    let lo = j;
    while (lo > edges.usableI0 && (v[j] as number) - (v[lo] as number) < reach) lo--;
    let hi = j;
    while (hi < i1 - 1 && (v[hi] as number) - (v[j] as number) < reach) hi++;
    if (hi === j || (v[hi] as number) - (v[j] as number) < reach) return none;
    let a = chord(points, u, lo, j);
    let b = chord(points, u, j, hi);
    // No point a whole step below (the bottom of the block): judge by the two chords above.
    if ((v[j] as number) - (v[lo] as number) < reach) {
      let hi2 = hi;
      while (hi2 < i1 - 1 && (v[hi2] as number) - (v[hi] as number) < reach) hi2++;
      if ((v[hi2] as number) - (v[hi] as number) < reach) return none;
      a = b;
      b = chord(points, u, hi, hi2);
    }
    // Chords of opposite sign a step apart: the slope is not resolved here either.
    const change = a.s * b.s > 0 ? Math.abs(Math.log(a.s / b.s)) : Infinity;
    const noise = Math.hypot(a.sd / Math.abs(a.s), b.sd / Math.abs(b.s));
    if (change - 2 * noise <= limit) return { startI: j, slopeChange: worst, stepV: h, limit: maxSlopeChange };
    worst = Math.max(worst ?? 0, Math.expm1(change));
  }
  return none;
}

/** Highest index in [lo, j) at least one step h below v[j], or -1. */
function stepBelow(v: Float64Array, lo: number, j: number, reach: number): number {
  let a = j - 1;
  while (a >= lo && (v[j] as number) - (v[a] as number) < reach) a--;
  return a;
}

/**
 * End (exclusive) of the usable range [i0, i1) once points past the bend into a
 * flat top are dropped: the last point leaves while the chord slope of its last
 * step misses the straight-line trend of the two chords below it (a smooth
 * curve, even a parabola up to its peak, continues that trend; a kink does
 * not) by more than `maxSlopeChange` of it beyond 2σ. Call only when a flat
 * top was found above i1.
 */
export function bendEnd(
  points: PointSet,
  u: Float64Array,
  i0: number,
  i1: number,
  maxSlopeChange = EDGE_ZONE_SLOPE_CHANGE,
): number {
  const h = regularStep(points.v, i0, i1);
  if (!(h > 0) || !(maxSlopeChange > 0)) return i1;
  const reach = h * (1 - 1e-6);
  let end = i1;
  while (end - i0 > 3) {
    const j = end - 1;
    const a = stepBelow(points.v, i0, j, reach);
    const b = a < 0 ? -1 : stepBelow(points.v, i0, a, reach);
    const c = b < 0 ? -1 : stepBelow(points.v, i0, b, reach);
    if (c < 0) break;
    const last = chord(points, u, a, j);
    const below = chord(points, u, b, a);
    const further = chord(points, u, c, b);
    // Chord slopes at the chords' midpoints, extended linearly to the last one's.
    const mid = (p: number, q: number): number => ((points.v[p] as number) + (points.v[q] as number)) / 2;
    const trend = below.s + ((below.s - further.s) * (mid(a, j) - mid(b, a))) / (mid(b, a) - mid(c, b));
    const sd = Math.hypot(last.sd, 2 * below.sd, further.sd);
    if (!(Math.abs(last.s - trend) - 2 * sd > maxSlopeChange * Math.abs(trend))) break;
    end--;
  }
  return end;
}
