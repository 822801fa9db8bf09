/**
 * Waits for the one reply line a command in flight is owed, with a deadline
 * on the injected clock. One timer is kept armed and re-armed lazily rather
 * than one timer per query: on the hot path a query costs one clock.now()
 * instead of a set-and-clear pair.
 */
import type { Clock } from '../time/clock.ts';
import { TimeoutError } from './errors.ts';

interface Pending {
  resolve: (line: Buffer | string) => void;
  reject: (error: Error) => void;
  command: string;
  timeoutS: number;
  deadline: number;
  raw: boolean;
  /** Called when the wait ends, before the caller's promise settles (frees the command slot). */
  onSettle: (() => void) | null;
  /** On timeout, report it as a reply still owed. */
  countLate: boolean;
}

export class LineWaiter {
  private pending: Pending | null = null;
  private armedDue = Number.POSITIVE_INFINITY;
  private cancelArmed: (() => void) | null = null;

  constructor(
    private readonly clock: Clock,
    private readonly onLate: (timeoutS: number) => void,
  ) {}

  get waiting(): boolean {
    return this.pending !== null;
  }

  /** Starts waiting for one line; resolves with it (a copy of the bytes when `raw`, else UTF-8 text). */
  expect(
    command: string,
    timeoutS: number,
    raw: boolean,
    countLate: boolean,
    onSettle: (() => void) | null,
  ): Promise<Buffer | string> {
    return new Promise((resolve, reject) => {
      const deadline = this.clock.now() + timeoutS;
      this.pending = { resolve, reject, command, timeoutS, deadline, raw, onSettle, countLate };
      if (this.cancelArmed === null || this.armedDue > deadline) this.arm(deadline);
    });
  }

  /** Hands a line to the waiting caller; false when nobody is waiting. */
  offer(line: Buffer): boolean {
    const pending = this.pending;
    if (pending === null) return false;
    this.pending = null;
    pending.onSettle?.();
    pending.resolve(pending.raw ? Buffer.from(line) : line.toString('utf8'));
    return true;
  }

  /** Fails the waiting caller (link lost, write failed, session closed). */
  fail(error: Error): void {
    const pending = this.pending;
    if (pending === null) return;
    this.pending = null;
    pending.onSettle?.();
    pending.reject(error);
  }

  /** Stops the armed timer (session closing). */
  dispose(): void {
    this.cancelArmed?.();
    this.cancelArmed = null;
    this.armedDue = Number.POSITIVE_INFINITY;
  }

  private arm(due: number): void {
    this.cancelArmed?.();
    this.armedDue = due;
    this.cancelArmed = this.clock.setTimer(Math.max(0, due - this.clock.now()), () => this.onTimer());
  }

  private onTimer(): void {
    this.cancelArmed = null;
    this.armedDue = Number.POSITIVE_INFINITY;
    const pending = this.pending;
    if (pending === null) return;
    // Timers may fire a hair early against now(); a tiny remainder re-arms.
    if (this.clock.now() < pending.deadline - 1e-9) {
      this.arm(pending.deadline);
      return;
    }
    this.pending = null;
    if (pending.countLate) this.onLate(pending.timeoutS);
    pending.onSettle?.();
    pending.reject(new TimeoutError(pending.command, pending.timeoutS));
  }
}
