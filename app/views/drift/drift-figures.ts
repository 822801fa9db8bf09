/**
 * Drift analysis input from the columns, and the display columns of the
 * after-run plots. The frequency–temperature view is reduced to chunk means
 * (display only; the analysis gets every reading).
 */
import { analyzeDrift, type DriftAnalysis } from '../../analysis/drift-analysis.ts';
import { outcomeOf, type AnalysisOutcome } from '../../state/analysis-outcome.ts';
import { driftInputFromColumns } from '../../state/column-inputs.ts';
import { STATUS_CODE, type ColumnSet } from '../../state/columns.ts';

export type DriftOutcome = AnalysisOutcome<DriftAnalysis>;

export function analyzeDriftColumns(columns: ColumnSet, n: number): DriftOutcome {
  if (n < 3) return { ok: false, message: 'fewer than 3 readings' };
  return outcomeOf(() => analyzeDrift(driftInputFromColumns(columns, n)));
}

export interface TempcoColumns {
  temperatureC: number[];
  frequencyHz: (number | null)[];
  lineHz: (number | null)[];
}

/** At most `maxPoints` chunk means, ordered by temperature, with the tempco line on the same x. */
export function tempcoColumns(columns: ColumnSet, n: number, analysis: DriftAnalysis, maxPoints = 4000): TempcoColumns {
  const chunk = Math.max(1, Math.ceil(n / maxPoints));
  const pairs: [number, number][] = [];
  for (let start = 0; start < n; start += chunk) {
    let sumT = 0;
    let sumF = 0;
    let count = 0;
    for (let i = start; i < Math.min(n, start + chunk); i += 1) {
      const t = columns.temperature_c.at(i);
      const f = columns.frequency_hz.at(i);
      if (columns.status.at(i) !== STATUS_CODE.ok || !Number.isFinite(t) || !Number.isFinite(f)) continue;
      sumT += t;
      sumF += f;
      count += 1;
    }
    if (count > 0) pairs.push([sumT / count, sumF / count]);
  }
  pairs.sort((a, b) => a[0] - b[0]);
  const slope = analysis.tempcoHzPerC;
  const meanT = analysis.meanTemperatureC;
  return {
    temperatureC: pairs.map((p) => p[0]),
    frequencyHz: pairs.map((p) => p[1]),
    // The least-squares line passes through the means (common practice).
    lineHz: pairs.map((p) => (slope !== null && meanT !== null ? analysis.meanHz + slope * (p[0] - meanT) : null)),
  };
}
