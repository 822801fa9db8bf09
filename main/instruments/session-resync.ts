/**
 * Getting back in step after a timeout left a reply owed: send the sync
 * query (`*OPC?`), drop every line before its "1", then wait a quiet window
 * and drop any further line (if the late reply was itself "1", the real
 * answer to *OPC? follows at once). Instruments answer in order, so a late
 * reply always comes before the sync answer.
 */
import type { Clock } from '../time/clock.ts';
import { TimeoutError } from './errors.ts';

export interface ResyncSteps {
  clock: Clock;
  syncQuery: string;
  timeoutS: number;
  quietS: number;
  /** Sends the sync query; rejects if the link is down. */
  send: () => Promise<void>;
  /** Routes incoming lines to `hook` (null: back to normal). */
  setLineHook: (hook: ((line: Buffer) => void) | null) => void;
}

export interface ResyncRun {
  /** Resolves with the number of lines dropped; rejects with TimeoutError, the send error or the abort error. */
  done: Promise<number>;
  /** Ends the resync at once with `error` (link lost, session closed). */
  abort: (error: Error) => void;
}

export function resync(steps: ResyncSteps): ResyncRun {
  const { clock, syncQuery, timeoutS, quietS } = steps;
  let abort: (error: Error) => void = () => undefined;
  const done = new Promise<number>((resolve, reject) => {
    let dropped = 0;
    let seenOne = false;
    let finished = false;
    const finish = (error: Error | null): void => {
      if (finished) return;
      finished = true;
      cancelTimer();
      steps.setLineHook(null);
      if (error === null) resolve(dropped);
      else reject(error);
    };
    let cancelTimer = clock.setTimer(timeoutS, () => finish(new TimeoutError(syncQuery, timeoutS)));
    // Lines can arrive several to a chunk, so each is judged here, synchronously.
    steps.setLineHook((line) => {
      if (!seenOne && !isOne(line.toString('utf8'))) {
        dropped += 1;
        return;
      }
      if (seenOne) dropped += 1;
      seenOne = true;
      cancelTimer();
      cancelTimer = clock.setTimer(quietS, () => finish(null));
    });
    abort = (error) => finish(error);
    steps.send().then(undefined, (error: unknown) => finish(error instanceof Error ? error : new Error(String(error))));
  });
  return { done, abort };
}

export function isOne(line: string): boolean {
  const text = line.trim();
  return text === '1' || text === '+1';
}
