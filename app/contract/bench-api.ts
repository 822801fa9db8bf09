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
import type { z } from 'zod';
import type { KnownShape } from './known-shape.ts';
import type { BenchConfig, DriftPlan, PushingPlan, SweepPlan } from './plans.ts';
import type {
  CampaignSheet,
  CampaignSummary,
  CampaignView,
  SoakSampleView,
  SweepPointView,
} from './campaign-schemas.ts';
import type { ReadingStatus } from './reading-status.ts';
import type { RunPreview } from './run-preview.ts';
import type { CsvPart, RunAnalysis, RunWindow, RunWindowRequest } from './run-window.ts';
import type { runMetaSchema } from './run-meta-schema.ts';
import type { benchStatusSchema, connectionStateSchema, progressSchema, readoutSchema } from './state-schemas.ts';

export type RunKind = 'sweep' | 'drift' | 'pushing';
export type SampleStatus = ReadingStatus;

// The contract's data types are inferred from their schemas (./state-schemas.ts,
// ./run-meta-schema.ts): a field dropped from a schema is dropped from the type.
export type ConnectionState = KnownShape<z.output<typeof connectionStateSchema>>;
export type RoleConnection = ConnectionState['roles'][number];
export type LiveReadout = KnownShape<z.output<typeof readoutSchema>>;
export type ProgressInfo = KnownShape<z.output<typeof progressSchema>>;

/** Metadata as in run.json (CONTRACTS.md), inferred from runMetaSchema. */
export type RunMeta = KnownShape<z.output<typeof runMetaSchema>>;
export type RunStatus = RunMeta['status'];

/** run.json `conditions`: the DUT supply voltage and the temperature around a run. */
export type RecordedConditions = NonNullable<RunMeta['conditions']>;
/** A condition read at the start and at the end of a run; null when it could not be read. */
export type ConditionSpan = RecordedConditions['dutSupplyV'];

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

/** Whether main can talk to one instrument; `lost` after a read failed for want of a link (detail: why). */
export type RoleLinkStatus = BenchStatus['links'][number];

/** How the last run left the supply: every safe-state step and whether each worked ("step: error" per failure). */
export type SafeStateReport = NonNullable<BenchStatus['safeState']>;

/**
 * What the bench is doing now, for the status strip on every screen. During a
 * run every figure comes from the run's own readings and events (no second
 * query stream competes with the procedure); while idle from the live poll.
 */
export type BenchStatus = KnownShape<z.output<typeof benchStatusSchema>>;

/** A bring-up setting for the control channel, outside any run, under the same limits. */
export interface ManualControlRequest {
  controlV: number;
  output: boolean;
  limits: { maxControlV: number; currentLimitA: number; ovpV?: number | undefined };
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
  | { type: 'bench-status'; status: BenchStatus }
  | { type: 'error'; message: string }
  /** Browser mode: how many other pages drive the same bench (any of them can stop, pause or rename a run). */
  | { type: 'peers'; others: number }
  /** A campaign's state changed (a condition, the unit-change question, the end). */
  | { type: 'campaign'; campaign: CampaignView }
  /** Soak readings (batched): setpoint, chamber air and DUT temperature. */
  | { type: 'campaign-soak'; samples: SoakSampleView[] }
  /** Readings of the condition being swept (batched), with the counter's gate they were read with. */
  | { type: 'campaign-sweep'; index: number; points: SweepPointView[]; gateS?: number };

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
  /** The bench status as the strip shows it (also pushed as `bench-status` events). */
  getBenchStatus(): Promise<BenchStatus>;
  /**
   * Bring-up: sets the control voltage and output by hand while no run holds
   * the bench. Limits are checked and applied first, the supply is read back;
   * disconnecting or closing leaves it in the safe state.
   */
  manualControl(request: ManualControlRequest): Promise<BenchStatus>;

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
  /**
   * The run at screen resolution before its full columns (./run-preview.ts):
   * `columns` is how many pixel columns the page's plot has. Optional: a
   * carrier without it sends the full columns only.
   */
  previewRun?(id: string, columns: number): Promise<RunPreview>;
  openRun(id: string): Promise<RunDetail>;
  /**
   * A big drift log stays in main (./run-window.ts): the readings of an x
   * range cut to the plot's slices, its analysis, and its plot data as CSV
   * parts. Optional: a carrier without them sends the full columns.
   */
  windowRun?(id: string, request: RunWindowRequest): Promise<RunWindow>;
  analyzeRun?(id: string): Promise<RunAnalysis>;
  runCsvPart?(id: string, fromRow: number, rows: number): Promise<CsvPart>;
  renameRun(id: string, dutId: string): Promise<RunMeta>;
  addNote(id: string, text: string): Promise<void>;
  deleteRun(id: string): Promise<void>;
  restoreRun(id: string): Promise<RunMeta>;
  importCsv(fileName: string, csvText: string, dutId: string): Promise<RunMeta>;

  /*
   * Campaigns (temperature chamber, supply corners, units). Optional: a
   * carrier without a chamber (the in-page web edition) leaves them out.
   * One campaign or run at a time on the connected bench, which needs a
   * chamber and the DUT thermometer.
   */
  /** Starts a campaign with this plan (campaign-plan.ts) in a new campaign folder of the runs folder. */
  startCampaign?(plan: unknown): Promise<CampaignView>;
  /** Carries on an interrupted or stopped campaign of the runs folder: done conditions are kept. */
  resumeCampaign?(id: string): Promise<CampaignView>;
  /** Stops the campaign: supply outputs off, chamber to safeC; resolves once it is told. */
  stopCampaign?(): Promise<void>;
  /** The operator has changed the unit (the campaign waits for this between units). */
  confirmUnitChange?(): Promise<void>;
  /** The campaign running now, else the last one this process ran; null when none. */
  getCampaign?(): Promise<CampaignView | null>;
  /** The campaign folders of the runs folder, newest first. */
  listCampaigns?(): Promise<CampaignSummary[]>;
  /** The campaign datasheet of one campaign folder. */
  campaignDatasheet?(id: string): Promise<CampaignSheet>;

  /**
   * Desktop app only (optional): prints the calling window's current page —
   * the datasheet screen — to a PDF the operator saves through a dialog.
   * `savedTo` is null when the dialog was cancelled. Browser mode leaves it
   * out (the browser's own Print → Save as PDF does the job there).
   */
  printDatasheetPdf?(fileName: string): Promise<{ savedTo: string | null }>;

  /**
   * Web edition only (optional; web/page-bench.ts): opens the browser's serial
   * port chooser; the granted port joins listSerialPorts() as `usb-VVVV-PPPP`
   * (its USB ids). Rejects, saying why, where the browser has no Web Serial.
   */
  chooseBrowserSerialPort?(): Promise<SerialPortInfo>;
  /** Web edition only: a run folder as a zip (run.json, samples.csv, events.jsonl under `<id>/`). */
  exportRunZip?(id: string): Promise<{ fileName: string; bytes: Uint8Array }>;
  /** Web edition only: run folders from a zip into the archive; an existing run is never overwritten. */
  importRunZip?(fileName: string, bytes: Uint8Array): Promise<RunMeta[]>;

  /** Subscribe to pushed events; returns an unsubscribe function. */
  subscribe(listener: (event: BenchEvent) => void): () => void;
}

/** Methods every carrier answers (IPC and WebSocket). */
export type BenchMethod = Exclude<keyof BenchApi, 'subscribe' | DesktopMethod | PageMethod>;
/** Optional methods only the desktop app (IPC) answers; absent from the API object elsewhere. */
export type DesktopMethod = 'printDatasheetPdf';
/** Optional methods only the web edition's in-page API has (no carrier crosses for them). */
export type PageMethod = 'chooseBrowserSerialPort' | 'exportRunZip' | 'importRunZip';
