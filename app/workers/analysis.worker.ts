/**
 * Runs analyses off the page's thread: a million-reading drift log takes
 * seconds to analyse, and the plots must stay responsive meanwhile.
 */
import { runJob, type AnalysisJob, type JobResult } from './analysis-jobs.ts';

interface WorkerScope {
  onmessage: ((event: MessageEvent<{ id: number; job: AnalysisJob }>) => void) | null;
  postMessage(message: { id: number; result: JobResult }): void;
}

const scope = self as unknown as WorkerScope;
scope.onmessage = (event) => {
  const { id, job } = event.data;
  scope.postMessage({ id, result: runJob(job) });
};
