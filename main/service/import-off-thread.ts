/**
 * Runs a CSV import in a worker thread with its own bounded heap: a large or
 * hostile file costs the worker, never the main thread that serves Stop and
 * keeps the bench safe. The text arrives whole (IPC, small WebSocket calls)
 * or streamed as UTF-8 slices (the WebSocket's binary parts, app/contract/
 * wire.ts), which go to the worker as they come, never joined on main.
 */
import { Worker } from 'node:worker_threads';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { BenchApiError } from './errors.ts';

export interface ImportTarget {
  runsDir: string;
  fileName: string;
  dutId: string;
}

export interface ImportJob extends ImportTarget {
  csvText: string;
}

export type ToImportWorker = { kind: 'text'; text: string } | { kind: 'slice'; bytes: Uint8Array } | { kind: 'end' };
export type ImportJobResult = { ok: true; meta: RunMeta } | { ok: false; message: string };

/** An import being fed slice by slice. */
export interface ImportStream {
  /** Hands the next UTF-8 slice to the worker (moved, not copied: do not use `bytes` afterwards). */
  push(bytes: Uint8Array): void;
  /** No more slices: parse, write, and resolve with the new run. */
  finish(): Promise<RunMeta>;
  /** Drops the import (the page went away or broke the rules). */
  abort(): void;
}

/** Heap the worker may use; a 64 MiB CSV parses in well under this. */
export const IMPORT_WORKER_HEAP_MB = 1024;

/** The worker's entry: the tsx bootstrap beside the sources, or the compiled bundle's own file. */
export function importWorkerEntry(): URL {
  const here = import.meta.url;
  return /\.ts(\?.*)?$/.test(here) ? new URL('./import-worker-entry.mjs', here) : new URL('./import-worker.js', here);
}

interface StartedWorker {
  post(message: ToImportWorker, transfer?: ArrayBuffer[]): void;
  result(): Promise<RunMeta>;
  abort(): void;
}

function startWorker(target: ImportTarget): StartedWorker {
  const data: ImportTarget = { runsDir: target.runsDir, fileName: target.fileName, dutId: target.dutId };
  const worker = new Worker(importWorkerEntry(), {
    workerData: data,
    resourceLimits: { maxOldGenerationSizeMb: IMPORT_WORKER_HEAP_MB },
  });
  let settle: ((outcome: ImportJobResult) => void) | null = null;
  const outcome = new Promise<ImportJobResult>((resolve) => (settle = resolve));
  const finishWith = (result: ImportJobResult): void => {
    settle?.(result);
    settle = null;
    void worker.terminate();
  };
  worker.once('message', (result: ImportJobResult) => finishWith(result));
  worker.once('error', (error: Error & { code?: string }) =>
    finishWith({
      ok: false,
      message:
        error.code === 'ERR_WORKER_OUT_OF_MEMORY'
          ? `importing ${target.fileName} needed more than ${IMPORT_WORKER_HEAP_MB} MB; split the file`
          : `importing ${target.fileName} failed: ${error.message}`,
    }),
  );
  worker.once('exit', (code) =>
    finishWith({ ok: false, message: `importing ${target.fileName} stopped unexpectedly (worker exit ${code})` }),
  );
  return {
    post(message, transfer = []) {
      if (settle) worker.postMessage(message, transfer);
    },
    async result() {
      const result = await outcome;
      if (!result.ok) throw new BenchApiError(result.message);
      return result.meta;
    },
    abort: () => finishWith({ ok: false, message: `importing ${target.fileName} was dropped` }),
  };
}

export function openImportStream(target: ImportTarget): ImportStream {
  const worker = startWorker(target);
  return {
    push(bytes) {
      // Its own buffer, moved to the worker: nothing of the file stays on this thread.
      const whole =
        bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer;
      const owned = whole ? bytes : bytes.slice();
      worker.post({ kind: 'slice', bytes: owned }, [owned.buffer as ArrayBuffer]);
    },
    finish() {
      worker.post({ kind: 'end' });
      return worker.result();
    },
    abort: () => worker.abort(),
  };
}

/** An import whose text is already whole (IPC, a small WebSocket call): one message, parsed in the worker. */
export function importCsvOffThread(job: ImportJob): Promise<RunMeta> {
  const worker = startWorker(job);
  worker.post({ kind: 'text', text: job.csvText });
  worker.post({ kind: 'end' });
  return worker.result();
}
