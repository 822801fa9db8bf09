/**
 * Warm-up of a drift log: where the drift rate has settled within a limit.
 */
import { fitPolynomial } from './poly-fit.ts';

export interface WarmUp {
  settled: boolean;
  /** First sample after the warm-up (the last quarter when never settled). */
  startIndex: number;
  limit: number;
  windowS: number;
}

/**
 * Warm-up: the record is cut into 20 windows (≥ 10 samples each); the drift
 * rate of each is its least-squares slope. Warm-up ends at the start of the
 * first window after which every window stays within the limit (allowing
 * two standard deviations of the window's slope for noise).
 */
export function findWarmUp(t: Float64Array, f: Float64Array, m: number, meanHz: number, limit: number): WarmUp {
  const windows = Math.max(1, Math.min(20, Math.floor(m / 10)));
  const size = Math.floor(m / windows);
  const toPpmH = (3600 * 1e6) / meanHz;
  let start = -1;
  for (let w = windows - 1; w >= 0; w--) {
    const a = w * size;
    const b = w === windows - 1 ? m : a + size;
    if (b - a < 3 || (t[b - 1] as number) <= (t[a] as number)) break;
    const line = fitPolynomial(t, f, a, b, 1);
    const rate = (line.coefficients[1] as number) * toPpmH;
    const rateSd = Number.isFinite(line.coefficientStdDev[1]) ? (line.coefficientStdDev[1] as number) * toPpmH : 0;
    // Settled while the rate is consistent (2σ) with lying inside the limit: noise alone does not extend warm-up.
    if (Math.abs(rate) - 2 * Math.abs(rateSd) > limit) break;
    start = a;
  }
  const windowS = ((t[m - 1] as number) - (t[0] as number)) / windows;
  if (start < 0) return { settled: false, startIndex: Math.floor((3 * m) / 4), limit, windowS };
  return { settled: true, startIndex: start, limit, windowS };
}
