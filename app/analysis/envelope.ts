/**
 * Decimation for dense or quantised traces: the visible x range is cut into
 * equal slices (about two pixels each) and each slice is drawn as its
 * minimum–maximum band with the mean as a line. A counter that flips between
 * two readings 10 Hz apart then reads as a band 10 Hz wide around its mean
 * instead of a solid block of verticals; no reading is hidden, since the band
 * holds every one. Zoomed in far enough, the readings themselves are drawn.
 * Pure: the page draws a live log with it, main cuts a big stored run with it.
 */

export interface EnvelopeSeries {
  mid: (number | null)[];
  lo: (number | null)[];
  hi: (number | null)[];
}

export interface Envelope {
  /** True when the range was cut into slices; false when the points are passed as they are. */
  dense: boolean;
  x: number[];
  series: EnvelopeSeries[];
}

/** First index with x[i] >= value (x ascending). */
export function lowerBound(x: ArrayLike<number>, value: number, n = x.length): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if ((x[mid] as number) < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

const cell = (value: number | null | undefined): number | null =>
  value === null || value === undefined || !Number.isFinite(value) ? null : value;

/**
 * Points of rows [0, n) with x in [from, to]. Dense when more than `maxPoints`
 * fall in the range; then `slices` equal x-slices, each with at least one row,
 * give mean, min and max per series (null where a slice holds no valid value,
 * so the line breaks at a gap).
 */
export function envelope(
  x: ArrayLike<number>,
  ys: readonly ArrayLike<number | null>[],
  n: number,
  from: number,
  to: number,
  maxSlices: number,
  maxPoints: number,
  /** Fewest readings a slice should hold on average (a band needs several to show a spread). */
  minPerSlice = 1,
): Envelope {
  const i0 = Math.max(0, lowerBound(x, from, n) - 1);
  let after = lowerBound(x, to, n);
  while (after < n && (x[after] as number) <= to) after += 1;
  const i1 = Math.min(n, after + 1);
  const count = Math.max(0, i1 - i0);
  const slices = Math.min(maxSlices, Math.floor(count / Math.max(1, minPerSlice)));
  if (count <= maxPoints || slices < 1 || !(to > from)) {
    const xs: number[] = [];
    const series = ys.map((): EnvelopeSeries => ({ mid: [], lo: [], hi: [] }));
    for (let i = i0; i < i1; i += 1) {
      xs.push(x[i] as number);
      ys.forEach((y, k) => {
        const v = cell(y[i]);
        const s = series[k] as EnvelopeSeries;
        s.mid.push(v);
        s.lo.push(null);
        s.hi.push(null);
      });
    }
    return { dense: false, x: xs, series };
  }
  const width = (to - from) / slices;
  const xs: number[] = [];
  const series: EnvelopeSeries[] = ys.map((): EnvelopeSeries => ({ mid: [], lo: [], hi: [] }));
  let i = i0;
  for (let b = 0; b < slices && i < i1; b += 1) {
    const end = b === slices - 1 ? Number.POSITIVE_INFINITY : from + (b + 1) * width;
    const start = i;
    let sumX = 0;
    while (i < i1 && (x[i] as number) < end) {
      sumX += x[i] as number;
      i += 1;
    }
    if (i === start) {
      // No reading in this slice (a pause, a gap in the log): break the line rather than draw across it.
      if (xs.length > 0 && (b === slices - 1 || i < i1)) {
        xs.push(from + (b + 0.5) * width);
        for (const s of series) {
          s.mid.push(null);
          s.lo.push(null);
          s.hi.push(null);
        }
      }
      continue;
    }
    xs.push(sumX / (i - start));
    ys.forEach((y, k) => {
      let lo = Number.POSITIVE_INFINITY;
      let hi = Number.NEGATIVE_INFINITY;
      let sum = 0;
      let valid = 0;
      for (let j = start; j < i; j += 1) {
        const v = cell(y[j]);
        if (v === null) continue;
        if (v < lo) lo = v;
        if (v > hi) hi = v;
        sum += v;
        valid += 1;
      }
      const s = series[k] as EnvelopeSeries;
      s.mid.push(valid > 0 ? sum / valid : null);
      s.lo.push(valid > 0 ? lo : null);
      s.hi.push(valid > 0 ? hi : null);
    });
  }
  return { dense: true, x: xs, series };
}
