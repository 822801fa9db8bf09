/**
 * An analysis result as data: the analysis, or the message of the error that
 * stopped it (screens show the message; nothing throws into React or across
 * the worker boundary).
 */
import { errorText } from '../bridge/bench-call-error.ts';

export type AnalysisOutcome<T> = { ok: true; analysis: T } | { ok: false; message: string };

export function outcomeOf<T>(analyze: () => T): AnalysisOutcome<T> {
  try {
    return { ok: true, analysis: analyze() };
  } catch (error) {
    return { ok: false, message: errorText(error) };
  }
}
