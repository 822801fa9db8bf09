/**
 * A table of readings (ColumnTable: a run folder's samples.csv or a user's
 * plain CSV, each read by its one reader) → the typed inputs of the
 * analyses. Knows the column names of CONTRACTS.md and applies the
 * reading-status rules of app/contract/reading-status.ts.
 */
import type { CodedTextColumn } from '../contract/bench-api.ts';
import type { ColumnTable } from '../contract/column-table.ts';
import { STATUS_EFFECT, readingStatus, sweepDirection } from '../contract/reading-status.ts';
import { meanOfFinite } from './mean-finite.ts';
import type { DriftInput } from './drift-analysis.ts';
import type { PushingInput } from './pushing-analysis.ts';
import type { SweepInput } from './sweep-points.ts';

export type CsvKind = 'sweep' | 'drift' | 'pushing';

/** Input that the analyses cannot use; `line` is the 1-based source line when known. */
export class CsvError extends Error {
  override name = 'CsvError';
  constructor(
    message: string,
    readonly line: number | null,
  ) {
    super(line === null ? message : `line ${line}: ${message}`);
  }
}

function lineOfRow(table: ColumnTable, row: number): number | null {
  return table.lineOf?.[row] ?? null;
}

function rowError(table: ColumnTable, row: number, message: string): CsvError {
  const line = lineOfRow(table, row);
  return new CsvError(line === null ? `row ${row + 1}: ${message}` : message, line);
}

/** A numeric column by name, or null when the table lacks it (the table's own array: copy before changing it). */
export function numericColumn(table: ColumnTable, name: string): Float64Array | null {
  return table.numeric[name] ?? null;
}

/** A numeric column the analysis needs: a copy to change (`copy`), else a view of the table's own (not to be changed). */
function requireNumeric(table: ColumnTable, name: string, purpose: string, copy = true): Float64Array {
  const col = numericColumn(table, name);
  if (!col)
    throw new CsvError(
      `missing column "${name}" (${purpose}); header has: ${table.names.join(', ')}`,
      table.headerLine ?? null,
    );
  return copy ? col.slice(0, table.rowCount) : col.subarray(0, table.rowCount);
}

/** True when the column holds at least two different finite values. */
function varies(values: Float64Array | null): boolean {
  if (!values) return false;
  let first = Number.NaN;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (Number.isNaN(first)) first = v;
    else if (v !== first) return true;
  }
  return false;
}

/**
 * Kind of a table: `supply_v` that varies + `frequency_hz` → pushing;
 * `control_v` that varies (or no `time_s`) → sweep; `time_s` → drift.
 */
export function detectCsvKind(table: ColumnTable): CsvKind {
  const has = (n: string): boolean => table.names.includes(n);
  if (!has('frequency_hz')) {
    throw new CsvError(
      `missing column "frequency_hz"; header has: ${table.names.join(', ')}`,
      table.headerLine ?? null,
    );
  }
  if (varies(numericColumn(table, 'supply_v'))) return 'pushing';
  if (has('control_v') && (varies(numericColumn(table, 'control_v')) || !has('time_s'))) return 'sweep';
  if (has('time_s')) return 'drift';
  throw new CsvError(
    'cannot tell the kind: a sweep needs control_v, a drift log time_s, a pushing run supply_v',
    table.headerLine ?? null,
  );
}

/** Per level of a coded column, then per row: one look-up per row. */
function levelValues<T>(column: CodedTextColumn, map: (level: string, index: number) => T): T[] {
  return column.levels.map(map);
}

/**
 * Applies the status column to a copy of the frequencies: `no-signal` →
 * NaN (no oscillation); `timeout`/`error` → NaN and the row is returned as
 * failed for the caller to drop. A word that is not a status is an error in a
 * user's file; in a run folder (no line numbers) it counts as `error`.
 */
function applyStatus(table: ColumnTable, frequencyHz: Float64Array): Uint8Array {
  const failed = new Uint8Array(frequencyHz.length);
  const status = table.text.status;
  if (!status) return failed;
  const fromFile = table.lineOf !== undefined;
  const effect = levelValues(status, (level) => {
    const s = readingStatus(level);
    return s === null ? null : STATUS_EFFECT[s];
  });
  for (let r = 0; r < frequencyHz.length; r++) {
    const code = status.codes[r] as number;
    const e = effect[code];
    if (e === 'measured') continue;
    if (e === null && fromFile)
      throw rowError(
        table,
        r,
        `column status: "${status.levels[code] ?? ''}" is not one of ok, no-signal, timeout, error`,
      );
    frequencyHz[r] = Number.NaN;
    if (e !== 'no-oscillation') failed[r] = 1;
  }
  return failed;
}

function directionColumn(table: ColumnTable): Int8Array | undefined {
  const dir = table.text.direction;
  if (!dir) return undefined;
  const sign = levelValues(dir, (level) => sweepDirection(level));
  const out = new Int8Array(table.rowCount);
  for (let r = 0; r < out.length; r++) {
    const code = dir.codes[r] as number;
    const d = sign[code];
    if (d === null || d === undefined)
      throw rowError(table, r, `column direction: "${dir.levels[code] ?? ''}" is not up or down`);
    out[r] = d;
  }
  return out;
}

export function sweepInputFromTable(table: ColumnTable, gateS?: number): SweepInput {
  // The table's own columns where nothing changes them (no status column, no failed row): a million
  // rows' copies are 16 MB of memory touched for the first time (the analysis only reads its input).
  const tableV = requireNumeric(table, 'control_v', 'control voltage of each reading, V', false);
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz', !!table.text.status);
  const failed = applyStatus(table, frequencyHz);
  const controlV = failed.includes(1) ? tableV.slice() : tableV;
  for (let r = 0; r < controlV.length; r++) {
    if (failed[r])
      controlV[r] = Number.NaN; // grouping skips rows without a control voltage
    else if (!Number.isFinite(controlV[r]))
      throw rowError(table, r, 'column control_v: a sweep reading needs a control voltage');
  }
  return { controlV, frequencyHz, direction: directionColumn(table), gateS };
}

export function driftInputFromTable(table: ColumnTable): DriftInput {
  const timeS = requireNumeric(table, 'time_s', 'time of each reading, s');
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz');
  applyStatus(table, frequencyHz);
  const temperatureC = numericColumn(table, 'temperature_c')?.slice(0, table.rowCount);
  for (let r = 1; r < timeS.length; r++) {
    if ((timeS[r] as number) < (timeS[r - 1] as number)) throw rowError(table, r, 'column time_s: time goes backwards');
  }
  return { timeS, frequencyHz, temperatureC };
}

export function pushingInputFromTable(table: ColumnTable): PushingInput {
  const supplyV = requireNumeric(table, 'supply_v', 'DUT supply voltage of each reading, V');
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz');
  const failed = applyStatus(table, frequencyHz);
  for (let r = 0; r < failed.length; r++) if (failed[r]) supplyV[r] = Number.NaN; // grouping skips these rows
  const controlV = meanOfFinite(numericColumn(table, 'control_v')) ?? undefined;
  return { supplyV, frequencyHz, controlV };
}
