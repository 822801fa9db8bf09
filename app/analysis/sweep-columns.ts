/**
 * The per-point parts of a sweep analysis (`points`, `kvco.local`) as columns:
 * typed arrays, one per key. A sweep of a million distinct control voltages
 * has a million of each; as objects they cost some hundreds of MB and most of
 * the analysis' time in allocation (issue 15 item 9), as columns 40 bytes a
 * point. A row object is made only when asked for: `row(i)` (the app's and
 * the tests' object shape, sweep-analysis.ts), or `fill(i, into)` into one
 * object reused from row to row (the CLI's JSON writer, main/cli/json-chunks.ts).
 * Both give the keys in the order the JSON has always had them.
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

/** Columns that hand out their rows: JSON.stringify sees the rows (toJSON), a writer can take them one at a time. */
export abstract class RowColumns<Row extends object> {
  /** Number of rows. */
  abstract readonly count: number;
  /** A new object of row i (an optional key only when the row has it). */
  abstract row(i: number): Row;
  /**
   * Row i written into `into`, an object from `blank()` reused from row to row:
   * every key present, in the row's order; a key the row leaves out is
   * `undefined`, which JSON.stringify leaves out too.
   */
  abstract fill(i: number, into: Record<string, unknown>): void;
  /** An object with every key of a row, in order (for `fill`). */
  abstract blank(): Record<string, unknown>;

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

  fill(i: number, into: Record<string, unknown>): void {
    into.v = this.v[i];
    into.meanHz = this.meanHz[i];
    into.sdHz = this.sdHz[i];
    into.readings = this.readings[i];
    into.noOscillation = this.noOscillation[i];
    into.unstable = this.unstable[i] === 1;
    into.unsettled = this.unsettled[i] === 1;
    into.edgeZone = this.edgeZone[i] === 1;
    into.fitHz = this.fitted[i] === 1 ? this.fitHz[i] : null;
  }

  blank(): Record<string, unknown> {
    return {
      v: 0,
      meanHz: 0,
      sdHz: 0,
      readings: 0,
      noOscillation: 0,
      unstable: false,
      unsettled: false,
      edgeZone: false,
      fitHz: null,
    };
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

  fill(i: number, into: Record<string, unknown>): void {
    into.v = this.v[i];
    into.hzPerV = this.hzPerV[i];
    into.fdHzPerV = this.fdHzPerV[i];
    into.uncertaintyHzPerV = this.uncertaintyHzPerV[i];
    into.source = this.fromFit[i] === 1 ? 'fit' : 'finite-difference';
    into.unstable = this.unstable[i] === 1;
    into.fitDisagrees = this.fitDisagrees[i] === 1;
    into.flatWithinUncertainty = this.flatWithinUncertainty[i] === 1 ? true : undefined;
  }

  blank(): Record<string, unknown> {
    return {
      v: 0,
      hzPerV: 0,
      fdHzPerV: 0,
      uncertaintyHzPerV: 0,
      source: 'fit',
      unstable: false,
      fitDisagrees: false,
      flatWithinUncertainty: undefined,
    };
  }
}
