/**
 * Growable Float64Array columns: a length plus a capacity that doubles, so a
 * run of a million readings grows in ~20 reallocations and uPlot is handed
 * `subarray(0, length)` views (no copies). Nothing here allocates per sample.
 */

const INITIAL_CAPACITY = 256;

export class GrowableColumn {
  private buffer: Float64Array;
  private size = 0;

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
    if (this.size === this.buffer.length) this.grow(this.size + 1);
    this.buffer[this.size] = value;
    this.size += 1;
  }

  /** Appends a plain array in one go (one growth at most). */
  append(values: ArrayLike<number>): void {
    const needed = this.size + values.length;
    if (needed > this.buffer.length) this.grow(needed);
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
    let capacity = this.buffer.length;
    while (capacity < minCapacity) capacity *= 2;
    const next = new Float64Array(capacity);
    next.set(this.buffer.subarray(0, this.size));
    this.buffer = next;
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
export const RUN_COLUMNS = ['time_s', 'control_v', 'control_meas_v', 'frequency_hz', 'temperature_c', 'supply_v', 'status', 'direction'] as const;
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
      else if (name === 'direction') set.direction.push(row.direction === 'down' ? DIRECTION_CODE.down : DIRECTION_CODE.up);
      else set[name].push(numericCell(row[name]));
    }
  }
}

/** Builds a column set from a stored run (numeric number[] + text string[] columns). */
export function columnSetFromStored(numeric: Record<string, number[]>, text: Record<string, string[]>): ColumnSet {
  let n = 0;
  for (const column of Object.values(numeric)) n = Math.max(n, column.length);
  for (const column of Object.values(text)) n = Math.max(n, column.length);
  const set = createColumnSet(Math.max(INITIAL_CAPACITY, n));
  // Whole columns at a time: a million-row run opens in tens of milliseconds.
  const nanRow = new Float64Array(n).fill(Number.NaN);
  for (const name of RUN_COLUMNS) {
    const column = set[name];
    if (name === 'status') {
      const source = text.status;
      const codes = new Float64Array(n);
      if (source) for (let i = 0; i < n; i += 1) codes[i] = source[i] === 'ok' ? STATUS_CODE.ok : statusCode(source[i]);
      column.append(codes);
    } else if (name === 'direction') {
      const source = text.direction;
      const codes = new Float64Array(n);
      if (source) for (let i = 0; i < n; i += 1) codes[i] = source[i] === 'down' ? DIRECTION_CODE.down : DIRECTION_CODE.up;
      column.append(codes);
    } else {
      const source = numeric[name];
      column.append(source && source.length === n ? source : source ? Float64Array.from({ length: n }, (_, i) => source[i] ?? Number.NaN) : nanRow);
    }
  }
  return set;
}
