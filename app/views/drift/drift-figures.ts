/**
 * Drift analysis input from the columns, and the display columns of the
 * after-run plots. The frequency–temperature view is reduced to chunk means
 * (display only; the analysis gets every reading).
 */
import { analyzeDrift, type DriftAnalysis } from '../../analysis/drift-analysis.ts';
import { outcomeOf, type AnalysisOutcome } from '../../state/analysis-outcome.ts';
import { driftInputFromColumns, okFrequency } from '../../state/column-inputs.ts';
import type { ColumnSet } from '../../state/columns.ts';
import { tempcoChunks } from '../../analysis/drift-run-view.ts';
import type { TempcoChunks } from '../../contract/run-window.ts';

export type DriftOutcome = AnalysisOutcome<DriftAnalysis>;

export function analyzeDriftColumns(columns: ColumnSet, n: number): DriftOutcome {
  if (n < 3) return { ok: false, message: 'fewer than 3 readings' };
  return outcomeOf(() => analyzeDrift(driftInputFromColumns(columns, n)));
}

export type TempcoColumns = TempcoChunks;

/** At most `maxPoints` chunk means, ordered by temperature, with the tempco line on the same x (the rule main uses too). */
export function tempcoColumns(columns: ColumnSet, n: number, analysis: DriftAnalysis, maxPoints = 4000): TempcoColumns {
  return tempcoChunks(columns.temperature_c.view(), okFrequency(columns, n), n, analysis, maxPoints);
}
