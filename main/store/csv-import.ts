/**
 * Imports a plain CSV as a finished run, so an old measurement or one from
 * another bench sits in the runs list beside our own and analyses the same way.
 */
import { join, resolve } from 'node:path';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { formatCell } from './csv-cells.ts';
import { dutIdSchema, makeRunId } from './run-id.ts';
import { EVENTS_JSONL, RUN_SCHEMA, SAMPLES_CSV, writeRunMeta } from './run-meta.ts';
import { makeRunDir } from './run-writer.ts';
import { parsePlainCsv } from './plain-csv.ts';
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
  kind?: 'sweep' | 'drift';
  /** ISO time of the import (the run's startedAt); default now. */
  nowIso?: string;
  fs?: StoreFs;
}

/** Throws CsvImportError (line-numbered problems) or StoreError; returns the new run's meta. */
export async function importCsvRun(options: ImportCsvOptions): Promise<RunMeta> {
  const fs = options.fs ?? nodeStoreFs;
  const dut = dutIdSchema.safeParse(options.dutId);
  if (!dut.success) throw new StoreError(dut.error.issues[0]?.message ?? 'dut id: invalid', 'bad-input');
  const data = parsePlainCsv(options.csvText, options.fileName, options.kind);
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
