/**
 * writer.lock: who is writing a running run. Holds the writer's pid, host and
 * a heartbeat (real wall time). A reader decides from it whether a run that
 * run.json calls `running` still has a live writer:
 * - same host: the pid must be alive (signal 0); on Linux it must also be
 *   the same process (start time from /proc/<pid>/stat), since a pid is
 *   reused after a reboot; and if it is this very process, the run must be
 *   open in this process's writer registry;
 * - another host (a shared folder): the heartbeat must be fresh.
 * The lock is replaced by rename (never seen half-written) but not fsynced:
 * after a power loss the writer is gone anyway.
 */
import { readFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { z } from 'zod';
import { type StoreFs, errorCode } from './store-fs.ts';

export const WRITER_LOCK = 'writer.lock';

export const writerLockSchema = z.object({
  pid: z.number().int().positive(),
  host: z.string(),
  startedAt: z.string(),
  heartbeatAt: z.string(),
  /** Linux: the writer's start time in clock ticks since boot (/proc/<pid>/stat field 22). */
  procStart: z.string().optional(),
});
export type WriterLock = z.infer<typeof writerLockSchema>;

/** A heartbeat older than this (real time) means a writer on another host is gone. */
export const STALE_HEARTBEAT_S = 60;

/** Run folders whose writer lives in this process (absolute paths). */
const openInThisProcess = new Set<string>();

export function registerOpenWriter(dir: string): void {
  openInThisProcess.add(dir);
}
export function unregisterOpenWriter(dir: string): void {
  openInThisProcess.delete(dir);
}

/** Start time of process `pid` (Linux /proc, see proc(5)); null where there is no /proc. */
export function procStartOf(pid: number): string | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Field 2 (comm) may hold spaces and parentheses: count fields after the last ')'.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return fields[19] ?? null; // field 22 overall
  } catch {
    return null;
  }
}

const ownProcStart = procStartOf(process.pid);

export function makeLock(startedAtIso: string, nowMs: number): WriterLock {
  const lock: WriterLock = {
    pid: process.pid,
    host: hostname(),
    startedAt: startedAtIso,
    heartbeatAt: new Date(nowMs).toISOString(),
  };
  if (ownProcStart !== null) lock.procStart = ownProcStart;
  return lock;
}

let lockTemp = 0;
export async function writeLock(fs: StoreFs, dir: string, lock: WriterLock): Promise<void> {
  lockTemp += 1;
  const temp = join(dir, `.${WRITER_LOCK}.${process.pid}.${lockTemp}.tmp`);
  try {
    await fs.writeFile(temp, `${JSON.stringify(lock)}\n`);
    await fs.rename(temp, join(dir, WRITER_LOCK));
  } catch (error) {
    // A full disk refuses the heartbeat: leave no empty temp file behind in the run folder.
    await fs.rm(temp, { force: true }).catch(() => undefined);
    throw error;
  }
}

/**
 * The lock, or null when it is missing or not a lock (both mean: no provable
 * writer). Any other failure to read it (EACCES, EIO, EMFILE…) is thrown: a
 * lock we could not read says nothing about the writer, and reading it as
 * "no writer" would mark a live run interrupted and delete its lock.
 */
export async function readLock(fs: StoreFs, dir: string): Promise<WriterLock | null> {
  let text: string;
  try {
    text = await fs.readFile(join(dir, WRITER_LOCK));
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    return null;
  }
  const parsed = writerLockSchema.safeParse(json);
  return parsed.success ? parsed.data : null;
}

export function isPidAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: it exists but belongs to someone else — alive.
    return errorCode(error) === 'EPERM';
  }
}

export interface LivenessProbe {
  host: string;
  pid: number;
  nowMs: number;
  isPidAlive(pid: number): boolean;
  procStartOf(pid: number): string | null;
}

export const realProbe = (): LivenessProbe => ({
  host: hostname(),
  pid: process.pid,
  nowMs: Date.now(),
  isPidAlive,
  procStartOf,
});

/** True when the lock proves a writer is still at work on `dir`. */
export function writerAlive(lock: WriterLock | null, dir: string, probe: LivenessProbe = realProbe()): boolean {
  if (lock === null) return false;
  if (lock.host !== probe.host) {
    const ageS = (probe.nowMs - Date.parse(lock.heartbeatAt)) / 1000;
    return Number.isFinite(ageS) && ageS <= STALE_HEARTBEAT_S;
  }
  if (lock.pid === probe.pid) return openInThisProcess.has(dir);
  if (!probe.isPidAlive(lock.pid)) return false;
  if (lock.procStart === undefined) return true;
  const start = probe.procStartOf(lock.pid);
  // Alive, but a different process under a reused pid: the writer is gone.
  return start === null || start === lock.procStart;
}

export async function removeLock(fs: StoreFs, dir: string): Promise<void> {
  try {
    await fs.rm(join(dir, WRITER_LOCK), { force: true });
  } catch (error) {
    if (errorCode(error) !== 'ENOENT') throw error;
  }
}
