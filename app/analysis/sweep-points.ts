/**
 * Readings of a sweep grouped into points: one point per control voltage and
 * direction, with mean, standard deviation and counts. Columns throughout.
 */
import { orderByVoltage } from './voltage-order.ts';

/** A sweep's readings. The analysis only reads them (they may be a table's own columns). */
export interface SweepInput {
  /** Control-voltage setpoint of each reading (V). */
  controlV: Float64Array;
  /** Frequency of each reading (Hz); NaN = no oscillation measured. */
  frequencyHz: Float64Array;
  /** Direction of each reading: +1 up, −1 down, 0 unknown (treated as up). */
  direction?: Int8Array;
  /** Counter gate time (s); sets the resolution floor 1/gate Hz. */
  gateS?: number;
  /** 1 for a reading of a point that never settled (a settle-timeout event; see run-quality.ts). */
  unsettled?: Uint8Array;
}

export type Direction = 'up' | 'down';

/** Points of one direction, ascending in voltage. */
export interface PointSet {
  direction: Direction;
  count: number;
  v: Float64Array;
  /** Mean of the oscillating readings (NaN when none). */
  meanHz: Float64Array;
  /** Sample standard deviation of the oscillating readings (NaN when < 2). */
  sdHz: Float64Array;
  nOsc: Int32Array;
  nNoOsc: Int32Array;
  /** 1 when any reading of the point was taken before it settled. */
  unsettled: Uint8Array;
}

/** True when a raw reading means "no oscillation" (CONTRACTS.md plain CSV rules). */
export function isNoOscillation(frequencyHz: number): boolean {
  return !Number.isFinite(frequencyHz) || frequencyHz <= 0 || frequencyHz >= 9.9e37;
}

function sameVoltage(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

/** Groups the readings of one direction (+1 includes unknown 0) into points. */
export function groupPoints(input: SweepInput, direction: Direction): PointSet {
  const { controlV, frequencyHz, direction: dirs } = input;
  const n = controlV.length;
  const want = direction === 'up' ? 1 : -1;
  let m = 0;
  for (let i = 0; i < n; i++) {
    const d = dirs ? (dirs[i] as number) : 1;
    if ((d === 0 ? 1 : d) === want && Number.isFinite(controlV[i])) m++;
  }
  const idx = new Uint32Array(m);
  m = 0;
  for (let i = 0; i < n; i++) {
    const d = dirs ? (dirs[i] as number) : 1;
    if ((d === 0 ? 1 : d) === want && Number.isFinite(controlV[i])) idx[m++] = i;
  }
  // Stable order by voltage, then reading order: deterministic grouping.
  orderByVoltage(controlV, idx);
  const v = new Float64Array(m);
  const meanHz = new Float64Array(m);
  const sdHz = new Float64Array(m);
  const nOsc = new Int32Array(m);
  const nNoOsc = new Int32Array(m);
  const unsettled = new Uint8Array(m);
  let p = -1;
  let mean = 0;
  let m2 = 0;
  for (let k = 0; k < m; k++) {
    const i = idx[k] as number;
    const vi = controlV[i] as number;
    if (p < 0 || !sameVoltage(v[p] as number, vi)) {
      if (p >= 0) finishPoint(meanHz, sdHz, nOsc, p, mean, m2);
      p++;
      v[p] = vi;
      mean = 0;
      m2 = 0;
    }
    if (input.unsettled && input.unsettled[i] === 1) unsettled[p] = 1;
    const f = frequencyHz[i] as number;
    if (isNoOscillation(f)) {
      nNoOsc[p] = (nNoOsc[p] as number) + 1;
    } else {
      // Welford's update: stable for small scatter on a large mean.
      const c = (nOsc[p] as number) + 1;
      nOsc[p] = c;
      const delta = f - mean;
      mean += delta / c;
      m2 += delta * (f - mean);
    }
  }
  if (p >= 0) finishPoint(meanHz, sdHz, nOsc, p, mean, m2);
  const count = p + 1;
  return {
    direction,
    count,
    v: v.subarray(0, count),
    meanHz: meanHz.subarray(0, count),
    sdHz: sdHz.subarray(0, count),
    nOsc: nOsc.subarray(0, count),
    nNoOsc: nNoOsc.subarray(0, count),
    unsettled: unsettled.subarray(0, count),
  };
}

/**
 * Point q's mean and SD from Welford's running mean and m2. Not a closure over
 * them: doubles a closure shares live boxed on the heap, a new box per update.
 */
function finishPoint(
  meanHz: Float64Array,
  sdHz: Float64Array,
  nOsc: Int32Array,
  q: number,
  mean: number,
  m2: number,
): void {
  const c = nOsc[q] as number;
  meanHz[q] = c > 0 ? mean : NaN;
  sdHz[q] = c > 1 ? Math.sqrt(m2 / (c - 1)) : NaN;
}

/** Fraction of a point's readings that oscillated. */
export function oscillatingFraction(points: PointSet, i: number): number {
  const a = points.nOsc[i] as number;
  const b = points.nNoOsc[i] as number;
  return a + b > 0 ? a / (a + b) : 0;
}

/** One plain row per point (for results and JSON): voltage, mean, SD, readings, of which no oscillation. */
export function pointSummaries(
  points: PointSet,
): { v: number; meanHz: number; sdHz: number; readings: number; noOscillation: number }[] {
  const rows = [];
  for (let i = 0; i < points.count; i++) {
    rows.push({
      v: points.v[i] as number,
      meanHz: points.meanHz[i] as number,
      sdHz: points.sdHz[i] as number,
      readings: (points.nOsc[i] as number) + (points.nNoOsc[i] as number),
      noOscillation: points.nNoOsc[i] as number,
    });
  }
  return rows;
}
