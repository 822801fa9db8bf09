/**
 * Imported first by the import worker, for its side effect: an import must
 * never take CPU from the thread that serves Stop. On Linux a thread's nice
 * value is its own (setpriority(2), "BUGS": per-thread under NPTL), so the
 * worker lowers just itself, before the rest of its modules load; elsewhere
 * the call would lower the whole process, so it is left alone.
 */
import { setPriority } from 'node:os';

export const IMPORT_WORKER_NICE = 10;

if (process.platform === 'linux') {
  try {
    setPriority(0, IMPORT_WORKER_NICE);
  } catch {
    // Not allowed here (a locked-down container): the worker runs at normal priority.
  }
}
