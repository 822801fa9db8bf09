/**
 * One entry for "analyse this table": picks the analysis by kind. Used by the
 * CLI (`tunebench analyze`) and the renderer alike.
 */
import { driftInputFromTable, pushingInputFromTable, sweepInputFromTable, type CsvKind } from './csv-columns.ts';
import type { ColumnTable } from '../contract/column-table.ts';
import { analyzeDrift, type DriftAnalysis, type DriftOptions } from './drift-analysis.ts';
import { analyzePushing, type PushingAnalysis } from './pushing-analysis.ts';
import { analyzeSweep, type SweepOptions } from './sweep-analysis.ts';
import type { SweepAnalysis } from './sweep-types.ts';

export type AnyAnalysis = SweepAnalysis | DriftAnalysis | PushingAnalysis;

export interface TableAnalysisOptions {
  sweep?: SweepOptions;
  drift?: DriftOptions;
  /** Counter gate time (s), from the run's plan when known. */
  gateS?: number;
}

export function analyzeTable(kind: CsvKind, table: ColumnTable, options: TableAnalysisOptions = {}): AnyAnalysis {
  switch (kind) {
    case 'sweep':
      return analyzeSweep(sweepInputFromTable(table, options.gateS), options.sweep);
    case 'drift':
      return analyzeDrift(driftInputFromTable(table), options.drift);
    case 'pushing':
      return analyzePushing(pushingInputFromTable(table));
  }
}

/** Parses `--fit` values: "auto", "poly:N" (N = 1…6). Null when malformed. */
export function parseFitSpec(text: string): 'auto' | number | null {
  if (text === 'auto') return 'auto';
  const m = /^poly:([1-6])$/.exec(text);
  return m ? Number(m[1]) : null;
}
