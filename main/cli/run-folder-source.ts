/**
 * The run-folder half of analysis-source.ts: reads a run folder through the
 * store (its samples through the column cache, as the app opens a run). Its
 * own module, loaded only when the path is a folder or may be a run id, so
 * analysing a plain CSV evaluates none of the store's schemas.
 */
import { join } from 'node:path';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import { datasheetRunLabel, runHints, type RunHints } from '../../app/analysis/datasheet-run.ts';
import type { RunEventLike } from '../../app/analysis/run-quality.ts';
import { readRunFolder } from '../store/run-reader.ts';
import { openSamples } from '../store/cached-samples.ts';
import { SAMPLES_CSV } from '../store/run-meta.ts';
import { runIdSchema } from '../store/run-id.ts';
import { UsageError } from './types.ts';

export interface RunFolderSource {
  table: ColumnTable;
  droppedLines: number;
  meta: RunMeta;
  eventsByType: Record<string, number>;
  events: RunEventLike[];
  label: string;
  hints: RunHints;
}

/** Whether `text` has the form of a run id (as `tunebench runs` prints it). */
export function looksLikeRunId(text: string): boolean {
  return runIdSchema.safeParse(text).success;
}

export async function readRunFolderSource(path: string): Promise<RunFolderSource> {
  const eventsByType: Record<string, number> = {};
  try {
    // Through the binary column cache, as the app opens a run: a million-reading run is not parsed again.
    const { run, table } = await openSamples(join(path, SAMPLES_CSV), {}, (withoutSamples) =>
      readRunFolder(path, { withoutSamples }),
    );
    for (const event of run.events) eventsByType[event.type] = (eventsByType[event.type] ?? 0) + 1;
    if (table.rowCount === 0) throw new UsageError(`${join(path, 'samples.csv')}: no readings recorded`);
    return {
      table,
      droppedLines: table.dropped.length,
      meta: run.meta,
      eventsByType,
      events: run.events,
      label: datasheetRunLabel(run.meta.id, run.meta.dut.id),
      hints: runHints(run.meta),
    };
  } catch (error) {
    if (error instanceof UsageError) throw error;
    throw new UsageError(`${path}: not a readable run folder (${(error as Error).message})`);
  }
}
