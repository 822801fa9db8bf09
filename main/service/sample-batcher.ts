/**
 * Collects sample rows and hands them on in batches, at most one batch per
 * interval of real time (default 150 ms), so the renderer redraws a few
 * times a second instead of once per reading. `flushNow()` sends what is
 * pending at once (end of a run).
 */
export interface BatchTimers {
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

export const realTimers: BatchTimers = {
  setTimeout: (callback, delayMs) => setTimeout(callback, delayMs),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
};

export class SampleBatcher<Row> {
  #pending: Row[] = [];
  #handle: unknown = null;
  readonly #intervalMs: number;
  readonly #send: (rows: Row[]) => void;
  readonly #timers: BatchTimers;

  constructor(send: (rows: Row[]) => void, intervalMs = 150, timers: BatchTimers = realTimers) {
    if (!(intervalMs > 0)) throw new RangeError(`intervalMs must be greater than 0, got ${intervalMs}`);
    this.#send = send;
    this.#intervalMs = intervalMs;
    this.#timers = timers;
  }

  push(row: Row): void {
    this.#pending.push(row);
    if (this.#handle === null) {
      this.#handle = this.#timers.setTimeout(() => {
        this.#handle = null;
        this.flushNow();
      }, this.#intervalMs);
    }
  }

  get pending(): number {
    return this.#pending.length;
  }

  flushNow(): void {
    if (this.#handle !== null) {
      this.#timers.clearTimeout(this.#handle);
      this.#handle = null;
    }
    if (this.#pending.length === 0) return;
    const rows = this.#pending;
    this.#pending = [];
    this.#send(rows);
  }
}
