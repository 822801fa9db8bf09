/**
 * Runs a CSV import in a worker thread with its own bounded heap: a large or
 * hostile file costs the worker, never the main thread that serves Stop and
 * keeps the bench safe. The text is already capped (MAX_IMPORT_CHARS) by the
 * call's schema; the worker's heap limit bounds what parsing it may take.
 */
import { Worker } from 'node:worker_threads';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { BenchApiError } from './errors.ts';

export interface ImportJob {
  runsDir: string;
  fileName: string;
  csvText: string;
  dutId: string;
}

export type ImportJobResult = { ok: true; meta: RunMeta } | { ok: false; message: string };

/** Heap the worker may use; a 64 MiB CSV parses in well under this. */
export const IMPORT_WORKER_HEAP_MB = 1024;

/** The worker's entry: the tsx bootstrap beside the sources, or the compiled bundle's own file. */
function workerEntry(): URL {
  const here = import.meta.url;
  return /\.ts(\?.*)?$/.test(here) ? new URL('./import-worker-entry.mjs', here) : new URL('./import-worker.js', here);
}

export function importCsvOffThread(job: ImportJob): Promise<RunMeta> {
  return new Promise((resolve, reject) => {
    let settled = false;
    const finish = (action: () => void): void => {
      if (settled) return;
      settled = true;
      action();
    };
    const worker = new Worker(workerEntry(), { workerData: job, resourceLimits: { maxOldGenerationSizeMb: IMPORT_WORKER_HEAP_MB } });
    worker.once('message', (result: ImportJobResult) => {
      finish(() => (result.ok ? resolve(result.meta) : reject(new BenchApiError(result.message))));
      void worker.terminate();
    });
    worker.once('error', (error: Error & { code?: string }) => {
      const message =
        error.code === 'ERR_WORKER_OUT_OF_MEMORY'
          ? `importing ${job.fileName} needed more than ${IMPORT_WORKER_HEAP_MB} MB; split the file`
          : `importing ${job.fileName} failed: ${error.message}`;
      finish(() => reject(new BenchApiError(message)));
    });
    worker.once('exit', (code) => finish(() => reject(new BenchApiError(`importing ${job.fileName} stopped unexpectedly (worker exit ${code})`))));
  });
}
