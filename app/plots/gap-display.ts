/**
 * uPlot marks gaps with null, which a Float64Array cannot hold. While a
 * column has no bad readings the typed view goes to uPlot as is; from the
 * first bad reading on, a plain display array with nulls is kept and
 * extended incrementally (only the new rows are visited per frame). The
 * store's columns are never changed.
 */
import type { GrowableColumn } from '../state/columns.ts';
import { STATUS_CODE } from '../state/columns.ts';

export class GapDisplay {
  private display: (number | null)[] | null = null;
  private synced = 0;

  constructor(
    private readonly values: GrowableColumn,
    private readonly status: GrowableColumn,
  ) {}

  /** Values for rows [0, n): the typed view if there is no gap, else the display array. */
  data(n = this.values.length): ArrayLike<number | null> {
    if (n < this.synced) this.reset();
    for (let i = this.synced; i < n; i += 1) {
      const value = this.values.at(i);
      const bad = this.status.at(i) !== STATUS_CODE.ok || !Number.isFinite(value);
      if (this.display === null && bad) this.display = Array.from(this.values.view().subarray(0, i));
      if (this.display !== null) this.display.push(bad ? null : value);
    }
    this.synced = n;
    if (this.display === null) return this.values.view().subarray(0, n);
    if (this.display.length > n) this.display.length = n;
    return this.display;
  }

  get hasGaps(): boolean {
    return this.display !== null;
  }

  reset(): void {
    this.display = null;
    this.synced = 0;
  }
}
