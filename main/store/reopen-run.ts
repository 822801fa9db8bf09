/**
 * Resumes an interrupted run (a drift log stopped by a crash) into the same
 * folder: cuts any torn last line off samples.csv and events.jsonl, records a
 * `gap` event from the last time on disk to now, sets the status back to
 * `running` and hands back a writer that appends where the old one stopped.
 * The run's time axis carries on from its start (wall time), so time_s keeps
 * growing across the gap.
 */
import { join, resolve } from 'node:path';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { AppendFile } from './append-file.ts';
import { splitCsvLine } from './csv-cells.ts';
import { runFolder } from './store-path.ts';
import { EVENTS_JSONL, SAMPLES_CSV, writeRunMeta } from './run-meta.ts';
import { lastTimeS, readRunStatus } from './run-reader.ts';
import { startWriter } from './start-writer.ts';
import type { RunWriter, WriterOptions } from './writer-types.ts';
import { StoreError } from './store-error.ts';
import { type StoreFileHandle, type StoreFs, nodeStoreFs, readFileIfExists } from './store-fs.ts';
import { makeLock, registerOpenWriter, unregisterOpenWriter, writeLock } from './writer-lock.ts';

export interface ReopenRunOptions extends WriterOptions {
  runsDir: string;
  id: string;
}

/** Opens `path` for appending with everything after its last newline cut off. */
async function openWhole(fs: StoreFs, path: string): Promise<{ handle: StoreFileHandle; text: string; bytes: number }> {
  const text = await readFileIfExists(fs, path);
  const whole = text.slice(0, text.lastIndexOf('\n') + 1);
  const bytes = Buffer.byteLength(whole, 'utf8');
  const handle = await fs.open(path, 'a');
  if (whole.length !== text.length) await handle.truncate(bytes);
  return { handle, text: whole, bytes };
}

export async function reopenRun(options: ReopenRunOptions): Promise<RunWriter> {
  const fs = options.fs ?? nodeStoreFs;
  let dir: string;
  try {
    dir = resolve(runFolder(options.runsDir, options.id));
  } catch (error) {
    throw new StoreError((error as Error).message, 'bad-input');
  }
  const before = await readRunStatus(dir, { fs }).catch((error: Error) => {
    throw new StoreError(error.message, 'not-found');
  });
  if (before.status === 'running')
    throw new StoreError(`run ${before.id} is still being recorded by a live process`, 'busy');
  if (before.status !== 'interrupted') {
    throw new StoreError(`run ${before.id} is ${before.status}; only an interrupted run can be resumed`, 'bad-state');
  }
  const { clock } = options;
  await writeLock(fs, dir, makeLock(before.startedAt, (options.wallNowMs ?? Date.now)()));
  const samples = await openWhole(fs, join(dir, SAMPLES_CSV));
  const events = await openWhole(fs, join(dir, EVENTS_JSONL));
  const headerLine = samples.text.slice(0, samples.text.indexOf('\n'));
  const columns = splitCsvLine(headerLine) ?? [];
  if (columns.length === 0 || headerLine === '') {
    await samples.handle.close();
    await events.handle.close();
    throw new StoreError(`run ${before.id}: samples.csv has no header row; cannot resume`, 'bad-state');
  }
  const lastS = await lastTimeS(fs, dir, events.text);
  // Elapsed wall time since the start; never behind what is already on disk.
  const wallElapsedS = (Date.parse(clock.wallTimeIso()) - Date.parse(before.startedAt)) / 1000;
  const resumeS = Number.isFinite(wallElapsedS) && wallElapsedS > lastS ? wallElapsedS : lastS;
  const meta: RunMeta = { ...before, status: 'running', endedAt: null };
  // Known as this process's writer before run.json says `running` (see createRun).
  registerOpenWriter(dir);
  await writeRunMeta(fs, dir, meta).catch((error: unknown) => {
    unregisterOpenWriter(dir);
    throw error;
  });
  const writer = startWriter({
    ...options,
    fs,
    meta,
    dir,
    columns,
    samples: new AppendFile(samples.handle, samples.bytes, join(dir, SAMPLES_CSV)),
    events: new AppendFile(events.handle, events.bytes, join(dir, EVENTS_JSONL)),
    startOffsetS: resumeS,
  });
  writer.appendEvent({
    type: 'gap',
    time_s: resumeS,
    fromS: lastS,
    toS: resumeS,
    reason: 'resumed after the writer stopped',
  });
  await writer.flush();
  return writer;
}
