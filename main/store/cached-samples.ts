/**
 * A run's sample table through the binary column cache (column-cache.ts):
 * taken from the cache when it matches the CSV as it is, else parsed from
 * the CSV and, for a run no longer being written, cached for next time.
 * Only on the real file system (an injected one, as in fault tests, reads
 * the CSV every time).
 */
import { csvKey, readColumnCache, writeColumnCache } from './column-cache.ts';
import type { ReadOptions, RunFolderContents } from './run-reader.ts';
import { type SampleTable, readSampleTable } from './sample-table.ts';

export interface OpenedSamples {
  run: RunFolderContents;
  table: SampleTable;
  /** Where the table came from. */
  source: 'cache' | 'csv';
}

export async function openSamples(
  csvPath: string,
  options: ReadOptions,
  readFolder: (withoutSamples: boolean) => Promise<RunFolderContents>,
): Promise<OpenedSamples> {
  const cacheable = options.fs === undefined;
  // The CSV's state before it is read: the cache may only describe exactly that file.
  const key = cacheable ? await csvKey(csvPath) : null;
  const cached = key === null ? null : await readColumnCache(csvPath);
  // With the table from the cache, the CSV itself is not read at all.
  const run = await readFolder(cached !== null);
  if (cached !== null) return { run, table: cached, source: 'cache' };
  const table = readSampleTable(run.samplesCsv);
  if (key !== null && run.meta.status !== 'running') await writeColumnCache(csvPath, table, key);
  return { run, table, source: 'csv' };
}
