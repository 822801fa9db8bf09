/**
 * The clock of the real world: monotonic seconds from performance.now(),
 * waits on the platform's timers.
 */
import { abortError } from './abort.ts';
import type { Clock } from './clock.ts';

/** setTimeout's delay is a signed 32-bit count of ms; longer waits are chained. */
const MAX_TIMEOUT_MS = 2_147_483_647;

function checkSeconds(seconds: number, what: string): number {
  if (typeof seconds !== 'number' || Number.isNaN(seconds)) {
    throw new TypeError(`${what}: seconds must be a number, got ${String(seconds)}`);
  }
  return Math.max(0, seconds);
}

export class RealClock implements Clock {
  now(): number {
    return performance.now() / 1000;
  }

  wallTimeIso(): string {
    return new Date().toISOString();
  }

  setTimer(seconds: number, callback: () => void): () => void {
    const dueMs = performance.now() + checkSeconds(seconds, 'RealClock.setTimer') * 1000;
    let handle: ReturnType<typeof setTimeout> | undefined;
    const arm = (): void => {
      const leftMs = dueMs - performance.now();
      if (leftMs > MAX_TIMEOUT_MS) {
        handle = setTimeout(arm, MAX_TIMEOUT_MS);
      } else {
        handle = setTimeout(callback, Math.max(0, leftMs));
      }
    };
    arm();
    return () => {
      if (handle !== undefined) clearTimeout(handle);
      handle = undefined;
    };
  }

  sleep(seconds: number, signal?: AbortSignal): Promise<void> {
    return sleepOn(this, checkSeconds(seconds, 'RealClock.sleep'), signal);
  }
}

/** sleep() in terms of setTimer(), shared by both clocks. */
export function sleepOn(clock: Pick<Clock, 'setTimer'>, seconds: number, signal?: AbortSignal): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    if (signal?.aborted) {
      reject(abortError(signal));
      return;
    }
    const onAbort = (): void => {
      cancel();
      reject(abortError(signal));
    };
    const cancel = clock.setTimer(seconds, () => {
      signal?.removeEventListener('abort', onAbort);
      resolve();
    });
    signal?.addEventListener('abort', onAbort, { once: true });
  });
}
