/**
 * AbortError helpers shared by the clocks (and anything else that waits).
 * The Clock contract says a cancelled wait rejects with name === 'AbortError',
 * the same name the platform's own fetch/timers use.
 */

/** An Error whose name is 'AbortError'; carries the signal's reason as `cause`. */
export function abortError(signal?: AbortSignal): Error {
  const error = new Error('The operation was aborted', { cause: signal?.reason });
  error.name = 'AbortError';
  return error;
}

export function isAbortError(error: unknown): boolean {
  return error instanceof Error && error.name === 'AbortError';
}
