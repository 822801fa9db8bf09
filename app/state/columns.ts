/**
 * Growable Float64Array columns: a length plus a capacity that doubles, so a
 * run of a million readings grows in ~20 reallocations and uPlot is handed
 * `subarray(0, length)` views (no copies). Nothing here allocates per sample.
 * A stored run's Float64Array (from the reply) is adopted as the buffer
 * itself, so opening a run copies no cells.
 */
import { type NumericColumn, type TextColumn, textCell } from '../contract/bench-api.ts';

const INITIAL_CAPACITY = 256;

export class GrowableColumn {
  private buffer: Float64Array;
  private size = 0;
  /** The buffer belongs to someone else too (an adopted reply array): never written in place, moved on first write. */
  private borrowed = false;

  /** A column whose filled part is `values` itself (not copied); the first append moves it to a buffer of its own. */
  static adopting(values: Float64Array): GrowableColumn {
    const column = new GrowableColumn(1);
    column.buffer = values;
    column.size = values.length;
    column.borrowed = true;
    return column;
  }

  constructor(initialCapacity = INITIAL_CAPACITY) {
    if (!(initialCapacity >= 1) || !Number.isInteger(initialCapacity)) {
      throw new TypeError(`initialCapacity must be a positive integer, got ${initialCapacity}`);
    }
    this.buffer = new Float64Array(initialCapacity);
  }

  get length(): number {
    return this.size;
  }

  get capacity(): number {
    return this.buffer.length;
  }

  push(value: number): void {
    if (this.size === this.buffer.length || this.borrowed) this.grow(this.size + 1);
    this.buffer[this.size] = value;
    this.size += 1;
  }

  /** Appends a plain array in one go (one growth at most). */
  append(values: ArrayLike<number>): void {
    const needed = this.size + values.length;
    if (needed > this.buffer.length || this.borrowed) this.grow(needed);
    // Native copy; holes and undefined become NaN, as a missing reading should.
    this.buffer.set(values, this.size);
    this.size = needed;
  }

  at(index: number): number {
    return index >= 0 && index < this.size ? (this.buffer[index] ?? Number.NaN) : Number.NaN;
  }

  /** A view on the filled part; valid until the next growth. */
  view(): Float64Array {
    return this.buffer.subarray(0, this.size);
  }

  clear(): void {
    this.size = 0;
  }

  private grow(minCapacity: number): void {
    let capacity = Math.max(1, this.buffer.length);
    while (capacity < minCapacity) capacity *= 2;
    const next = new Float64Array(capacity);
    next.set(this.buffer.subarray(0, this.size));
    this.buffer = next;
    this.borrowed = false;
  }
}

/** Status codes kept in a numeric column (uPlot and typed arrays hold no strings). */
export const STATUS_CODE = { ok: 0, 'no-signal': 1, timeout: 2, error: 3 } as const;
export type StatusName = keyof typeof STATUS_CODE;

export function statusCode(text: unknown): number {
  return typeof text === 'string' && text in STATUS_CODE ? STATUS_CODE[text as StatusName] : STATUS_CODE.error;
}

export const DIRECTION_CODE = { up: 0, down: 1 } as const;

/** The columns every run view draws from; absent columns stay NaN-filled. */
export const RUN_COLUMNS = [
  'time_s',
  'control_v',
  'control_meas_v',
  'frequency_hz',
  'temperature_c',
  'supply_v',
  'status',
  'direction',
] as const;
export type RunColumnName = (typeof RUN_COLUMNS)[number];

export type ColumnSet = Record<RunColumnName, GrowableColumn>;

export function createColumnSet(initialCapacity = INITIAL_CAPACITY): ColumnSet {
  const set = {} as ColumnSet;
  for (const name of RUN_COLUMNS) set[name] = new GrowableColumn(initialCapacity);
  return set;
}

/** Number of complete rows (all columns are appended together). */
export function rowCount(set: ColumnSet): number {
  return set.time_s.length;
}

function numericCell(value: number | string | undefined): number {
  if (typeof value === 'number') return value;
  if (typeof value === 'string' && value.trim() !== '') {
    const parsed = Number(value);
    return Number.isFinite(parsed) ? parsed : Number.NaN;
  }
  return Number.NaN;
}

/** Appends rows as pushed in a 'samples' event. */
export function appendRows(set: ColumnSet, rows: readonly Record<string, number | string>[]): void {
  for (const row of rows) {
    for (const name of RUN_COLUMNS) {
      if (name === 'status') set.status.push(statusCode(row.status ?? 'ok'));
      else if (name === 'direction')
        set.direction.push(row.direction === 'down' ? DIRECTION_CODE.down : DIRECTION_CODE.up);
      else set[name].push(numericCell(row[name]));
    }
  }
}

/** Numeric codes of a text column through `codeOf` (per level for coded columns, so a million rows cost one table look-up each). */
function codedColumn(
  source: TextColumn | undefined,
  n: number,
  codeOf: (text: string) => number,
  missing: number,
): Float64Array {
  const out = new Float64Array(n);
  if (!source) {
    if (missing !== 0) out.fill(missing);
    return out;
  }
  if (Array.isArray(source)) {
    for (let i = 0; i < n; i += 1) out[i] = codeOf(textCell(source, i));
    return out;
  }
  const table = source.levels.map(codeOf);
  const { codes } = source;
  for (let i = 0; i < n; i += 1) {
    const code = codes[i];
    out[i] = code === undefined ? codeOf('') : (table[code] as number);
  }
  return out;
}

/**
 * Builds a column set from a stored run. Float64Array columns of the full
 * length are adopted as they are (no copy); plain arrays are copied once.
 * Absent columns share one NaN-filled buffer (adopted buffers are never
 * written in place).
 */
export function columnSetFromStored(
  numeric: Record<string, NumericColumn>,
  text: Record<string, TextColumn>,
): ColumnSet {
  let n = 0;
  for (const column of Object.values(numeric)) n = Math.max(n, column.length);
  for (const column of Object.values(text))
    n = Math.max(n, Array.isArray(column) ? column.length : column.codes.length);
  let nanRow: Float64Array | null = null;
  const set = {} as ColumnSet;
  for (const name of RUN_COLUMNS) {
    if (name === 'status') {
      set.status = GrowableColumn.adopting(
        codedColumn(text.status, n, (t) => (t === 'ok' ? STATUS_CODE.ok : statusCode(t)), STATUS_CODE.ok),
      );
    } else if (name === 'direction') {
      set.direction = GrowableColumn.adopting(
        codedColumn(
          text.direction,
          n,
          (t) => (t === 'down' ? DIRECTION_CODE.down : DIRECTION_CODE.up),
          DIRECTION_CODE.up,
        ),
      );
    } else {
      const source = numeric[name];
      if (source instanceof Float64Array && source.length === n) set[name] = GrowableColumn.adopting(source);
      else if (source) {
        // One native copy; rows past a short column (and holes) stay NaN.
        const copy = new Float64Array(n).fill(Number.NaN);
        copy.set(source);
        set[name] = GrowableColumn.adopting(copy);
      } else set[name] = GrowableColumn.adopting((nanRow ??= new Float64Array(n).fill(Number.NaN)));
    }
  }
  return set;
}
