/**
 * The Kvco figures over the tuning window: local Kvco at every point, min and
 * max (a wrong-sign figure counts only beyond 2σ), typ at the nominal point,
 * the best straight line and the widest linear range.
 */
import { belowFloor } from './format-figure.ts';
import { listVolts } from './list-volts.ts';
import type { Edges } from './sweep-edges.ts';
import { bestLine, fitKvco, widestLinearRange } from './sweep-gain.ts';
import { localKvcoEntries } from './sweep-local-kvco.ts';
import type { PointSet } from './sweep-points.ts';
import type { SweepAnalysisOf, SweepColumnAnalysis } from './sweep-types.ts';
import type { FittedCurve } from './sweep-fit.ts';

type Kvco = SweepColumnAnalysis['kvco'];

export interface KvcoSummaryInput {
  points: PointSet;
  edges: Edges;
  u: Float64Array;
  fitted: FittedCurve;
  window: SweepAnalysisOf<unknown, unknown>['window'];
  /** Window point indices [w0, w1). */
  w0: number;
  w1: number;
  nominalV?: number;
  linearityLimitPct: number;
}

/** Everything of `kvco` but the range-end keys (turnsBackAboveV, flatAboveV, saturation). */
export function kvcoSummary(
  input: KvcoSummaryInput,
  warnings: string[],
): Omit<Kvco, 'turnsBackAboveV' | 'flatAboveV' | 'saturation'> {
  const { points, edges, u, fitted, window } = input;
  const { model, json: fitJson, kf0, kf1, rmsU } = fitted;
  const { local, misfits } = localKvcoEntries(points, edges, model, u, kf0, kf1);
  if (misfits > 0) {
    warnings.push(
      `the ${fitJson.model} fit misses the local slope at ${misfits} point(s) (residual SD ${fitJson.residualStdDevHz.toPrecision(3)} Hz vs ` +
        `measurement ${rmsU.toPrecision(3)} Hz); Kvco there comes from the smoothed finite differences`,
    );
  }
  // A figure of the wrong sign counts only when it is beyond 2σ (the measured
  // curve really falls); otherwise it is noise on a flat part.
  const sense = fitted.rising ? 1 : -1;
  let kMin = Infinity;
  let kMax = -Infinity;
  let kMinU = NaN;
  let kMaxU = NaN;
  let kMinV = NaN;
  let kMaxV = NaN;
  const wrongWay: number[] = [];
  for (let n = 0; n < local.count; n++) {
    const v = local.v[n] as number;
    let hzPerV = local.hzPerV[n] as number;
    const uk = local.uncertaintyHzPerV[n] as number;
    if (v < window.fromV - 1e-9 || v > window.toV + 1e-9 || !Number.isFinite(hzPerV)) continue;
    if (sense * hzPerV < 0) {
      if (sense * hzPerV < -2 * uk) wrongWay.push(v);
      else {
        hzPerV = 0; // flat within its uncertainty: not a sign change
        local.hzPerV[n] = 0;
        local.flatWithinUncertainty[n] = 1;
      }
    }
    if (hzPerV < kMin) {
      kMin = hzPerV;
      kMinU = uk;
      kMinV = v;
    }
    if (hzPerV > kMax) {
      kMax = hzPerV;
      kMaxU = uk;
      kMaxV = v;
    }
  }
  if (wrongWay.length > 0) {
    warnings.push(
      `the measured curve falls back beyond its uncertainty at ${listVolts(wrongWay)} V inside the window: Kvco changes sign there`,
    );
  }
  const { fromV, toV } = fitJson;
  const nominalV = input.nominalV ?? (window.fromV + window.toV) / 2;
  if (nominalV < fromV || nominalV > toV)
    warnings.push(`nominal point ${nominalV} V lies outside the fitted range ${fromV}–${toV} V`);
  const nominal = fitKvco(model, Math.min(Math.max(nominalV, fromV), toV));
  const linear = bestLine(points.v, points.meanHz, input.w0, input.w1, rmsU);
  if (belowFloor(linear.maxLinearityErrorPct, 100, 1e-12)) linear.maxLinearityErrorPct = 0;
  return {
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
    signChangeAtV: wrongWay,
    nominal: { v: nominalV, hzPerV: nominal.hzPerV, uncertaintyHzPerV: nominal.sd },
    widestLinearRange: widestLinearRange(
      model,
      Math.max(window.fromV, fromV),
      Math.min(window.toV, toV),
      input.linearityLimitPct,
    ),
  };
}
