/**
 * One entry for "analyse this table": picks the analysis by kind. Used by the
 * CLI (`tunebench analyze`) and the renderer alike.
 */
import { driftInputFromTable, pushingInputFromTable, sweepInputFromTable, type CsvKind } from './csv-columns.ts';
import type { ColumnTable } from '../contract/column-table.ts';
import { analyzeDrift, type DriftAnalysis, type DriftOptions } from './drift-analysis.ts';
import { analyzePushing, type PushingAnalysis } from './pushing-analysis.ts';
import { analyzeSweepColumns, sweepAnalysisRows, type SweepOptions } from './sweep-analysis.ts';
import { qualityWarnings, runQuality, type RunEventLike, type RunQuality } from './run-quality.ts';
import type { SweepAnalysis, SweepColumnAnalysis } from './sweep-types.ts';

/** Any analysis; `quality` is there when events (a run folder) were given. */
export type AnyAnalysis = (SweepAnalysis | DriftAnalysis | PushingAnalysis) & { quality?: RunQuality };
/** The same with a sweep's `points` and `kvco.local` as columns (sweep-columns.ts). */
export type AnyColumnAnalysis = (SweepColumnAnalysis | DriftAnalysis | PushingAnalysis) & { quality?: RunQuality };

export interface TableAnalysisOptions {
  sweep?: SweepOptions;
  drift?: DriftOptions;
  /** Counter gate time (s), from the run's plan when known. */
  gateS?: number;
  /** The run's events.jsonl (a run folder): quality counts and unsettled points come from them. */
  events?: readonly RunEventLike[];
}

export function analyzeTable(kind: CsvKind, table: ColumnTable, options: TableAnalysisOptions = {}): AnyAnalysis {
  const result = analyzeTableColumns(kind, table, options);
  return result.kind === 'sweep' ? sweepAnalysisRows(result) : result;
}

/** analyzeTable with a sweep's per-point parts as columns: what a writer of a million points wants. */
export function analyzeTableColumns(
  kind: CsvKind,
  table: ColumnTable,
  options: TableAnalysisOptions = {},
): AnyColumnAnalysis {
  const checked = options.events ? runQuality(table, options.events) : null;
  let result: AnyColumnAnalysis;
  switch (kind) {
    case 'sweep': {
      const input = sweepInputFromTable(table, options.gateS);
      if (checked) input.unsettled = checked.unsettledRows;
      const sweep = analyzeSweepColumns(input, options.sweep);
      if (checked) checked.quality.unsettledPointsLeftOut = sweep.fit.unsettledLeftOutV.length;
      result = sweep;
      break;
    }
    case 'drift':
      result = analyzeDrift(driftInputFromTable(table), { gateS: options.gateS, ...options.drift });
      break;
    case 'pushing':
      result = analyzePushing(pushingInputFromTable(table));
      break;
  }
  if (!checked) return result;
  const extra = qualityWarnings(checked.quality);
  if ('warnings' in result) return { ...result, warnings: [...extra, ...result.warnings], quality: checked.quality };
  return { ...result, quality: checked.quality };
}

/** Parses `--fit` values: "spline" (default), "auto" (polynomial, AICc), "poly:N" (N = 1…6). Null when malformed. */
export function parseFitSpec(text: string): 'spline' | 'auto' | number | null {
  if (text === 'auto' || text === 'spline') return text;
  const m = /^poly:([1-6])$/.exec(text);
  return m ? Number(m[1]) : null;
}

/** Parses "A:B" volts (each with SI prefixes through `parseNumber`); null when malformed or A ≥ B. */
export function parseVoltRange(
  text: string,
  parseNumber: (t: string) => number | null,
): { fromV: number; toV: number } | null {
  const parts = text.split(':');
  if (parts.length !== 2) return null;
  const fromV = parseNumber((parts[0] as string).trim());
  const toV = parseNumber((parts[1] as string).trim());
  return fromV !== null && toV !== null && Number.isFinite(fromV) && Number.isFinite(toV) && fromV < toV
    ? { fromV, toV }
    : null;
}
