/**
 * Imported first by the import worker, for its side effect: an import must
 * never take CPU from the thread that serves Stop. On Linux a thread's nice
 * value is its own (setpriority(2), "BUGS": per-thread under NPTL), so the
 * worker lowers just itself, before the rest of its modules load; elsewhere
 * the call would lower the whole process, so it is left alone.
 */
import { setPriority } from 'node:os';
import { workerData } from 'node:worker_threads';

export const IMPORT_WORKER_NICE = 10;

// A drift log's analysis (./drift-analysis-off-thread.ts) keeps its priority: a person waits for it, as for the
// page's own analysis before, and on a busy machine a niced worker would get a few per cent of a core. Main's
// thread, which serves Stop, still gets its own share of the CPU beside it.
const isDriftAnalysis = typeof workerData === 'object' && workerData !== null && 'driftJob' in workerData;

if (process.platform === 'linux' && !isDriftAnalysis) {
  try {
    setPriority(0, IMPORT_WORKER_NICE);
  } catch {
    // Not allowed here (a locked-down container): the worker runs at normal priority.
  }
}
