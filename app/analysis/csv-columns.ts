/**
 * Parsed CSV table → the typed inputs of the analyses. Knows the column names
 * of CONTRACTS.md (plain CSV and run-folder samples.csv).
 */
import { CsvError, numericColumn, requireNumeric, textColumn, type CsvTable } from './csv-input.ts';
import { meanOfFinite } from './mean-finite.ts';
import type { DriftInput } from './drift-analysis.ts';
import type { PushingInput } from './pushing-analysis.ts';
import type { SweepInput } from './sweep-points.ts';

export type CsvKind = 'sweep' | 'drift' | 'pushing';

const STATUSES = new Set(['ok', 'no-signal', 'timeout', 'error']);

/**
 * Kind of a plain CSV: `supply_v` + `frequency_hz` → pushing; `control_v` with
 * more than one value → sweep; `time_s` + `frequency_hz` → drift.
 */
export function detectCsvKind(table: CsvTable): CsvKind {
  const has = (n: string): boolean => table.header.includes(n);
  if (!has('frequency_hz')) {
    throw new CsvError(`missing column "frequency_hz"; header has: ${table.header.join(', ')}`, table.headerLine);
  }
  if (has('supply_v')) {
    const s = numericColumn(table, 'supply_v');
    if (s && new Set(Array.from(s).filter(Number.isFinite)).size > 1) return 'pushing';
  }
  if (has('control_v')) {
    const c = numericColumn(table, 'control_v');
    if (c && (new Set(Array.from(c).filter(Number.isFinite)).size > 1 || !has('time_s'))) return 'sweep';
  }
  if (has('time_s')) return 'drift';
  throw new CsvError('cannot tell the kind: a sweep needs control_v, a drift log time_s, a pushing run supply_v', table.headerLine);
}

/**
 * Applies the status column: `no-signal` is evidence of no oscillation (the
 * frequency becomes NaN); `timeout` and `error` say nothing either way, so
 * those rows are returned as failed for the caller to drop.
 */
function applyStatus(table: CsvTable, frequencyHz: Float64Array): Uint8Array {
  const failed = new Uint8Array(frequencyHz.length);
  const status = textColumn(table, 'status');
  if (!status) return failed;
  for (let r = 0; r < status.length; r++) {
    const s = (status[r] as string).toLowerCase();
    if (s === '' || s === 'ok') continue;
    if (!STATUSES.has(s)) {
      throw new CsvError(`column status: "${status[r]}" is not one of ok, no-signal, timeout, error`, table.lineOf[r] as number);
    }
    frequencyHz[r] = NaN;
    if (s !== 'no-signal') failed[r] = 1;
  }
  return failed;
}

export function sweepInputFromTable(table: CsvTable, gateS?: number): SweepInput {
  const controlV = requireNumeric(table, 'control_v', 'control voltage of each reading, V');
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz');
  const failed = applyStatus(table, frequencyHz);
  for (let r = 0; r < controlV.length; r++) {
    if (!Number.isFinite(controlV[r] as number)) {
      throw new CsvError('column control_v: a sweep reading needs a control voltage', table.lineOf[r] as number);
    }
    if (failed[r]) controlV[r] = NaN; // grouping skips rows without a control voltage
  }
  const dirText = textColumn(table, 'direction');
  let direction: Int8Array | undefined;
  if (dirText) {
    direction = new Int8Array(dirText.length);
    for (let r = 0; r < dirText.length; r++) {
      const d = (dirText[r] as string).toLowerCase();
      if (d === 'up' || d === '') direction[r] = 1;
      else if (d === 'down') direction[r] = -1;
      else throw new CsvError(`column direction: "${dirText[r]}" is not up or down`, table.lineOf[r] as number);
    }
  }
  return { controlV, frequencyHz, direction, gateS };
}

export function driftInputFromTable(table: CsvTable): DriftInput {
  const timeS = requireNumeric(table, 'time_s', 'time of each reading, s');
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz');
  applyStatus(table, frequencyHz);
  const temperatureC = numericColumn(table, 'temperature_c') ?? undefined;
  for (let r = 1; r < timeS.length; r++) {
    if ((timeS[r] as number) < (timeS[r - 1] as number)) {
      throw new CsvError('column time_s: time goes backwards', table.lineOf[r] as number);
    }
  }
  return { timeS, frequencyHz, temperatureC };
}

export function pushingInputFromTable(table: CsvTable): PushingInput {
  const supplyV = requireNumeric(table, 'supply_v', 'DUT supply voltage of each reading, V');
  const frequencyHz = requireNumeric(table, 'frequency_hz', 'frequency of each reading, Hz');
  const failed = applyStatus(table, frequencyHz);
  for (let r = 0; r < failed.length; r++) if (failed[r]) supplyV[r] = NaN; // grouping skips these rows
  const controlV = meanOfFinite(numericColumn(table, 'control_v')) ?? undefined;
  return { supplyV, frequencyHz, controlV };
}
