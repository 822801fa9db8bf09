/**
 * What a procedure needs from the world, by injection: the role drivers of an
 * assembled bench, a clock, and a sink that records rows and events as they
 * arrive. Nothing here knows about files, sockets or the simulator, so a
 * 12-hour drift log runs on a virtual clock in seconds.
 */
import type { Counter, RoleName, Supply, Thermometer } from '../instruments/roles.ts';
import type {
  ProgressInfo,
  RecordedConditions,
  RunKind,
  RunStatus,
  SampleStatus,
} from '../../app/contract/bench-api.ts';

/** The role drivers of one bench, plus which supply channel does what. */
export interface BenchRoles {
  supply: Supply;
  counter: Counter;
  thermometer?: Thermometer | undefined;
  /** Supply channel that drives the DUT's tuning port. */
  controlChannel: number;
  /** Supply channel that powers the DUT (pushing steps it). */
  dutSupplyChannel: number;
  /**
   * Re-opens the link to one role after a drop (the driver objects stay the
   * same). Absent when the bench cannot reconnect; procedures then treat a
   * drop as final.
   */
  reconnect?: ((role: RoleName) => Promise<void>) | undefined;
  /**
   * Drains one instrument's error queue (SCPI SYSTem:ERRor?). Lets a long
   * log notice errors that no write of its own would report. Optional.
   */
  drainErrors?: ((role: RoleName) => Promise<{ code: number; message: string }[]>) | undefined;
  /** Where each role is (for messages that name the instrument). Optional. */
  instruments?: readonly { role: string; idn: string; address: string }[] | undefined;
  /** Link diagnostics (drops, reopens, resyncs) of every role; returns an unsubscribe. Optional. */
  subscribeLinkEvents?:
    ((listener: (role: RoleName, event: { type: string; [key: string]: unknown }) => void) => () => void) | undefined;
}

/** One samples.csv row: column name → number (NaN = empty) or text. */
export type SampleRow = Record<string, number | string>;

/** An event before it is stamped with the run time. */
export interface EventBody {
  type: string;
  [key: string]: unknown;
}

/** One events.jsonl line; `time_s` is seconds since the run started. */
export interface ProcedureEvent extends EventBody {
  time_s: number;
}

/**
 * Where a procedure records. The run store's writer satisfies it (see
 * ./store-sink.ts); tests use an in-memory one. appendSample/appendEvent
 * must not lose a row once they return, short of a process crash before the
 * next flush.
 */
export interface RunSink {
  appendSample(row: SampleRow): void;
  appendEvent(event: ProcedureEvent): void;
  /** Pushes buffered rows to durable storage. */
  flush(): Promise<void>;
}

export type ProcedureProgress = ProgressInfo;

/** How a procedure ended. `failure` is set when the work failed (exit code 1). */
export interface ProcedureOutcome {
  kind: RunKind;
  status: Extract<RunStatus, 'complete' | 'aborted'>;
  /** Why it stopped early: 'stop', 'pause-timeout', 'instrument-error', … */
  reason: string | null;
  failure: { kind: FailureKind; message: string } | null;
  /** Readings recorded (rows in samples.csv written by this call). */
  rowsWritten: number;
  /** True when every safe-state step was confirmed by readback (or none was needed). */
  safeStateOk: boolean;
  /** One line per unconfirmed safe-state step, naming the channel and what was read back. */
  safeStateFailures?: string[];
  /** Conditions read around the run (sweeps, once the output was on); run.json `conditions`. */
  conditions?: RecordedConditions;
}

export type FailureKind =
  'instrument-error' | 'disconnected' | 'timeout' | 'reply-format' | 'internal' | 'stall' | 'limits' | 'counter-fault';

export type { SampleStatus };
