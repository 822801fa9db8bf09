import { describe, expect, it } from 'vitest';
import { analyzeSweep, analyzeSweepColumns } from './sweep-analysis.ts';
import { LocalKvcoColumns, SweepPointColumns } from './sweep-columns.ts';
import { localSlope, localSlopeInto } from './sweep-gain.ts';
import { sortedAtInPlace } from './select-kth.ts';
import type { SweepInput } from './sweep-points.ts';

/** 300 distinct control voltages, two readings each: stall below 0.62 V, √ onset, a plateau (2.0–2.3 V), then a line. */
function plateauSweep(): SweepInput {
  const controlV: number[] = [];
  const frequencyHz: number[] = [];
  for (let k = 0; k < 300; k++) {
    const v = Number((0.3 + k * 0.013).toFixed(3));
    const f =
      v < 0.62
        ? NaN
        : v < 2
          ? 2e4 * Math.sqrt(v - 0.6)
          : v < 2.3
            ? 2e4 * Math.sqrt(1.4)
            : 2e4 * Math.sqrt(1.4) + 8e3 * (v - 2.3);
    for (let r = 0; r < 2; r++) {
      controlV.push(v);
      frequencyHz.push(f + 3 * Math.sin((2 * k + r) * 12.9898) + 2 * Math.sin((2 * k + r) * 78.233));
    }
  }
  return { controlV: Float64Array.from(controlV), frequencyHz: Float64Array.from(frequencyHz) };
}

describe('sweep analysis as columns', () => {
  const input = plateauSweep();
  const options = { window: { fromV: 0.8, toV: 3.9, source: 'flag' as const }, fit: 3 };

  it('gives the object path’s rows, number for number and key for key', () => {
    const columns = analyzeSweepColumns(input, options);
    const objects = analyzeSweep(input, options);
    expect(columns.points.count).toBe(objects.points.length);
    expect(columns.kvco.local.count).toBe(objects.kvco.local.length);
    expect(columns.points.rows()).toStrictEqual(objects.points);
    expect(columns.kvco.local.rows()).toStrictEqual(objects.kvco.local);
    // Real values on both sides: 300 points, 293 oscillating, every flag somewhere.
    expect(objects.points).toHaveLength(300);
    expect(objects.kvco.local).toHaveLength(objects.points.filter((p) => p.readings > p.noOscillation).length);
    expect(objects.points.some((p) => p.fitHz === null)).toBe(true);
    expect(objects.points.some((p) => p.unstable)).toBe(true);
    expect(objects.kvco.local.some((e) => e.flatWithinUncertainty === true)).toBe(true);
    expect(objects.kvco.local.some((e) => e.source === 'finite-difference')).toBe(true);
    // The smoothed finite difference at 1.6 V against d/dV 2e4·√(V − 0.6 V) = 10 kHz/V there.
    const fd = objects.kvco.local.find((e) => e.v === 1.6)?.fdHzPerV ?? NaN;
    expect(Math.abs(fd / 1e4 - 1)).toBeLessThan(0.03);
  });

  it('fields() hold what row() makes, key for key in order (a left-out key absent), and JSON.stringify sees rows', () => {
    const { points, kvco } = analyzeSweepColumns(input, options);
    for (const columns of [points, kvco.local] as const) {
      const fields = columns.fields();
      for (let i = 0; i < columns.count; i++) {
        const fromFields: Record<string, unknown> = {};
        for (const field of fields) {
          const at = field.values[i] as number;
          if (field.kind === 'number') fromFields[field.key] = field.present?.[i] === 0 ? null : at;
          else if (field.kind === 'count') fromFields[field.key] = at;
          else if (field.kind === 'choice') fromFields[field.key] = field.texts[at];
          else if (at === 1 || !field.omitFalse) fromFields[field.key] = at === 1;
        }
        expect(Object.keys(fromFields)).toEqual(Object.keys(columns.row(i)));
        expect(fromFields).toEqual(columns.row(i));
      }
      expect(JSON.stringify(columns, null, 2)).toBe(JSON.stringify(columns.rows(), null, 2));
    }
  });

  it('empty columns give no rows', () => {
    expect(new SweepPointColumns(0).rows()).toEqual([]);
    expect(JSON.stringify(new LocalKvcoColumns(5))).toBe('[]');
  });
});

describe('helpers the columns use', () => {
  it('localSlopeInto writes localSlope’s slope and SD', () => {
    const v = Float64Array.from([1, 1.1, 1.25, 1.3, 1.5]);
    const f = Float64Array.from([10, 12.1, 15.2, 16.1, 20.3]);
    const u = Float64Array.from([0.1, 0.2, 0.1, 0.3, 0.1]);
    const out = { slope: 0, sd: 0 };
    for (const [a, b] of [
      [0, 5],
      [1, 4],
      [2, 3],
    ] as const) {
      localSlopeInto(v, f, u, a, b, out);
      expect(out).toEqual(localSlope(v, f, u, a, b));
    }
    expect(localSlope(v, f, u, 0, 2).slope).toBeCloseTo(21, 12); // (12.1 − 10)/0.1
  });

  it('sortedAtInPlace is sort()[k], NaN included', () => {
    const values = Float64Array.from({ length: 501 }, (_, i) => Math.sin(i * 7.3) * 100);
    for (const k of [0, 250, 500]) expect(sortedAtInPlace(values.slice(), k)).toBe(values.slice().sort()[k]);
    const withNaN = Float64Array.from([3, NaN, 1, 2, NaN]);
    expect(sortedAtInPlace(withNaN.slice(), 2)).toBe(3);
    expect(sortedAtInPlace(withNaN.slice(), 4)).toBeNaN();
  });
});
