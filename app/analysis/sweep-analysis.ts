/**
 * analyzeSweep: from raw readings to the CONTRACTS.md `analyze --json` sweep
 * object (plus extra keys). Deterministic; no I/O.
 */
import { AnalysisError } from './analysis-error.ts';
import { fitPolynomialAuto } from './poly-fit-auto.ts';
import { fitPolynomial, type PolyFit } from './poly-fit.ts';
import { belowFloor, formatFigure } from './format-figure.ts';
import { fitSpline } from './spline-fit.ts';
import { polyModel, splineModel, type TuningModel } from './tuning-model.ts';
import { findEdges, type Edges } from './sweep-edges.ts';
import { bestLine, fitKvco, widestLinearRange } from './sweep-gain.ts';
import { localKvcoEntries } from './sweep-local-kvco.ts';
import { compareDirections, type Hysteresis } from './sweep-hysteresis.ts';
import { groupPoints, pointSummaries, type Direction, type PointSet, type SweepInput } from './sweep-points.ts';
import type { SweepAnalysis } from './sweep-types.ts';

export interface SweepOptions {
  /** 'spline' (default: penalised regression spline, GCV), polynomial degree 1–6, or 'auto' (polynomial, AICc). */
  fit?: 'spline' | 'auto' | number;
  /** Points the model is fitted to: the usable range (default; the window when one is given), all oscillating points, or A–B volts. */
  fitRange?: 'usable' | 'all' | { fromV: number; toV: number };
  /** Tuning window the PLL can drive: Kvco min/max/typ and linearity are taken over it. */
  window?: { fromV: number; toV: number; source: 'plan' | 'flag' };
  /** Keep points that never settled in the fit (default: left out, with a warning). */
  keepUnsettled?: boolean;
  /** Linearity limit for the widest linear range, ± % of span. Default 5. */
  linearityLimitPct?: number;
  /** Control voltage of the nominal operating point; default mid usable range. */
  nominalV?: number;
  /** See EdgeOptions.unstableFactor. Default 5. */
  unstableFactor?: number;
  /** The usable range ends where the step slope stays below this fraction of its median (flat top). Default 0.1; 0 disables. */
  flatKvcoFraction?: number;
}

interface Curve {
  points: PointSet;
  edges: Edges;
}

function curveOf(input: SweepInput, direction: Direction, options: SweepOptions): Curve | null {
  const points = groupPoints(input, direction);
  if (points.count === 0) return null;
  return { points, edges: findEdges(points, { gateS: input.gateS, unstableFactor: options.unstableFactor }) };
}

/** Per-point frequency SD: reading scatter of the mean and ±1 count/gate (rectangular). */
function pointUncertainty(points: PointSet, gateS: number | undefined): Float64Array {
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

/**
 * Index of the extreme point where a tuning curve turns back, or null when it
 * is monotonic within noise. The curve's sense is taken from its two ends;
 * the turn counts only when the frequency past the extreme falls back by
 * more than 3σ of the two points' uncertainties.
 */
export function turningPoint(meanHz: Float64Array, u: Float64Array, i0: number, i1: number): number | null {
  if (i1 - i0 < 3) return null;
  const rising = (meanHz[i1 - 1] as number) >= (meanHz[i0] as number);
  let iExt = i0;
  for (let i = i0 + 1; i < i1; i++) {
    const f = meanHz[i] as number;
    if (rising ? f > (meanHz[iExt] as number) : f < (meanHz[iExt] as number)) iExt = i;
  }
  if (iExt >= i1 - 1) return null;
  let worstBack = 0;
  let iWorst = iExt;
  for (let i = iExt + 1; i < i1; i++) {
    const back = rising
      ? (meanHz[iExt] as number) - (meanHz[i] as number)
      : (meanHz[i] as number) - (meanHz[iExt] as number);
    if (back > worstBack) [worstBack, iWorst] = [back, i];
  }
  const noise = 3 * Math.hypot(u[iExt] as number, u[iWorst] as number);
  return worstBack > noise ? iExt : null;
}

/**
 * End (exclusive) of the usable range after trimming a flat top: trailing
 * steps whose slope, in the curve's sense, stays below `fraction` of the
 * median step slope by more than 3σ. A saturated tuning port gives Kvco ≈ 0
 * there, and a loop's gain vanishes with it. The 10 % default is tunebench's
 * own rule, not a published one.
 */
export function flatTopEnd(
  v: Float64Array,
  meanHz: Float64Array,
  u: Float64Array,
  i0: number,
  i1: number,
  fraction: number,
): number {
  const steps = i1 - i0 - 1;
  if (steps < 3 || !(fraction > 0)) return i1;
  const sense = (meanHz[i1 - 1] as number) >= (meanHz[i0] as number) ? 1 : -1;
  const slopes = new Float64Array(steps);
  for (let i = i0; i < i1 - 1; i++) {
    slopes[i - i0] =
      (sense * ((meanHz[i + 1] as number) - (meanHz[i] as number))) / ((v[i + 1] as number) - (v[i] as number));
  }
  const sorted = Float64Array.from(slopes).sort();
  const median = sorted[steps >> 1] as number;
  if (!(median > 0)) return i1;
  let end = i1;
  while (end - i0 > 2) {
    const a = end - 2;
    const dv = (v[a + 1] as number) - (v[a] as number);
    const slopeSd = Math.hypot(u[a] as number, u[a + 1] as number) / dv;
    if ((slopes[a - i0] as number) + 3 * slopeSd < fraction * median) end--;
    else break;
  }
  return end;
}

/** Indices [a, b) of the points with fromV ≤ v ≤ toV inside [lo, hi). */
function indexRange(v: Float64Array, lo: number, hi: number, fromV: number, toV: number): [number, number] {
  const tol = 1e-9 * Math.max(1, Math.abs(fromV), Math.abs(toV));
  let a = lo;
  while (a < hi && (v[a] as number) < fromV - tol) a++;
  let b = a;
  while (b < hi && (v[b] as number) <= toV + tol) b++;
  return [a, b];
}

interface FittedModel {
  model: TuningModel;
  json: SweepAnalysis['fit'];
}

function fitModel(
  points: PointSet,
  u: Float64Array,
  keep: number[],
  options: SweepOptions,
  monotone: 'rising' | 'falling' | null,
  warnings: string[],
  rmsU: number,
): FittedModel {
  const n = keep.length;
  const v = Float64Array.from(keep, (i) => points.v[i] as number);
  const f = Float64Array.from(keep, (i) => points.meanHz[i] as number);
  const uk = Float64Array.from(keep, (i) => u[i] as number);
  const fromV = v[0] as number;
  const toV = v[n - 1] as number;
  const spec = options.fit ?? 'spline';
  if (spec === 'spline' && n >= 6) {
    const fit = fitSpline(v, f, uk, 0, n, { monotone });
    return {
      model: splineModel(fit),
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
        curve: curveSamples(splineModel(fit), fromV, toV),
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

/**
 * Where a flat top begins: between the last usable point and the first flat
 * one, ± half that step. When the last usable step is itself already below half
 * the median step slope, the bend lies somewhere in it too, and the interval
 * starts one point lower (the edge is quoted with the interval it can be in).
 */
function saturationEdge(
  v: Float64Array,
  f: Float64Array,
  i0: number,
  i1: number,
): { edgeV: number; uncertaintyV: number } {
  const slopes: number[] = [];
  for (let i = i0; i < i1 - 1; i++)
    slopes.push(Math.abs(((f[i + 1] as number) - (f[i] as number)) / ((v[i + 1] as number) - (v[i] as number))));
  const sorted = [...slopes].sort((a, b) => a - b);
  const median = sorted[sorted.length >> 1] ?? 0;
  const last = slopes[slopes.length - 1] ?? Infinity;
  const lo = last < 0.5 * median && i1 - 2 >= i0 ? (v[i1 - 2] as number) : (v[i1 - 1] as number);
  const hi = v[i1] as number;
  return { edgeV: (lo + hi) / 2, uncertaintyV: (hi - lo) / 2 };
}

export function analyzeSweep(input: SweepInput, options: SweepOptions = {}): SweepAnalysis {
  if (input.controlV.length !== input.frequencyHz.length) {
    throw new AnalysisError('control_v and frequency_hz have different lengths');
  }
  const up = curveOf(input, 'up', options);
  const down = curveOf(input, 'down', options);
  const primary = up ?? down;
  if (!primary) throw new AnalysisError('no readings with a control voltage');
  const { points, edges } = primary;
  const warnings: string[] = [];
  if (edges.blockI1 === edges.blockI0) throw new AnalysisError('the oscillator stalled over the whole range', true);
  const i0 = edges.usableI0;
  const u = pointUncertainty(points, input.gateS);
  // A tuning curve that turns back (frequency falls again past its extreme)
  // is unusable beyond the turn: a PLL's loop gain changes sign there. The
  // usable range ends at the turning point when the fall-back exceeds 3σ.
  const turn = turningPoint(points.meanHz, u, i0, edges.blockI1);
  const afterTurn = turn === null ? edges.blockI1 : turn + 1;
  const flatFraction = options.flatKvcoFraction ?? 0.1;
  const i1 = flatTopEnd(points.v, points.meanHz, u, i0, afterTurn, flatFraction);
  let saturation: SweepAnalysis['kvco']['saturation'] = null;
  if (i1 < afterTurn) {
    saturation = saturationEdge(points.v, points.meanHz, i0, i1);
    const below = points.v[i1 - 1] as number;
    warnings.push(
      `the tuning curve flattens above ${formatFigure(below, 'V', { digits: 4 })} (Kvco below ${flatFraction * 100} % of its median; edge ${formatFigure(saturation.edgeV, 'V', { uncertainty: saturation.uncertaintyV })}); ` +
        'the usable range ends there',
    );
  }
  const n = i1 - i0;
  if (n < 2) throw new AnalysisError(`only ${n} oscillating point in the usable range; need at least 2`, true);
  if (turn !== null) {
    warnings.push(
      `the tuning curve turns back above ${points.v[turn] as number} V (frequency falls again toward ${points.v[edges.blockI1 - 1] as number} V); ` +
        'the usable range ends at the turn',
    );
  }
  const usableFromV = points.v[i0] as number;
  const usableToV = points.v[i1 - 1] as number;
  const measuredFromV = points.v[edges.blockI0] as number;
  const measuredToV = points.v[edges.blockI1 - 1] as number;

  // The tuning window: the plan's or the flag's, else the automatic usable range.
  let window: SweepAnalysis['window'];
  if (options.window) {
    const w = options.window;
    if (!(w.toV > w.fromV)) throw new AnalysisError(`window ${w.fromV}–${w.toV} V: fromV must be below toV`);
    const tol = 1e-9 * Math.max(1, Math.abs(measuredToV));
    if (w.fromV < measuredFromV - tol || w.toV > measuredToV + tol) {
      throw new AnalysisError(
        `window ${w.fromV}–${w.toV} V (${w.source}) reaches outside the measured oscillating range ${measuredFromV}–${measuredToV} V; choose a window inside it`,
      );
    }
    window = { fromV: w.fromV, toV: w.toV, source: w.source };
  } else {
    window = { fromV: usableFromV, toV: usableToV, source: 'auto' };
  }
  const [w0, w1] = indexRange(points.v, edges.blockI0, edges.blockI1, window.fromV, window.toV);
  if (w1 - w0 < 2)
    throw new AnalysisError(
      `window ${window.fromV}–${window.toV} V holds ${w1 - w0} measured point(s); need at least 2`,
    );
  if (window.source !== 'auto' && (window.fromV < usableFromV - 1e-9 || window.toV > usableToV + 1e-9)) {
    warnings.push(
      `the tuning window ${window.fromV}–${window.toV} V reaches beyond the usable range ${usableFromV}–${usableToV} V`,
    );
  }

  // The fit range: the user's choice, else the window when one was given, else the usable range.
  const range = options.fitRange ?? (options.window ? { fromV: window.fromV, toV: window.toV } : 'usable');
  let f0: number;
  let f1: number;
  if (range === 'usable') [f0, f1] = [i0, i1];
  else if (range === 'all') [f0, f1] = [edges.blockI0, edges.blockI1];
  else [f0, f1] = indexRange(points.v, edges.blockI0, edges.blockI1, range.fromV, range.toV);
  const keep: number[] = [];
  const leftOut: number[] = [];
  for (let i = f0; i < f1; i++) {
    if (!((points.nOsc[i] as number) > 0)) continue;
    if (points.unsettled[i] === 1 && !options.keepUnsettled) leftOut.push(points.v[i] as number);
    else keep.push(i);
  }
  if (leftOut.length > 0) {
    warnings.push(
      `${leftOut.length} point(s) never settled and are left out of the fit (at ${leftOut.join(', ')} V); --keep-unsettled keeps them`,
    );
  }
  if (keep.length < 2) throw new AnalysisError(`the fit range holds ${keep.length} usable point(s); need at least 2`);
  let rmsU = 0;
  for (const i of keep) rmsU += (u[i] as number) * (u[i] as number);
  rmsU = Math.sqrt(rmsU / keep.length);
  // Monotone where the data allow it: the curve never falls back beyond 3σ within the fit range.
  const kf0 = keep[0] as number;
  const kf1 = (keep[keep.length - 1] as number) + 1;
  const falls = turningPoint(points.meanHz, u, kf0, kf1) !== null;
  const rising = (points.meanHz[kf1 - 1] as number) >= (points.meanHz[kf0] as number);
  const monotone = falls ? null : rising ? 'rising' : 'falling';
  const { model, json: fitJson } = fitModel(points, u, keep, options, monotone, warnings, rmsU);
  fitJson.unsettledLeftOutV = leftOut;
  // Rounding noise of an exact fit is not a residual: below 1e-12 of the frequency it is 0.
  const fScale = Math.max(Math.abs(points.meanHz[kf0] as number), Math.abs(points.meanHz[kf1 - 1] as number));
  if (belowFloor(fitJson.residualStdDevHz, fScale, 1e-12)) fitJson.residualStdDevHz = 0;
  if (Number.isFinite(fitJson.residualStdDevHz) && fitJson.residualStdDevHz > 1.5 * rmsU) {
    warnings.push(
      `the ${fitJson.model} fit leaves residual SD ${fitJson.residualStdDevHz.toPrecision(3)} Hz against ${rmsU.toPrecision(3)} Hz point scatter: ` +
        'the curve has structure the model does not follow',
    );
  }
  const fromV = fitJson.fromV;
  const toV = fitJson.toV;

  const { local, misfits } = localKvcoEntries(points, edges, model, u, kf0, kf1);
  if (misfits > 0) {
    warnings.push(
      `the ${fitJson.model} fit misses the local slope at ${misfits} point(s) (residual SD ${fitJson.residualStdDevHz.toPrecision(3)} Hz vs ` +
        `measurement ${rmsU.toPrecision(3)} Hz); Kvco there comes from the smoothed finite differences`,
    );
  }
  // Kvco figures over the window. A figure of the wrong sign counts only when it is
  // beyond 2σ (the measured curve really falls); otherwise it is noise on a flat part.
  const sense = rising ? 1 : -1;
  let kMin = Infinity;
  let kMax = -Infinity;
  let kMinU = NaN;
  let kMaxU = NaN;
  let kMinV = NaN;
  let kMaxV = NaN;
  const wrongWay: number[] = [];
  for (const e of local) {
    if (e.v < window.fromV - 1e-9 || e.v > window.toV + 1e-9 || !Number.isFinite(e.hzPerV)) continue;
    if (sense * e.hzPerV < 0) {
      if (sense * e.hzPerV < -2 * e.uncertaintyHzPerV) wrongWay.push(e.v);
      else {
        e.hzPerV = 0; // flat within its uncertainty: not a sign change
        e.flatWithinUncertainty = true;
      }
    }
    if (e.hzPerV < kMin) [kMin, kMinU, kMinV] = [e.hzPerV, e.uncertaintyHzPerV, e.v];
    if (e.hzPerV > kMax) [kMax, kMaxU, kMaxV] = [e.hzPerV, e.uncertaintyHzPerV, e.v];
  }
  if (wrongWay.length > 0) {
    warnings.push(
      `the measured curve falls back beyond its uncertainty at ${wrongWay.join(', ')} V inside the window: Kvco changes sign there`,
    );
  }
  const nominalV = options.nominalV ?? (window.fromV + window.toV) / 2;
  if (nominalV < fromV || nominalV > toV)
    warnings.push(`nominal point ${nominalV} V lies outside the fitted range ${fromV}–${toV} V`);
  const nominal = fitKvco(model, Math.min(Math.max(nominalV, fromV), toV));

  let iMin = i0;
  let iMax = i0;
  for (let i = i0; i < i1; i++) {
    if ((points.meanHz[i] as number) < (points.meanHz[iMin] as number)) iMin = i;
    if ((points.meanHz[i] as number) > (points.meanHz[iMax] as number)) iMax = i;
  }
  const linear = bestLine(points.v, points.meanHz, w0, w1, rmsU);
  if (belowFloor(linear.maxLinearityErrorPct, 100, 1e-12)) linear.maxLinearityErrorPct = 0;
  const limitPct = options.linearityLimitPct ?? 5;
  const other = primary === up ? down : null;
  const hysteresis: Hysteresis | null = other
    ? compareDirections(primary.points, primary.edges, other.points, other.edges)
    : null;
  if (edges.upperStallV !== null) warnings.push(`oscillation stops again above ${edges.upperStallV} V`);

  return {
    kind: 'sweep',
    primaryDirection: points.direction,
    tuningRange: {
      fMinHz: points.meanHz[iMin] as number,
      fMaxHz: points.meanHz[iMax] as number,
      vAtFMin: points.v[iMin] as number,
      vAtFMax: points.v[iMax] as number,
      fMinUncertaintyHz: u[iMin] as number,
      fMaxUncertaintyHz: u[iMax] as number,
    },
    stall: {
      stalled: edges.stalled,
      thresholdV: edges.thresholdV,
      unstableBelowV: edges.unstableBelowV,
      thresholdUncertaintyV: edges.thresholdUncertaintyV,
      unstableBelowUncertaintyV: edges.unstableBelowUncertaintyV,
      upperStallV: edges.upperStallV,
      medianRelativeScatter: Number.isFinite(edges.medianRelativeScatter) ? edges.medianRelativeScatter : null,
    },
    kvco: {
      linear,
      local,
      minHzPerV: kMin,
      maxHzPerV: kMax,
      minUncertaintyHzPerV: kMinU,
      maxUncertaintyHzPerV: kMaxU,
      vAtMin: kMinV,
      vAtMax: kMaxV,
      typHzPerV: nominal.hzPerV,
      typUncertaintyHzPerV: nominal.sd,
      // Ratio of magnitudes, so a falling (negative-gain) curve reads the same; NaN if the sign changes.
      maxToMinRatio:
        kMin * kMax > 0 ? Math.max(Math.abs(kMin), Math.abs(kMax)) / Math.min(Math.abs(kMin), Math.abs(kMax)) : NaN,
      turnsBackAboveV: turn === null ? null : (points.v[turn] as number),
      flatAboveV: i1 < afterTurn ? (points.v[i1 - 1] as number) : null,
      saturation,
      signChangeAtV: wrongWay,
      nominal: { v: nominalV, hzPerV: nominal.hzPerV, uncertaintyHzPerV: nominal.sd },
      widestLinearRange: widestLinearRange(model, Math.max(window.fromV, fromV), Math.min(window.toV, toV), limitPct),
    },
    fit: fitJson,
    window,
    usableRange: { fromV: usableFromV, toV: usableToV },
    points: pointsJson(points, edges, model),
    hysteresis,
    counter: { gateS: input.gateS ?? null, resolutionHz: input.gateS ? 1 / input.gateS : null },
    warnings,
  };
}

function pointsJson(points: PointSet, edges: Edges, model: TuningModel): SweepAnalysis['points'] {
  const tol = 1e-9 * Math.max(1, Math.abs(model.toV));
  return pointSummaries(points).map((row, i) => {
    const inFit = row.v >= model.fromV - tol && row.v <= model.toV + tol;
    // The flags go onto each row in place: a million-point sweep makes no second copy of its rows.
    return Object.assign(row, {
      unstable: edges.unstable[i] === 1,
      unsettled: points.unsettled[i] === 1,
      fitHz: inFit ? model.value(row.v) : null,
    });
  });
}
