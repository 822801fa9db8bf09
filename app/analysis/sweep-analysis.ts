/**
 * analyzeSweep: from raw readings to the CONTRACTS.md `analyze --json` sweep
 * object (plus extra keys). Deterministic; no I/O.
 */
import { AnalysisError } from './analysis-error.ts';
import { fitPolynomialAuto } from './poly-fit-auto.ts';
import { fitPolynomial, type PolyFit } from './poly-fit.ts';
import { findEdges, type Edges } from './sweep-edges.ts';
import { bestLine, fitKvco, widestLinearRange, type LocalKvco } from './sweep-gain.ts';
import { localKvcoEntries } from './sweep-local-kvco.ts';
import { compareDirections, type Hysteresis } from './sweep-hysteresis.ts';
import { groupPoints, pointSummaries, type Direction, type PointSet, type SweepInput } from './sweep-points.ts';
import type { SweepAnalysis } from './sweep-types.ts';

export interface SweepOptions {
  /** Polynomial degree 1–6, or 'auto' (AICc). Default 'auto'. */
  fit?: 'auto' | number;
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
    const back = rising ? (meanHz[iExt] as number) - (meanHz[i] as number) : (meanHz[i] as number) - (meanHz[iExt] as number);
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
export function flatTopEnd(v: Float64Array, meanHz: Float64Array, u: Float64Array, i0: number, i1: number, fraction: number): number {
  const steps = i1 - i0 - 1;
  if (steps < 3 || !(fraction > 0)) return i1;
  const sense = (meanHz[i1 - 1] as number) >= (meanHz[i0] as number) ? 1 : -1;
  const slopes = new Float64Array(steps);
  for (let i = i0; i < i1 - 1; i++) {
    slopes[i - i0] = (sense * ((meanHz[i + 1] as number) - (meanHz[i] as number))) / ((v[i + 1] as number) - (v[i] as number));
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
  if (i1 < afterTurn) {
    warnings.push(
      `the tuning curve flattens above ${points.v[i1 - 1] as number} V (Kvco below ${flatFraction * 100} % of its median); ` +
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
  let rmsU = 0;
  for (let i = i0; i < i1; i++) rmsU += (u[i] as number) * (u[i] as number);
  rmsU = Math.sqrt(rmsU / n);

  let fit: PolyFit;
  let selection: string;
  if (options.fit === undefined || options.fit === 'auto') {
    const auto = fitPolynomialAuto(points.v, points.meanHz, i0, i1, 6);
    fit = auto.fit;
    selection = 'auto: corrected Akaike information criterion (AICc) over degrees 1–6';
  } else {
    const wanted = options.fit;
    if (!Number.isInteger(wanted) || wanted < 1 || wanted > 6) throw new AnalysisError(`fit degree must be 1–6 (got ${wanted})`);
    const degree = Math.min(wanted, n - 1);
    if (degree < wanted) warnings.push(`fit degree lowered from ${wanted} to ${degree}: only ${n} usable points`);
    fit = fitPolynomial(points.v, points.meanHz, i0, i1, degree);
    selection = 'user';
  }
  const sigma = Math.max(Number.isFinite(fit.residualStdDev) ? fit.residualStdDev : 0, rmsU);
  const fromV = points.v[i0] as number;
  const toV = points.v[i1 - 1] as number;

  const { local, misfits } = localKvcoEntries(points, edges, fit, u, sigma, i0, i1);
  if (misfits > 0) {
    warnings.push(
      `the degree-${fit.degree} fit misses the local slope at ${misfits} point(s) (residual SD ${fit.residualStdDev.toPrecision(3)} Hz vs ` +
        `measurement ${rmsU.toPrecision(3)} Hz); Kvco there comes from the smoothed finite differences`,
    );
  }
  let kMin = Infinity;
  let kMax = -Infinity;
  let kMinU = NaN;
  let kMaxU = NaN;
  let kMinV = NaN;
  let kMaxV = NaN;
  for (let j = 0; j < local.length; j++) {
    const e = local[j] as LocalKvco;
    // min/max over the usable range only (fit-backed or fit-checked entries).
    if (e.v < fromV || e.v > toV || !Number.isFinite(e.hzPerV)) continue;
    if (e.hzPerV < kMin) [kMin, kMinU, kMinV] = [e.hzPerV, e.uncertaintyHzPerV, e.v];
    if (e.hzPerV > kMax) [kMax, kMaxU, kMaxV] = [e.hzPerV, e.uncertaintyHzPerV, e.v];
  }
  const nominalV = options.nominalV ?? (fromV + toV) / 2;
  if (nominalV < fromV || nominalV > toV) warnings.push(`nominal point ${nominalV} V lies outside the usable range`);
  const nominal = fitKvco(fit, nominalV, sigma);

  let iMin = i0;
  let iMax = i0;
  for (let i = i0; i < i1; i++) {
    if ((points.meanHz[i] as number) < (points.meanHz[iMin] as number)) iMin = i;
    if ((points.meanHz[i] as number) > (points.meanHz[iMax] as number)) iMax = i;
  }
  const linear = bestLine(points.v, points.meanHz, i0, i1, rmsU);
  const limitPct = options.linearityLimitPct ?? 5;
  const other = primary === up ? down : null;
  const hysteresis: Hysteresis | null = other ? compareDirections(primary.points, primary.edges, other.points, other.edges) : null;
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
      // Ratio of magnitudes, so a falling (negative-gain) curve reads the same; NaN if the sign changes.
      maxToMinRatio: kMin * kMax > 0 ? Math.max(Math.abs(kMin), Math.abs(kMax)) / Math.min(Math.abs(kMin), Math.abs(kMax)) : NaN,
      turnsBackAboveV: turn === null ? null : (points.v[turn] as number),
      flatAboveV: i1 < afterTurn ? (points.v[i1 - 1] as number) : null,
      nominal: { v: nominalV, hzPerV: nominal.hzPerV, uncertaintyHzPerV: nominal.sd },
      widestLinearRange: widestLinearRange(fit, fromV, toV, limitPct),
    },
    fit: {
      model: 'poly',
      degree: fit.degree,
      coefficients: fit.coefficients,
      coefficientStdDev: fit.coefficientStdDev,
      selection,
      residualStdDevHz: fit.residualStdDev,
      r2: fit.rSquared,
      fromV,
      toV,
      points: n,
    },
    points: pointsJson(points, edges),
    hysteresis,
    counter: { gateS: input.gateS ?? null, resolutionHz: input.gateS ? 1 / input.gateS : null },
    warnings,
  };
}

function pointsJson(points: PointSet, edges: Edges): SweepAnalysis['points'] {
  // The flag goes onto each row in place: a million-point sweep makes no second copy of its rows.
  return pointSummaries(points).map((row, i) => Object.assign(row, { unstable: edges.unstable[i] === 1 }));
}
