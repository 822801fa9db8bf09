/**
 * analyzeSweep: from raw readings to the CONTRACTS.md `analyze --json` sweep
 * object (plus extra keys). Deterministic; no I/O. Each step is its own
 * module: edges (sweep-edges.ts), usable range (sweep-usable-range.ts),
 * window and fit range (sweep-window.ts), the model (sweep-fit.ts) and the
 * Kvco figures (sweep-kvco-summary.ts); this file puts them together.
 */
import { AnalysisError } from './analysis-error.ts';
import { pointUncertainty } from './point-uncertainty.ts';
import { findEdges, type Edges } from './sweep-edges.ts';
import { fitTuningCurve, type FitSpec } from './sweep-fit.ts';
import { compareDirections, type Hysteresis } from './sweep-hysteresis.ts';
import { kvcoSummary } from './sweep-kvco-summary.ts';
import { groupPoints, type Direction, type PointSet, type SweepInput } from './sweep-points.ts';
import { SweepPointColumns } from './sweep-columns.ts';
import type { SweepAnalysis, SweepAnalysisOf, SweepColumnAnalysis } from './sweep-types.ts';
import { usableRange, type UsableRange } from './sweep-usable-range.ts';
import { formatFigure } from './format-figure.ts';
import { fitRangeIndices, tuningWindow, type FitRangeRequest, type WindowRequest } from './sweep-window.ts';
import type { TuningModel } from './tuning-model.ts';
import { releaseScratchColumns } from './scratch-columns.ts';

export interface SweepOptions {
  /** 'spline' (default: penalised regression spline, GCV), polynomial degree 1–6, or 'auto' (polynomial, AICc). */
  fit?: FitSpec;
  /** Points the model is fitted to: the usable range (default; the window when one is given), all oscillating points, or A–B volts. */
  fitRange?: FitRangeRequest;
  /** Tuning window the PLL can drive: Kvco min/max/typ and linearity are taken over it. */
  window?: WindowRequest;
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
  /** Stall-edge zone: points where the chord slope changes by more than this fraction per step are left out of the usable range. Default 0.1; 0 disables. */
  edgeSlopeChange?: number;
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

/** Lowest and highest mean frequency over the usable range [i0, i1). */
function tuningRange(points: PointSet, u: Float64Array, i0: number, i1: number): SweepColumnAnalysis['tuningRange'] {
  let iMin = i0;
  let iMax = i0;
  for (let i = i0; i < i1; i++) {
    if ((points.meanHz[i] as number) < (points.meanHz[iMin] as number)) iMin = i;
    if ((points.meanHz[i] as number) > (points.meanHz[iMax] as number)) iMax = i;
  }
  return {
    fMinHz: points.meanHz[iMin] as number,
    fMaxHz: points.meanHz[iMax] as number,
    vAtFMin: points.v[iMin] as number,
    vAtFMax: points.v[iMax] as number,
    fMinUncertaintyHz: u[iMin] as number,
    fMaxUncertaintyHz: u[iMax] as number,
  };
}

/** The analysis with `points` and `kvco.local` as rows of objects (the app's and the tests' shape). */
export function analyzeSweep(input: SweepInput, options: SweepOptions = {}): SweepAnalysis {
  return sweepAnalysisRows(analyzeSweepColumns(input, options));
}

/** `points` and `kvco.local` of a column analysis as rows of objects; every other key as it is. */
export function sweepAnalysisRows<A extends SweepColumnAnalysis>(
  a: A,
): Omit<A, 'points' | 'kvco'> & SweepAnalysisOf<SweepAnalysis['points'], SweepAnalysis['kvco']['local']> {
  return { ...a, kvco: { ...a.kvco, local: a.kvco.local.rows() }, points: a.points.rows() };
}

/** The analysis with `points` and `kvco.local` as columns (sweep-columns.ts): no object per point. */
export function analyzeSweepColumns(input: SweepInput, options: SweepOptions = {}): SweepColumnAnalysis {
  try {
    return sweepColumns(input, options);
  } finally {
    releaseScratchColumns(); // a big sweep's working columns go with it
  }
}

function sweepColumns(input: SweepInput, options: SweepOptions): SweepColumnAnalysis {
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
  const u = pointUncertainty(points, input.gateS);
  const usable = usableRange(points, edges, u, options.flatKvcoFraction ?? 0.1, options.edgeSlopeChange, warnings);
  const { i0, i1 } = usable;
  const usableV = { fromV: points.v[i0] as number, toV: points.v[i1 - 1] as number };
  const zone = edgeZoneJson(points, edges, usable);
  const { window, w0, w1 } = tuningWindow(points, edges, usableV, options.window, warnings);
  const [f0, f1] = fitRangeIndices(points, edges, usable, options.fitRange, window);
  const fitted = fitTuningCurve(points, u, f0, f1, options, warnings);
  const kvco = kvcoSummary(
    {
      points,
      edges,
      u,
      fitted,
      window,
      w0,
      w1,
      nominalV: options.nominalV,
      linearityLimitPct: options.linearityLimitPct ?? 5,
    },
    warnings,
  );
  const other = primary === up ? down : null;
  const hysteresis: Hysteresis | null = other
    ? compareDirections(primary.points, primary.edges, other.points, other.edges)
    : null;
  if (edges.upperStallV !== null) warnings.push(`oscillation stops again above ${edges.upperStallV} V`);

  return {
    kind: 'sweep',
    primaryDirection: points.direction,
    tuningRange: tuningRange(points, u, i0, i1),
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
      linear: kvco.linear,
      local: kvco.local,
      minHzPerV: kvco.minHzPerV,
      maxHzPerV: kvco.maxHzPerV,
      minUncertaintyHzPerV: kvco.minUncertaintyHzPerV,
      maxUncertaintyHzPerV: kvco.maxUncertaintyHzPerV,
      vAtMin: kvco.vAtMin,
      vAtMax: kvco.vAtMax,
      typHzPerV: kvco.typHzPerV,
      typUncertaintyHzPerV: kvco.typUncertaintyHzPerV,
      maxToMinRatio: kvco.maxToMinRatio,
      turnsBackAboveV: usable.turn === null ? null : (points.v[usable.turn] as number),
      flatAboveV: i1 < usable.afterTurn ? (points.v[i1 - 1] as number) : null,
      saturation: usable.saturation,
      signChangeAtV: kvco.signChangeAtV,
      nominal: kvco.nominal,
      widestLinearRange: kvco.widestLinearRange,
    },
    fit: fitted.json,
    window,
    usableRange: { ...usableV, edgeZone: zone },
    points: pointColumns(points, edges, fitted.model, edges.usableI0, usable.zone.startI),
    hysteresis,
    counter: { gateS: input.gateS ?? null, resolutionHz: input.gateS ? 1 / input.gateS : null },
    warnings,
  };
}

/** The edge zone for the JSON, with the reason its points are out in words. */
function edgeZoneJson(
  points: PointSet,
  edges: Edges,
  usable: UsableRange,
): SweepColumnAnalysis['usableRange']['edgeZone'] {
  const { zone } = usable;
  if (zone.startI <= edges.usableI0) return null;
  const fromV = points.v[edges.usableI0] as number;
  const toV = points.v[zone.startI - 1] as number;
  const limitPct = zone.limit * 100;
  const change = zone.slopeChange === null ? null : zone.slopeChange * 100;
  return {
    fromV,
    toV,
    slopeChangePct: change,
    limitPct,
    stepV: zone.stepV,
    reason:
      `next to the stall edge (${formatFigure(edges.thresholdV ?? NaN, 'V', { uncertainty: edges.thresholdUncertaintyV ?? 0 })}) the tuning slope changes by up to ` +
      `${change === null ? '—' : formatFigure(change, '%', { digits: 2 })} per ${formatFigure(zone.stepV, 'V', { digits: 3 })} step (limit ${formatFigure(limitPct, '%', { digits: 2 })}): ` +
      'faster than the sweep resolves, so Kvco there is not quoted',
  };
}

function pointColumns(
  points: PointSet,
  edges: Edges,
  model: TuningModel,
  zoneI0: number,
  zoneI1: number,
): SweepPointColumns {
  const tol = 1e-9 * Math.max(1, Math.abs(model.toV));
  // The point set's own columns, shared: nothing changes them after this.
  const out = new SweepPointColumns(points.count, {
    v: points.v,
    meanHz: points.meanHz,
    sdHz: points.sdHz,
    noOscillation: points.nNoOsc,
    unstable: edges.unstable.subarray(0, points.count),
    unsettled: points.unsettled,
  });
  for (let i = 0; i < points.count; i++) {
    const v = points.v[i] as number;
    out.readings[i] = (points.nOsc[i] as number) + (points.nNoOsc[i] as number);
    if (i >= zoneI0 && i < zoneI1) out.edgeZone[i] = 1;
    if (v >= model.fromV - tol && v <= model.toV + tol) {
      out.fitted[i] = 1;
      out.fitHz[i] = model.value(v);
    }
  }
  return out;
}
