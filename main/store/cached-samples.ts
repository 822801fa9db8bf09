/**
 * A run's sample table through the binary column cache (column-cache.ts):
 * taken from the cache when it matches the CSV as it is, else parsed from
 * the CSV and, for a run no longer being written, cached for next time.
 * Only on the real file system (an injected one, as in fault tests, reads
 * the CSV every time).
 */
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { csvKey, readColumnCache, writeColumnCache, sameCsvKey, type CsvKey } from './column-cache.ts';
import { SAMPLES_CSV } from './run-meta.ts';
import type { ReadOptions, RunFolderContents } from './run-reader.ts';
import { type SampleTable, readSampleTable } from './sample-table.ts';

export interface OpenedSamples {
  run: RunFolderContents;
  table: SampleTable;
  /** Where the table came from. */
  source: 'cache' | 'csv';
}

/**
 * Builds of a finished run's cache under way (cacheFinishedRun, in the background in the app), by CSV path: an
 * opening that arrives meanwhile takes the table being built instead of parsing the CSV a second time.
 */
const building = new Map<string, Promise<BuiltTable | null>>();

interface BuiltTable {
  table: SampleTable;
  key: CsvKey;
}

export async function openSamples(
  csvPath: string,
  options: ReadOptions,
  readFolder: (withoutSamples: boolean) => Promise<RunFolderContents>,
): Promise<OpenedSamples> {
  const cacheable = options.fs === undefined;
  const inFlight = cacheable ? building.get(csvPath) : undefined;
  const built = inFlight ? await inFlight.catch(() => null) : null;
  // The CSV's state before it is read: the cache may only describe exactly that file.
  const key = cacheable ? await csvKey(csvPath) : null;
  if (built !== null && key !== null && sameCsvKey(built.key, key)) {
    return { run: await readFolder(true), table: built.table, source: 'cache' };
  }
  const cached = key === null ? null : await readColumnCache(csvPath);
  // With the table from the cache, the CSV itself is not read at all.
  const run = await readFolder(cached !== null);
  if (cached !== null) return { run, table: cached, source: 'cache' };
  const table = readSampleTable(run.samplesCsv);
  if (key !== null && run.meta.status !== 'running') await writeColumnCache(csvPath, table, key);
  return { run, table, source: 'csv' };
}

/**
 * Runs of at least this many rows get their column cache when they finish; the page's pixel preview starts at
 * the same count (app/analysis/pixel-preview.ts PREVIEW_MIN_ROWS). Smaller runs parse faster than a cache pays.
 */
export const CACHE_AT_FINISH_MIN_ROWS = 20_000;

/**
 * Builds a finished run's column cache at once, so that the first opening of a big run (a week-long drift log)
 * reads the cache instead of parsing the CSV. Best effort: the CSV stays the source of truth, and a run whose
 * cache can't be written still opens from it. Returns whether a cache was written.
 */
export async function cacheFinishedRun(dir: string, rowsWritten: number): Promise<boolean> {
  if (rowsWritten < CACHE_AT_FINISH_MIN_ROWS) return false;
  const csvPath = join(dir, SAMPLES_CSV);
  const build = buildCache(csvPath);
  building.set(csvPath, build);
  try {
    return (await build) !== null;
  } finally {
    if (building.get(csvPath) === build) building.delete(csvPath);
  }
}

/** The table parsed and its cache written; null when the CSV is gone or the cache could not be written. */
async function buildCache(csvPath: string): Promise<BuiltTable | null> {
  // The CSV's state before it is read: writeColumnCache skips the cache if the file changed meanwhile.
  const key = await csvKey(csvPath);
  if (key === null) return null;
  const table = readSampleTable(await readFile(csvPath, 'utf8'));
  return (await writeColumnCache(csvPath, table, key)) ? { table, key } : null;
}
