/**
 * The running writer over already-open files, shared by createRun and
 * reopenRun: buffers rows as one string, writes it with one write per file
 * per flush (timer on the injected clock, or flush() at the end of a point),
 * fsyncs at most once per real second, beats the writer.lock heartbeat, and
 * on finish records the final status in run.json atomically.
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { AppendFile } from './append-file.ts';
import { formatCell, type CellValue } from './csv-cells.ts';
import { join } from 'node:path';
import { SAMPLES_CSV, readRunMeta, writeRunMeta } from './run-meta.ts';
import { RunFolderGoneError } from './store-error.ts';
import { type StoreFs, errorCode } from './store-fs.ts';
import type { RunWriter, WriterOptions } from './writer-types.ts';
import { makeLock, registerOpenWriter, removeLock, unregisterOpenWriter, writeLock } from './writer-lock.ts';

/** fsync at most this often (real time): bounds loss on power failure without wearing the disk. */
const SYNC_EVERY_MS = 1000;
/** writer.lock heartbeat period (real time); readers on other hosts give up after STALE_HEARTBEAT_S. */
const HEARTBEAT_EVERY_MS = 10_000;

export interface WriterState extends WriterOptions {
  fs: StoreFs;
  meta: RunMeta;
  dir: string;
  columns: readonly string[];
  samples: AppendFile;
  events: AppendFile;
  /** Elapsed run time at the moment the writer starts (non-zero when resuming). */
  startOffsetS: number;
}

/** Shared by createRun and reopenRun: the writer over already-open files. */
export function startWriter(state: WriterState): RunWriter {
  const { fs, dir, clock, columns, samples, events } = state;
  const flushEveryS = state.flushEveryS ?? 1;
  if (!(flushEveryS > 0 && flushEveryS <= 1))
    throw new RangeError(`flushEveryS: expected a number in (0, 1], got ${flushEveryS}`);
  const wallNowMs = state.wallNowMs ?? Date.now;
  const t0 = clock.now() - state.startOffsetS;
  let meta = state.meta;
  let lastSyncMs = wallNowMs();
  let lastHeartbeatMs = lastSyncMs;
  let unsynced = false;
  let chain: Promise<void> = Promise.resolve();
  let finishing: Promise<RunMeta> | null = null;
  let cancelTimer: () => void = () => undefined;
  let armed = false;
  let syncTimer: ReturnType<typeof setTimeout> | undefined;
  registerOpenWriter(dir);

  const elapsedS = (): number => clock.now() - t0;
  const report = (error: unknown): void => state.onError?.(error instanceof Error ? error : new Error(String(error)));

  /**
   * A deleted run folder does not fail our writes (the open files live on,
   * unlinked), so every flush first checks that samples.csv is still there.
   */
  async function checkFolder(): Promise<void> {
    try {
      await fs.stat(join(dir, SAMPLES_CSV));
    } catch (error) {
      const code = errorCode(error);
      if (code === 'ENOENT' || code === 'ENOTDIR') throw new RunFolderGoneError(dir);
      throw error;
    }
  }

  async function writeOut(forceSync: boolean): Promise<void> {
    await checkFolder();
    const wrote = samples.pendingCount + events.pendingCount > 0;
    await samples.drain();
    await events.drain();
    unsynced ||= wrote;
    const now = wallNowMs();
    if (unsynced && (forceSync || now - lastSyncMs >= SYNC_EVERY_MS)) {
      lastSyncMs = now;
      unsynced = false;
      await samples.sync();
      await events.sync();
    }
    if (!forceSync && now - lastHeartbeatMs >= HEARTBEAT_EVERY_MS) {
      lastHeartbeatMs = now;
      await writeLock(fs, dir, makeLock(meta.startedAt, now));
    }
    if (unsynced && !forceSync) scheduleSync();
  }

  function enqueue(forceSync: boolean): Promise<void> {
    const next = chain.then(() => writeOut(forceSync));
    chain = next.catch(() => undefined);
    return next;
  }

  // The flush timer runs on the injected clock and only while something is
  // pending, so a virtual clock sees no endless timer from an idle writer.
  function tick(): void {
    armed = false;
    enqueue(false).catch((error: unknown) => {
      report(error);
      arm(); // the data is still pending: try again within a period
    });
  }
  function arm(): void {
    if (armed || finishing) return;
    armed = true;
    cancelTimer = clock.setTimer(flushEveryS, tick);
  }

  // fsync and heartbeat are about the real world (power loss, other hosts),
  // so they ride on real, unref'd timers that never hold the process open.
  function scheduleSync(): void {
    if (syncTimer !== undefined) return;
    syncTimer = setTimeout(() => {
      syncTimer = undefined;
      if (!finishing) enqueue(false).catch(report);
    }, SYNC_EVERY_MS);
    syncTimer.unref();
  }
  const heartbeat = setInterval(() => {
    if (!finishing) enqueue(false).catch(report);
  }, HEARTBEAT_EVERY_MS);
  heartbeat.unref();

  /** The disk refused the run's files: record the run as failed, with the reason, where the disk still allows. */
  async function recordFailure(error: unknown): Promise<void> {
    const reason = error instanceof Error ? error.message : String(error);
    await samples.closeAtWholeLine().catch(() => undefined);
    await events.closeAtWholeLine().catch(() => undefined);
    try {
      const onDisk = await readRunMeta(fs, dir).catch(() => meta);
      meta = { ...onDisk, status: 'failed', endedAt: clock.wallTimeIso(), failure: reason };
      await writeRunMeta(fs, dir, meta);
      await removeLock(fs, dir);
    } catch {
      // The folder is gone or the disk is full even for run.json: a reader will find it interrupted.
    }
    unregisterOpenWriter(dir);
  }

  function assertOpen(): void {
    if (finishing) throw new Error(`run ${meta.id}: already finished`);
  }

  return {
    id: meta.id,
    dir,
    columns,
    meta: () => meta,
    elapsedS,
    appendSample(row) {
      assertOpen();
      let line = '';
      const byIndex = Array.isArray(row);
      for (let c = 0; c < columns.length; c++) {
        if (c > 0) line += ',';
        line += formatCell(
          byIndex
            ? (row as readonly CellValue[])[c]
            : (row as Readonly<Record<string, CellValue>>)[columns[c] as string],
        );
      }
      samples.push(`${line}\n`);
      arm();
    },
    appendEvent(event) {
      assertOpen();
      const record = { ...event, time_s: event.time_s ?? elapsedS(), type: event.type };
      events.push(`${JSON.stringify(record)}\n`);
      arm();
    },
    flush: () => enqueue(false),
    finish(status, extra) {
      finishing ??= (async () => {
        cancelTimer();
        armed = false;
        clearInterval(heartbeat);
        clearTimeout(syncTimer);
        syncTimer = undefined;
        try {
          // A second try: the first may have been a passing fault (its partial write is cut back first).
          await enqueue(true).catch(() => enqueue(true));
        } catch (error) {
          await recordFailure(error);
          throw error;
        }
        await samples.close();
        await events.close();
        // Keep DUT renames and notes made by other processes while we ran.
        const onDisk = await readRunMeta(fs, dir).catch(() => meta);
        meta = { ...onDisk, ...extra, status, endedAt: clock.wallTimeIso() };
        await writeRunMeta(fs, dir, meta);
        await removeLock(fs, dir);
        unregisterOpenWriter(dir);
        return meta;
      })();
      return finishing;
    },
    pendingRows: () => samples.pendingCount,
    rowsWritten: () => samples.linesWritten,
  };
}
