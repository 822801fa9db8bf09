/**
 * Standard uncertainty of each point's mean frequency: what the fit weights,
 * the range rules and every Kvco SD start from.
 */
import type { PointSet } from './sweep-points.ts';

/** Per-point frequency SD: reading scatter of the mean and ±1 count/gate (rectangular). */
export function pointUncertainty(points: PointSet, gateS: number | undefined): Float64Array {
  const u = new Float64Array(points.count);
  for (let i = 0; i < points.count; i++)
    u[i] = meanReadingUncertainty(points.sdHz[i] as number, points.nOsc[i] as number, gateS);
  return u;
}

/**
 * 1σ of a mean of `n` counter readings with sample SD `sdHz`: the standard
 * error and the ±1 count of a `gateS` gate as a rectangular distribution,
 * 1/(gate·√3) (GUM §4.3.7). Also what the plots' read-outs carry.
 */
export function meanReadingUncertainty(sdHz: number, n: number, gateS: number | null | undefined): number {
  const q = gateS && gateS > 0 ? 1 / (gateS * Math.sqrt(3)) : 0;
  const scatter = n > 1 && Number.isFinite(sdHz) ? (sdHz * sdHz) / n : 0;
  return Math.sqrt(scatter + q * q);
}

/** RMS of u over the given points: the pooled scatter a fit's residual SD is judged against. */
export function rmsUncertainty(u: Float64Array, indices: ArrayLike<number>): number {
  let sum = 0;
  for (let k = 0; k < indices.length; k++) {
    const i = indices[k] as number;
    sum += (u[i] as number) * (u[i] as number);
  }
  return Math.sqrt(sum / indices.length);
}
