/**
 * Automatic choice of the polynomial degree for the tuning curve.
 */
import { nestedResidualSumsInPlace } from './least-squares.ts';
import { designMatrix, fitPolynomial, type PolyFit } from './poly-fit.ts';

export interface AutoFitResult {
  fit: PolyFit;
  criterion: 'AICc';
  /** AICc for each tried degree (index = degree − 1). */
  scores: number[];
}

/**
 * Degree chosen by the corrected Akaike information criterion
 * AICc = n·ln(RSS/n) + 2k + 2k(k+1)/(n−k−1), k = degree + 2 (coefficients and
 * the noise variance) — Hurvich & Tsai (1989), common practice. RSS is floored
 * at (1e-12·|y|range)²·n so exact data picks the lowest adequate degree.
 */
export function fitPolynomialAuto(
  xs: Float64Array,
  ys: Float64Array,
  i0: number,
  i1: number,
  maxDegree = 6,
): AutoFitResult {
  const n = i1 - i0;
  let yMin = Infinity;
  let yMax = -Infinity;
  for (let i = i0; i < i1; i++) {
    yMin = Math.min(yMin, ys[i] as number);
    yMax = Math.max(yMax, ys[i] as number);
  }
  const floor = Math.pow(1e-12 * Math.max(yMax - yMin, Math.abs(yMax), 1e-300), 2) * n;
  // One QR of the largest model gives the RSS of every lower degree (nested columns).
  let top = maxDegree;
  while (top > 1 && n - (top + 2) - 1 <= 0) top--;
  let bestDegree = Math.min(1, n - 1);
  const scores: number[] = [];
  if (n - 3 - 1 > 0) {
    const { a, rhs } = designMatrix(xs, ys, i0, i1, top + 1);
    const rssByColumns = nestedResidualSumsInPlace(a, n, top + 1, rhs);
    let bestScore = Infinity;
    for (let d = 1; d <= top; d++) {
      const k = d + 2;
      const rssD = rssByColumns[d] as number;
      if (!Number.isFinite(rssD)) break; // x values too few for this degree
      const rss = Math.max(rssD, floor);
      const score = n * Math.log(rss / n) + 2 * k + (2 * k * (k + 1)) / (n - k - 1);
      scores.push(score);
      if (score < bestScore - 1e-9) {
        bestScore = score;
        bestDegree = d;
      }
    }
  }
  return { fit: fitPolynomial(xs, ys, i0, i1, bestDegree), criterion: 'AICc', scores };
}
