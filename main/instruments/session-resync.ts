/**
 * Getting back in step after a timeout left a reply owed: send a sync query
 * and drop every line before its answer. Instruments answer in order, so a
 * late reply always comes before the sync answer.
 *
 * The default sync (`tokenSync`) sets the IEEE 488.2 event status enable
 * register to a fresh random value and reads it back (`*ESE n;*ESE?`): no
 * late reply can look like that answer, so alignment is proven. The legacy
 * `*OPC?` sync answers "1", which a late reply can also be; it waits a
 * quiet window after the "1" and drops any further line.
 */
import type { Clock } from '../time/clock.ts';
import { TimeoutError } from './errors.ts';

/** One sync exchange: what to send and which line answers it. */
export interface SyncExchange {
  command: string;
  isAnswer: (line: string) => boolean;
  /** Wait after the answer, dropping further lines (0: done at once). */
  quietS: number;
}

/** `*ESE n;*ESE?` with n in 1..255, never the previous n. */
export function tokenSync(random: () => number, previous: number | null): SyncExchange & { token: number } {
  let token = 1 + Math.floor(random() * 255);
  if (token === previous) token = (token % 255) + 1;
  return {
    token,
    command: `*ESE ${token};*ESE?`,
    isAnswer: (line) => /^\+?\d+$/.test(line.trim()) && Number(line.trim()) === token,
    quietS: 0,
  };
}

/** The legacy sync: a query that answers "1" (normally `*OPC?`). */
export function oneSync(command: string, quietS: number): SyncExchange {
  return { command, isAnswer: isOne, quietS };
}

export interface ResyncSteps {
  clock: Clock;
  sync: SyncExchange;
  timeoutS: number;
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
  const { clock, timeoutS } = steps;
  const { command: syncQuery, isAnswer, quietS } = steps.sync;
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
      if (!seenOne && !isAnswer(line.toString('utf8'))) {
        dropped += 1;
        return;
      }
      if (seenOne) dropped += 1;
      seenOne = true;
      if (quietS <= 0) {
        finish(null);
        return;
      }
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
