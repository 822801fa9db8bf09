/**
 * The run writer: creates a run folder and appends to it as a procedure goes.
 *
 * Durability: pending rows and events are written (one write per file) at
 * least every `flushEveryS` seconds of the injected clock (default 1 s) and
 * whenever the procedure calls flush() (end of each point), so a killed
 * process loses at most the last second. Files are fsynced at most once per
 * real second and at finish, bounding a power loss to about the same.
 * run.json is only ever replaced atomically. writer.lock carries pid, host
 * and a heartbeat so readers can tell a dead writer.
 */
import { join, resolve } from 'node:path';
import { AppendFile } from './append-file.ts';
import { dutIdSchema, makeRunId } from './run-id.ts';
import { EVENTS_JSONL, SAMPLES_CSV, writeRunMeta } from './run-meta.ts';
import { startingRunMeta } from './starting-meta.ts';
import { startWriter } from './start-writer.ts';
import { type StoreFileHandle, type StoreFs, errorCode, nodeStoreFs } from './store-fs.ts';
import type { CreateRunOptions, RunWriter } from './writer-types.ts';
import { makeLock, registerOpenWriter, unregisterOpenWriter, writeLock } from './writer-lock.ts';

export type { CreateRunOptions, RunEventInput, RunWriter, SampleRow, WriterOptions } from './writer-types.ts';

const COLUMN_NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

export function validateColumns(columns: readonly string[]): void {
  if (columns.length === 0) throw new RangeError('columns: expected at least one column name');
  const seen = new Set<string>();
  for (const name of columns) {
    if (!COLUMN_NAME.test(name))
      throw new RangeError(`columns: expected names like "frequency_hz", got ${JSON.stringify(name)}`);
    if (seen.has(name)) throw new RangeError(`columns: "${name}" appears twice`);
    seen.add(name);
  }
}

/** Makes the run folder with a fresh id (adding -2, -3… if the second is taken). */
export async function makeRunDir(fs: StoreFs, runsDir: string, baseId: string): Promise<{ id: string; dir: string }> {
  await fs.mkdir(runsDir, { recursive: true });
  for (let n = 1; n < 1000; n++) {
    const id = n === 1 ? baseId : `${baseId}-${n}`;
    const dir = join(runsDir, id);
    const inTrash = await fs.stat(join(runsDir, '.trash', id)).then(
      () => true,
      () => false,
    );
    if (inTrash) continue;
    try {
      await fs.mkdir(dir);
      return { id, dir };
    } catch (error) {
      if (errorCode(error) !== 'EEXIST') throw error;
    }
  }
  throw new Error(`cannot find a free run id for ${baseId}`);
}

export async function createRun(options: CreateRunOptions): Promise<RunWriter> {
  const fs = options.fs ?? nodeStoreFs;
  validateColumns(options.columns);
  const dutId = dutIdSchema.parse(options.dut.id);
  const startedAt = options.clock.wallTimeIso();
  const runsDir = resolve(options.runsDir);
  const { id, dir } = await makeRunDir(fs, runsDir, makeRunId(startedAt, dutId));
  const meta = startingRunMeta(options, { id, startedAt, dutId });
  const wallNowMs = options.wallNowMs ?? Date.now;
  const header = `${options.columns.join(',')}\n`;
  const opened: StoreFileHandle[] = [];
  // This process's writer is known before run.json says `running`: a listing in this process that read
  // run.json before the writer started (the directory fsync after its rename is slow on a busy disk) found
  // no writer and recorded the live run `interrupted` (seen in the browser tests at load 18).
  registerOpenWriter(dir);
  try {
    await writeLock(fs, dir, makeLock(startedAt, wallNowMs()));
    const samples = await fs.open(join(dir, SAMPLES_CSV), 'a');
    opened.push(samples);
    await samples.write(header);
    const events = await fs.open(join(dir, EVENTS_JSONL), 'a');
    opened.push(events);
    await writeRunMeta(fs, dir, meta);
    return startWriter({
      ...options,
      fs,
      meta,
      dir,
      samples: new AppendFile(samples, Buffer.byteLength(header), join(dir, SAMPLES_CSV)),
      events: new AppendFile(events, 0, join(dir, EVENTS_JSONL)),
      startOffsetS: 0,
    });
  } catch (error) {
    // No half-made run folder: nothing was recorded in it yet.
    unregisterOpenWriter(dir);
    for (const handle of opened) await handle.close().catch(() => undefined);
    await fs.rm(dir, { recursive: true, force: true }).catch(() => undefined);
    throw error;
  }
}
