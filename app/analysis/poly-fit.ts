/**
 * Polynomial least squares f(x) = Σ cᵢ·xⁱ over an index window of two
 * columns. x is centred and scaled to [-1, 1] before the design matrix is
 * built (keeps the Vandermonde columns well conditioned); the coefficients are
 * converted back to the unscaled x for output.
 */
import { solveLeastSquaresInPlace } from './least-squares.ts';
import { centreAndScale, solveLineScaled, type ScaledSolution } from './poly-fit-line.ts';
import { solveQuadraticScaled } from './poly-fit-quadratic.ts';

export interface PolyFit {
  degree: number;
  /** Points used. */
  n: number;
  /** u = (x - centre) / scale. */
  centre: number;
  scale: number;
  /** Coefficients in u (what evaluation uses: better rounding). */
  scaledCoefficients: Float64Array;
  /** (AᵀA)⁻¹ in u, row-major; σ² times this is the covariance of scaledCoefficients. */
  scaledUnscaledCovariance: Float64Array;
  /** c₀…c_d of f(x) = Σ cᵢ·xⁱ, x unscaled. */
  coefficients: number[];
  /** Standard deviations of `coefficients` (residual-based). */
  coefficientStdDev: number[];
  residualSumSquares: number;
  /** √(RSS / (n − degree − 1)); NaN when n = degree + 1. */
  residualStdDev: number;
  rSquared: number;
}

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

/** Centred, scaled Vandermonde matrix (column-major, p columns) and right-hand side. */
export function designMatrix(
  xs: Float64Array,
  ys: Float64Array,
  i0: number,
  i1: number,
  p: number,
): { a: Float64Array; rhs: Float64Array; centre: number; scale: number } {
  const n = i1 - i0;
  const { centre, scale } = centreAndScale(xs, i0, i1);
  const a = new Float64Array(n * p);
  const rhs = new Float64Array(n);
  for (let r = 0; r < n; r++) {
    const u = ((xs[i0 + r] as number) - centre) / scale;
    let pow = 1;
    for (let j = 0; j < p; j++) {
      a[j * n + r] = pow;
      pow *= u;
    }
    rhs[r] = ys[i0 + r] as number;
  }
  return { a, rhs, centre, scale };
}

/** Householder QR on the full design matrix (any degree). */
function solveScaled(xs: Float64Array, ys: Float64Array, i0: number, i1: number, p: number): ScaledSolution {
  const { a, rhs, centre, scale } = designMatrix(xs, ys, i0, i1, p);
  const sol = solveLeastSquaresInPlace(a, i1 - i0, p, rhs);
  return {
    centre,
    scale,
    coefficients: sol.coefficients,
    unscaledCovariance: sol.unscaledCovariance,
    fullRank: sol.fullRank,
  };
}

/**
 * Least-squares polynomial of `degree` through (xs[i], ys[i]), i0 ≤ i < i1.
 * A straight line and a quadratic take the matrix-free paths (same arithmetic,
 * no allocation per point) unless `general` is set (tests compare the two).
 */
export function fitPolynomial(
  xs: Float64Array,
  ys: Float64Array,
  i0: number,
  i1: number,
  degree: number,
  general = false,
): PolyFit {
  if (!Number.isInteger(degree) || degree < 0 || degree > 12) {
    throw new RangeError(`degree must be an integer 0–12 (got ${degree})`);
  }
  const n = i1 - i0;
  const p = degree + 1;
  if (n < p) throw new RangeError(`a degree-${degree} fit needs at least ${p} points (got ${n})`);
  const sol =
    p === 2 && !general
      ? solveLineScaled(xs, ys, i0, i1)
      : ((p === 3 && !general ? solveQuadraticScaled(xs, ys, i0, i1) : null) ?? solveScaled(xs, ys, i0, i1, p));
  const { centre, scale } = sol;
  if (!sol.fullRank) throw new RangeError(`a degree-${degree} fit needs ${p} distinct x values`);
  const b = sol.coefficients;
  // Residuals evaluated directly (two-pass) rather than from Qᵀy: same value, clearer.
  let yMean = 0;
  for (let i = i0; i < i1; i++) yMean += ys[i] as number;
  yMean /= n;
  let rss = 0;
  let sst = 0;
  for (let i = i0; i < i1; i++) {
    const y = ys[i] as number;
    const r = y - hornerScaled(b, ((xs[i] as number) - centre) / scale);
    rss += r * r;
    sst += (y - yMean) * (y - yMean);
  }
  const dof = n - p;
  const sigma2 = dof > 0 ? rss / dof : NaN;
  // c = T b with T[j][k] = C(k, j)·(−centre)^(k−j) / scale^k.
  const t = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let k = j; k < p; k++) {
      t[j * p + k] = (binomial(k, j) * Math.pow(-centre, k - j)) / Math.pow(scale, k);
    }
  }
  const coefficients: number[] = [];
  const coefficientStdDev: number[] = [];
  const cov = sol.unscaledCovariance;
  for (let j = 0; j < p; j++) {
    let c = 0;
    for (let k = j; k < p; k++) c += (t[j * p + k] as number) * (b[k] as number);
    coefficients.push(c);
    let v = 0;
    for (let k = j; k < p; k++) {
      for (let l = j; l < p; l++) v += (t[j * p + k] as number) * (cov[k * p + l] as number) * (t[j * p + l] as number);
    }
    coefficientStdDev.push(Math.sqrt(Math.max(0, v * sigma2)));
  }
  return {
    degree,
    n,
    centre,
    scale,
    scaledCoefficients: b,
    scaledUnscaledCovariance: cov,
    coefficients,
    coefficientStdDev,
    residualSumSquares: rss,
    residualStdDev: Math.sqrt(sigma2),
    rSquared: sst > 0 ? 1 - rss / sst : 1,
  };
}

function hornerScaled(b: Float64Array, u: number): number {
  let s = 0;
  for (let k = b.length - 1; k >= 0; k--) s = s * u + (b[k] as number);
  return s;
}

/** f(x) of a fit. */
export function evalPoly(fit: PolyFit, x: number): number {
  return hornerScaled(fit.scaledCoefficients, (x - fit.centre) / fit.scale);
}

/** df/dx of a fit. */
export function evalPolyDerivative(fit: PolyFit, x: number): number {
  const b = fit.scaledCoefficients;
  const u = (x - fit.centre) / fit.scale;
  let s = 0;
  for (let k = b.length - 1; k >= 1; k--) s = s * u + k * (b[k] as number);
  return s / fit.scale;
}

/**
 * Standard deviation of df/dx at x for a per-point standard deviation sigma
 * (defaults to the residual SD): √(gᵀ·(AᵀA)⁻¹·g)·σ, g = ∂(df/dx)/∂b.
 */
export function derivativeStdDev(fit: PolyFit, x: number, sigma = fit.residualStdDev): number {
  const p = fit.degree + 1;
  const u = (x - fit.centre) / fit.scale;
  const cov = fit.scaledUnscaledCovariance;
  let v = 0;
  for (let i = 1; i < p; i++) {
    const gi = (i * Math.pow(u, i - 1)) / fit.scale;
    for (let j = 1; j < p; j++) {
      const gj = (j * Math.pow(u, j - 1)) / fit.scale;
      v += gi * (cov[i * p + j] as number) * gj;
    }
  }
  return Math.sqrt(Math.max(0, v)) * sigma;
}
