/**
 * A big drift log's analysis (app/analysis/drift-run-view.ts) in a worker
 * thread: on 10,000,000 readings it takes seconds, and main's thread serves
 * Stop and keeps the bench safe meanwhile. The held columns are shared with
 * the worker (SharedArrayBuffer), never copied. The worker is the import worker's niced entry
 * (./import-worker.ts), so every build already carries it.
 */
import { Worker } from 'node:worker_threads';
import type { DriftAnalysisJob } from '../../app/analysis/drift-run-view.ts';
import type { RunAnalysis } from '../../app/contract/run-window.ts';
import { IMPORT_WORKER_HEAP_MB, importWorkerEntry } from './import-off-thread.ts';
import type { DriftAnalyzer } from './run-opener.ts';

export interface DriftWorkerData {
  driftJob: DriftAnalysisJob;
}

const failed = (message: string, holdV: number | null): RunAnalysis => ({
  outcome: { ok: false, message },
  tempco: null,
  holdV,
});

export const analyzeOffThread: DriftAnalyzer = (job) =>
  new Promise((resolve) => {
    // Shared buffers are read in place by the worker; a buffer of the job's own is moved, not copied.
    const buffers = [
      job.timeS.buffer,
      job.frequencyHz.buffer,
      ...(job.temperatureC ? [job.temperatureC.buffer] : []),
    ].filter((buffer): buffer is ArrayBuffer => buffer instanceof ArrayBuffer);
    const workerData: DriftWorkerData = { driftJob: job };
    const worker = new Worker(importWorkerEntry(), {
      workerData,
      transferList: buffers,
      resourceLimits: { maxOldGenerationSizeMb: IMPORT_WORKER_HEAP_MB },
    });
    let done = false;
    const finish = (result: RunAnalysis): void => {
      if (done) return;
      done = true;
      resolve(result);
      void worker.terminate();
    };
    worker.once('message', (result: RunAnalysis) => finish(result));
    worker.once('error', (error: Error & { code?: string }) =>
      finish(
        failed(
          error.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? `the analysis needed more than ${IMPORT_WORKER_HEAP_MB} MB`
            : `the analysis failed: ${error.message}`,
          job.holdV,
        ),
      ),
    );
    worker.once('exit', (code) => finish(failed(`the analysis stopped unexpectedly (worker exit ${code})`, job.holdV)));
  });
