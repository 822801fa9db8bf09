/**
 * Operations on the runs folder: list, open, rename the DUT, add a note,
 * delete to `<runs>/.trash/<id>` and restore. Every id from outside passes
 * the run id schema first. Edits to run.json are read-modify-write with an
 * atomic replace, serialised per run within this process.
 */
import { join, resolve } from 'node:path';
import { z } from 'zod';
import type { RunDetail, RunMeta } from '../../app/contract/bench-api.ts';
import { eventLineAfter } from './events-jsonl.ts';
import { assertRunId, dutIdSchema } from './run-id.ts';
import { EVENTS_JSONL, SAMPLES_CSV, readRunMeta, writeRunMeta } from './run-meta.ts';
import { openSamples } from './cached-samples.ts';
import { type ReadOptions, lastTimeS, readRunFolder, readRunStatus } from './run-reader.ts';
import type { SampleTable } from './sample-table.ts';
import { StoreError } from './store-error.ts';
import { type StoreFs, errorCode, nodeStoreFs, readFileIfExists } from './store-fs.ts';

export const TRASH = '.trash';

export const noteSchema = z
  .string({ error: 'note: expected text' })
  .trim()
  .min(1, 'note: must not be empty')
  .max(10_000, 'note: at most 10000 characters')
  .refine((text) => !/[\u0000-\u0008\u000b-\u001f\u007f]/.test(text), 'note: must not contain control characters');

export interface ListResult {
  runs: RunMeta[];
  /** Folders that look like runs but could not be read, with the reason. */
  problems: { name: string; message: string }[];
  /** Campaign folders (campaign.json; their runs are inside): names only. */
  campaigns?: string[];
}

export interface OpenedRun extends RunDetail {
  /** Float64Array numeric and dictionary-coded text columns (the fast reader; same rows as parseSamplesCsv). */
  samples: SampleTable;
  droppedEventLines: number[];
}

function fsOf(options: ReadOptions): StoreFs {
  return options.fs ?? nodeStoreFs;
}

function checkedId(id: unknown): string {
  try {
    return assertRunId(id);
  } catch (error) {
    throw new StoreError((error as Error).message, 'bad-input');
  }
}

async function exists(fs: StoreFs, path: string): Promise<boolean> {
  return fs.stat(path).then(
    () => true,
    () => false,
  );
}

/** Every run in `runsDir`, newest first (by start time, then id), interrupted status applied. */
export async function listRunsDetailed(runsDir: string, options: ReadOptions = {}): Promise<ListResult> {
  const fs = fsOf(options);
  let names: string[];
  try {
    names = await fs.readdir(runsDir);
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return { runs: [], problems: [] };
    throw error;
  }
  const result: ListResult = { runs: [], problems: [] };
  for (const name of names) {
    if (name.startsWith('.')) continue;
    try {
      assertRunId(name);
    } catch {
      continue; // not a run folder name; not ours to report
    }
    const dir = join(runsDir, name);
    const stat = await fs.stat(dir).catch(() => null);
    if (!stat?.isDirectory()) continue;
    if (!(await exists(fs, join(dir, 'run.json'))) && (await exists(fs, join(dir, 'campaign.json')))) {
      (result.campaigns ??= []).push(name);
      continue;
    }
    try {
      result.runs.push(await readRunStatus(dir, options));
    } catch (error) {
      result.problems.push({ name, message: (error as Error).message });
    }
  }
  result.runs.sort((a, b) =>
    a.startedAt === b.startedAt ? b.id.localeCompare(a.id) : a.startedAt < b.startedAt ? 1 : -1,
  );
  return result;
}

export async function listRuns(runsDir: string, options: ReadOptions = {}): Promise<RunMeta[]> {
  return (await listRunsDetailed(runsDir, options)).runs;
}

async function runDir(fs: StoreFs, runsDir: string, id: unknown): Promise<string> {
  const dir = join(runsDir, checkedId(id));
  if (!(await exists(fs, join(dir, 'run.json'))))
    throw new StoreError(`no run "${String(id)}" in ${runsDir}`, 'not-found');
  return dir;
}

export async function openRun(runsDir: string, id: string, options: ReadOptions = {}): Promise<OpenedRun> {
  const dir = await runDir(fsOf(options), runsDir, id);
  const samples = await openSamples(join(dir, SAMPLES_CSV), options, (withoutSamples) =>
    readRunFolder(dir, { ...options, withoutSamples }),
  );
  return {
    meta: samples.run.meta,
    samples: samples.table,
    events: samples.run.events,
    droppedEventLines: samples.run.droppedEventLines,
  };
}

const editQueues = new Map<string, Promise<unknown>>();

/** Runs `edit` after any earlier edit of the same run in this process. */
function serialised<T>(dir: string, edit: () => Promise<T>): Promise<T> {
  const key = resolve(dir);
  const next = (editQueues.get(key) ?? Promise.resolve()).then(edit, edit);
  const settled = next.catch(() => undefined);
  editQueues.set(key, settled);
  void settled.then(() => {
    if (editQueues.get(key) === settled) editQueues.delete(key);
  });
  return next;
}

export async function renameDut(
  runsDir: string,
  id: string,
  dutId: string,
  options: ReadOptions = {},
): Promise<RunMeta> {
  const fs = fsOf(options);
  const parsed = dutIdSchema.safeParse(dutId);
  if (!parsed.success) throw new StoreError(parsed.error.issues[0]?.message ?? 'dut id: invalid', 'bad-input');
  // Join the run's queue before any await: edits then apply in call order.
  const dir = join(runsDir, checkedId(id));
  return serialised(dir, async () => {
    await runDir(fs, runsDir, id);
    const meta = await readRunStatus(dir, options);
    const renamed: RunMeta = { ...meta, dut: { ...meta.dut, id: parsed.data } };
    await writeRunMeta(fs, dir, renamed);
    return renamed;
  });
}

/** Appends to dut.notes (one line per note) and records a `note` event. */
export async function addNote(runsDir: string, id: string, text: string, options: ReadOptions = {}): Promise<RunMeta> {
  const fs = fsOf(options);
  const parsed = noteSchema.safeParse(text);
  if (!parsed.success) throw new StoreError(parsed.error.issues[0]?.message ?? 'note: invalid', 'bad-input');
  const note = parsed.data;
  const dir = join(runsDir, checkedId(id));
  return serialised(dir, async () => {
    await runDir(fs, runsDir, id);
    const eventsPath = join(dir, EVENTS_JSONL);
    const eventsText = await readFileIfExists(fs, eventsPath);
    const event = {
      time_s: await lastTimeS(fs, dir, eventsText),
      type: 'note',
      text: note,
      at: new Date().toISOString(),
    };
    await fs.appendFile(eventsPath, eventLineAfter(eventsText, event));
    const meta = await readRunStatus(dir, options);
    const notes = meta.dut.notes === '' ? note : `${meta.dut.notes}\n${note}`;
    const updated: RunMeta = { ...meta, dut: { ...meta.dut, notes } };
    await writeRunMeta(fs, dir, updated);
    return updated;
  });
}

/** Moves a run to `<runs>/.trash/<id>`; a run still being written is refused. */
export async function deleteRun(runsDir: string, id: string, options: ReadOptions = {}): Promise<void> {
  const fs = fsOf(options);
  const dir = await runDir(fs, runsDir, id);
  const safeId = checkedId(id);
  const meta = await readRunStatus(dir, options);
  if (meta.status === 'running') throw new StoreError(`run ${id} is still being recorded; stop it first`, 'busy');
  // The folder moves under its own validated name, never under the id written inside run.json.
  if (meta.id !== safeId)
    throw new StoreError(`run folder ${safeId} holds a run.json whose id differs; it was not moved`, 'bad-input');
  const trashDir = join(runsDir, TRASH);
  await fs.mkdir(trashDir, { recursive: true });
  const target = join(trashDir, safeId);
  if (await exists(fs, target))
    throw new StoreError(`the trash already holds a run ${id}; restore or empty it first`, 'exists');
  await fs.rename(dir, target);
}

/** Moves a run back from the trash. */
export async function restoreRun(runsDir: string, id: string, options: ReadOptions = {}): Promise<RunMeta> {
  const fs = fsOf(options);
  const safeId = checkedId(id);
  const source = join(runsDir, TRASH, safeId);
  if (!(await exists(fs, source))) throw new StoreError(`no run "${safeId}" in the trash`, 'not-found');
  const target = join(runsDir, safeId);
  if (await exists(fs, target))
    throw new StoreError(`a run ${safeId} already exists; it was not overwritten`, 'exists');
  await fs.rename(source, target);
  return readRunMeta(fs, target);
}

/** Runs in the trash, newest first. */
export async function listTrash(runsDir: string, options: ReadOptions = {}): Promise<RunMeta[]> {
  return listRuns(join(runsDir, TRASH), options);
}
