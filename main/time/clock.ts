/**
 * Time source for everything that waits: instrument timeouts, settling,
 * drift intervals, the simulated DUT. Injected so that tests can run a
 * 12-hour log on virtual time in seconds.
 *
 * All times are in seconds (SI). `now()` is monotonic from an arbitrary epoch.
 */
export interface Clock {
  /** Monotonic time in seconds. */
  now(): number;
  /** Wall-clock time as an ISO-8601 string, for run metadata only. */
  wallTimeIso(): string;
  /**
   * Resolves after `seconds`. Rejects with an AbortError (name === 'AbortError')
   * if `signal` aborts first.
   */
  sleep(seconds: number, signal?: AbortSignal): Promise<void>;
  /** Calls `callback` after `seconds`; returns a function that cancels it. */
  setTimer(seconds: number, callback: () => void): () => void;
}
