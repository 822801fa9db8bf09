/**
 * The physics floor of a sweep (issue 12 item 3): each point recorded by the
 * sweep (refinement points included, in the order run), settled to within the
 * counter's ±1 count — τ·ln(step / resolution) with the step in Hz from the
 * previous point's mean (or, after a point without oscillation, ΔV × the
 * local slope), resolution 1/gate — plus its gate times. A point without
 * oscillation costs only its gates.
 *
 * Beside it, the floor of the recorded mean (criterion 'recorded-mean'): the
 * point's readings are recorded as their mean, and the mean of n back-to-back
 * gates opening t after a step of A misses by A·e^(−t/τ)·F(τ, n·g) (settle-
 * predict.ts): the first gate may open at τ·ln(F·step / resolution).
 */
import { gateAverageFactor } from '../../main/procedures/settle-predict.ts';
import type { SampleRow } from '../../main/procedures/types.ts';

export interface PointMean {
  controlV: number;
  meanHz: number;
}

/** Points in the order run, with the mean of their ok readings (NaN when none oscillated). */
export function pointsOf(rows: readonly SampleRow[]): PointMean[] {
  const byIndex = new Map<number, { controlV: number; sum: number; n: number }>();
  for (const row of rows) {
    const index = row.point_index as number;
    const p = byIndex.get(index) ?? { controlV: row.control_v as number, sum: 0, n: 0 };
    if (row.status === 'ok') {
      p.sum += row.frequency_hz as number;
      p.n++;
    }
    byIndex.set(index, p);
  }
  return [...byIndex.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([, p]) => ({ controlV: p.controlV, meanHz: p.n > 0 ? p.sum / p.n : Number.NaN }));
}

/** Local slope |df/dV| at a point, from its nearest oscillating neighbour on the curve. */
function localSlope(curve: PointMean[], v: number, f: number): number {
  let best: PointMean | null = null;
  for (const p of curve) {
    if (!Number.isFinite(p.meanHz) || p.controlV === v) continue;
    if (best === null || Math.abs(p.controlV - v) < Math.abs(best.controlV - v)) best = p;
  }
  return best === null ? 0 : Math.abs(best.meanHz - f) / Math.abs(best.controlV - v);
}

export function floorSeconds(
  points: PointMean[],
  tauS: number,
  gateS: number,
  readings: number,
  criterion: 'first-gate' | 'recorded-mean' = 'first-gate',
): number {
  const resolutionHz = 1 / gateS;
  const kept = criterion === 'recorded-mean' ? gateAverageFactor(tauS, readings * gateS) : 1;
  let total = 0;
  for (let i = 0; i < points.length; i++) {
    const p = points[i] as PointMean;
    total += readings * gateS;
    if (!Number.isFinite(p.meanHz)) continue;
    const prev = points[i - 1];
    const stepHz =
      prev !== undefined && Number.isFinite(prev.meanHz)
        ? Math.abs(p.meanHz - prev.meanHz)
        : Math.abs(p.controlV - (prev?.controlV ?? 0)) * localSlope(points, p.controlV, p.meanHz);
    if (kept * stepHz > resolutionHz) total += tauS * Math.log((kept * stepHz) / resolutionHz);
  }
  return total;
}
