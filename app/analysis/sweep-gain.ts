/**
 * Gain of the tuning curve: local Kvco from the fitted curve and from smoothed
 * finite differences, the best straight line and its linearity, and the widest
 * range within a linearity limit.
 */
import { derivativeStdDev, evalPoly, fitPolynomial } from './poly-fit.ts';
import type { TuningModel } from './tuning-model.ts';

export interface LocalKvco {
  v: number;
  /** From the fitted curve inside the usable range, else the finite difference. */
  hzPerV: number;
  /** Smoothed finite difference (local straight line over ±2 points); NaN alone. */
  fdHzPerV: number;
  uncertaintyHzPerV: number;
  source: 'fit' | 'finite-difference';
  unstable: boolean;
  /** The fit's slope and the local slope differ by > 3σ and > 10 %: the local one is used. */
  fitDisagrees: boolean;
  /** The slope had the wrong sign by less than 2σ and is shown as 0 (flat within its uncertainty). */
  flatWithinUncertainty?: boolean;
}

/**
 * Slope of the least-squares line through points j0 ≤ j < j1 (a local
 * Savitzky–Golay first derivative of degree 1 — common practice) and its SD
 * for per-point SDs u.
 */
export function localSlope(
  v: Float64Array,
  f: Float64Array,
  u: Float64Array,
  j0: number,
  j1: number,
): { slope: number; sd: number } {
  const out = { slope: NaN, sd: NaN };
  localSlopeInto(v, f, u, j0, j1, out);
  return out;
}

/** localSlope written into `out` (a caller looping over a million points reuses one object). */
export function localSlopeInto(
  v: Float64Array,
  f: Float64Array,
  u: Float64Array,
  j0: number,
  j1: number,
  out: { slope: number; sd: number },
): void {
  const n = j1 - j0;
  if (n < 2) {
    out.slope = NaN;
    out.sd = NaN;
    return;
  }
  let vm = 0;
  let fm = 0;
  for (let j = j0; j < j1; j++) {
    vm += v[j] as number;
    fm += f[j] as number;
  }
  vm /= n;
  fm /= n;
  let sxx = 0;
  let sxy = 0;
  for (let j = j0; j < j1; j++) {
    const dv = (v[j] as number) - vm;
    sxx += dv * dv;
    sxy += dv * ((f[j] as number) - fm);
  }
  let var_ = 0;
  for (let j = j0; j < j1; j++) {
    const w = ((v[j] as number) - vm) / sxx;
    var_ += w * w * (u[j] as number) * (u[j] as number);
  }
  out.slope = sxy / sxx;
  out.sd = Math.sqrt(var_);
}

export interface LinearSummary {
  slopeHzPerV: number;
  slopeUncertaintyHzPerV: number;
  interceptHz: number;
  r2: number;
  maxLinearityErrorPct: number;
  fromV: number;
  toV: number;
}

/** Straight line over points i0 ≤ i < i1; error as % of the frequency span there. */
export function bestLine(v: Float64Array, f: Float64Array, i0: number, i1: number, sigmaHz: number): LinearSummary {
  const line = fitPolynomial(v, f, i0, i1, 1);
  let fMin = Infinity;
  let fMax = -Infinity;
  let worst = 0;
  for (let i = i0; i < i1; i++) {
    const fi = f[i] as number;
    fMin = Math.min(fMin, fi);
    fMax = Math.max(fMax, fi);
    worst = Math.max(worst, Math.abs(fi - evalPoly(line, v[i] as number)));
  }
  const span = fMax - fMin;
  const sigma = Math.max(Number.isFinite(line.residualStdDev) ? line.residualStdDev : 0, sigmaHz);
  return {
    slopeHzPerV: line.coefficients[1] as number,
    slopeUncertaintyHzPerV: derivativeStdDev(line, v[i0] as number, sigma),
    interceptHz: line.coefficients[0] as number,
    r2: line.rSquared,
    maxLinearityErrorPct: span > 0 ? (100 * worst) / span : 0,
    fromV: v[i0] as number,
    toV: v[i1 - 1] as number,
  };
}

export interface WidestRange {
  fromV: number;
  toV: number;
  slopeHzPerV: number;
  maxLinearityErrorPct: number;
  limitPct: number;
  /** How it was found (stated in the output). */
  method: string;
}

const GRID = 257;

/**
 * Widest voltage window over which a straight line stays within ±limitPct of
 * the window's frequency span, searched on the fitted curve (noise-free) on a
 * uniform grid by a two-pointer sweep (greedy: grows the right end while the
 * window passes, then moves the left end).
 */
export function widestLinearRange(
  model: TuningModel,
  fromV: number,
  toV: number,
  limitPct: number,
): WidestRange | null {
  if (!(toV > fromV)) return null;
  const gv = new Float64Array(GRID);
  const gf = new Float64Array(GRID);
  for (let i = 0; i < GRID; i++) {
    gv[i] = fromV + ((toV - fromV) * i) / (GRID - 1);
    gf[i] = model.value(gv[i] as number);
  }
  const check = (a: number, b: number): { ok: boolean; slope: number; errPct: number } => {
    const { slope } = localSlope(gv, gf, gf, a, b + 1);
    let vm = 0;
    let fm = 0;
    for (let i = a; i <= b; i++) {
      vm += gv[i] as number;
      fm += gf[i] as number;
    }
    vm /= b - a + 1;
    fm /= b - a + 1;
    let fMin = Infinity;
    let fMax = -Infinity;
    let worst = 0;
    for (let i = a; i <= b; i++) {
      const fi = gf[i] as number;
      fMin = Math.min(fMin, fi);
      fMax = Math.max(fMax, fi);
      worst = Math.max(worst, Math.abs(fi - (fm + slope * ((gv[i] as number) - vm))));
    }
    const errPct = fMax > fMin ? (100 * worst) / (fMax - fMin) : 0;
    return { ok: errPct <= limitPct, slope, errPct };
  };
  let best = { a: 0, b: 1, ...check(0, 1) };
  let b = 1;
  for (let a = 0; a < GRID - 1; a++) {
    if (b <= a) b = a + 1;
    while (b + 1 < GRID && check(a, b + 1).ok) b++;
    const c = check(a, b);
    if (c.ok && b - a > best.b - best.a) best = { a, b, ...c };
  }
  return {
    fromV: gv[best.a] as number,
    toV: gv[best.b] as number,
    slopeHzPerV: best.slope,
    maxLinearityErrorPct: best.errPct,
    limitPct,
    method: `straight line on the fitted curve, ${GRID}-point grid, greedy two-pointer search`,
  };
}

/** The model's analytic derivative and its SD at v. */
export function fitKvco(model: TuningModel, v: number): { hzPerV: number; sd: number } {
  return { hzPerV: model.slope(v), sd: model.slopeSd(v) };
}
