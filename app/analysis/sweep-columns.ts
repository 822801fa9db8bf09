/**
 * The per-point parts of a sweep analysis (`points`, `kvco.local`) as columns:
 * typed arrays, one per key. A sweep of a million distinct control voltages
 * has a million of each; as objects they cost some hundreds of MB and most of
 * the analysis' time in allocation (issue 15 item 9), as columns 40 bytes a
 * point. A row object is made only when asked for: `row(i)` (the app's and
 * the tests' object shape, sweep-analysis.ts), or not at all: `fields` lists
 * the columns behind each key, in the row's order, for a writer that reads
 * the typed arrays itself (the CLI's JSON writer, main/cli/json-rows.ts, so a
 * million rows box no number). Both give the keys in the order the JSON has
 * always had them.
 */
import type { LocalKvco } from './sweep-gain.ts';

/** One point of the sweep as the JSON writes it (keys in this order). */
export interface SweepPointRow {
  v: number;
  meanHz: number;
  sdHz: number;
  readings: number;
  noOscillation: number;
  unstable: boolean;
  unsettled: boolean;
  /** In the stall edge's zone: left out of the usable range (see `usableRange.edgeZone`). */
  edgeZone: boolean;
  /** The fitted curve at this point (null outside the fitted range): residual = meanHz − fitHz. */
  fitHz: number | null;
}

/**
 * The column behind one key of a row: a number (null where `present` is 0;
 * NaN is written null too, as JSON does), a count, a flag (true/false; left
 * out where false when `omitFalse`), or one of two texts (`texts[value]`).
 */
export type RowField =
  | { key: string; kind: 'number'; values: Float64Array; present?: Uint8Array }
  | { key: string; kind: 'count'; values: Int32Array }
  | { key: string; kind: 'flag'; values: Uint8Array; omitFalse?: boolean }
  | { key: string; kind: 'choice'; values: Uint8Array; texts: readonly [string, string] };

/** Columns that hand out their rows: JSON.stringify sees the rows (toJSON), a writer can take them one at a time. */
export abstract class RowColumns<Row extends object> {
  /** Number of rows. */
  abstract readonly count: number;
  /** A new object of row i (an optional key only when the row has it). */
  abstract row(i: number): Row;
  /** The columns behind every key a row can have, in the row's order: row(i) in columns. */
  abstract fields(): readonly RowField[];

  rows(): Row[] {
    const out = new Array<Row>(this.count);
    for (let i = 0; i < this.count; i++) out[i] = this.row(i);
    return out;
  }

  toJSON(): Row[] {
    return this.rows();
  }
}

/** `points`: one row per point of the primary direction, ascending in voltage. */
export class SweepPointColumns extends RowColumns<SweepPointRow> {
  readonly v: Float64Array;
  readonly meanHz: Float64Array;
  readonly sdHz: Float64Array;
  readonly readings: Int32Array;
  readonly noOscillation: Int32Array;
  readonly unstable: Uint8Array;
  readonly unsettled: Uint8Array;
  readonly edgeZone: Uint8Array;
  /** The fitted curve at the point; meaningful where `fitted` is 1 (elsewhere the row says null). */
  readonly fitHz: Float64Array;
  readonly fitted: Uint8Array;
  readonly count: number;

  /** `count` rows; columns given in `from` are used as they are (not copied), the others start at 0. */
  constructor(
    count: number,
    from: Partial<Pick<SweepPointColumns, 'v' | 'meanHz' | 'sdHz' | 'noOscillation' | 'unstable' | 'unsettled'>> = {},
  ) {
    super();
    this.count = count;
    this.v = from.v ?? new Float64Array(count);
    this.meanHz = from.meanHz ?? new Float64Array(count);
    this.sdHz = from.sdHz ?? new Float64Array(count);
    this.readings = new Int32Array(count);
    this.noOscillation = from.noOscillation ?? new Int32Array(count);
    this.unstable = from.unstable ?? new Uint8Array(count);
    this.unsettled = from.unsettled ?? new Uint8Array(count);
    this.edgeZone = new Uint8Array(count);
    this.fitHz = new Float64Array(count);
    this.fitted = new Uint8Array(count);
  }

  row(i: number): SweepPointRow {
    return {
      v: this.v[i] as number,
      meanHz: this.meanHz[i] as number,
      sdHz: this.sdHz[i] as number,
      readings: this.readings[i] as number,
      noOscillation: this.noOscillation[i] as number,
      unstable: this.unstable[i] === 1,
      unsettled: this.unsettled[i] === 1,
      edgeZone: this.edgeZone[i] === 1,
      fitHz: this.fitted[i] === 1 ? (this.fitHz[i] as number) : null,
    };
  }

  fields(): readonly RowField[] {
    return [
      { key: 'v', kind: 'number', values: this.v },
      { key: 'meanHz', kind: 'number', values: this.meanHz },
      { key: 'sdHz', kind: 'number', values: this.sdHz },
      { key: 'readings', kind: 'count', values: this.readings },
      { key: 'noOscillation', kind: 'count', values: this.noOscillation },
      { key: 'unstable', kind: 'flag', values: this.unstable },
      { key: 'unsettled', kind: 'flag', values: this.unsettled },
      { key: 'edgeZone', kind: 'flag', values: this.edgeZone },
      { key: 'fitHz', kind: 'number', values: this.fitHz, present: this.fitted },
    ] satisfies (RowField & { key: keyof SweepPointRow })[];
  }
}

/** `kvco.local`: one row per point that oscillated at all, ascending in voltage. */
export class LocalKvcoColumns extends RowColumns<LocalKvco> {
  count = 0;
  readonly v: Float64Array;
  readonly hzPerV: Float64Array;
  readonly fdHzPerV: Float64Array;
  readonly uncertaintyHzPerV: Float64Array;
  /** 1: `source` 'fit', 0: 'finite-difference'. */
  readonly fromFit: Uint8Array;
  readonly unstable: Uint8Array;
  readonly fitDisagrees: Uint8Array;
  readonly flatWithinUncertainty: Uint8Array;

  /** Room for `capacity` rows; `count` grows as rows are added. */
  constructor(capacity: number) {
    super();
    this.v = new Float64Array(capacity);
    this.hzPerV = new Float64Array(capacity);
    this.fdHzPerV = new Float64Array(capacity);
    this.uncertaintyHzPerV = new Float64Array(capacity);
    this.fromFit = new Uint8Array(capacity);
    this.unstable = new Uint8Array(capacity);
    this.fitDisagrees = new Uint8Array(capacity);
    this.flatWithinUncertainty = new Uint8Array(capacity);
  }

  row(i: number): LocalKvco {
    const row: LocalKvco = {
      v: this.v[i] as number,
      hzPerV: this.hzPerV[i] as number,
      fdHzPerV: this.fdHzPerV[i] as number,
      uncertaintyHzPerV: this.uncertaintyHzPerV[i] as number,
      source: this.fromFit[i] === 1 ? 'fit' : 'finite-difference',
      unstable: this.unstable[i] === 1,
      fitDisagrees: this.fitDisagrees[i] === 1,
    };
    if (this.flatWithinUncertainty[i] === 1) row.flatWithinUncertainty = true;
    return row;
  }

  fields(): readonly RowField[] {
    return [
      { key: 'v', kind: 'number', values: this.v },
      { key: 'hzPerV', kind: 'number', values: this.hzPerV },
      { key: 'fdHzPerV', kind: 'number', values: this.fdHzPerV },
      { key: 'uncertaintyHzPerV', kind: 'number', values: this.uncertaintyHzPerV },
      { key: 'source', kind: 'choice', values: this.fromFit, texts: ['finite-difference', 'fit'] },
      { key: 'unstable', kind: 'flag', values: this.unstable },
      { key: 'fitDisagrees', kind: 'flag', values: this.fitDisagrees },
      { key: 'flatWithinUncertainty', kind: 'flag', values: this.flatWithinUncertainty, omitFalse: true },
    ] satisfies (RowField & { key: keyof LocalKvco })[];
  }
}
