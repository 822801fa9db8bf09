/**
 * Local Kvco at every point that oscillated at all: the fitted curve's slope,
 * cross-checked against a smoothed finite difference (local straight line
 * over ±2 neighbouring oscillating points).
 */
import type { Edges } from './sweep-edges.ts';
import { fitKvco, localSlope, type LocalKvco } from './sweep-gain.ts';
import type { PointSet } from './sweep-points.ts';
import type { TuningModel } from './tuning-model.ts';

export function localKvcoEntries(
  points: PointSet,
  edges: Edges,
  model: TuningModel,
  u: Float64Array,
  i0: number,
  i1: number,
): { local: LocalKvco[]; misfits: number } {
  const local: LocalKvco[] = [];
  let misfits = 0;
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
    const fd = localSlope(points.v, points.meanHz, u, r0, r1);
    const vi = points.v[i] as number;
    const k = inFit ? fitKvco(model, vi) : null;
    // Cross-check: where the fit's slope and the local one differ by more than 3σ and
    // 10 %, the polynomial is not following the curve (e.g. the steep onset just above
    // a stall edge); the local slope is the better estimate there.
    const disagrees =
      k !== null &&
      Number.isFinite(fd.slope) &&
      Math.abs(k.hzPerV - fd.slope) > 3 * Math.hypot(k.sd, fd.sd) &&
      Math.abs(k.hzPerV - fd.slope) > 0.1 * Math.abs(k.hzPerV);
    if (disagrees) misfits++;
    const useFit = k !== null && !disagrees;
    local.push({
      v: vi,
      hzPerV: useFit ? k.hzPerV : fd.slope,
      fdHzPerV: fd.slope,
      uncertaintyHzPerV: useFit ? k.sd : fd.sd,
      source: useFit ? 'fit' : 'finite-difference',
      unstable: edges.unstable[i] === 1,
      fitDisagrees: disagrees,
    });
  }
  return { local, misfits };
}
