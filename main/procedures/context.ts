/**
 * Shared plumbing of every procedure: the run's time base, event and row
 * recording, and counter readings that survive a dropped link when the
 * bench can reconnect.
 */
import type { Clock } from '../time/clock.ts';
import type { RoleName } from '../instruments/roles.ts';
import {
  AlignmentError,
  ChannelLimitError,
  DisconnectedError,
  InstrumentError,
  ReplyFormatError,
  TimeoutError,
} from '../instruments/errors.ts';
import { RunStoppedError } from './run-control.ts';
import { isLinkLoss, readCounter, type CounterReading } from './read-counter.ts';
import type { BenchRoles, FailureKind, EventBody, RunSink, SampleRow } from './types.ts';

/** Consecutive failed readings after which a run gives up (the link is there but useless). */
export const MAX_CONSECUTIVE_FAILURES = 20;

export class ProcedureContext {
  readonly clock: Clock;
  readonly bench: BenchRoles;
  readonly sink: RunSink;
  readonly startS: number;
  rowsWritten = 0;
  /** Counter readings by outcome; a run whose every reading failed is a counter fault, not a stall. */
  readonly tally = { ok: 0, noSignal: 0, failed: 0, lastFailure: null as string | null };
  #consecutiveFailures = 0;
  #unsubscribeLink: (() => void) | null = null;

  constructor(clock: Clock, bench: BenchRoles, sink: RunSink, timeOffsetS = 0) {
    this.clock = clock;
    this.bench = bench;
    this.sink = sink;
    // time_s counts from the run's start; a resumed run passes how far in it is.
    this.startS = clock.now() - timeOffsetS;
    // Drops, reopens and resyncs happen inside the drivers; the run records them too.
    this.#unsubscribeLink =
      bench.subscribeLinkEvents?.((role, event) => {
        const { type, ...detail } = event;
        this.event({ type: 'link', role, event: type, ...detail });
      }) ?? null;
  }

  /** Stops recording link events (call once the procedure has ended). */
  dispose(): void {
    this.#unsubscribeLink?.();
    this.#unsubscribeLink = null;
  }

  /** Drains `role`'s error queue and records each entry as a fault; never throws. */
  async recordQueuedErrors(role: RoleName): Promise<number> {
    if (!this.bench.drainErrors) return 0;
    try {
      const entries = await this.bench.drainErrors(role);
      for (const entry of entries)
        this.event({
          type: 'fault',
          role,
          status: 'error',
          errorName: 'InstrumentError',
          code: entry.code,
          error: entry.message,
        });
      return entries.length;
    } catch (error) {
      this.event({
        type: 'fault',
        role,
        operation: 'error-queue',
        error: error instanceof Error ? error.message : String(error),
      });
      return 0;
    }
  }

  timeS(): number {
    return this.clock.now() - this.startS;
  }

  event(event: EventBody): void {
    this.sink.appendEvent({ time_s: this.timeS(), ...event });
  }

  row(row: SampleRow): void {
    this.sink.appendSample(row);
    this.rowsWritten++;
  }

  /**
   * One counter reading. Failed readings become events and rows; a dropped
   * link is reopened once (when the bench can) and the reading counts as an
   * error; a link that will not reopen, or too many failures in a row, throw.
   */
  async readFrequency(): Promise<CounterReading> {
    let reading: CounterReading;
    try {
      reading = await readCounter(this.bench.counter);
    } catch (error) {
      if (!isLinkLoss(error)) throw error;
      this.event({ type: 'link-lost', role: 'counter', error: error.message });
      await this.reconnectOrThrow('counter', error);
      reading = { status: 'error', frequencyHz: Number.NaN, detail: error.message, errorName: error.name };
    }
    this.count(reading);
    if (reading.status === 'timeout' || reading.status === 'error') {
      this.event({
        type: 'fault',
        role: 'counter',
        status: reading.status,
        error: reading.detail,
        errorName: reading.errorName,
      });
      this.#consecutiveFailures++;
      if (this.#consecutiveFailures >= MAX_CONSECUTIVE_FAILURES) {
        throw new ProcedureFailure(
          'counter-fault',
          `${MAX_CONSECUTIVE_FAILURES} readings in a row failed on ${this.describe('counter')}; last: ${reading.detail ?? reading.status}`,
        );
      }
    } else {
      this.#consecutiveFailures = 0;
    }
    return reading;
  }

  /** Adds one reading to the tally (procedures that read the counter themselves call it too). */
  count(reading: CounterReading): void {
    if (reading.status === 'ok') this.tally.ok++;
    else if (reading.status === 'no-signal') this.tally.noSignal++;
    else {
      this.tally.failed++;
      this.tally.lastFailure = reading.detail ?? reading.status;
    }
  }

  /**
   * A counter fault when the counter delivered nothing usable: readings
   * failed and none was a frequency or a no-signal answer. Only no-signal
   * may mean a stalled DUT; errors mean the counter.
   */
  counterFault(): { kind: 'counter-fault'; message: string } | null {
    const { ok, noSignal, failed, lastFailure } = this.tally;
    if (failed === 0 || ok + noSignal > 0) return null;
    return {
      kind: 'counter-fault',
      message: `all ${failed} readings failed on ${this.describe('counter')} (last: ${lastFailure ?? 'unknown'}); this is a counter fault, not a stalled DUT`,
    };
  }

  /** "the counter at tcp://…" when the bench says where, else "the counter". */
  describe(role: RoleName): string {
    const address = this.bench.instruments?.find((i) => i.role === role)?.address;
    return address === undefined ? `the ${role}` : `the ${role} at ${address}`;
  }

  async reconnectOrThrow(role: RoleName, cause: DisconnectedError): Promise<void> {
    if (!this.bench.reconnect) throw cause;
    try {
      await this.bench.reconnect(role);
      this.event({ type: 'reconnected', role });
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      this.event({ type: 'reconnect-failed', role, error: message });
      throw new ProcedureFailure('disconnected', `link to the ${role} lost and not reopened: ${message}`, {
        cause: error,
      });
    }
  }
}

/** The run cannot go on; `kind` says why, for the outcome and the exit code. */
export class ProcedureFailure extends Error {
  override readonly name = 'ProcedureFailure';
  readonly kind: FailureKind;
  constructor(kind: FailureKind, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.kind = kind;
  }
}

/** Sorts whatever ended a run into a stop reason and, for failures, a kind. */
export function classifyEnd(error: unknown): {
  reason: string;
  failure: { kind: FailureKind; message: string } | null;
} {
  if (error instanceof RunStoppedError) return { reason: error.reason, failure: null };
  if (error instanceof Error && error.name === 'AbortError') {
    // The clock's AbortError carries the signal's reason (RunControl.stop's argument) as cause.
    return { reason: typeof error.cause === 'string' ? error.cause : 'stop', failure: null };
  }
  const message = error instanceof Error ? error.message : String(error);
  if (error instanceof ProcedureFailure) return { reason: error.kind, failure: { kind: error.kind, message } };
  if (error instanceof DisconnectedError) return { reason: 'disconnected', failure: { kind: 'disconnected', message } };
  if (error instanceof InstrumentError)
    return { reason: 'instrument-error', failure: { kind: 'instrument-error', message } };
  if (error instanceof TimeoutError) return { reason: 'timeout', failure: { kind: 'timeout', message } };
  if (error instanceof ReplyFormatError || error instanceof AlignmentError)
    return { reason: 'reply-format', failure: { kind: 'reply-format', message } };
  if (error instanceof ChannelLimitError) return { reason: 'limits', failure: { kind: 'limits', message } };
  const name = error instanceof Error ? `${error.name}: ` : '';
  return { reason: 'internal-error', failure: { kind: 'internal', message: `${name}${message}` } };
}

/** Standard deviation of the 'ok' readings in a small window (0 with fewer than two). */
export function scatterHz(values: Float64Array, n: number): number {
  let count = 0;
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i] as number;
    if (Number.isNaN(v)) continue;
    count++;
    const delta = v - mean;
    mean += delta / count;
    m2 += delta * (v - mean);
  }
  return count >= 2 ? Math.sqrt(m2 / (count - 1)) : 0;
}
