/**
 * Reads a run folder. Every reader goes through here, so every reader shows
 * a run whose writer is gone as `interrupted` — and the first one to notice
 * records it (run.json replaced atomically, an `interrupted` event appended),
 * guarded by an exclusive claim file so two readers do not both record it.
 */
import { hostname } from 'node:os';
import { join, resolve } from 'node:path';
import type { RunEvent, RunMeta } from '../../app/contract/bench-api.ts';
import { eventLineAfter, parseEventsJsonl } from './events-jsonl.ts';
import { EVENTS_JSONL, SAMPLES_CSV, readRunMeta, writeRunMeta } from './run-meta.ts';
import { parseSamplesCsv } from './samples-csv.ts';
import { type StoreFs, errorCode, nodeStoreFs, readFileIfExists } from './store-fs.ts';
import { type LivenessProbe, type WriterLock, readLock, realProbe, removeLock, writerAlive } from './writer-lock.ts';

export const INTERRUPT_CLAIM = 'interrupted.claim';
/** A claim older than this is left over from a reader that died while recording. */
const STALE_CLAIM_MS = 30_000;

export interface ReadOptions {
  fs?: StoreFs;
  probe?: LivenessProbe;
}

export interface RunFolderContents {
  meta: RunMeta;
  samplesCsv: string;
  events: RunEvent[];
  /** Line numbers of events.jsonl lines that were torn or malformed and skipped. */
  droppedEventLines: number[];
}

/** `withoutSamples`: leave samples.csv unread (samplesCsv ''), when its table comes from the column cache. */
export async function readRunFolder(
  dir: string,
  options: ReadOptions & { withoutSamples?: boolean } = {},
): Promise<RunFolderContents> {
  const fs = options.fs ?? nodeStoreFs;
  const absDir = resolve(dir);
  let meta = await readRunMeta(fs, absDir);
  if (meta.status === 'running') meta = await applyLiveness(fs, absDir, meta, options.probe);
  const samplesCsv = options.withoutSamples === true ? '' : await readFileIfExists(fs, join(absDir, SAMPLES_CSV));
  const { events, droppedLines } = parseEventsJsonl(await readFileIfExists(fs, join(absDir, EVENTS_JSONL)));
  return { meta, samplesCsv, events, droppedEventLines: droppedLines };
}

/** Reads run.json only, with the interrupted rule applied (for listings). */
export async function readRunStatus(dir: string, options: ReadOptions = {}): Promise<RunMeta> {
  const fs = options.fs ?? nodeStoreFs;
  const absDir = resolve(dir);
  const meta = await readRunMeta(fs, absDir);
  return meta.status === 'running' ? applyLiveness(fs, absDir, meta, options.probe) : meta;
}

/** For a `running` run: unchanged if its writer is alive, otherwise `interrupted` (recorded if we can). */
export async function applyLiveness(fs: StoreFs, dir: string, meta: RunMeta, probe?: LivenessProbe): Promise<RunMeta> {
  const lock = await readLock(fs, dir);
  if (writerAlive(lock, dir, probe ?? realProbe())) return meta;
  const shown: RunMeta = { ...meta, status: 'interrupted', endedAt: lock?.heartbeatAt ?? meta.endedAt };
  try {
    return (await recordInterrupted(fs, dir, lock)) ?? shown;
  } catch {
    // A read-only folder, a full disk: still show it as interrupted.
    return shown;
  }
}

async function claim(fs: StoreFs, path: string): Promise<boolean> {
  const body = JSON.stringify({ pid: process.pid, host: hostname(), at: new Date().toISOString() });
  try {
    await fs.writeFile(path, body, { flag: 'wx' });
    return true;
  } catch (error) {
    if (errorCode(error) !== 'EEXIST') throw error;
    const stat = await fs.stat(path).catch(() => null);
    if (stat === null || Date.now() - stat.mtimeMs < STALE_CLAIM_MS) return false;
    await fs.rm(path, { force: true });
    return claim(fs, path);
  }
}

/** Records the interruption; null if another reader holds the claim. */
async function recordInterrupted(fs: StoreFs, dir: string, lock: WriterLock | null): Promise<RunMeta | null> {
  const claimPath = join(dir, INTERRUPT_CLAIM);
  if (!(await claim(fs, claimPath))) return null;
  try {
    const current = await readRunMeta(fs, dir);
    if (current.status !== 'running') return current;
    const eventsPath = join(dir, EVENTS_JSONL);
    const eventsText = await readFileIfExists(fs, eventsPath);
    const event: RunEvent = {
      time_s: await lastTimeS(fs, dir, eventsText),
      type: 'interrupted',
      detectedAt: new Date().toISOString(),
      lastHeartbeatAt: lock?.heartbeatAt ?? null,
      writerPid: lock?.pid ?? null,
      writerHost: lock?.host ?? null,
    };
    await fs.appendFile(eventsPath, eventLineAfter(eventsText, event));
    const recorded: RunMeta = { ...current, status: 'interrupted', endedAt: lock?.heartbeatAt ?? current.endedAt };
    await writeRunMeta(fs, dir, recorded);
    await removeLock(fs, dir);
    return recorded;
  } finally {
    await fs.rm(claimPath, { force: true }).catch(() => undefined);
  }
}

/** The last time on the run's axis that made it to disk (samples or events). */
export async function lastTimeS(fs: StoreFs, dir: string, eventsText: string): Promise<number> {
  let last = 0;
  for (const event of parseEventsJsonl(eventsText).events) if (event.time_s > last) last = event.time_s;
  const samples = parseSamplesCsv(await readFileIfExists(fs, join(dir, SAMPLES_CSV)));
  const times = samples.numeric.time_s;
  if (times) for (const t of times) if (t > last) last = t;
  return last;
}
