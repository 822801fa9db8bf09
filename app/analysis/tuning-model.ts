/**
 * The fitted tuning curve behind one interface, whichever model made it:
 * value, analytic slope (Kvco) and their SDs from the fit's covariance.
 */
import { derivativeStdDev, evalPoly, evalPolyDerivative, type PolyFit } from './poly-fit.ts';
import { splineSlope, splineSlopeSd, splineValue, splineValueSd, type SplineFit } from './spline-fit.ts';

export interface TuningModel {
  kind: 'spline' | 'poly';
  fromV: number;
  toV: number;
  value(v: number): number;
  slope(v: number): number;
  valueSd(v: number): number;
  slopeSd(v: number): number;
}

export function splineModel(fit: SplineFit): TuningModel {
  return {
    kind: 'spline',
    fromV: fit.fromV,
    toV: fit.toV,
    value: (v) => splineValue(fit, v),
    slope: (v) => splineSlope(fit, v),
    valueSd: (v) => splineValueSd(fit, v),
    slopeSd: (v) => splineSlopeSd(fit, v),
  };
}

/** A polynomial; SDs scale with sigmaHz (the larger of residual SD and point uncertainty). */
export function polyModel(fit: PolyFit, fromV: number, toV: number, sigmaHz: number): TuningModel {
  return {
    kind: 'poly',
    fromV,
    toV,
    value: (v) => evalPoly(fit, v),
    slope: (v) => evalPolyDerivative(fit, v),
    valueSd: (v) => {
      // √(xᵀ C x) in scaled u with the unscaled covariance × σ².
      const u = (v - fit.centre) / fit.scale;
      const p = fit.degree + 1;
      const x = new Float64Array(p);
      let pow = 1;
      for (let i = 0; i < p; i++) {
        x[i] = pow;
        pow *= u;
      }
      let s = 0;
      for (let i = 0; i < p; i++)
        for (let j = 0; j < p; j++)
          s += (x[i] as number) * (x[j] as number) * (fit.scaledUnscaledCovariance[i * p + j] as number);
      return sigmaHz * Math.sqrt(Math.max(s, 0));
    },
    slopeSd: (v) => derivativeStdDev(fit, v, sigmaHz),
  };
}
