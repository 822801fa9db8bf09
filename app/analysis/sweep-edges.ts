/**
 * Where the oscillator works: the stall edge (lowest control voltage at which
 * it oscillates) and the unstable region just above it.
 */
import { oscillatingFraction, type PointSet } from './sweep-points.ts';
import { scratchColumn } from './scratch-columns.ts';

export interface EdgeOptions {
  /** Counter gate (s): resolution floor 1/gate Hz. */
  gateS?: number;
  /** A point is unstable when its relative scatter exceeds this many times
   *  the larger of the counter floor and the curve's median scatter. */
  unstableFactor?: number;
}

export interface Edges {
  /** First and one-past-last point of the oscillating block (i1 = i0 when none). */
  blockI0: number;
  blockI1: number;
  stalled: boolean;
  thresholdV: number | null;
  thresholdUncertaintyV: number | null;
  /** Edge where oscillation stops again above the block, if it does. */
  upperStallV: number | null;
  unstableBelowV: number | null;
  unstableBelowUncertaintyV: number | null;
  /** Per point: 1 when flagged unstable (intermittent or scattered). */
  unstable: Uint8Array;
  /** Usable range (stable part of the block). */
  usableI0: number;
  usableI1: number;
  /** Median relative scatter of the block (the curve's own level). */
  medianRelativeScatter: number;
}

/** Voltage where the oscillating fraction crosses ½ between points a and b. */
function crossing(points: PointSet, a: number, b: number): number {
  const pa = oscillatingFraction(points, a);
  const pb = oscillatingFraction(points, b);
  const va = points.v[a] as number;
  const vb = points.v[b] as number;
  if (pa === pb) return (va + vb) / 2;
  return va + ((0.5 - pa) / (pb - pa)) * (vb - va);
}

function median(values: Float64Array, n: number): number {
  if (n === 0) return NaN;
  const s = scratchColumn(1, n); // slot 1 (findEdges holds slot 0)
  s.set(values.subarray(0, n));
  s.sort();
  return n % 2 ? (s[(n - 1) >> 1] as number) : ((s[n / 2 - 1] as number) + (s[n / 2] as number)) / 2;
}

export function findEdges(points: PointSet, options: EdgeOptions = {}): Edges {
  const n = points.count;
  const factor = options.unstableFactor ?? 5;
  // Longest contiguous run of points where most readings oscillate (lowest on ties).
  let bestI0 = 0;
  let bestI1 = 0;
  for (let i = 0; i < n;) {
    if (oscillatingFraction(points, i) < 0.5) {
      i++;
      continue;
    }
    let j = i;
    while (j < n && oscillatingFraction(points, j) >= 0.5) j++;
    if (j - i > bestI1 - bestI0) {
      bestI0 = i;
      bestI1 = j;
    }
    i = j;
  }
  let anyStalled = false;
  for (let i = 0; i < n; i++)
    if ((points.nNoOsc[i] as number) > 0 && (points.nOsc[i] as number) === 0) anyStalled = true;
  const unstable = new Uint8Array(n);
  const rel = scratchColumn(0, n); // slot 0
  let nRel = 0;
  for (let i = bestI0; i < bestI1; i++) {
    if ((points.nOsc[i] as number) >= 2) rel[nRel++] = (points.sdHz[i] as number) / (points.meanHz[i] as number);
  }
  const medianRel = median(rel, nRel);
  for (let i = 0; i < n; i++) {
    const nOsc = points.nOsc[i] as number;
    if (nOsc === 0) continue;
    if ((points.nNoOsc[i] as number) > 0) {
      unstable[i] = 1; // intermittent: sometimes no oscillation at all
      continue;
    }
    if (nOsc < 2) continue;
    const f = points.meanHz[i] as number;
    const floorRel = options.gateS ? 1 / (options.gateS * f) : 0;
    const limit = factor * Math.max(floorRel, Number.isFinite(medianRel) ? medianRel : 0, 1e-12);
    if ((points.sdHz[i] as number) / f > limit) unstable[i] = 1;
  }
  const result: Edges = {
    blockI0: bestI0,
    blockI1: bestI1,
    stalled: anyStalled || bestI1 === bestI0,
    thresholdV: null,
    thresholdUncertaintyV: null,
    upperStallV: null,
    unstableBelowV: null,
    unstableBelowUncertaintyV: null,
    unstable,
    usableI0: bestI0,
    usableI1: bestI1,
    medianRelativeScatter: medianRel,
  };
  if (bestI1 === bestI0) return result;
  if (bestI0 > 0) {
    result.thresholdV = crossing(points, bestI0 - 1, bestI0);
    result.thresholdUncertaintyV = ((points.v[bestI0] as number) - (points.v[bestI0 - 1] as number)) / 2;
  }
  if (bestI1 < n) result.upperStallV = crossing(points, bestI1 - 1, bestI1);
  // Unstable region: the run of flagged points starting at the bottom of the block.
  let k = bestI0;
  while (k < bestI1 && unstable[k] === 1) k++;
  if (k > bestI0 && k < bestI1) {
    const below = points.v[k - 1] as number;
    const above = points.v[k] as number;
    result.unstableBelowV = (below + above) / 2;
    result.unstableBelowUncertaintyV = (above - below) / 2;
    result.usableI0 = k;
  } else if (k === bestI1) {
    // Every point is unstable: report it, but keep the whole block usable.
    result.unstableBelowV = points.v[bestI1 - 1] as number;
    result.unstableBelowUncertaintyV = 0;
  }
  return result;
}
