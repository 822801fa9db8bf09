/**
 * A run reduced to one column per screen pixel, so a plot can be drawn at
 * once from a few thousand numbers instead of millions of readings: the x
 * range [first x, last x] is cut into `columns` equal slices and each slice
 * keeps, per series, its first, lowest, highest and last valid value, their
 * mean and how many there were. Rows whose value is not finite or that the
 * caller marks invalid (a reading without signal) count as no value: a
 * slice without one holds null, so a line drawn from it breaks there.
 * Pure: main computes it from the column cache (main/store/run-preview.ts),
 * the page draws it (app/views/drift) until the full columns arrive.
 */

import type { RunDetail } from '../contract/bench-api.ts';
import {
  MAX_PREVIEW_COLUMNS,
  type PixelPreview,
  type PreviewSeries,
  type RunPreview,
} from '../contract/run-preview.ts';

export type { PixelPreview, PreviewSeries };

export interface PreviewInput {
  x: { name: string; values: ArrayLike<number> };
  series: { name: string; values: ArrayLike<number> }[];
  /** Rows [0, n) are reduced. */
  n: number;
  /** How many slices (pixels) at most. */
  columns: number;
  /** Whether row i is a reading with a value (e.g. status ok); every row when absent. */
  rowOk?: (row: number) => boolean;
}

/**
 * Reduces rows [0, n) to at most `columns` slices of equal x width. x must
 * be ascending (a run's time column); rows with a non-finite x are skipped.
 * There are never more slices than readings (a single x value: one slice),
 * so a short run is not padded with thousands of empty ones.
 */
export function pixelPreview(input: PreviewInput): PixelPreview {
  const { x, series, rowOk } = input;
  const xs = x.values;
  const n = Math.max(0, Math.min(input.n, xs.length));
  let i0 = 0;
  while (i0 < n && !Number.isFinite(xs[i0])) i0 += 1;
  let i1 = n - 1;
  while (i1 >= i0 && !Number.isFinite(xs[i1])) i1 -= 1;
  const xFrom = i1 >= i0 ? (xs[i0] as number) : null;
  const xTo = i1 >= i0 ? (xs[i1] as number) : null;
  const span = xFrom === null || xTo === null ? 0 : xTo - xFrom;
  const wanted = Math.max(1, Math.min(MAX_PREVIEW_COLUMNS, Math.floor(input.columns)));
  const columns = i1 < i0 ? 0 : span > 0 ? Math.min(wanted, i1 - i0 + 1) : 1;
  const out: PixelPreview = {
    x: x.name,
    columns,
    xFrom,
    xTo,
    rows: [],
    xFirst: [],
    xLast: [],
    series: {},
  };
  // Typed accumulators: a plain array of number | null would box every value it is given (seconds for 10M rows).
  const scale = span > 0 ? columns / span : 0;
  const origin = xFrom ?? 0;
  // The last x falls on the range's end: it belongs to the last slice.
  const sliceOf = (xi: number): number => Math.min(columns - 1, Math.max(0, Math.floor((xi - origin) * scale)));
  const rows = new Float64Array(columns);
  const xFirst = new Float64Array(columns);
  const xLast = new Float64Array(columns);
  for (let i = i0; i <= i1; i += 1) {
    const xi = xs[i] as number;
    if (!Number.isFinite(xi)) continue;
    const c = sliceOf(xi);
    if (rows[c] === 0) xFirst[c] = xi;
    xLast[c] = xi;
    rows[c] = (rows[c] as number) + 1;
  }
  out.rows = Array.from(rows);
  out.xFirst = cellsOf(xFirst, rows);
  out.xLast = cellsOf(xLast, rows);
  for (const { name, values } of series) {
    const first = new Float64Array(columns);
    const min = new Float64Array(columns);
    const max = new Float64Array(columns);
    const last = new Float64Array(columns);
    const sum = new Float64Array(columns);
    const count = new Float64Array(columns);
    for (let i = i0; i <= i1; i += 1) {
      const xi = xs[i] as number;
      const v = values[i] as number;
      if (!Number.isFinite(xi) || !Number.isFinite(v) || (rowOk !== undefined && !rowOk(i))) continue;
      const c = sliceOf(xi);
      if (count[c] === 0) {
        first[c] = v;
        min[c] = v;
        max[c] = v;
      } else {
        if (v < (min[c] as number)) min[c] = v;
        if (v > (max[c] as number)) max[c] = v;
      }
      last[c] = v;
      count[c] = (count[c] as number) + 1;
      sum[c] = (sum[c] as number) + v;
    }
    for (let c = 0; c < columns; c += 1)
      if ((count[c] as number) > 0) sum[c] = (sum[c] as number) / (count[c] as number);
    out.series[name] = {
      first: cellsOf(first, count),
      min: cellsOf(min, count),
      max: cellsOf(max, count),
      last: cellsOf(last, count),
      mean: cellsOf(sum, count),
      count: Array.from(count),
    };
  }
  return out;
}

/** Each slice's value, null where the slice holds none. */
function cellsOf(values: Float64Array, counts: Float64Array): (number | null)[] {
  const out = new Array<number | null>(values.length);
  for (let c = 0; c < values.length; c += 1) out[c] = (counts[c] as number) > 0 ? (values[c] as number) : null;
  return out;
}

/** The series each kind of run plots against time, in preview order (drift: frequency and temperature). */
const PLOTTED: Readonly<Record<string, readonly string[]>> = {
  drift: ['frequency_hz', 'temperature_c'],
};

/**
 * Below this many readings a run's full columns arrive about as fast as a
 * preview would (a few hundred kilobytes): no preview is made.
 */
export const PREVIEW_MIN_ROWS = 20_000;

/**
 * The preview of an opened run: its plotted series against time_s, rows
 * whose status is not `ok` counted as no value (the plots break there too).
 * Null for a run of another kind, a small run, or one without time_s.
 */
export function runPreviewOf(detail: RunDetail, columns: number): RunPreview {
  const { meta, samples, events } = detail;
  const time = samples.numeric.time_s;
  const rowCount = samples.rowCount ?? time?.length ?? 0;
  const names = (PLOTTED[meta.kind] ?? []).filter((name) => samples.numeric[name] !== undefined);
  const base = { meta, events, rowCount };
  if (time === undefined || names.length === 0 || rowCount < PREVIEW_MIN_ROWS) return { ...base, preview: null };
  const status = samples.text.status;
  let rowOk: ((row: number) => boolean) | undefined;
  if (status !== undefined && !Array.isArray(status)) {
    const okCode = status.levels.indexOf('ok');
    const codes = status.codes;
    rowOk = (row) => codes[row] === okCode;
  } else if (status !== undefined) rowOk = (row) => status[row] === 'ok';
  const preview = pixelPreview({
    x: { name: 'time_s', values: time },
    series: names.map((name) => ({ name, values: samples.numeric[name] as ArrayLike<number> })),
    n: rowCount,
    columns,
    ...(rowOk ? { rowOk } : {}),
  });
  return { ...base, preview };
}
