/**
 * Sends analysis jobs to one shared worker and matches the answers. Where no
 * Worker exists (unit tests) or it fails to start, the job runs in the page
 * after a macrotask, so the first paint still comes first.
 */
import { runJob, type AnalysisJob, type JobResult } from './analysis-jobs.ts';

let worker: Worker | null | undefined;
let nextId = 1;
// Jobs are kept (and copied, not transferred, to the worker) so that if the worker cannot
// start — some packaged file:// setups refuse module workers — they still run in the page.
const waiting = new Map<number, { job: AnalysisJob; resolve: (result: JobResult) => void }>();

function getWorker(): Worker | null {
  if (worker !== undefined) return worker;
  try {
    worker =
      typeof Worker === 'undefined'
        ? null
        : new Worker(new URL('./analysis.worker.ts', import.meta.url), { type: 'module' });
  } catch {
    worker = null;
  }
  worker?.addEventListener('message', (event: MessageEvent<{ id: number; result: JobResult }>) => {
    const entry = waiting.get(event.data.id);
    waiting.delete(event.data.id);
    entry?.resolve(event.data.result);
  });
  worker?.addEventListener('error', () => {
    // The worker failed: answer everyone in the page instead, and stop using it.
    worker = null;
    for (const [id, entry] of waiting) {
      waiting.delete(id);
      setTimeout(() => entry.resolve(runJob(entry.job)), 0);
    }
  });
  return worker;
}

/**
 * Runs `post` once the next frame has been painted (or after 100 ms when no
 * frame comes, e.g. a hidden tab): copying a million-row job into the
 * worker takes a good part of a second, and the plots should paint first.
 */
function afterNextFrame(post: () => void): void {
  let done = false;
  const once = (): void => {
    if (done) return;
    done = true;
    post();
  };
  if (typeof requestAnimationFrame === 'function') requestAnimationFrame(() => setTimeout(once, 0));
  setTimeout(once, 100);
}

export function analyzeInBackground(job: AnalysisJob): Promise<JobResult> {
  const target = getWorker();
  if (!target) return new Promise((resolve) => setTimeout(() => resolve(runJob(job)), 0));
  const id = nextId;
  nextId += 1;
  return new Promise((resolve) => {
    waiting.set(id, { job, resolve });
    afterNextFrame(() => {
      // The worker may have failed meanwhile; then the error handler has answered this job in the page.
      if (waiting.has(id)) target.postMessage({ id, job });
    });
  });
}
