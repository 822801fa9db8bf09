import { describe, expect, it } from 'vitest';
import { analyzeSweep } from './sweep-analysis.ts';
import { groupPoints, pointSummaries } from './sweep-points.ts';

describe('analyzeSweep points rows', () => {
  it('hold pointSummaries’ figures for every point, keys in the same order, then the flags', () => {
    // Up then down, three readings a point, stalled below 0.8 V (no oscillation), rows out of order.
    const controlV: number[] = [];
    const frequencyHz: number[] = [];
    const direction: number[] = [];
    for (const dir of [1, -1]) {
      for (let k = 0; k <= 40; k++) {
        const v = dir === 1 ? 0.5 + k * 0.05 : 2.5 - k * 0.05;
        for (let r = 0; r < 3; r++) {
          controlV.push(v);
          frequencyHz.push(v < 0.8 ? Number.NaN : 1e6 + 2e5 * v + 3 * Math.sin(controlV.length * 7.1));
          direction.push(dir);
        }
      }
    }
    const input = {
      controlV: Float64Array.from(controlV),
      frequencyHz: Float64Array.from(frequencyHz),
      direction: Int8Array.from(direction),
      gateS: 0.1,
    };
    const result = analyzeSweep(input, {});
    const summaries = pointSummaries(groupPoints(input, result.primaryDirection));
    expect(result.points).toHaveLength(summaries.length);
    result.points.forEach((row, i) => {
      expect(Object.keys(row)).toEqual([
        'v',
        'meanHz',
        'sdHz',
        'readings',
        'noOscillation',
        'unstable',
        'unsettled',
        'edgeZone',
        'fitHz',
      ]);
      expect({ ...row }).toMatchObject(summaries[i] as object);
      const inFit = row.v >= result.fit.fromV - 1e-9 && row.v <= result.fit.toV + 1e-9;
      expect(row.fitHz === null).toBe(!inFit);
    });
    expect(result.points.some((row) => row.noOscillation === 3)).toBe(true);
  });
});
