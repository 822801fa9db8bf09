/**
 * A table of readings as columns: what both readers give — the store's
 * reader of a run folder's samples.csv and the plain-CSV reader of a user's
 * file — and what the analyses' inputs are built from. Numbers are
 * Float64Array (NaN for an empty cell); words are dictionary-coded.
 */
import type { CodedTextColumn } from './bench-api.ts';

export interface ColumnTable {
  names: readonly string[];
  numeric: Readonly<Record<string, Float64Array>>;
  text: Readonly<Record<string, CodedTextColumn>>;
  rowCount: number;
  /** 1-based line in the source file of each row, where the table came from a user's file (for error messages). */
  lineOf?: Uint32Array;
  /** 1-based line of the header, likewise. */
  headerLine?: number;
}
