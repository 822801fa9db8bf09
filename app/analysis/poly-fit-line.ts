/**
 * The straight-line case of fitPolynomial without a design matrix. Drift
 * analysis fits lines through a million samples several times over; building
 * the n×2 matrix for each fit cost more (allocation and page faults) than the
 * arithmetic. This performs exactly the floating-point operations, in the same
 * order, that designMatrix + Householder QR (least-squares.ts) perform for two
 * columns [1, u], u = (x − centre)/scale — so the result is bit-for-bit the
 * same — but regenerates each column entry from xs instead of storing it:
 *   column 0 is all ones, so its Householder vector is (1 + √n, 1, 1, …) and
 *   the updated column 1 is u₀ − f·(1 + √n), uᵢ − f (i ≥ 1); likewise for y.
 * poly-fit.test.ts checks the identity against the general path.
 */

export interface ScaledSolution {
  centre: number;
  scale: number;
  /** Coefficients in u. */
  coefficients: Float64Array;
  /** (AᵀA)⁻¹ in u, row-major. */
  unscaledCovariance: Float64Array;
  fullRank: boolean;
}

/** Centre and half-span of xs over the window (scale 1 when all x are equal), as designMatrix. */
export function centreAndScale(xs: Float64Array, i0: number, i1: number): { centre: number; scale: number } {
  let xMin = Infinity;
  let xMax = -Infinity;
  for (let i = i0; i < i1; i++) {
    const x = xs[i] as number;
    if (x < xMin) xMin = x;
    if (x > xMax) xMax = x;
  }
  return { centre: (xMin + xMax) / 2, scale: xMax > xMin ? (xMax - xMin) / 2 : 1 };
}

/** Least-squares line in u through (xs[i], ys[i]), i0 ≤ i < i1 (needs i1 − i0 ≥ 2). */
export function solveLineScaled(xs: Float64Array, ys: Float64Array, i0: number, i1: number): ScaledSolution {
  const n = i1 - i0;
  const { centre, scale } = centreAndScale(xs, i0, i1);
  const u0 = ((xs[i0] as number) - centre) / scale;
  const y0 = ys[i0] as number;
  // Column 0 (ones): norm √n, alpha = −√n, v = (1 − alpha, 1, …, 1).
  const norm0 = Math.sqrt(n); // Σ 1² is exact
  const alpha0 = -norm0;
  const v0 = 1 - alpha0;
  const vtv0 = -2 * alpha0 * (1 - alpha0);
  let dot = 0;
  let doty = 0;
  dot += v0 * u0;
  doty += v0 * y0;
  for (let i = i0 + 1; i < i1; i++) {
    dot += ((xs[i] as number) - centre) / scale;
    doty += ys[i] as number;
  }
  const f = (2 * dot) / vtv0;
  const fy = (2 * doty) / vtv0;
  // Column 1 after the first reflection: a1[0] = u₀ − f·v0, a1[i] = uᵢ − f; y'[0] = y₀ − fy·v0, y'[i] = yᵢ − fy.
  const r01 = u0 - f * v0;
  const yq0 = y0 - fy * v0;
  let big = 0;
  for (let i = i0 + 1; i < i1; i++) big = Math.max(big, Math.abs(((xs[i] as number) - centre) / scale - f));
  let ss = 0;
  if (big > 0) {
    for (let i = i0 + 1; i < i1; i++) {
      const t = (((xs[i] as number) - centre) / scale - f) / big;
      ss += t * t;
    }
  }
  const norm1 = big * Math.sqrt(ss);
  const maxNorm = Math.max(norm0, norm1);
  const coefficients = new Float64Array(2);
  const unscaledCovariance = new Float64Array(4);
  if (norm1 === 0 || norm1 <= 1e-13 * maxNorm)
    return { centre, scale, coefficients, unscaledCovariance, fullRank: false };
  const akk = ((xs[i0 + 1] as number) - centre) / scale - f;
  const alpha1 = akk > 0 ? -norm1 : norm1;
  const v1 = akk - alpha1;
  const vtv1 = -2 * alpha1 * (akk - alpha1);
  let doty1 = 0;
  for (let i = i0 + 1; i < i1; i++) {
    const a = i === i0 + 1 ? v1 : ((xs[i] as number) - centre) / scale - f;
    doty1 += a * ((ys[i] as number) - fy);
  }
  const fy1 = (2 * doty1) / vtv1;
  const yq1 = (ys[i0 + 1] as number) - fy - fy1 * v1;
  // Back substitution with R = [[alpha0, r01], [0, alpha1]], then (AᵀA)⁻¹ = R⁻¹R⁻ᵀ.
  const b1 = yq1 / alpha1;
  let s = yq0;
  s -= r01 * b1;
  coefficients[0] = s / alpha0;
  coefficients[1] = b1;
  const rinv00 = 1 / alpha0;
  const rinv11 = 1 / alpha1;
  let t01 = 0;
  t01 -= r01 * rinv11;
  const rinv01 = t01 / alpha0;
  let c00 = 0;
  c00 += rinv00 * rinv00;
  c00 += rinv01 * rinv01;
  let c01 = 0;
  c01 += rinv01 * rinv11;
  let c11 = 0;
  c11 += rinv11 * rinv11;
  unscaledCovariance[0] = c00;
  unscaledCovariance[1] = c01;
  unscaledCovariance[2] = c01;
  unscaledCovariance[3] = c11;
  return { centre, scale, coefficients, unscaledCovariance, fullRank: true };
}
