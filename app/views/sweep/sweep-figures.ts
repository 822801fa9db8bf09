/**
 * From columns to the analysis input and from the analysis to what the
 * sweep plots draw: fit curve, Kvco against V, residuals, shaded regions.
 * Runs once when a sweep ends or a stored sweep opens, not per sample.
 */
import { analyzeSweep, type SweepOptions } from '../../analysis/sweep-analysis.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { outcomeOf, type AnalysisOutcome } from '../../state/analysis-outcome.ts';
import { sweepInputFromColumns } from '../../state/column-inputs.ts';
import type { ColumnSet } from '../../state/columns.ts';
import type { XRegion } from '../../plots/regions-plugin.ts';
import { formatFigure } from '../../analysis/format-figure.ts';
import { setpointText } from '../figure-text.ts';
import { stallText } from './sweep-key-figures.ts';

export type SweepOutcome = AnalysisOutcome<SweepAnalysis>;

export function analyzeColumns(
  columns: ColumnSet,
  n: number,
  gateS: number | undefined,
  options?: SweepOptions,
): SweepOutcome {
  if (n === 0) return { ok: false, message: 'no readings' };
  return outcomeOf(() => analyzeSweep(sweepInputFromColumns(columns, n, gateS), options));
}

/** f(V) = Σ cᵢ·Vⁱ (CONTRACTS.md fit coefficients, V unscaled). */
export function evalFit(coefficients: readonly number[], v: number): number {
  let sum = 0;
  for (let i = coefficients.length - 1; i >= 0; i -= 1) sum = sum * v + (coefficients[i] ?? 0);
  return sum;
}

/** The fitted curve on the display x column; null outside the fitted range. A spline comes as samples (fit.curve). */
export function fitOnX(analysis: SweepAnalysis, x: readonly number[]): (number | null)[] {
  const { coefficients, fromV, toV, curve } = analysis.fit;
  return x.map((v) =>
    v >= fromV - 1e-12 && v <= toV + 1e-12
      ? coefficients.length
        ? evalFit(coefficients, v)
        : onCurve(curve, v)
      : null,
  );
}

/** Linear interpolation in the fitted curve's samples (display only). */
function onCurve(curve: SweepAnalysis['fit']['curve'], v: number): number {
  return alongCurve(curve.v, curve.hz, v);
}

/** Linear interpolation of `ys` on the curve's ascending grid `grid` (its band, its frequency); clamped to the ends. */
export function alongCurve(grid: readonly number[], ys: readonly number[], v: number): number {
  let i = 1;
  while (i < grid.length - 1 && (grid[i] as number) < v) i++;
  const v0 = grid[i - 1] as number;
  const v1 = grid[i] ?? v0;
  const t = v1 > v0 ? Math.min(1, Math.max(0, (v - v0) / (v1 - v0))) : 0;
  const y0 = ys[i - 1] as number;
  return y0 + t * ((ys[i] ?? y0) - y0);
}

/**
 * Stall and unsteady regions. The titles quote the edges with their ± when the
 * analysis gives them (`a`); the live estimate during a sweep has none.
 */
export function stallRegions(thresholdV: number | null, unstableBelowV: number | null, a?: SweepAnalysis): XRegion[] {
  const regions: XRegion[] = [];
  if (thresholdV !== null) {
    regions.push({
      key: 'stall',
      fromX: Number.NEGATIVE_INFINITY,
      toX: thresholdV,
      className: 'region-stall',
      title: `No oscillation below ${a ? stallText(a) : `about ${setpointText(thresholdV)}`}`,
      testId: 'stall-region',
    });
  }
  if (thresholdV !== null && unstableBelowV !== null && unstableBelowV > thresholdV) {
    const upTo = a
      ? formatFigure(unstableBelowV, 'V', { uncertainty: a.stall.unstableBelowUncertaintyV })
      : setpointText(unstableBelowV);
    regions.push({
      key: 'unstable',
      fromX: thresholdV,
      toX: unstableBelowV,
      className: 'region-unstable',
      title: `Unsteady oscillation up to ${upTo}`,
      testId: 'unstable-region',
    });
  }
  return regions;
}

/** Where the usable tuning range ends: the curve turns back or goes flat above this voltage; null if it does neither. */
export function usableEndV(analysis: SweepAnalysis): number | null {
  const ends = [analysis.kvco.turnsBackAboveV, analysis.kvco.flatAboveV].filter(
    (v): v is number => v !== null && Number.isFinite(v),
  );
  return ends.length > 0 ? Math.min(...ends) : null;
}

/** Stall, unsteady and edge-zone regions, plus the range beyond the usable tuning window. */
export function sweepRegions(analysis: SweepAnalysis): XRegion[] {
  const regions = stallRegions(analysis.stall.thresholdV, analysis.stall.unstableBelowV, analysis);
  const zone = analysis.usableRange.edgeZone;
  if (zone) {
    // From the edge (or the unsteady points' end) to halfway to the first usable point.
    const from = Math.max(analysis.stall.unstableBelowV ?? -Infinity, analysis.stall.thresholdV ?? -Infinity);
    regions.push({
      key: 'edge-zone',
      fromX: Number.isFinite(from) ? from : zone.fromV,
      toX: (zone.toV + analysis.usableRange.fromV) / 2,
      className: 'region-edge-zone',
      title: `Stall edge's zone, ${setpointText(zone.fromV)} – ${setpointText(zone.toV)}: ${zone.reason}`,
      testId: 'edge-zone-region',
    });
  }
  const end = usableEndV(analysis);
  if (end !== null) {
    const why = analysis.kvco.turnsBackAboveV === end ? 'the tuning curve turns back' : 'the tuning curve goes flat';
    regions.push({
      key: 'unusable',
      fromX: end,
      toX: Number.POSITIVE_INFINITY,
      className: 'region-unusable',
      title: `Outside the usable range above ${setpointText(end)}: ${why}`,
      testId: 'unusable-region',
    });
  }
  return regions;
}

export interface GainColumns {
  v: number[];
  stable: (number | null)[];
  unstable: (number | null)[];
  /** 1σ of each local Kvco (its read-out's digits). */
  u: number[];
}

/** Local Kvco in two series: quoted, and not quoted (unsteady, or in the stall edge's zone) — drawn apart. */
export function gainColumns(analysis: SweepAnalysis): GainColumns {
  const local = [...analysis.kvco.local].sort((a, b) => a.v - b.v);
  const zone = new Set(analysis.points.filter((p) => p.edgeZone).map((p) => p.v));
  const out = (k: (typeof local)[number]): boolean => k.unstable || zone.has(k.v);
  return {
    v: local.map((k) => k.v),
    stable: local.map((k) => (out(k) || !Number.isFinite(k.hzPerV) ? null : k.hzPerV)),
    unstable: local.map((k) => (out(k) && Number.isFinite(k.hzPerV) ? k.hzPerV : null)),
    u: local.map((k) => k.uncertaintyHzPerV),
  };
}

export function residualColumns(analysis: SweepAnalysis): { v: number[]; residualHz: (number | null)[] } {
  const points = analysis.points.filter((p) => Number.isFinite(p.meanHz)).sort((a, b) => a.v - b.v);
  return {
    v: points.map((p) => p.v),
    residualHz: points.map((p) => (p.fitHz !== null && !p.unstable ? p.meanHz - p.fitHz : null)),
  };
}
