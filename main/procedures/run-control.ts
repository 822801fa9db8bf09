/**
 * Operator control of a running procedure: pause, resume, stop. A procedure
 * checks `checkpoint()` between points; a pause holds it there (instruments
 * left as they are) until resumed, stopped, or the pause timeout runs out —
 * an unattended bench must not sit paused forever with the DUT powered.
 */
import type { Clock } from '../time/clock.ts';

export type StopReason = 'stop' | 'pause-timeout' | 'signal';

/** Thrown out of checkpoint() when the run must end; carries the reason. */
export class RunStoppedError extends Error {
  override readonly name = 'RunStoppedError';
  // `string & {}` keeps the known reasons offered by editors while any text is allowed.
  readonly reason: StopReason | (string & {});
  constructor(reason: StopReason | (string & {})) {
    super(`run stopped: ${reason}`);
    this.reason = reason;
  }
}

export interface RunControlOptions {
  /** Longest a pause may last before the run is stopped safely, s. Default 1 h. */
  pauseTimeoutS?: number;
  /** An outside signal (e.g. the CLI's SIGINT) that stops the run. */
  signal?: AbortSignal | undefined;
}

export class RunControl {
  readonly #abort = new AbortController();
  readonly #pauseTimeoutS: number;
  #paused = false;
  #resumeWaiters: (() => void)[] = [];
  #onPause: ((paused: boolean) => void) | null = null;

  constructor(options: RunControlOptions = {}) {
    const timeout = options.pauseTimeoutS ?? 3600;
    if (!(timeout > 0)) throw new TypeError(`pauseTimeoutS must be greater than 0, got ${timeout}`);
    this.#pauseTimeoutS = timeout;
    const outside = options.signal;
    if (outside) {
      if (outside.aborted) this.stop('signal');
      else outside.addEventListener('abort', () => this.stop('signal'), { once: true });
    }
  }

  /** Aborted when the run must stop; pass it to every wait. */
  get signal(): AbortSignal {
    return this.#abort.signal;
  }

  get paused(): boolean {
    return this.#paused;
  }

  get stopReason(): string | null {
    return this.#abort.signal.aborted ? String(this.#abort.signal.reason) : null;
  }

  pause(): void {
    if (this.#abort.signal.aborted || this.#paused) return;
    this.#paused = true;
    this.#onPause?.(true);
  }

  resume(): void {
    if (!this.#paused) return;
    this.#paused = false;
    this.#onPause?.(false);
    const waiters = this.#resumeWaiters;
    this.#resumeWaiters = [];
    for (const wake of waiters) wake();
  }

  stop(reason: StopReason | (string & {}) = 'stop'): void {
    if (this.#abort.signal.aborted) return;
    this.#abort.abort(reason);
    const waiters = this.#resumeWaiters;
    this.#resumeWaiters = [];
    for (const wake of waiters) wake();
  }

  /** Lets the procedure hear pause/resume (to record events). */
  onPauseChange(listener: ((paused: boolean) => void) | null): void {
    this.#onPause = listener;
  }

  /**
   * Returns when the run may go on. While paused, waits for resume; throws
   * RunStoppedError if stopped, or stops the run when the pause outlasts the
   * pause timeout.
   */
  async checkpoint(clock: Clock): Promise<void> {
    this.#throwIfStopped();
    if (!this.#paused) return;
    const cancelTimer = clock.setTimer(this.#pauseTimeoutS, () => this.stop('pause-timeout'));
    try {
      while (this.#paused && !this.#abort.signal.aborted) {
        await new Promise<void>((resolve) => this.#resumeWaiters.push(resolve));
      }
    } finally {
      cancelTimer();
    }
    this.#throwIfStopped();
  }

  #throwIfStopped(): void {
    if (this.#abort.signal.aborted) throw new RunStoppedError(String(this.#abort.signal.reason));
  }
}
