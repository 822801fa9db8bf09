/**
 * Penalised regression spline (P-spline) for a tuning curve f(V):
 * cubic B-splines on equally spaced knots, a third-order difference penalty
 * on neighbouring coefficients, each point weighted by 1/u² (its measured
 * uncertainty). Eilers & Marx (1996), "Flexible smoothing with B-splines and
 * penalties", Statistical Science 11(2).
 *
 * - Smoothing λ by generalised cross-validation, GCV = n·RSSw/(n − edf)²
 *   (Craven & Wahba 1979), on a log grid then refined by golden section.
 * - edf = tr((G + λP)⁻¹G) from the band of the inverse of the banded Cholesky
 *   factor (Hutchinson & de Hoog 1985), so every λ costs O(K), not O(K³).
 * - Confidence band: Bayesian posterior covariance σ²(G + λP)⁻¹ (Wahba 1983),
 *   σ² = max(1, RSSw/(n − edf)) so a fit that misses the points widens its band.
 * - Monotone shape (when the caller says the data allow it): an asymmetric
 *   penalty κ·Σ vⱼ(Δαⱼ)² on first differences of wrong sign, iterated until the
 *   set of such differences stops changing (Bollaerts, Eilers & van Mechelen
 *   2006); non-decreasing B-spline coefficients give a non-decreasing curve.
 *
 * The penalty's null space is the quadratics, so the fit of y − q (q the
 * least-squares quadratic) is the fit of y less q: GCV works on y − q, which
 * keeps its quadratic forms well scaled at 400 MHz.
 */
import { evalPoly, fitPolynomial } from './poly-fit.ts';
import { sortedAtInPlace } from './select-kth.ts';
import { scratchColumn } from './scratch-columns.ts';

const BAND = 3; // cubic B-splines overlap 4 wide; the 3rd-difference penalty too
const MAX_SEGMENTS = 40;

export interface SplineFit {
  model: 'spline';
  fromV: number;
  toV: number;
  segments: number;
  /** B-spline coefficients (K = segments + 3). */
  coefficients: Float64Array;
  /** Band of the coefficients' covariance (already × σ²), row i at i·(BAND+1)+d = cov(i, i+d). */
  covarianceBand: Float64Array;
  lambda: number;
  /** Effective degrees of freedom tr(S). */
  edf: number;
  /** The GCV score at the chosen λ (weighted). */
  gcv: number;
  n: number;
  residualSumSquares: number;
  /** √(RSS/(n − edf)), unweighted, Hz. */
  residualStdDev: number;
  /** Weighted residual sum over its degrees of freedom (≈ 1 when the fit is within scatter). */
  chiSquarePerDof: number;
  rSquared: number;
  monotone: 'rising' | 'falling' | null;
  /** Knots are uniform in z = ½·(V − V₀)/(V₁ − V₀) + ½·(g(V) − g(V₀))/(g(V₁) − g(V₀)), g this pilot fit; null: uniform in V. */
  warp: SplineFit | null;
}

export interface SplineOptions {
  /** Force the curve non-decreasing ('rising') or non-increasing ('falling'). */
  monotone?: 'rising' | 'falling' | null;
}

/** The four non-zero B-splines (or their derivatives) at the last `basisAt`'s x: one buffer, no allocation per call. */
const BASIS = new Float64Array(4);

/** Fills BASIS with the four non-zero cubic B-splines at x (uniform knots) and returns the first index. */
function basisAt(fromV: number, h: number, segments: number, x: number, derivative: boolean): number {
  const u = (x - fromV) / h;
  let j = Math.floor(u);
  if (j < 0) j = 0;
  if (j > segments - 1) j = segments - 1;
  const t = u - j;
  const s = 1 - t;
  if (!derivative) {
    BASIS[0] = (s * s * s) / 6;
    BASIS[1] = (3 * t * t * t - 6 * t * t + 4) / 6;
    BASIS[2] = (-3 * t * t * t + 3 * t * t + 3 * t + 1) / 6;
    BASIS[3] = (t * t * t) / 6;
  } else {
    BASIS[0] = (-s * s) / 2 / h;
    BASIS[1] = (3 * t * t - 4 * t) / 2 / h;
    BASIS[2] = (-3 * t * t + 2 * t + 1) / 2 / h;
    BASIS[3] = (t * t) / 2 / h;
  }
  return j;
}

/** Banded Cholesky A = L·Lᵀ in place on a dense row-major K×K lower triangle. False if not positive definite. */
function choleskyBand(a: Float64Array, k: number): boolean {
  for (let j = 0; j < k; j++) {
    const k0 = Math.max(0, j - BAND);
    let d = a[j * k + j] as number;
    for (let m = k0; m < j; m++) d -= (a[j * k + m] as number) ** 2;
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    a[j * k + j] = ljj;
    for (let i = j + 1; i <= Math.min(k - 1, j + BAND); i++) {
      let s = a[i * k + j] as number;
      for (let m = Math.max(0, i - BAND); m < j; m++) s -= (a[i * k + m] as number) * (a[j * k + m] as number);
      a[i * k + j] = s / ljj;
    }
  }
  return true;
}

function solveBand(l: Float64Array, k: number, rhs: Float64Array, out: Float64Array): void {
  for (let i = 0; i < k; i++) {
    let s = rhs[i] as number;
    for (let m = Math.max(0, i - BAND); m < i; m++) s -= (l[i * k + m] as number) * (out[m] as number);
    out[i] = s / (l[i * k + i] as number);
  }
  for (let i = k - 1; i >= 0; i--) {
    let s = out[i] as number;
    for (let m = i + 1; m <= Math.min(k - 1, i + BAND); m++) s -= (l[m * k + i] as number) * (out[m] as number);
    out[i] = s / (l[i * k + i] as number);
  }
}

/** Band of A⁻¹ from A = L·Lᵀ (Hutchinson & de Hoog 1985): out[i·(BAND+1)+d] = (A⁻¹)[i][i+d]. */
function inverseBand(l: Float64Array, k: number, out: Float64Array): void {
  const w = BAND + 1;
  const at = (i: number, j: number): number =>
    i <= j ? (out[i * w + (j - i)] as number) : (out[j * w + (i - j)] as number);
  for (let i = k - 1; i >= 0; i--) {
    const lii = l[i * k + i] as number;
    for (let j = Math.min(k - 1, i + BAND); j >= i; j--) {
      let s = i === j ? 1 / lii : 0;
      for (let m = i + 1; m <= Math.min(k - 1, i + BAND); m++) s -= (l[m * k + i] as number) * at(m, j);
      out[i * w + (j - i)] = s / lii;
    }
  }
}

export function fitUniformSpline(
  xs: Float64Array,
  ys: Float64Array,
  u: Float64Array,
  i0: number,
  i1: number,
  options: SplineOptions = {},
): SplineFit {
  const n = i1 - i0;
  if (n < 6) throw new RangeError(`a spline needs at least 6 points (got ${n})`);
  const fromV = xs[i0] as number;
  const toV = xs[i1 - 1] as number;
  // About two points per segment: every basis function rests on data, so even a
  // small λ leaves the coefficients determined (K < n).
  const segments = Math.max(3, Math.min(MAX_SEGMENTS, Math.floor(n / 2)));
  const h = (toV - fromV) / segments;
  const k = segments + 3;
  // Weights 1/u², with u floored at half the median: a point whose few readings
  // happened to agree must not pin the curve.
  const uCopy = scratchColumn(0, n); // slot 0: only until the median is taken
  uCopy.set(u.subarray(i0, i1));
  const uFloor = 0.5 * sortedAtInPlace(uCopy, n >> 1);
  const q = fitPolynomial(xs, ys, i0, i1, 2);
  const g = new Float64Array(k * k);
  const c = new Float64Array(k);
  let yWy = 0;
  for (let i = 0; i < n; i++) {
    const x = xs[i0 + i] as number;
    // No uncertainties known (exact or synthetic data): equal weights.
    const ui = uFloor > 0 ? Math.max(u[i0 + i] as number, uFloor) : 1;
    const wi = 1 / (ui * ui);
    const r = (ys[i0 + i] as number) - evalPoly(q, x);
    yWy += wi * r * r;
    const j = basisAt(fromV, h, segments, x, false);
    for (let p = 0; p < 4; p++) {
      c[j + p] = (c[j + p] as number) + wi * (BASIS[p] as number) * r;
      for (let s = 0; s <= p; s++)
        g[(j + p) * k + j + s] = (g[(j + p) * k + j + s] as number) + wi * (BASIS[p] as number) * (BASIS[s] as number);
    }
  }
  // Third-difference penalty P = DᵀD, D rows (−1, 3, −3, 1); lower triangle.
  const pen = new Float64Array(k * k);
  const d3 = [-1, 3, -3, 1];
  for (let r = 0; r + 3 < k; r++) {
    for (let p = 0; p < 4; p++)
      for (let s = 0; s <= p; s++)
        pen[(r + p) * k + r + s] = (pen[(r + p) * k + r + s] as number) + (d3[p] as number) * (d3[s] as number);
  }
  let trG = 0;
  let trP = 0;
  for (let i = 0; i < k; i++) {
    trG += g[i * k + i] as number;
    trP += pen[i * k + i] as number;
  }
  const scale = trG / trP;
  const a = new Float64Array(k * k);
  const alpha = new Float64Array(k);
  const inv = new Float64Array(k * (BAND + 1));
  const build = (lambda: number, extra: Uint8Array | null, kappa: number): boolean => {
    for (let i = 0; i < k; i++) {
      for (let j = Math.max(0, i - BAND); j <= i; j++)
        a[i * k + j] = (g[i * k + j] as number) + lambda * (pen[i * k + j] as number);
    }
    if (extra) {
      for (let j = 0; j + 1 < k; j++) {
        if (extra[j] !== 1) continue;
        a[j * k + j] = (a[j * k + j] as number) + kappa;
        a[(j + 1) * k + j + 1] = (a[(j + 1) * k + j + 1] as number) + kappa;
        a[(j + 1) * k + j] = (a[(j + 1) * k + j] as number) - kappa;
      }
    }
    return choleskyBand(a, k);
  };
  const gcvAt = (logLambda: number): { gcv: number; edf: number; rssW: number } => {
    const lambda = scale * Math.pow(10, logLambda);
    if (!build(lambda, null, 0)) return { gcv: Infinity, edf: NaN, rssW: NaN };
    solveBand(a, k, c, alpha);
    inverseBand(a, k, inv);
    let edf = 0;
    let aGa = 0;
    let ac = 0;
    for (let i = 0; i < k; i++) {
      ac += (alpha[i] as number) * (c[i] as number);
      for (let j = Math.max(0, i - BAND); j <= i; j++) {
        const gij = g[i * k + j] as number;
        const sij = inv[j * (BAND + 1) + (i - j)] as number;
        const pair = (alpha[i] as number) * (alpha[j] as number) * gij;
        aGa += i === j ? pair : 2 * pair;
        edf += i === j ? sij * gij : 2 * sij * gij;
      }
    }
    const rssW = Math.max(yWy - 2 * ac + aGa, 0);
    const dof = n - edf;
    return { gcv: dof > 0.5 ? (n * rssW) / (dof * dof) : Infinity, edf, rssW };
  };
  // Coarse log grid, then golden section around the best grid point.
  let bestT = 0;
  let bestGcv = Infinity;
  for (let t = -8; t <= 8; t += 0.5) {
    const r = gcvAt(t);
    if (r.gcv < bestGcv) [bestGcv, bestT] = [r.gcv, t];
  }
  let lo = bestT - 0.5;
  let hi = bestT + 0.5;
  const phi = (Math.sqrt(5) - 1) / 2;
  let x1 = hi - phi * (hi - lo);
  let x2 = lo + phi * (hi - lo);
  let f1 = gcvAt(x1).gcv;
  let f2 = gcvAt(x2).gcv;
  for (let it = 0; it < 24; it++) {
    if (f1 < f2) {
      [hi, x2, f2] = [x2, x1, f1];
      x1 = hi - phi * (hi - lo);
      f1 = gcvAt(x1).gcv;
    } else {
      [lo, x1, f1] = [x1, x2, f2];
      x2 = lo + phi * (hi - lo);
      f2 = gcvAt(x2).gcv;
    }
  }
  const tBest = f1 < f2 ? x1 : x2;
  const chosen = gcvAt(tBest);
  const lambda = scale * Math.pow(10, tBest);
  const chi2 = chosen.rssW / Math.max(n - chosen.edf, 1);
  const sigma2 = Math.max(1, chi2);
  // gcvAt left the band of (G + λP)⁻¹ in inv and the fit of y − q in alpha. The
  // curve's own coefficients add q's exact B-spline coefficients (its blossom at
  // each basis function's three inner knots — Marsden's identity, de Boor,
  // A Practical Guide to Splines, ch. IX), so the shape constraint sees the whole curve.
  const covarianceBand = inv.map((x) => x * sigma2);
  const qc = q.coefficients;
  const qAlpha = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    const x1 = fromV + (i - 2) * h;
    const x2 = fromV + (i - 1) * h;
    const x3 = fromV + i * h;
    qAlpha[i] = (qc[0] ?? 0) + ((qc[1] ?? 0) * (x1 + x2 + x3)) / 3 + ((qc[2] ?? 0) * (x1 * x2 + x1 * x3 + x2 * x3)) / 3;
  }
  const coefficients = new Float64Array(k);
  for (let i = 0; i < k; i++) coefficients[i] = (alpha[i] as number) + (qAlpha[i] as number);
  const monotone = options.monotone ?? null;
  if (monotone) {
    const sense = monotone === 'rising' ? 1 : -1;
    const kappa = 1e6 * (trG / k);
    const wrong = new Uint8Array(k - 1);
    const rhs = new Float64Array(k);
    for (let it = 0; it < 50; it++) {
      let changed = false;
      for (let j = 0; j + 1 < k; j++) {
        const bad = sense * ((coefficients[j + 1] as number) - (coefficients[j] as number)) < 0 ? 1 : 0;
        if (bad === 1 && wrong[j] !== 1) {
          wrong[j] = 1;
          changed = true;
        }
      }
      if (!changed) break;
      // Penalty on Δ(α + α_q): (A + κM)·α = c − κM·α_q.
      rhs.set(c);
      for (let j = 0; j + 1 < k; j++) {
        if (wrong[j] !== 1) continue;
        const dq = (qAlpha[j + 1] as number) - (qAlpha[j] as number);
        rhs[j] = (rhs[j] as number) + kappa * dq;
        rhs[j + 1] = (rhs[j + 1] as number) - kappa * dq;
      }
      if (!build(lambda, wrong, kappa)) break;
      solveBand(a, k, rhs, alpha);
      for (let i = 0; i < k; i++) coefficients[i] = (alpha[i] as number) + (qAlpha[i] as number);
    }
    // κ leaves violations of order 1e-6 of a step: project them away so the slope never changes sign.
    for (let j = 1; j < k; j++) {
      const prev = coefficients[j - 1] as number;
      if (sense * ((coefficients[j] as number) - prev) < 0) coefficients[j] = prev;
    }
  }
  const fit: SplineFit = {
    model: 'spline',
    fromV,
    toV,
    segments,
    coefficients,
    covarianceBand,
    lambda,
    edf: chosen.edf,
    gcv: chosen.gcv,
    n,
    residualSumSquares: 0,
    residualStdDev: NaN,
    chiSquarePerDof: chi2,
    rSquared: NaN,
    monotone,
    warp: null,
  };
  let rss = 0;
  let mean = 0;
  for (let i = i0; i < i1; i++) mean += ys[i] as number;
  mean /= n;
  let tss = 0;
  for (let i = i0; i < i1; i++) {
    const e = (ys[i] as number) - splineValue(fit, xs[i] as number);
    rss += e * e;
    tss += ((ys[i] as number) - mean) ** 2;
  }
  fit.residualSumSquares = rss;
  fit.residualStdDev = n - chosen.edf > 0.5 ? Math.sqrt(rss / (n - chosen.edf)) : NaN;
  fit.rSquared = tss > 0 ? 1 - rss / tss : 1;
  return fit;
}

/** The pilot's values at its two ends, computed once per pilot (every warped evaluation needs them). */
const warpEnds = new WeakMap<SplineFit, { g0: number; g1: number }>();

/** The last pilot asked about and its ends: a million evaluations in a row ask about one pilot. */
let lastPilot: SplineFit | null = null;
let lastEnds = { g0: 0, g1: 0 };

function endsOf(pilot: SplineFit): { g0: number; g1: number } {
  if (pilot === lastPilot) return lastEnds; // no WeakMap look-up (some 30 ns, four per local Kvco)
  let ends = warpEnds.get(pilot);
  if (!ends) {
    ends = { g0: splineValue(pilot, pilot.fromV), g1: splineValue(pilot, pilot.toV) };
    warpEnds.set(pilot, ends);
  }
  lastPilot = pilot;
  lastEnds = ends;
  return ends;
}

function warpZ(pilot: SplineFit, v: number): number {
  const { g0, g1 } = endsOf(pilot);
  return 0.5 * ((v - pilot.fromV) / (pilot.toV - pilot.fromV)) + 0.5 * ((splineValue(pilot, v) - g0) / (g1 - g0));
}

function warpSlope(pilot: SplineFit, v: number): number {
  const { g0, g1 } = endsOf(pilot);
  const span = g1 - g0;
  return 0.5 / (pilot.toV - pilot.fromV) + (0.5 * splineSlope(pilot, v)) / span;
}

/**
 * The tuning-curve spline: a first fit with knots uniform in V, then, when the
 * curve is monotone, a second with knots uniform in the mean of normalised V
 * and normalised frequency (arc length, roughly): knots crowd where the curve
 * is steep, which is where a tuning curve bends (the onset above a stall, the
 * low-bias end of a varactor), so the penalty stops fighting the curvature there.
 * The second fit is kept only if its GCV score is lower.
 */
export function fitSpline(
  xs: Float64Array,
  ys: Float64Array,
  u: Float64Array,
  i0: number,
  i1: number,
  options: SplineOptions = {},
): SplineFit {
  const pilot = fitUniformSpline(xs, ys, u, i0, i1, options);
  if (!pilot.monotone) return pilot;
  const n = i1 - i0;
  const zs = scratchColumn(1, n); // slot 1 (the inner fit takes slot 0 for a while; its result keeps no column)
  for (let i = 0; i < n; i++) zs[i] = warpZ(pilot, xs[i0 + i] as number);
  const inner = fitUniformSpline(zs, ys, u.subarray(i0, i1), 0, n, options);
  // Keep the warped knots only when they predict better (lower GCV on the same data):
  // a curve the uniform knots already follow (a line, a parabola) stays exact.
  const span = Math.abs(splineValue(pilot, pilot.toV) - splineValue(pilot, pilot.fromV));
  if (!(inner.gcv < 0.95 * pilot.gcv) || !(pilot.residualStdDev > 1e-9 * span)) return pilot;
  return { ...inner, fromV: pilot.fromV, toV: pilot.toV, warp: { ...pilot }, inner } as SplineFit;
}

/** f(v) in Hz. */
export function splineValue(fit: SplineFit, v: number): number {
  if (fit.warp) return splineValue(innerOf(fit), warpZ(fit.warp, v));
  const j = basisAt(fit.fromV, (fit.toV - fit.fromV) / fit.segments, fit.segments, v, false);
  let s = 0;
  for (let p = 0; p < 4; p++) s += (BASIS[p] as number) * (fit.coefficients[j + p] as number);
  return s;
}

function innerOf(fit: SplineFit): SplineFit {
  return (fit as SplineFit & { inner: SplineFit }).inner;
}

/** df/dv in Hz/V (the analytic derivative of the spline). */
export function splineSlope(fit: SplineFit, v: number): number {
  if (fit.warp) return splineSlope(innerOf(fit), warpZ(fit.warp, v)) * warpSlope(fit.warp, v);
  const raw = rawSlope(fit, v);
  // Monotone coefficients give a slope of one sign; rounding can leave −1e-12 where they are equal.
  if (fit.monotone === 'rising') return Math.max(raw, 0);
  if (fit.monotone === 'falling') return Math.min(raw, 0);
  return raw;
}

function rawSlope(fit: SplineFit, v: number): number {
  const j = basisAt(fit.fromV, (fit.toV - fit.fromV) / fit.segments, fit.segments, v, true);
  let s = 0;
  for (let p = 0; p < 4; p++) s += (BASIS[p] as number) * (fit.coefficients[j + p] as number);
  return s;
}

/** √(bᵀ C b) for the basis in BASIS starting at index j. */
function bandForm(fit: SplineFit, j: number): number {
  const w = BAND + 1;
  let s = 0;
  for (let p = 0; p < 4; p++) {
    for (let r = 0; r < 4; r++) {
      const i = j + Math.min(p, r);
      const d = Math.abs(p - r);
      s += (BASIS[p] as number) * (BASIS[r] as number) * (fit.covarianceBand[i * w + d] as number);
    }
  }
  return Math.sqrt(Math.max(s, 0));
}

/** SD of f(v) from the fit's covariance (Hz). */
export function splineValueSd(fit: SplineFit, v: number): number {
  if (fit.warp) return splineValueSd(innerOf(fit), warpZ(fit.warp, v));
  return bandForm(fit, basisAt(fit.fromV, (fit.toV - fit.fromV) / fit.segments, fit.segments, v, false));
}

/** SD of df/dv from the fit's covariance (Hz/V). */
export function splineSlopeSd(fit: SplineFit, v: number): number {
  if (fit.warp) return splineSlopeSd(innerOf(fit), warpZ(fit.warp, v)) * warpSlope(fit.warp, v);
  return bandForm(fit, basisAt(fit.fromV, (fit.toV - fit.fromV) / fit.segments, fit.segments, v, true));
}
