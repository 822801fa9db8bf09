/**
 * Imports a plain CSV as a finished run, so an old measurement or one from
 * another bench sits in the runs list beside our own and analyses the same way.
 */
import { join, resolve } from 'node:path';
import type { RunKind, RunMeta } from '../../app/contract/bench-api.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import {
  CsvError,
  detectCsvKind,
  driftInputFromTable,
  pushingInputFromTable,
  sweepInputFromTable,
} from '../../app/analysis/csv-columns.ts';
import { isNoOscillation } from '../../app/analysis/sweep-points.ts';
import { type CellValue, formatCell } from './csv-cells.ts';
import { dutIdSchema, makeRunId } from './run-id.ts';
import { EVENTS_JSONL, RUN_SCHEMA, SAMPLES_CSV, writeRunMeta } from './run-meta.ts';
import { makeRunDir } from './run-writer.ts';
import { CsvImportError, readPlainCsv } from './plain-csv.ts';
import { SOFTWARE_VERSION } from './software-version.ts';
import { StoreError } from './store-error.ts';
import { type StoreFs, nodeStoreFs } from './store-fs.ts';

export interface ImportCsvOptions {
  runsDir: string;
  /** Name of the file the text came from (recorded; used in error messages). */
  fileName: string;
  csvText: string;
  dutId: string;
  /** Override the kind inferred from the columns. */
  kind?: RunKind;
  /** ISO time of the import (the run's startedAt); default now. */
  nowIso?: string;
  fs?: StoreFs;
}

/** Columns an imported run keeps, in this order (a missing one is left out). */
const KEPT_COLUMNS = ['time_s', 'control_v', 'supply_v', 'frequency_hz', 'temperature_c', 'direction'] as const;

export interface ImportedSamples {
  kind: RunKind;
  columns: string[];
  rows: CellValue[][];
}

/**
 * Reads a plain CSV with the one reader, checks it as the analysis will read
 * it (kind, required columns, status words, time order) and gives the rows to
 * store: a frequency that means no oscillation (empty, NaN, 0, 9.91E37) is
 * stored as a `no-signal` reading.
 */
export function importedSamples(csvText: string, fileName: string, forceKind?: RunKind): ImportedSamples {
  const table = readPlainCsv(csvText, fileName);
  const asImportError = (error: unknown): never => {
    if (error instanceof CsvError)
      throw new CsvImportError(
        [{ line: error.line ?? table.headerLine, message: error.message.replace(/^line \d+: /, '') }],
        fileName,
      );
    throw error;
  };
  if (table.rowCount === 0)
    throw new CsvImportError([{ line: table.headerLine + 1, message: 'no data rows after the header' }], fileName);
  let kind: RunKind;
  try {
    kind = forceKind ?? detectCsvKind(table);
    const check = { sweep: sweepInputFromTable, drift: driftInputFromTable, pushing: pushingInputFromTable }[kind];
    check(table);
  } catch (error) {
    return asImportError(error);
  }
  return { kind, ...storedRows(table) };
}

function storedRows(table: ColumnTable): Omit<ImportedSamples, 'kind'> {
  const columns = KEPT_COLUMNS.filter((name) => table.numeric[name] !== undefined || table.text[name] !== undefined);
  const frequency = table.numeric.frequency_hz;
  const status = table.text.status;
  const rows: CellValue[][] = [];
  for (let r = 0; r < table.rowCount; r++) {
    const row: CellValue[] = columns.map((name) => {
      const text = table.text[name];
      return text ? text.levels[text.codes[r] as number] : table.numeric[name]?.[r];
    });
    const given = status ? (status.levels[status.codes[r] as number] ?? 'ok') : 'ok';
    const silent = frequency !== undefined && isNoOscillation(frequency[r] as number);
    if (silent && frequency !== undefined) row[columns.indexOf('frequency_hz')] = Number.NaN;
    row.push(given === 'ok' && silent ? 'no-signal' : given);
    rows.push(row);
  }
  return { columns: [...columns, 'status'], rows };
}

/** Throws CsvImportError (line-numbered problems) or StoreError; returns the new run's meta. */
export async function importCsvRun(options: ImportCsvOptions): Promise<RunMeta> {
  const fs = options.fs ?? nodeStoreFs;
  const dut = dutIdSchema.safeParse(options.dutId);
  if (!dut.success) throw new StoreError(dut.error.issues[0]?.message ?? 'dut id: invalid', 'bad-input');
  const data = importedSamples(options.csvText, options.fileName, options.kind);
  const startedAt = options.nowIso ?? new Date().toISOString();
  const { id, dir } = await makeRunDir(fs, resolve(options.runsDir), makeRunId(startedAt, dut.data));
  try {
    let samples = `${data.columns.join(',')}\n`;
    for (const row of data.rows) samples += `${row.map(formatCell).join(',')}\n`;
    await fs.writeFile(join(dir, SAMPLES_CSV), samples);
    const event = { time_s: 0, type: 'imported', fileName: options.fileName, rows: data.rows.length };
    await fs.writeFile(join(dir, EVENTS_JSONL), `${JSON.stringify(event)}\n`);
    const meta: RunMeta = {
      schema: RUN_SCHEMA,
      id,
      kind: data.kind,
      status: 'complete',
      startedAt,
      endedAt: startedAt,
      dut: { id: dut.data, notes: '' },
      instruments: [],
      plan: { importedFrom: options.fileName },
      software: { version: SOFTWARE_VERSION },
    };
    // run.json last: a folder without it is never listed as a run.
    await writeRunMeta(fs, dir, meta);
    return meta;
  } catch (error) {
    await fs.rm(dir, { recursive: true, force: true }).catch(() => undefined);
    throw error;
  }
}
