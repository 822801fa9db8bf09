/**
 * A sweep against a reference sweep: at each setpoint of the run, its mean
 * frequency minus the reference's, the reference read off by straight-line
 * interpolation between its own setpoint means (no extrapolation: outside the
 * reference's oscillating range the difference is left out).
 */
import { STATUS_CODE, type ColumnSet } from '../../state/columns.ts';

export interface PointMeans {
  v: number[];
  hz: number[];
}

/** Mean oscillating frequency per setpoint, ascending in V (setpoints compared to 1 µV). */
export function pointMeans(columns: ColumnSet, rows: number): PointMeans {
  const sums = new Map<number, { sum: number; n: number }>();
  for (let i = 0; i < rows; i += 1) {
    const f = columns.frequency_hz.at(i);
    if (columns.status.at(i) !== STATUS_CODE.ok || !Number.isFinite(f) || f <= 0) continue;
    const v = Math.round(columns.control_v.at(i) * 1e6) / 1e6;
    const entry = sums.get(v) ?? { sum: 0, n: 0 };
    entry.sum += f;
    entry.n += 1;
    sums.set(v, entry);
  }
  const v = [...sums.keys()].sort((a, b) => a - b);
  return {
    v,
    hz: v.map((key) => {
      const e = sums.get(key) as { sum: number; n: number };
      return e.sum / e.n;
    }),
  };
}

/** Reference frequency at `v` by linear interpolation; null outside its range. */
export function interpolate(ref: PointMeans, v: number): number | null {
  const n = ref.v.length;
  if (n === 0 || v < (ref.v[0] as number) || v > (ref.v[n - 1] as number)) return null;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if ((ref.v[mid] as number) <= v) lo = mid;
    else hi = mid;
  }
  const v0 = ref.v[lo] as number;
  const v1 = ref.v[hi] as number;
  const f0 = ref.hz[lo] as number;
  const f1 = ref.hz[hi] as number;
  return v1 === v0 ? f0 : f0 + ((f1 - f0) * (v - v0)) / (v1 - v0);
}

/** Run minus reference on one shared, ascending x column (null where a run has no point or the reference no value). */
export function differenceColumns(
  reference: PointMeans,
  runs: readonly PointMeans[],
): { x: number[]; ys: (number | null)[][] } {
  const x = [...new Set(runs.flatMap((r) => r.v))].sort((a, b) => a - b);
  const ys = runs.map((run) => {
    const at = new Map(run.v.map((v, i) => [v, run.hz[i] as number]));
    return x.map((v) => {
      const f = at.get(v);
      const ref = interpolate(reference, v);
      return f === undefined || ref === null ? null : f - ref;
    });
  });
  return { x, ys };
}
