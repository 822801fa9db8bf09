/**
 * A minimal virtual clock for instrument-layer tests (main/time/ holds the
 * project's own clocks). Time moves only when a test calls `advance`.
 */
import type { Clock } from '../../time/clock.ts';

interface Timer {
  at: number;
  seq: number;
  callback: () => void;
}

export class FakeClock implements Clock {
  private t = 0;
  private seq = 0;
  private timers: Timer[] = [];

  now(): number {
    return this.t;
  }

  wallTimeIso(): string {
    return new Date(Date.UTC(2026, 0, 1) + this.t * 1000).toISOString();
  }

  setTimer(seconds: number, callback: () => void): () => void {
    const timer: Timer = { at: this.t + Math.max(0, seconds), seq: this.seq++, callback };
    this.timers.push(timer);
    return () => {
      this.timers = this.timers.filter((x) => x !== timer);
    };
  }

  sleep(seconds: number, signal?: AbortSignal): Promise<void> {
    return new Promise((resolve, reject) => {
      const cancel = this.setTimer(seconds, resolve);
      signal?.addEventListener(
        'abort',
        () => {
          cancel();
          reject(Object.assign(new Error('aborted'), { name: 'AbortError' }));
        },
        { once: true },
      );
    });
  }

  /** Pending timers (for assertions that nothing leaks). */
  get pendingTimers(): number {
    return this.timers.length;
  }

  /**
   * Moves time forward by `seconds`, firing due timers in order and letting
   * promise callbacks run between them.
   */
  async advance(seconds: number): Promise<void> {
    const end = this.t + seconds;
    await flushMicrotasks();
    for (;;) {
      const due = this.timers.filter((x) => x.at <= end).sort((a, b) => a.at - b.at || a.seq - b.seq)[0];
      if (due === undefined) break;
      this.timers = this.timers.filter((x) => x !== due);
      this.t = due.at;
      due.callback();
      await flushMicrotasks();
    }
    this.t = end;
    await flushMicrotasks();
  }
}

/** Lets queued promise reactions run (a few macrotask turns deep). */
export async function flushMicrotasks(): Promise<void> {
  for (let i = 0; i < 5; i += 1) await new Promise<void>((resolve) => setImmediate(resolve));
}
