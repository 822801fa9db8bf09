/** Types of the run writer (see run-writer.ts for what it guarantees). */
import type { RunKind, RunMeta, RunStatus } from '../../app/contract/bench-api.ts';
import type { Clock } from '../time/clock.ts';
import type { CellValue } from './csv-cells.ts';
import type { StoreFs } from './store-fs.ts';

/** One reading: values in column order, or by column name (missing → empty). */
export type SampleRow = readonly CellValue[] | Readonly<Record<string, CellValue>>;

/** An event for events.jsonl; time_s defaults to the writer's elapsed time. */
export interface RunEventInput {
  type: string;
  time_s?: number;
  [key: string]: unknown;
}

export interface WriterOptions {
  clock: Clock;
  fs?: StoreFs;
  /** Seconds of clock time between automatic flushes; (0, 1], default 1. */
  flushEveryS?: number;
  /** Called with errors of automatic (timer) flushes; explicit flush() rejects instead. */
  onError?: (error: Error) => void;
  /** Real wall time in ms, for heartbeats and fsync pacing; default Date.now. */
  wallNowMs?: () => number;
}

export interface CreateRunOptions extends WriterOptions {
  runsDir: string;
  kind: RunKind;
  dut: { id: string; notes?: string };
  instruments: RunMeta['instruments'];
  plan: unknown;
  columns: readonly string[];
  softwareVersion?: string;
}

export interface RunWriter {
  readonly id: string;
  readonly dir: string;
  readonly columns: readonly string[];
  /** run.json as this writer last wrote it. */
  meta(): RunMeta;
  /** Seconds since the run started, on the run's time axis (the injected clock). */
  elapsedS(): number;
  appendSample(row: SampleRow): void;
  appendEvent(event: RunEventInput): void;
  /** Writes everything pending; rejects if the disk refuses (the data stays pending). */
  flush(): Promise<void>;
  /**
   * Flushes, fsyncs, closes, and records the final status in run.json, with
   * `extra` keys (e.g. the run's `conditions`) added to it.
   */
  finish(status: Exclude<RunStatus, 'running'>, extra?: Pick<RunMeta, 'conditions'>): Promise<RunMeta>;
  /** Rows appended but not yet written. */
  pendingRows(): number;
  /** Rows written to samples.csv by this writer. */
  rowsWritten(): number;
}
