/**
 * The quadratic case of fitPolynomial without a design matrix. The tuning-curve
 * spline removes the least-squares quadratic before it smooths (spline-fit.ts),
 * twice per fit; for a sweep of a million distinct voltages the n×3 matrix (24 MB)
 * and its passes cost more than the spline itself. As poly-fit-line.ts does for
 * the line, this performs exactly the floating-point operations, in the same
 * order, that designMatrix + Householder QR (least-squares.ts) perform for the
 * columns [1, u, u·u], u = (x − centre)/scale, so the result is bit-for-bit
 * the same, but regenerates every entry from xs instead of storing it:
 *   column 0 is all ones: its Householder vector is (1 + √n, 1, 1, …), and after
 *   that reflection column j is cⱼ(u) − fⱼ (row 0: cⱼ(u₀) − fⱼ·(1 + √n));
 *   the second reflection's vector is those updated column-1 entries from row 1
 *   (row 1 itself: a₁₁ − α₁), and column 2 after it is a₂′ − f₂₁·v₁ from row 1;
 *   the third's is that column from row 2. y follows the same reflections.
 * Only y's first three entries are needed after the last one (back substitution);
 * the residuals fitPolynomial computes itself. A rank-deficient fit returns null
 * and the caller takes the general path, which handles it.
 * poly-fit.test.ts checks the identity against the general path.
 */
import { solveTriangular } from './least-squares.ts';
import { centreAndScale, type ScaledSolution } from './poly-fit-line.ts';

/**
 * u of row i. A plain function, not a closure made per call: V8 inlines a
 * closure as the one function object it saw, and the next fit's new closure
 * threw the optimised loops away again (a dozen times in a 1e6-point analyze).
 */
function scaledAt(xs: Float64Array, i: number, centre: number, scale: number): number {
  return ((xs[i] as number) - centre) / scale;
}

/** Column 2 after the first two reflections, from u: (u·u − f2) − f21·(u − f1). */
function secondColumnAt(u: number, f1: number, f2: number, f21: number): number {
  return 1 * u * u - f2 - f21 * (u - f1);
}

/** Least-squares quadratic in u through (xs[i], ys[i]), i0 ≤ i < i1 (needs i1 − i0 ≥ 3); null when rank-deficient. */
export function solveQuadraticScaled(
  xs: Float64Array,
  ys: Float64Array,
  i0: number,
  i1: number,
): ScaledSolution | null {
  const n = i1 - i0;
  if (n < 3) return null;
  const { centre, scale } = centreAndScale(xs, i0, i1);
  // Reflection 0 (column of ones): norm √n (Σ 1² is exact), alpha −√n, v = (1 − alpha, 1, …, 1).
  const norm0 = Math.sqrt(n);
  const alpha0 = -norm0;
  const v0 = 1 - alpha0;
  const vtv0 = -2 * alpha0 * (1 - alpha0);
  const u0 = scaledAt(xs, i0, centre, scale);
  const u0sq = 1 * u0 * u0; // the design matrix's running power: 1, 1·u, (1·u)·u
  const y0 = ys[i0] as number;
  let dot1 = 0;
  let dot2 = 0;
  let doty = 0;
  dot1 += v0 * u0;
  dot2 += v0 * u0sq;
  doty += v0 * y0;
  for (let r = 1; r < n; r++) {
    const u = scaledAt(xs, i0 + r, centre, scale);
    dot1 += u;
    dot2 += 1 * u * u;
    doty += ys[i0 + r] as number;
  }
  const f1 = (2 * dot1) / vtv0;
  const f2 = (2 * dot2) / vtv0;
  const fy0 = (2 * doty) / vtv0;
  const r01 = u0 - f1 * v0;
  const r02 = u0sq - f2 * v0;
  const yq0 = y0 - fy0 * v0;

  // Reflection 1, on column 1 from row 1: a₁′ᵣ = uᵣ − f1.
  let big1 = 0;
  for (let r = 1; r < n; r++) big1 = Math.max(big1, Math.abs(scaledAt(xs, i0 + r, centre, scale) - f1));
  let ss1 = 0;
  if (big1 > 0) {
    for (let r = 1; r < n; r++) {
      const t = (scaledAt(xs, i0 + r, centre, scale) - f1) / big1;
      ss1 += t * t;
    }
  }
  const norm1 = big1 * Math.sqrt(ss1);
  let maxNorm = Math.max(norm0, norm1);
  if (norm1 === 0 || norm1 <= 1e-13 * maxNorm) return null;
  const akk1 = scaledAt(xs, i0 + 1, centre, scale) - f1;
  const alpha1 = akk1 > 0 ? -norm1 : norm1;
  const v11 = akk1 - alpha1;
  const vtv1 = -2 * alpha1 * (akk1 - alpha1);
  let dot21 = 0;
  let doty1 = 0;
  for (let r = 1; r < n; r++) {
    const u = scaledAt(xs, i0 + r, centre, scale);
    const v1 = r === 1 ? v11 : u - f1;
    dot21 += v1 * (1 * u * u - f2);
    doty1 += v1 * ((ys[i0 + r] as number) - fy0);
  }
  const f21 = (2 * dot21) / vtv1;
  const fy1 = (2 * doty1) / vtv1;
  const u1 = scaledAt(xs, i0 + 1, centre, scale);
  const r12 = 1 * u1 * u1 - f2 - f21 * v11;
  const yq1 = (ys[i0 + 1] as number) - fy0 - fy1 * v11;

  // Reflection 2, on column 2 from row 2: a₂″ᵣ = (uᵣ·uᵣ − f2) − f21·(uᵣ − f1).
  let big2 = 0;
  for (let r = 2; r < n; r++)
    big2 = Math.max(big2, Math.abs(secondColumnAt(scaledAt(xs, i0 + r, centre, scale), f1, f2, f21)));
  let ss2 = 0;
  if (big2 > 0) {
    for (let r = 2; r < n; r++) {
      const t = secondColumnAt(scaledAt(xs, i0 + r, centre, scale), f1, f2, f21) / big2;
      ss2 += t * t;
    }
  }
  const norm2 = big2 * Math.sqrt(ss2);
  maxNorm = Math.max(maxNorm, norm2);
  if (norm2 === 0 || norm2 <= 1e-13 * maxNorm) return null;
  const akk2 = secondColumnAt(scaledAt(xs, i0 + 2, centre, scale), f1, f2, f21);
  const alpha2 = akk2 > 0 ? -norm2 : norm2;
  const v22 = akk2 - alpha2;
  const vtv2 = -2 * alpha2 * (akk2 - alpha2);
  let doty2 = 0;
  for (let r = 2; r < n; r++) {
    const v2 = r === 2 ? v22 : secondColumnAt(scaledAt(xs, i0 + r, centre, scale), f1, f2, f21);
    doty2 += v2 * ((ys[i0 + r] as number) - fy0 - fy1 * (scaledAt(xs, i0 + r, centre, scale) - f1));
  }
  const fy2 = (2 * doty2) / vtv2;
  const yq2 = (ys[i0 + 2] as number) - fy0 - fy1 * (scaledAt(xs, i0 + 2, centre, scale) - f1) - fy2 * v22;

  const above = [0, r01, r02, 0, 0, r12];
  const { coefficients, unscaledCovariance } = solveTriangular(
    Float64Array.of(alpha0, alpha1, alpha2),
    (i, j) => above[i * 3 + j] as number,
    [yq0, yq1, yq2],
    3,
    true,
  );
  return { centre, scale, coefficients, unscaledCovariance, fullRank: true };
}
