/**
 * Opening a stored run (issue 12, big runs open fast and in bounded
 * memory). The page first asks `previewRun` — the run reduced to its plot's
 * pixel columns (app/analysis/pixel-preview.ts), drawn at once.
 *  - A big drift log (a preview was made) then stays here: the columns its
 *    time plot draws are kept (app/analysis/drift-run-view.ts) and the page
 *    asks `windowRun` for the slices of what it shows (whole or zoomed),
 *    `analyzeRun` for the analysis (run by `analyze`, a worker thread in
 *    serve and the desktop, on every reading) and `runCsvPart` for an
 *    export. The page never holds its readings.
 *  - Any other run: the table read for the preview is kept for the
 *    `openRun` that follows, once, so the store is read once per opening.
 * Any edit through the service drops what is kept of that run.
 */
import { planHints } from '../../app/analysis/datasheet-run.ts';
import {
  driftAnalysisJob,
  driftCsvPart,
  driftDisplayColumns,
  driftWindow,
  runDriftAnalysis,
  type DriftAnalysisJob,
  type DriftDisplayColumns,
} from '../../app/analysis/drift-run-view.ts';
import { runPreviewOf } from '../../app/analysis/pixel-preview.ts';
import type { CodedTextColumn, RunDetail } from '../../app/contract/bench-api.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import type { RunPreview } from '../../app/contract/run-preview.ts';
import type { CsvPart, RunAnalysis, RunWindow, RunWindowRequest } from '../../app/contract/run-window.ts';
import { BenchApiError } from './errors.ts';

export interface RunOpener {
  preview(id: string, columns: number): Promise<RunPreview>;
  open(id: string): Promise<RunDetail>;
  window(id: string, request: RunWindowRequest): Promise<RunWindow>;
  analysis(id: string): Promise<RunAnalysis>;
  csvPart(id: string, fromRow: number, rows: number): Promise<CsvPart>;
  /** The run changed (renamed, noted, deleted): a kept table of it is stale. */
  forget(id: string): void;
}

/** Runs a drift analysis job; the buffers may be moved (a worker thread), so the caller must not use them after. */
export type DriftAnalyzer = (job: DriftAnalysisJob) => Promise<RunAnalysis>;

/** In this thread, after the current turn (the web edition's page, tests). */
export const analyzeHere: DriftAnalyzer = (job) =>
  new Promise((resolve) => setTimeout(() => resolve(runDriftAnalysis(job)), 0));

interface HeldLog {
  id: string;
  columns: DriftDisplayColumns;
  gateS: number | undefined;
  analysis: Promise<RunAnalysis> | null;
}

function codedText(column: RunDetail['samples']['text'][string]): CodedTextColumn {
  if (!Array.isArray(column)) return column;
  const levels: string[] = [];
  const index = new Map<string, number>();
  const codes = new Uint32Array(column.length);
  column.forEach((text, row) => {
    let code = index.get(text);
    if (code === undefined) {
      code = levels.push(text) - 1;
      index.set(text, code);
    }
    codes[row] = code;
  });
  return { levels, codes };
}

/** A run's samples as the table the drift view reads (the store's own columns, not copied). */
function tableOf(detail: RunDetail): ColumnTable {
  const { samples } = detail;
  const numeric: Record<string, Float64Array> = {};
  for (const [name, column] of Object.entries(samples.numeric))
    numeric[name] = column instanceof Float64Array ? column : Float64Array.from(column);
  const text: Record<string, CodedTextColumn> = {};
  for (const [name, column] of Object.entries(samples.text)) text[name] = codedText(column);
  const rowCount = samples.rowCount ?? numeric.time_s?.length ?? 0;
  return { names: [...Object.keys(numeric), ...Object.keys(text)], numeric, text, rowCount };
}

export function createRunOpener(
  read: (id: string) => Promise<RunDetail>,
  analyze: DriftAnalyzer = analyzeHere,
): RunOpener {
  // At most one run's table, waiting for its openRun; a second preview replaces it.
  let kept: { id: string; detail: RunDetail } | null = null;
  // At most one big drift log held for its page's windows and analysis; the newest opened replaces it.
  let held: HeldLog | null = null;

  const hold = (id: string, detail: RunDetail): HeldLog => {
    held = {
      id,
      columns: driftDisplayColumns(tableOf(detail)),
      gateS: planHints(detail.meta.plan).gateS,
      analysis: null,
    };
    return held;
  };
  // A read of a log to hold that is under way: calls that arrive meanwhile share it.
  let reading: { id: string; log: Promise<HeldLog> } | null = null;
  const heldLog = (id: string): Promise<HeldLog> => {
    if (held?.id === id) return Promise.resolve(held);
    if (reading?.id === id) return reading.log;
    // Another page opened another log meanwhile, or main restarted: read it again.
    const log = read(id).then((detail) => {
      if (detail.meta.kind !== 'drift')
        throw new BenchApiError(`run ${id} is a ${detail.meta.kind} run; only a drift log is held in main`, 'id');
      return held?.id === id ? held : hold(id, detail);
    });
    reading = { id, log };
    const done = (): void => {
      if (reading?.log === log) reading = null;
    };
    log.then(done, done);
    return log;
  };

  return {
    async preview(id, columns) {
      const detail = await read(id);
      const shown = runPreviewOf(detail, columns);
      kept = null;
      // A run still being written grows between calls: each later call reads it again.
      if (detail.meta.status === 'running') return shown;
      if (shown.preview !== null && detail.meta.kind === 'drift') {
        // Already held (another page opened it): its columns and analysis stand.
        if (held?.id === id || reading?.id === id) return shown;
        // After the preview has gone out: the columns held are made while the page draws it.
        const log = new Promise<HeldLog>((resolve) => setTimeout(() => resolve(hold(id, detail)), 0));
        reading = { id, log };
        const done = (): void => {
          if (reading?.log === log) reading = null;
        };
        void log.then(done);
      } else kept = { id, detail };
      return shown;
    },
    async open(id) {
      if (kept !== null && kept.id === id) {
        const { detail } = kept;
        kept = null;
        return detail;
      }
      return read(id);
    },
    async window(id, request) {
      return driftWindow((await heldLog(id)).columns, request);
    },
    async analysis(id) {
      const log = await heldLog(id);
      // One analysis per held log, however many pages ask; the logged temperatures are needed by it alone.
      if (log.analysis === null) {
        log.analysis = analyze(driftAnalysisJob(log.columns, log.gateS));
        // The analysis reads them in place (shared) or has its copy: the log no longer keeps them.
        log.columns.rawTemperatureC = null;
      }
      return log.analysis;
    },
    async csvPart(id, fromRow, rows) {
      return driftCsvPart((await heldLog(id)).columns, fromRow, rows);
    },
    forget(id) {
      if (kept?.id === id) kept = null;
      if (held?.id === id) held = null;
      if (reading?.id === id) reading = null;
    },
  };
}
