/**
 * Fitting the tuning-curve model over the fit range: which points go in (never
 * settled ones only on request), the monotone constraint where the data allow
 * it, the spline or polynomial itself, and the fit's JSON (with the curve
 * plots draw).
 */
import { AnalysisError } from './analysis-error.ts';
import { belowFloor } from './format-figure.ts';
import { listVolts } from './list-volts.ts';
import { rmsUncertainty } from './point-uncertainty.ts';
import { fitPolynomialAuto } from './poly-fit-auto.ts';
import { fitPolynomial, type PolyFit } from './poly-fit.ts';
import { fitSpline } from './spline-fit.ts';
import { turningPoint } from './sweep-usable-range.ts';
import type { PointSet } from './sweep-points.ts';
import type { SweepAnalysis } from './sweep-types.ts';
import { polyModel, splineModel, type TuningModel } from './tuning-model.ts';

/** 'spline' (default), a polynomial degree 1–6, or 'auto' (polynomial, AICc). */
export type FitSpec = 'spline' | 'auto' | number;

export interface FittedCurve {
  model: TuningModel;
  json: SweepAnalysis['fit'];
  /** First and one-past-last point index the fit spans. */
  kf0: number;
  kf1: number;
  /** RMS uncertainty of the fitted points (pooled scatter). */
  rmsU: number;
  /** The curve's sense over the fit range. */
  rising: boolean;
}

/** Oscillating points of [f0, f1) the fit keeps (indices, ascending), and the voltages of never-settled ones it leaves out. */
function fitPoints(
  points: PointSet,
  f0: number,
  f1: number,
  keepUnsettled: boolean,
): { keep: Uint32Array; leftOut: number[] } {
  const keep = new Uint32Array(Math.max(f1 - f0, 0));
  const leftOut: number[] = [];
  let n = 0;
  for (let i = f0; i < f1; i++) {
    if (!((points.nOsc[i] as number) > 0)) continue;
    if (points.unsettled[i] === 1 && !keepUnsettled) leftOut.push(points.v[i] as number);
    else keep[n++] = i;
  }
  return { keep: keep.subarray(0, n), leftOut };
}

/** Column `values` at the kept indices: a view when they are one unbroken run (the usual case), else a copy. */
function gather(values: Float64Array, keep: Uint32Array): Float64Array {
  const n = keep.length;
  const first = keep[0] as number;
  if ((keep[n - 1] as number) - first === n - 1) return values.subarray(first, first + n);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = values[keep[k] as number] as number;
  return out;
}

export function fitTuningCurve(
  points: PointSet,
  u: Float64Array,
  f0: number,
  f1: number,
  options: { fit?: FitSpec; keepUnsettled?: boolean },
  warnings: string[],
): FittedCurve {
  const { keep, leftOut } = fitPoints(points, f0, f1, options.keepUnsettled ?? false);
  if (leftOut.length > 0) {
    warnings.push(
      `${leftOut.length} point(s) never settled and are left out of the fit (at ${listVolts(leftOut)} V); --keep-unsettled keeps them`,
    );
  }
  if (keep.length < 2) throw new AnalysisError(`the fit range holds ${keep.length} usable point(s); need at least 2`);
  const rmsU = rmsUncertainty(u, keep);
  // Monotone where the data allow it: the curve never falls back beyond 3σ within the fit range.
  const kf0 = keep[0] as number;
  const kf1 = (keep[keep.length - 1] as number) + 1;
  const falls = turningPoint(points.meanHz, u, kf0, kf1) !== null;
  const rising = (points.meanHz[kf1 - 1] as number) >= (points.meanHz[kf0] as number);
  const monotone = falls ? null : rising ? 'rising' : 'falling';
  const { model, json } = fitModel(points, u, keep, options.fit ?? 'spline', monotone, warnings, rmsU);
  json.unsettledLeftOutV = leftOut;
  // Rounding noise of an exact fit is not a residual: below 1e-12 of the frequency it is 0.
  const fScale = Math.max(Math.abs(points.meanHz[kf0] as number), Math.abs(points.meanHz[kf1 - 1] as number));
  if (belowFloor(json.residualStdDevHz, fScale, 1e-12)) json.residualStdDevHz = 0;
  if (Number.isFinite(json.residualStdDevHz) && json.residualStdDevHz > 1.5 * rmsU) {
    warnings.push(
      `the ${json.model} fit leaves residual SD ${json.residualStdDevHz.toPrecision(3)} Hz against ${rmsU.toPrecision(3)} Hz point scatter: ` +
        'the curve has structure the model does not follow',
    );
  }
  return { model, json, kf0, kf1, rmsU, rising };
}

function fitModel(
  points: PointSet,
  u: Float64Array,
  keep: Uint32Array,
  spec: FitSpec,
  monotone: 'rising' | 'falling' | null,
  warnings: string[],
  rmsU: number,
): { model: TuningModel; json: SweepAnalysis['fit'] } {
  const n = keep.length;
  const v = gather(points.v, keep);
  const f = gather(points.meanHz, keep);
  const uk = gather(u, keep);
  const fromV = v[0] as number;
  const toV = v[n - 1] as number;
  if (spec === 'spline' && n >= 6) {
    const fit = fitSpline(v, f, uk, 0, n, { monotone });
    const model = splineModel(fit);
    return {
      model,
      json: {
        model: 'spline',
        degree: 3,
        coefficients: [],
        coefficientStdDev: [],
        selection:
          'penalised cubic regression spline (P-spline), weights 1/u², smoothing by generalised cross-validation' +
          (monotone ? `, constrained ${monotone === 'rising' ? 'non-decreasing' : 'non-increasing'}` : ''),
        residualStdDevHz: fit.residualStdDev,
        pointScatterHz: rmsU,
        effectiveDegreesOfFreedom: fit.edf,
        smoothing: fit.lambda,
        monotone: fit.monotone,
        r2: fit.rSquared,
        fromV,
        toV,
        points: n,
        unsettledLeftOutV: [],
        curve: curveSamples(model, fromV, toV),
      },
    };
  }
  if (spec === 'spline')
    warnings.push(`only ${n} points to fit: a spline needs 6, so the tuning curve is a polynomial (AICc)`);
  let fit: PolyFit;
  let selection: string;
  if (spec === 'spline' || spec === 'auto') {
    fit = fitPolynomialAuto(v, f, 0, n, 6).fit;
    selection = 'auto: corrected Akaike information criterion (AICc) over degrees 1–6';
  } else {
    if (!Number.isInteger(spec) || spec < 1 || spec > 6)
      throw new AnalysisError(`fit degree must be 1–6 (got ${spec})`);
    const degree = Math.min(spec, n - 1);
    if (degree < spec) warnings.push(`fit degree lowered from ${spec} to ${degree}: only ${n} points to fit`);
    fit = fitPolynomial(v, f, 0, n, degree);
    selection = 'user';
  }
  const sigma = Math.max(Number.isFinite(fit.residualStdDev) ? fit.residualStdDev : 0, rmsU);
  const model = polyModel(fit, fromV, toV, sigma);
  return {
    model,
    json: {
      model: 'poly',
      degree: fit.degree,
      coefficients: fit.coefficients,
      coefficientStdDev: fit.coefficientStdDev,
      selection,
      residualStdDevHz: fit.residualStdDev,
      pointScatterHz: rmsU,
      effectiveDegreesOfFreedom: fit.degree + 1,
      smoothing: null,
      monotone: null,
      r2: fit.rSquared,
      fromV,
      toV,
      points: n,
      unsettledLeftOutV: [],
      curve: curveSamples(model, fromV, toV),
    },
  };
}

const CURVE_SAMPLES = 129;

/** The fitted curve and its 1σ band on an even grid: what plots draw (any model). */
function curveSamples(model: TuningModel, fromV: number, toV: number): SweepAnalysis['fit']['curve'] {
  const v: number[] = [];
  const hz: number[] = [];
  const sdHz: number[] = [];
  for (let i = 0; i < CURVE_SAMPLES; i++) {
    const x = i === CURVE_SAMPLES - 1 ? toV : fromV + ((toV - fromV) * i) / (CURVE_SAMPLES - 1);
    v.push(x);
    hz.push(model.value(x));
    sdHz.push(model.valueSd(x));
  }
  return { v, hz, sdHz };
}
