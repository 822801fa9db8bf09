/**
 * A stored drift log as main holds it for a page that draws only what is on
 * screen (app/contract/run-window.ts): the columns the time plot draws (time
 * and, masked to the readings whose status is ok, frequency and
 * temperature), the plot's slices for an x range, the drift analysis with
 * its frequency–temperature chunk means, and the plot's data as CSV. Every
 * rule is the page's own for a log it holds whole (app/views/drift
 * DriftFigures, app/workers/analysis-jobs.ts, app/state/column-inputs.ts), so
 * the figures are the same numbers either way; a test holds them equal.
 */
import type { ColumnTable } from '../contract/column-table.ts';
import { STATUS_EFFECT, readingStatus } from '../contract/reading-status.ts';
import type { RunAnalysis, RunWindow, RunWindowRequest, TempcoChunks } from '../contract/run-window.ts';
import { analyzeDrift, type DriftAnalysis } from './drift-analysis.ts';
import { columnsCsv } from './csv-cells.ts';
import { envelope, type EnvelopeSeries } from './envelope.ts';

export interface DriftDisplayColumns {
  rowCount: number;
  /** The time column (a copy the worker can share). */
  timeS: Float64Array;
  /** NaN where a reading's status is not ok (the plot breaks there; the analysis counts no value). */
  frequencyHz: Float64Array;
  temperatureC: Float64Array;
  /** The temperature column as logged (the analysis takes it unmasked); dropped once the analysis has its copy. */
  rawTemperatureC: Float64Array | null;
  /** Control voltage of the first reading; null when unknown. */
  holdV: number | null;
}

/** Which rows are measurements (status ok, or no status column at all). */
function measuredRows(table: ColumnTable): (row: number) => boolean {
  const status = table.text.status;
  if (!status) return () => true;
  const measured = status.levels.map((level) => {
    const s = readingStatus(level);
    return s !== null && STATUS_EFFECT[s] === 'measured';
  });
  return (row) => measured[status.codes[row] as number] === true;
}

/**
 * Room for n values, shared where the platform has SharedArrayBuffer (Node, main's side): a worker thread then
 * analyses the held columns in place instead of a 240 MB copy of a 10,000,000-reading log.
 */
function column(n: number): Float64Array {
  return typeof SharedArrayBuffer === 'function'
    ? new Float64Array(new SharedArrayBuffer(n * Float64Array.BYTES_PER_ELEMENT))
    : new Float64Array(n);
}

const isShared = (values: Float64Array): boolean =>
  typeof SharedArrayBuffer === 'function' && values.buffer instanceof SharedArrayBuffer;

function masked(values: Float64Array | undefined, n: number, keep: (row: number) => boolean): Float64Array {
  const out = column(n).fill(Number.NaN);
  if (!values) return out;
  const m = Math.min(n, values.length);
  for (let i = 0; i < m; i += 1) if (keep(i)) out[i] = values[i] as number;
  return out;
}

export function driftDisplayColumns(table: ColumnTable): DriftDisplayColumns {
  const n = table.rowCount;
  const timeS = masked(table.numeric.time_s, n, () => true);
  const keep = measuredRows(table);
  const control = table.numeric.control_v?.[0];
  const temperature = table.numeric.temperature_c;
  return {
    rowCount: n,
    timeS,
    frequencyHz: masked(table.numeric.frequency_hz, n, keep),
    temperatureC: masked(temperature, n, keep),
    rawTemperatureC: temperature ? masked(temperature, n, () => true) : null,
    holdV: n > 0 && control !== undefined && Number.isFinite(control) ? control : null,
  };
}

/**
 * The time plot's points for an x range, by the page's rule for a log it
 * holds (DriftFigures timeData): slices at least 4 px and 4 readings wide,
 * the readings themselves once no more than widthPx/4 are in view.
 */
export function driftWindow(columns: DriftDisplayColumns, request: RunWindowRequest): RunWindow {
  const { timeS: x, rowCount: n } = columns;
  const whole = request.xMin === null || request.xMax === null;
  const from = whole ? (x[0] ?? 0) : (request.xMin as number);
  const to = whole ? (x[n - 1] ?? 0) : (request.xMax as number);
  const px = Math.max(100, request.widthPx);
  const env = envelope(
    x,
    [columns.frequencyHz, columns.temperatureC],
    n,
    from,
    to,
    Math.floor(px / 4),
    Math.floor(px / 4),
    4,
  );
  const [freq, temp] = env.series as [EnvelopeSeries, EnvelopeSeries];
  return {
    dense: env.dense,
    x: env.x,
    series: [
      { name: 'frequency_hz', ...freq },
      { name: 'temperature_c', ...temp },
    ],
    rowCount: n,
  };
}

/** What a drift analysis needs: shared buffers read in place, or buffers of its own (they may be moved to a worker thread). */
export interface DriftAnalysisJob {
  timeS: Float64Array;
  frequencyHz: Float64Array;
  /** Null when no reading has a temperature (as the page's driftInputFromColumns). */
  temperatureC: Float64Array | null;
  gateS: number | null;
  holdV: number | null;
}

export function driftAnalysisJob(columns: DriftDisplayColumns, gateS: number | undefined): DriftAnalysisJob {
  const raw = columns.rawTemperatureC;
  let anyTemperature = false;
  if (raw) for (let i = 0; i < raw.length && !anyTemperature; i += 1) anyTemperature = Number.isFinite(raw[i]);
  // Shared columns are read in place (the analysis only reads its input); others are copied, since they may be moved.
  const own = (values: Float64Array): Float64Array => (isShared(values) ? values : values.slice());
  return {
    timeS: own(columns.timeS),
    frequencyHz: own(columns.frequencyHz),
    temperatureC: anyTemperature && raw ? own(raw) : null,
    gateS: gateS ?? null,
    holdV: columns.holdV,
  };
}

/** At most `maxPoints` chunk means of the valid readings, ordered by temperature, with the tempco line on the same x. */
export function tempcoChunks(
  temperatureC: ArrayLike<number>,
  /** NaN where a reading is not a measurement. */
  frequencyHz: ArrayLike<number>,
  n: number,
  analysis: Pick<DriftAnalysis, 'tempcoHzPerC' | 'meanTemperatureC' | 'meanHz'>,
  maxPoints = 4000,
): TempcoChunks {
  const chunk = Math.max(1, Math.ceil(n / maxPoints));
  const pairs: [number, number][] = [];
  for (let start = 0; start < n; start += chunk) {
    let sumT = 0;
    let sumF = 0;
    let count = 0;
    for (let i = start; i < Math.min(n, start + chunk); i += 1) {
      const t = temperatureC[i] as number;
      const f = frequencyHz[i] as number;
      if (!Number.isFinite(t) || !Number.isFinite(f)) continue;
      sumT += t;
      sumF += f;
      count += 1;
    }
    if (count > 0) pairs.push([sumT / count, sumF / count]);
  }
  pairs.sort((a, b) => a[0] - b[0]);
  const slope = analysis.tempcoHzPerC;
  const meanT = analysis.meanTemperatureC;
  return {
    temperatureC: pairs.map((p) => p[0]),
    frequencyHz: pairs.map((p) => p[1]),
    // The least-squares line passes through the means (common practice).
    lineHz: pairs.map((p) => (slope !== null && meanT !== null ? analysis.meanHz + slope * (p[0] - meanT) : null)),
  };
}

/** The analysis, its chunk means and the held voltage, as the page shows them; failures as a message. */
export function runDriftAnalysis(job: DriftAnalysisJob): RunAnalysis {
  const base = { holdV: job.holdV };
  if (job.timeS.length < 3) return { ...base, outcome: { ok: false, message: 'fewer than 3 readings' }, tempco: null };
  let analysis: DriftAnalysis;
  try {
    const input = job.temperatureC
      ? { timeS: job.timeS, frequencyHz: job.frequencyHz, temperatureC: job.temperatureC }
      : { timeS: job.timeS, frequencyHz: job.frequencyHz };
    analysis = analyzeDrift(input, job.gateS !== null ? { gateS: job.gateS } : {});
  } catch (error) {
    return {
      ...base,
      outcome: { ok: false, message: error instanceof Error ? error.message : String(error) },
      tempco: null,
    };
  }
  const tempco =
    analysis.tempcoHzPerC !== null && job.temperatureC
      ? tempcoChunks(job.temperatureC, job.frequencyHz, job.timeS.length, analysis)
      : null;
  return { ...base, outcome: { ok: true, analysis }, tempco };
}

/**
 * Rows [fromRow, fromRow + rows) of the time plot's data as CSV, cell for cell
 * what the page's export of a log it holds writes (columnsCsv; readings not ok
 * are empty cells); the header only in the part from row 0.
 */
export function driftCsvPart(
  columns: DriftDisplayColumns,
  fromRow: number,
  rows: number,
): { text: string; nextRow: number; rowCount: number } {
  const n = columns.rowCount;
  const from = Math.min(n, fromRow);
  const end = Math.min(n, from + rows);
  const text = columnsCsv(
    ['time_s', 'frequency_hz', 'temperature_c'],
    [
      columns.timeS.subarray(from, end),
      columns.frequencyHz.subarray(from, end),
      columns.temperatureC.subarray(from, end),
    ],
  );
  return { text: from === 0 ? text : text.slice(text.indexOf('\r\n') + 2), nextRow: end, rowCount: n };
}
