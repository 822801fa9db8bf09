/**
 * Loads what `analyze` and `datasheet` work on: a run folder (through the
 * store's reader, which also marks dead `running` runs as interrupted, and
 * drops a line a crash tore as every reader of the store does; its samples
 * through the store's column cache, as the app opens a run) or a plain CSV
 * file (through the one plain-CSV reader). Malformed input becomes a
 * UsageError naming file and line.
 */
import { isAscii } from 'node:buffer';
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import { CsvError, detectCsvKind, numericColumn, type CsvKind } from '../../app/analysis/csv-columns.ts';
import { runConditions, type RunHints } from '../../app/analysis/run-conditions.ts';
import { CsvImportError, readPlainCsv } from '../store/plain-csv.ts';
import type { RunEventLike } from '../../app/analysis/run-quality.ts';
import { UsageError } from './types.ts';
import { BIG_INPUT_BYTES, compileLongLoopsAtOnce, tuneForBigWork } from './v8-tuning.ts';

// A run folder's reader (the store and its schemas) loads only for a folder or a run id: a plain
// CSV, what `analyze` is most often given, starts without it.
const runFolderSource = async (): Promise<typeof import('./run-folder-source.ts')> => import('./run-folder-source.ts');

export interface AnalysisSource {
  path: string;
  label: string;
  kind: CsvKind;
  table: ColumnTable;
  /** Run folder only: samples.csv lines the store's reader dropped (torn by a crash, damaged). */
  droppedLines: number;
  meta: RunMeta | null;
  /** Run folder only: how many events of each type (faults, gaps, retries…). */
  eventsByType: Record<string, number>;
  /** Run folder only: the events themselves (null for a plain CSV). */
  events: RunEventLike[] | null;
  gateS: number | undefined;
  /** The plan's tuning window, when it has one. */
  window: { fromV: number; toV: number } | undefined;
  conditions: { temperatureC: number | null; supplyV: number | null; gateS: number | null };
}

/**
 * A file's bytes as text. Plain ASCII (what a CSV of numbers is) becomes V8's
 * one-byte string by a copy, without UTF-8 decoding in pieces (a 17 MB CSV:
 * some 250 ms and 64 MB of new memory read as UTF-8 through readFile's decoder).
 */
function fileText(bytes: Buffer): string {
  return isAscii(bytes) ? bytes.toString('latin1') : bytes.toString('utf8');
}

function plainTable(text: string, file: string): ColumnTable {
  try {
    const table = readPlainCsv(text, file);
    if (table.rowCount === 0) throw new UsageError(`${file}: no data rows after the header`);
    return table;
  } catch (error) {
    if (error instanceof CsvImportError) throw new UsageError(error.message);
    throw error;
  }
}

/**
 * A path as given, or else a run id as `tunebench runs` prints it, looked up
 * in `runsDir`.
 */
async function locate(
  path: string,
  runsDir: string | undefined,
): Promise<{ path: string; info: Awaited<ReturnType<typeof stat>> }> {
  const info = await stat(path).catch(() => null);
  if (info) return { path, info };
  if (runsDir !== undefined && (await runFolderSource()).looksLikeRunId(path)) {
    const folder = join(runsDir, path);
    const inRuns = await stat(folder).catch(() => null);
    if (inRuns?.isDirectory()) return { path: folder, info: inRuns };
    throw new UsageError(
      `${path}: no such file, run folder or run id in ${runsDir} (expected RUN_DIR, RUN_ID or FILE.csv; --runs picks the runs folder)`,
    );
  }
  throw new UsageError(`${path}: no such file or run folder (expected RUN_DIR, RUN_ID or FILE.csv)`);
}

export async function loadAnalysisSource(given: string, runsDir?: string): Promise<AnalysisSource> {
  const { path, info } = await locate(given, runsDir);
  // A run folder (its reader, maybe a million readings) or a big CSV is big work for V8.
  if (info.isDirectory() || info.size > BIG_INPUT_BYTES) {
    tuneForBigWork();
    compileLongLoopsAtOnce();
  }
  let table: ColumnTable;
  let droppedLines = 0;
  let meta: RunMeta | null = null;
  let kind: CsvKind;
  let label = path;
  let hints: RunHints = {};
  let eventsByType: Record<string, number> = {};
  let events: RunEventLike[] | null = null;
  if (info.isDirectory()) {
    const run = await (await runFolderSource()).readRunFolderSource(path);
    ({ table, droppedLines, meta, eventsByType, events, label, hints } = run);
    kind = run.meta.kind;
  } else {
    table = plainTable(fileText(await readFile(path)), path);
    try {
      kind = detectCsvKind(table);
    } catch (error) {
      if (error instanceof CsvError) throw new UsageError(`${path}: ${error.message}`);
      throw error;
    }
  }
  let conditions: AnalysisSource['conditions'];
  try {
    conditions = runConditions(
      kind,
      { supplyV: numericColumn(table, 'supply_v'), temperatureC: numericColumn(table, 'temperature_c') },
      hints,
    );
  } catch (error) {
    if (error instanceof CsvError) throw new UsageError(`${path}: ${error.message}`);
    throw error;
  }
  return {
    path,
    label,
    kind,
    table,
    droppedLines,
    meta,
    eventsByType,
    events,
    gateS: hints.gateS,
    window: hints.window,
    conditions,
  };
}
