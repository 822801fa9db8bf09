/**
 * A stored supply-pushing run → its analysis and the columns of its plot:
 * mean frequency at each DUT supply voltage and the fitted Hz/V line on the
 * same x. Pure; the run is small (a handful of supply steps), so it is
 * analysed on the page.
 */
import { analyzePushing, type PushingAnalysis } from '../../analysis/pushing-analysis.ts';
import { outcomeOf, type AnalysisOutcome } from '../../state/analysis-outcome.ts';
import { pushingInputFromColumns } from '../../state/column-inputs.ts';
import type { ColumnSet } from '../../state/columns.ts';

export type PushingOutcome = AnalysisOutcome<PushingAnalysis>;

export function analyzePushingColumns(columns: ColumnSet, n: number): PushingOutcome {
  return outcomeOf(() => analyzePushing(pushingInputFromColumns(columns, n)));
}

export interface PushingPlotColumns {
  supplyV: number[];
  /** Mean of the oscillating readings; null where none oscillated. */
  meanHz: (number | null)[];
  /** The least-squares line f(V) = f(nominal) + Hz/V·(V − nominal). */
  lineHz: number[];
}

export function pushingPlotColumns(analysis: PushingAnalysis): PushingPlotColumns {
  const points = [...analysis.points].sort((a, b) => a.supplyV - b.supplyV);
  const line = (v: number) => analysis.frequencyAtNominalHz + analysis.pushingHzPerV * (v - analysis.nominalSupplyV);
  return {
    supplyV: points.map((p) => p.supplyV),
    meanHz: points.map((p) => (Number.isFinite(p.meanHz) ? p.meanHz : null)),
    lineHz: points.map((p) => line(p.supplyV)),
  };
}
