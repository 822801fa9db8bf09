/**
 * Where a PLL built on a measured VCO will sit: the lock point N·f_ref on the
 * run's fitted tuning curve (its control voltage and the local Kvco there),
 * and the Kvco corners over the tuning window. A corner the loop cannot use
 * (Kvco ≤ 0 — no loop gain — or the lock point outside the tuning range) is
 * kept with its reason, never dropped: the designer must see it.
 */
import type { SweepAnalysis } from './sweep-types.ts';
import { formatFigure } from './format-figure.ts';

export interface KvcoCorner {
  label: 'min' | 'lock' | 'max';
  v: number;
  kvcoHzPerV: number;
  uncertaintyHzPerV: number;
  /** False when no loop can be checked at this corner; `reason` says why. */
  usable: boolean;
  reason: string | null;
}

export interface OperatingPoint {
  targetHz: number;
  /** N·f_ref lies inside the run's measured tuning range (fitted part). */
  inRange: boolean;
  message: string | null;
  lockV: number | null;
  lockUncertaintyV: number | null;
  corners: KvcoCorner[];
}

/** Linear interpolation of y(x) on ascending x; NaN outside. */
function interpolate(x: readonly number[], y: readonly number[], at: number): number {
  for (let i = 1; i < x.length; i++) {
    const x0 = x[i - 1] as number;
    const x1 = x[i] as number;
    if (at >= x0 && at <= x1)
      return x1 > x0
        ? (y[i - 1] as number) + ((at - x0) / (x1 - x0)) * ((y[i] as number) - (y[i - 1] as number))
        : (y[i] as number);
  }
  return NaN;
}

function corner(label: KvcoCorner['label'], v: number, k: number, u: number, sense: number): KvcoCorner {
  // The loop uses |Kvco| of the curve's own sense; zero or the other sign means no (or inverted) loop gain.
  const reason =
    !(sense * k > 0) || !Number.isFinite(k)
      ? `Kvco ${formatFigure(k, 'Hz/V', { uncertainty: u })} at ${formatFigure(v, 'V', { digits: 4 })}: no loop gain there (the curve is flat or folds over)`
      : null;
  return { label, v, kvcoHzPerV: k, uncertaintyHzPerV: u, usable: reason === null, reason };
}

export function loopOperatingPoint(sweep: SweepAnalysis, referenceHz: number, dividerN: number): OperatingPoint {
  const targetHz = referenceHz * dividerN;
  const { curve } = sweep.fit;
  const sense = (curve.hz[curve.hz.length - 1] as number) >= (curve.hz[0] as number) ? 1 : -1;
  const lo = Math.min(curve.hz[0] as number, curve.hz[curve.hz.length - 1] as number);
  const hi = Math.max(curve.hz[0] as number, curve.hz[curve.hz.length - 1] as number);
  const local = sweep.kvco.local
    .filter((e) => e.v >= sweep.fit.fromV - 1e-9 && e.v <= sweep.fit.toV + 1e-9)
    .sort((a, b) => a.v - b.v);
  const kv = local.map((e) => e.v);
  const corners: KvcoCorner[] = [];
  let lockV: number | null = null;
  let lockU: number | null = null;
  let message: string | null = null;
  const inRange = targetHz >= lo && targetHz <= hi;
  if (inRange) {
    // The curve samples are monotone where the fit is constrained; search in the curve's sense.
    const xs = sense > 0 ? curve.hz : [...curve.hz].reverse();
    const vs = sense > 0 ? curve.v : [...curve.v].reverse();
    lockV = interpolate(xs, vs, targetHz);
    const k = interpolate(
      kv,
      local.map((e) => e.hzPerV),
      lockV,
    );
    const ku = interpolate(
      kv,
      local.map((e) => e.uncertaintyHzPerV),
      lockV,
    );
    const fu = interpolate(curve.v, curve.sdHz, lockV);
    lockU = Math.abs(k) > 0 ? fu / Math.abs(k) : null;
    const outside =
      lockV < sweep.window.fromV || lockV > sweep.window.toV
        ? `the lock point ${formatFigure(lockV, 'V', { digits: 4 })} lies outside the tuning window ${formatFigure(sweep.window.fromV, 'V', { digits: 4 })} … ${formatFigure(sweep.window.toV, 'V', { digits: 4 })}`
        : null;
    corners.push(corner('lock', lockV, k, ku, sense));
    if (outside) message = outside;
  } else {
    message = `N·f_ref = ${formatFigure(targetHz, 'Hz', { digits: 6 })} lies outside this run's tuning range ${formatFigure(lo, 'Hz', { digits: 6 })} … ${formatFigure(hi, 'Hz', { digits: 6 })}: the loop cannot lock on this VCO`;
    corners.push({ label: 'lock', v: NaN, kvcoHzPerV: NaN, uncertaintyHzPerV: NaN, usable: false, reason: message });
  }
  const k = sweep.kvco;
  corners.unshift(corner('min', k.vAtMin, k.minHzPerV, k.minUncertaintyHzPerV, sense));
  corners.push(corner('max', k.vAtMax, k.maxHzPerV, k.maxUncertaintyHzPerV, sense));
  return { targetHz, inRange, message, lockV, lockUncertaintyV: lockU, corners };
}
