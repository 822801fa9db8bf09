/**
 * Any saved run → its analysis and the conditions it was taken under, for
 * the gain table and the loop-filter screen. Pure: columns in, objects out.
 */
import type { AnyAnalysis } from '../../analysis/analyze-table.ts';
import type { DatasheetRun, RunConditions } from '../../analysis/datasheet.ts';
import { analyzePushing } from '../../analysis/pushing-analysis.ts';
import { errorText } from '../../bridge/bench-call-error.ts';
import type { RunMeta } from '../../contract/bench-api.ts';
import { STATUS_CODE, type ColumnSet } from '../../state/columns.ts';
import { analyzeDriftColumns } from '../drift/drift-figures.ts';
import { analyzeColumns } from '../sweep/sweep-figures.ts';

export type RunAnalysisOutcome = { ok: true; analysis: AnyAnalysis } | { ok: false; message: string };

function planNumber(plan: unknown, key: string): number | undefined {
  if (typeof plan !== 'object' || plan === null) return undefined;
  const value = (plan as Record<string, unknown>)[key];
  return typeof value === 'number' && Number.isFinite(value) ? value : undefined;
}

export function analyzeRun(meta: RunMeta, columns: ColumnSet, rows: number): RunAnalysisOutcome {
  if (meta.kind === 'sweep') return analyzeColumns(columns, rows, planNumber(meta.plan, 'gateS'));
  if (meta.kind === 'drift') return analyzeDriftColumns(columns, rows);
  const frequencyHz = new Float64Array(rows);
  for (let i = 0; i < rows; i += 1) frequencyHz[i] = columns.status.at(i) === STATUS_CODE.ok ? columns.frequency_hz.at(i) : Number.NaN;
  try {
    const controlV = planNumber(meta.plan, 'controlV');
    const input = { supplyV: columns.supply_v.view().slice(0, rows), frequencyHz, ...(controlV !== undefined ? { controlV } : {}) };
    return { ok: true, analysis: analyzePushing(input) };
  } catch (error) {
    return { ok: false, message: errorText(error) };
  }
}

function meanFinite(values: Float64Array): number | null {
  let sum = 0;
  let count = 0;
  for (const value of values) {
    if (Number.isFinite(value)) {
      sum += value;
      count += 1;
    }
  }
  return count > 0 ? sum / count : null;
}

export function conditionsOf(meta: RunMeta, columns: ColumnSet, rows: number): RunConditions {
  return {
    temperatureC: meanFinite(columns.temperature_c.view().subarray(0, rows)),
    supplyV: meanFinite(columns.supply_v.view().subarray(0, rows)),
    gateS: planNumber(meta.plan, 'gateS') ?? null,
  };
}

export function datasheetRun(meta: RunMeta, columns: ColumnSet, rows: number): { run: DatasheetRun | null; message: string | null } {
  const outcome = analyzeRun(meta, columns, rows);
  if (!outcome.ok) return { run: null, message: `${meta.dut.id} (${meta.id}): ${outcome.message}` };
  return { run: { label: `${meta.dut.id} · ${meta.id}`, analysis: outcome.analysis, conditions: conditionsOf(meta, columns, rows) }, message: null };
}
