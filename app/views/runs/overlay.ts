/**
 * Several sweeps on one plot: uPlot shares one ascending x column, so the
 * runs' readings are merged by setpoint with null where a row belongs to
 * another run. Display only.
 */
import { STATUS_CODE, type ColumnSet } from '../../state/columns.ts';

export function overlayColumns(runs: readonly { columns: ColumnSet; rows: number }[]): {
  x: number[];
  ys: (number | null)[][];
} {
  const entries: { v: number; f: number; run: number }[] = [];
  runs.forEach((run, index) => {
    for (let i = 0; i < run.rows; i += 1) {
      const f = run.columns.frequency_hz.at(i);
      if (run.columns.status.at(i) !== STATUS_CODE.ok || !Number.isFinite(f) || f <= 0) continue;
      entries.push({ v: run.columns.control_v.at(i), f, run: index });
    }
  });
  entries.sort((a, b) => a.v - b.v);
  const x = entries.map((e) => e.v);
  const ys = runs.map((_, index) => entries.map((e) => (e.run === index ? e.f : null)));
  return { x, ys };
}
