/** React side: run an analysis job in the background once per data set; null while it runs. */
import { useEffect, useState } from 'react';
import type { AnalysisJob, AnalysisOutcome } from './analysis-jobs.ts';
import { analyzeInBackground } from './analysis-client.ts';

export function useBackgroundAnalysis<T>(
  key: string | null,
  makeJob: () => AnalysisJob,
): { outcome: AnalysisOutcome<T> | null; running: boolean } {
  const [state, setState] = useState<{ key: string; outcome: AnalysisOutcome<T> } | null>(null);
  useEffect(() => {
    if (key === null) return;
    let live = true;
    void analyzeInBackground(makeJob()).then((outcome) => {
      if (live) setState({ key, outcome: outcome as AnalysisOutcome<T> });
    });
    return () => {
      live = false;
    };
    // makeJob reads the data set that `key` names.
  }, [key]);
  const outcome = state && state.key === key ? state.outcome : null;
  return { outcome, running: key !== null && outcome === null };
}
