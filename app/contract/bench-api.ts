/**
 * BenchApi: the one contract between the renderer and main. Plain
 * serialisable data only (no class instances). The one exception is sample
 * columns: a stored run's numeric columns may be Float64Array and its text
 * columns dictionary-coded (levels + Uint8/16/32 codes) so a million-row run
 * crosses without a per-cell copy: Electron IPC carries typed arrays by
 * structured clone, the WebSocket as a binary frame (./wire.ts).
 * Electron carries it over IPC (preload + contextBridge); browser mode over a
 * WebSocket. The renderer never knows which.
 *
 * main/ treats every incoming payload as `unknown` and validates it with the
 * schemas in ./bench-api-schemas.ts before use.
 */
import type { BenchConfig, DriftPlan, PushingPlan, SweepPlan } from './plans.ts';

export type RunKind = 'sweep' | 'drift' | 'pushing';
export type RunStatus = 'running' | 'complete' | 'aborted' | 'interrupted';
export type SampleStatus = 'ok' | 'no-signal' | 'timeout' | 'error';

export interface RoleConnection {
  role: 'supply' | 'counter' | 'thermometer';
  address: string;
  idn: string;
  simulated: boolean;
}

export interface ConnectionState {
  connected: boolean;
  simulated: boolean;
  roles: RoleConnection[];
  error: string | null;
}

export interface LiveReadout {
  controlSetV: number | null;
  controlMeasV: number | null;
  frequencyHz: number | null;
  temperatureC: number | null;
  timeS: number;
}

/** Metadata as in run.json (CONTRACTS.md). */
export interface RunMeta {
  schema: 'tunebench.run/1';
  id: string;
  kind: RunKind;
  status: RunStatus;
  startedAt: string;
  endedAt: string | null;
  dut: { id: string; notes: string };
  instruments: { role: string; idn: string; address: string }[];
  plan: unknown;
  software: { version: string };
  /** Conditions read at the start and end of the run (sweeps; absent in older runs). */
  conditions?: RecordedConditions;
  /** True when the run was taken on the simulated bench (absent: real instruments, or an older run — see isSimulatedBench). */
  simulated?: boolean;
}

/** A condition read at the start and at the end of a run; null when it could not be read. */
export interface ConditionSpan {
  start: number | null;
  end: number | null;
}

/** run.json `conditions`: the DUT supply voltage and the temperature around a run. */
export interface RecordedConditions {
  dutSupplyV: ConditionSpan;
  temperatureC: ConditionSpan;
}

/** A numeric column: NaN for an empty cell. number[] is the older plain form, still accepted everywhere. */
export type NumericColumn = number[] | Float64Array;

/** A text column as a dictionary: row i holds `levels[codes[i]]` (status, direction: a handful of words). */
export interface CodedTextColumn {
  levels: string[];
  codes: Uint8Array | Uint16Array | Uint32Array;
}

/** A text column: one string per row, or dictionary-coded. */
export type TextColumn = string[] | CodedTextColumn;

/** Columns of samples.csv (all columns hold the same number of rows). */
export interface SampleColumns {
  names: string[];
  numeric: Record<string, NumericColumn>;
  text: Record<string, TextColumn>;
  /** Rows in every column; present when main read the run (older senders leave it out). */
  rowCount?: number;
}

/** Row i of a text column, whichever form it has ('' past the end). */
export function textCell(column: TextColumn, row: number): string {
  if (Array.isArray(column)) return column[row] ?? '';
  const code = column.codes[row];
  return code === undefined ? '' : (column.levels[code] ?? '');
}

export interface RunEvent {
  time_s: number;
  type: string;
  [key: string]: unknown;
}

export interface RunDetail {
  meta: RunMeta;
  samples: SampleColumns;
  events: RunEvent[];
}

export interface ProgressInfo {
  runId: string;
  kind: RunKind;
  phase: 'settling' | 'reading' | 'refining' | 'logging' | 'paused' | 'finishing';
  pointsDone: number;
  pointsTotal: number;
  etaS: number | null;
  /** supplyV: the stepped DUT supply of a pushing run. */
  latest: { controlV: number; frequencyHz: number | null; status: SampleStatus; supplyV?: number } | null;
}

/** Events pushed from main to the renderer. */
export type BenchEvent =
  | { type: 'connection'; state: ConnectionState }
  | { type: 'live'; readout: LiveReadout }
  | { type: 'run-started'; meta: RunMeta }
  | { type: 'samples'; runId: string; rows: Record<string, number | string>[] }
  | { type: 'progress'; progress: ProgressInfo }
  | { type: 'run-ended'; meta: RunMeta }
  | { type: 'run-event'; runId: string; event: RunEvent }
  | { type: 'error'; message: string }
  /** Browser mode: how many other pages drive the same bench (any of them can stop, pause or rename a run). */
  | { type: 'peers'; others: number };

export interface SerialPortInfo {
  path: string;
  manufacturer: string | null;
}

export interface BenchApi {
  listSerialPorts(): Promise<SerialPortInfo[]>;
  listProfiles(): Promise<{ name: string; role: string }[]>;
  connect(config: BenchConfig | 'sim'): Promise<ConnectionState>;
  disconnect(): Promise<ConnectionState>;
  getConnection(): Promise<ConnectionState>;

  startSweep(plan: SweepPlan, dutId: string): Promise<RunMeta>;
  startDrift(plan: DriftPlan, dutId: string): Promise<RunMeta>;
  startPushing(plan: PushingPlan, dutId: string): Promise<RunMeta>;
  pauseRun(): Promise<void>;
  resumeRun(): Promise<void>;
  /**
   * Clean stop: drift ends as `complete`, a sweep as `aborted`. Resolves as
   * soon as the run has been told to stop (served before anything else
   * queued); the safe state follows, and `run-ended` says when it is done.
   */
  stopRun(): Promise<void>;

  listRuns(): Promise<RunMeta[]>;
  openRun(id: string): Promise<RunDetail>;
  renameRun(id: string, dutId: string): Promise<RunMeta>;
  addNote(id: string, text: string): Promise<void>;
  deleteRun(id: string): Promise<void>;
  restoreRun(id: string): Promise<RunMeta>;
  importCsv(fileName: string, csvText: string, dutId: string): Promise<RunMeta>;

  /**
   * Desktop app only (optional): prints the calling window's current page —
   * the datasheet screen — to a PDF the operator saves through a dialog.
   * `savedTo` is null when the dialog was cancelled. Browser mode leaves it
   * out (the browser's own Print → Save as PDF does the job there).
   */
  printDatasheetPdf?(fileName: string): Promise<{ savedTo: string | null }>;

  /** Subscribe to pushed events; returns an unsubscribe function. */
  subscribe(listener: (event: BenchEvent) => void): () => void;
}

/** Methods every carrier answers (IPC and WebSocket). */
export type BenchMethod = Exclude<keyof BenchApi, 'subscribe' | DesktopMethod>;
/** Optional methods only the desktop app (IPC) answers; absent from the API object elsewhere. */
export type DesktopMethod = 'printDatasheetPdf';
