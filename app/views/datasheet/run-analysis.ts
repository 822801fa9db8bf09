/**
 * Any saved run → its analysis and the conditions it was taken under, for
 * the gain table and the loop-filter screen. Pure: columns in, objects out.
 * Label, conditions and inputs follow the same rules as `tunebench
 * datasheet` (app/analysis/datasheet-run.ts, app/state/column-inputs.ts), so
 * the screen's table and files match the command's.
 */
import type { AnyAnalysis } from '../../analysis/analyze-table.ts';
import type { DatasheetRun, RunConditions } from '../../analysis/datasheet.ts';
import { datasheetRunLabel, planHints, runConditions, runHints, runOrigin } from '../../analysis/datasheet-run.ts';
import type { RunMeta } from '../../contract/bench-api.ts';
import type { AnalysisOutcome } from '../../state/analysis-outcome.ts';
import type { ColumnSet } from '../../state/columns.ts';
import { analyzeDriftColumns } from '../drift/drift-figures.ts';
import { analyzePushingColumns } from '../runs/pushing-figures.ts';
import { analyzeColumns } from '../sweep/sweep-figures.ts';

export type RunAnalysisOutcome = AnalysisOutcome<AnyAnalysis>;

export function analyzeRun(meta: RunMeta, columns: ColumnSet, rows: number): RunAnalysisOutcome {
  if (meta.kind === 'sweep') {
    const hints = planHints(meta.plan);
    return analyzeColumns(
      columns,
      rows,
      hints.gateS,
      hints.window ? { window: { ...hints.window, source: 'plan' } } : undefined,
    );
  }
  if (meta.kind === 'drift') return analyzeDriftColumns(columns, rows);
  return analyzePushingColumns(columns, rows);
}

export function conditionsOf(meta: RunMeta, columns: ColumnSet, rows: number): RunConditions {
  const logged = {
    temperatureC: columns.temperature_c.view().subarray(0, rows),
    supplyV: columns.supply_v.view().subarray(0, rows),
  };
  return runConditions(meta.kind, logged, runHints(meta));
}

export function datasheetRun(
  meta: RunMeta,
  columns: ColumnSet,
  rows: number,
): { run: DatasheetRun | null; message: string | null } {
  const outcome = analyzeRun(meta, columns, rows);
  if (!outcome.ok) return { run: null, message: `${meta.dut.id} (${meta.id}): ${outcome.message}` };
  return {
    run: {
      label: datasheetRunLabel(meta.id, meta.dut.id),
      analysis: outcome.analysis,
      conditions: conditionsOf(meta, columns, rows),
      origin: runOrigin(meta),
    },
    message: null,
  };
}
