/**
 * A clock that runs a fixed factor faster than real time. For the simulated
 * bench only (demos, browser tests): a 60 s drift log at 20× takes 3 s of
 * real time, and readings still arrive spread out in time as they would on
 * a real bench, unlike a virtual clock that jumps. Never for real
 * instruments, whose settling and gate times are physical.
 */
import type { Clock } from './clock.ts';
import { sleepOn } from './real-clock.ts';

export class ScaledClock implements Clock {
  readonly #scale: number;
  readonly #realStartMs = performance.now();
  readonly #wallStartMs = Date.now();

  constructor(scale: number) {
    if (!(scale > 0) || !Number.isFinite(scale))
      throw new RangeError(`ScaledClock: scale must be a positive number, got ${scale}`);
    this.#scale = scale;
  }

  now(): number {
    return ((performance.now() - this.#realStartMs) / 1000) * this.#scale;
  }

  wallTimeIso(): string {
    return new Date(this.#wallStartMs + this.now() * 1000).toISOString();
  }

  setTimer(seconds: number, callback: () => void): () => void {
    if (typeof seconds !== 'number' || Number.isNaN(seconds))
      throw new TypeError(`ScaledClock.setTimer: seconds must be a number, got ${String(seconds)}`);
    const handle = setTimeout(callback, (Math.max(0, seconds) * 1000) / this.#scale);
    return () => clearTimeout(handle);
  }

  sleep(seconds: number, signal?: AbortSignal): Promise<void> {
    return sleepOn(this, seconds, signal);
  }
}
