/**
 * Local Kvco at every point that oscillated at all: the fitted curve's slope,
 * cross-checked against a smoothed finite difference (local straight line
 * over ±2 neighbouring oscillating points). Written into columns
 * (sweep-columns.ts): no object per point.
 */
import { LocalKvcoColumns } from './sweep-columns.ts';
import type { Edges } from './sweep-edges.ts';
import { localSlopeInto } from './sweep-gain.ts';
import type { PointSet } from './sweep-points.ts';
import type { TuningModel } from './tuning-model.ts';

export function localKvcoEntries(
  points: PointSet,
  edges: Edges,
  model: TuningModel,
  u: Float64Array,
  i0: number,
  i1: number,
): { local: LocalKvcoColumns; misfits: number } {
  const local = new LocalKvcoColumns(points.count);
  const fd = { slope: NaN, sd: NaN };
  let misfits = 0;
  let n = 0;
  for (let i = 0; i < points.count; i++) {
    if ((points.nOsc[i] as number) === 0) continue;
    // Inside the fit range the local line stays inside it too, so a kink just
    // outside (a clamped drive, a stall) does not pull the cross-check.
    const inFit = i >= i0 && i < i1;
    const lo = inFit ? i0 : 0;
    const hi = inFit ? i1 : points.count;
    let r0 = i;
    while (r0 > lo && (points.nOsc[r0 - 1] as number) > 0 && r0 > i - 2) r0--;
    let r1 = i + 1;
    while (r1 < hi && (points.nOsc[r1] as number) > 0 && r1 < i + 3) r1++;
    localSlopeInto(points.v, points.meanHz, u, r0, r1, fd);
    const vi = points.v[i] as number;
    const k = inFit ? model.slope(vi) : NaN;
    const kSd = inFit ? model.slopeSd(vi) : NaN;
    // Cross-check: where the fit's slope and the local one differ by more than 3σ and
    // 10 %, the polynomial is not following the curve (e.g. the steep onset just above
    // a stall edge); the local slope is the better estimate there.
    const disagrees =
      inFit &&
      Number.isFinite(fd.slope) &&
      Math.abs(k - fd.slope) > 3 * Math.hypot(kSd, fd.sd) &&
      Math.abs(k - fd.slope) > 0.1 * Math.abs(k);
    if (disagrees) misfits++;
    const useFit = inFit && !disagrees;
    local.v[n] = vi;
    local.hzPerV[n] = useFit ? k : fd.slope;
    local.fdHzPerV[n] = fd.slope;
    local.uncertaintyHzPerV[n] = useFit ? kSd : fd.sd;
    local.fromFit[n] = useFit ? 1 : 0;
    local.unstable[n] = edges.unstable[i] === 1 ? 1 : 0;
    local.fitDisagrees[n] = disagrees ? 1 : 0;
    n++;
  }
  local.count = n;
  return { local, misfits };
}
