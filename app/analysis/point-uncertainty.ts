/**
 * Standard uncertainty of each point's mean frequency: what the fit weights,
 * the range rules and every Kvco SD start from.
 */
import type { PointSet } from './sweep-points.ts';

/** Per-point frequency SD: reading scatter of the mean and ±1 count/gate (rectangular). */
export function pointUncertainty(points: PointSet, gateS: number | undefined): Float64Array {
  const q = gateS ? 1 / (gateS * Math.sqrt(3)) : 0;
  const u = new Float64Array(points.count);
  for (let i = 0; i < points.count; i++) {
    const n = points.nOsc[i] as number;
    const sd = points.sdHz[i] as number;
    const scatter = n > 1 && Number.isFinite(sd) ? (sd * sd) / n : 0;
    u[i] = Math.sqrt(scatter + q * q);
  }
  return u;
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
