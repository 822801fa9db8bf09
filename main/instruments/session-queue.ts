/**
 * Runs async tasks one at a time in arrival order: a SCPI link carries one
 * command in flight. A plain array and a flag, no promise chain, so a task
 * that fails does not poison the ones behind it. `tryAcquire`/`release` let
 * the hot path (one query, link in step) skip the task wrapper entirely.
 */
interface Entry {
  task: () => Promise<unknown>;
  resolve: (value: unknown) => void;
  reject: (error: unknown) => void;
}

export class SessionQueue {
  private readonly entries: Entry[] = [];
  private busy = false;

  /** Tasks waiting plus the one running. */
  get length(): number {
    return this.entries.length + (this.busy ? 1 : 0);
  }

  run<T>(task: () => Promise<T>): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      this.entries.push({ task, resolve: resolve as (value: unknown) => void, reject });
      if (!this.busy) void this.pump();
    });
  }

  /** Takes the slot when nothing runs or waits; the caller must `release()` it. */
  tryAcquire(): boolean {
    if (this.busy || this.entries.length > 0) return false;
    this.busy = true;
    return true;
  }

  /** Gives back a slot taken with tryAcquire and starts whatever waits. */
  release(): void {
    this.busy = false;
    if (this.entries.length > 0) void this.pump();
  }

  /** Fails every task not yet started (session closing). */
  rejectAll(error: Error): void {
    const waiting = this.entries.splice(0, this.entries.length);
    for (const entry of waiting) entry.reject(error);
  }

  private async pump(): Promise<void> {
    this.busy = true;
    for (let entry = this.entries.shift(); entry !== undefined; entry = this.entries.shift()) {
      try {
        entry.resolve(await entry.task());
      } catch (error) {
        entry.reject(error);
      }
    }
    this.busy = false;
  }
}
