/**
 * A clock whose time moves only when told to. Tests and the simulated bench
 * use it to run hours of procedure in seconds of real time.
 *
 * Two ways to move time:
 * - `await clock.advance(seconds)`: fires, in due order, every timer that
 *   falls due, letting the event loop settle between timers so that async
 *   chains woken by one timer can set the next before it is considered.
 * - auto-advance: `await clock.runUntil(promise)`, or the `autoAdvance`
 *   option: whenever the event loop is idle (every pending piece of work is
 *   waiting on this clock), time jumps to the next timer. Only for benches
 *   that are entirely in-process; a real socket read is invisible to it.
 */
import type { Clock } from './clock.ts';
import { eventLoopIdle } from './event-loop-idle.ts';
import { sleepOn } from './real-clock.ts';
import { TimerQueue } from './timer-queue.ts';

export interface VirtualClockOptions {
  /** Initial value of now(), seconds. Default 0. */
  startS?: number;
  /** Wall time at now() = startS. Default 2026-01-01T00:00:00.000Z (fixed, for reproducible runs). */
  startWallIso?: string;
  /** Jump to the next timer whenever the event loop goes idle. Default false. */
  autoAdvance?: boolean;
}

export interface RunUntilOptions {
  /** Give up (reject) if virtual time would pass this many seconds from the start of the call. */
  limitS?: number;
  /** Real milliseconds to wait, when no timer is left, before calling it a deadlock. Default 50. */
  idleGraceMs?: number;
}

export class VirtualClock implements Clock {
  #nowS: number;
  readonly #startS: number;
  readonly #startWallMs: number;
  readonly #timers = new TimerQueue();
  #autoAdvance: boolean;
  #driving = false;
  /** advance()/runAll()/runUntil() calls in progress; the background driver stands aside for them. */
  #manualDepth = 0;

  constructor(options: VirtualClockOptions = {}) {
    this.#nowS = options.startS ?? 0;
    this.#startS = this.#nowS;
    const wallMs = Date.parse(options.startWallIso ?? '2026-01-01T00:00:00.000Z');
    if (Number.isNaN(wallMs))
      throw new TypeError(`VirtualClock: startWallIso is not an ISO date: ${options.startWallIso}`);
    this.#startWallMs = wallMs;
    this.#autoAdvance = options.autoAdvance ?? false;
  }

  now(): number {
    return this.#nowS;
  }

  wallTimeIso(): string {
    return new Date(this.#startWallMs + (this.#nowS - this.#startS) * 1000).toISOString();
  }

  /** Timers waiting to fire. */
  get pendingTimers(): number {
    return this.#timers.size;
  }

  /** Due time of the earliest timer, or null. */
  nextTimerS(): number | null {
    return this.#timers.peek()?.dueS ?? null;
  }

  setTimer(seconds: number, callback: () => void): () => void {
    if (typeof seconds !== 'number' || Number.isNaN(seconds)) {
      throw new TypeError(`VirtualClock.setTimer: seconds must be a number, got ${String(seconds)}`);
    }
    const entry = this.#timers.push(this.#nowS + Math.max(0, seconds), callback);
    if (this.#autoAdvance) this.#startDriver();
    return () => this.#timers.cancel(entry);
  }

  sleep(seconds: number, signal?: AbortSignal): Promise<void> {
    return sleepOn(this, seconds, signal);
  }

  /** Turns auto-advance on or off (see the module comment). */
  setAutoAdvance(on: boolean): void {
    this.#autoAdvance = on;
    if (on && this.#timers.size > 0) this.#startDriver();
  }

  /**
   * Moves time forward by `seconds`, firing due timers in order (ties in the
   * order they were set). A timer callback that throws rejects the returned
   * promise after time has reached the timer's due time.
   */
  async advance(seconds: number): Promise<void> {
    if (!(seconds >= 0)) throw new RangeError(`VirtualClock.advance: seconds must be ≥ 0, got ${seconds}`);
    const targetS = this.#nowS + seconds;
    await this.#manually(async () => {
      for (;;) {
        await eventLoopIdle();
        const next = this.#timers.peek();
        if (!next || next.dueS > targetS) break;
        this.#fireNext();
      }
      this.#nowS = Math.max(this.#nowS, targetS);
      await eventLoopIdle();
    });
  }

  /** Advances to the due time of every timer until none remain (bounded by `limitS`). */
  async runAll(limitS = Number.POSITIVE_INFINITY): Promise<void> {
    const endS = this.#nowS + limitS;
    await this.#manually(async () => {
      for (;;) {
        await eventLoopIdle();
        const next = this.#timers.peek();
        if (!next || next.dueS > endS) return;
        this.#fireNext();
      }
    });
  }

  /**
   * Auto-advances until `promise` settles, then returns its value (or throws
   * its error). Rejects if the promise is still pending when no timer is left
   * (nothing could ever wake it), or if time would pass `limitS`.
   */
  async runUntil<T>(promise: Promise<T>, options: RunUntilOptions = {}): Promise<T> {
    let settled = false;
    const watched = promise.then(
      (value) => {
        settled = true;
        return value;
      },
      (error: unknown) => {
        settled = true;
        throw error;
      },
    );
    watched.catch(() => undefined);
    const endS = this.#nowS + (options.limitS ?? Number.POSITIVE_INFINITY);
    await this.#manually(async () => {
      for (;;) {
        await eventLoopIdle();
        if (settled) return;
        let next = this.#timers.peek();
        if (!next) {
          // Maybe real I/O the idle check cannot see (a socket read): give it a moment of real time.
          for (let waitedMs = 0; !settled && !next && waitedMs < (options.idleGraceMs ?? 50); waitedMs += 5) {
            await new Promise((resolve) => setTimeout(resolve, 5));
            await eventLoopIdle();
            next = this.#timers.peek();
          }
          if (settled) return;
        }
        if (!next) {
          throw new Error(`VirtualClock.runUntil: still pending at t=${this.#nowS} s with no timer left to wake it`);
        }
        if (next.dueS > endS) {
          throw new Error(`VirtualClock.runUntil: still pending when the limit of ${options.limitS} s was reached`);
        }
        this.#fireNext();
      }
    });
    return watched;
  }

  async #manually(work: () => Promise<void>): Promise<void> {
    this.#manualDepth++;
    try {
      await work();
    } finally {
      this.#manualDepth--;
      if (this.#autoAdvance && this.#manualDepth === 0 && this.#timers.size > 0) this.#startDriver();
    }
  }

  #fireNext(): void {
    const timer = this.#timers.pop();
    if (!timer) return;
    if (timer.dueS > this.#nowS) this.#nowS = timer.dueS;
    timer.callback();
  }

  /** Background loop for the autoAdvance option; runs while timers remain. */
  #startDriver(): void {
    if (this.#driving || this.#manualDepth > 0) return;
    this.#driving = true;
    void (async () => {
      try {
        while (this.#autoAdvance) {
          await eventLoopIdle();
          if (!this.#autoAdvance || this.#manualDepth > 0 || this.#timers.size === 0) break;
          try {
            this.#fireNext();
          } catch (error) {
            // Like a throwing platform timer: surface it, keep the clock going.
            queueMicrotask(() => {
              throw error;
            });
          }
        }
      } finally {
        this.#driving = false;
      }
    })();
  }
}
