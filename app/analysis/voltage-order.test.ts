import { describe, expect, it } from 'vitest';
import { orderByVoltage } from './voltage-order.ts';

function lcg(seed: number): () => number {
  let n = seed;
  return () => {
    n = (16807 * n) % 2147483647;
    return n / 2147483647;
  };
}

/** The order groupPoints used before: a comparator sort, stable by reading index. */
function comparatorOrder(v: Float64Array, idx: Uint32Array): number[] {
  return Array.from(idx).sort((a, b) => (v[a] as number) - (v[b] as number) || a - b);
}

describe('orderByVoltage', () => {
  it('gives the comparator sort’s order: random, repeated, reversed, sorted, −0 and 0, a subset of rows', () => {
    const rnd = lcg(11);
    const cases: Float64Array[] = [
      Float64Array.from({ length: 3000 }, () => Math.floor(rnd() * 40) * 0.05 + 0.5),
      Float64Array.from({ length: 3000 }, () => rnd() * 4),
      Float64Array.from({ length: 2000 }, (_, i) => 4 - Math.floor(i / 10) * 0.01),
      Float64Array.from({ length: 2000 }, (_, i) => Math.floor(i / 10) * 0.01),
      Float64Array.from([0, -0, 1, 0, -0, -1, 1e-12, 0]),
      // Up and back down, as a sweep with both directions gives them.
      Float64Array.from({ length: 1000 }, (_, i) => (i < 500 ? i : 999 - i) * 0.003),
    ];
    for (const v of cases) {
      const all = Uint32Array.from({ length: v.length }, (_, i) => i);
      expect(Array.from(orderByVoltage(v, all.slice()))).toEqual(comparatorOrder(v, all));
      const everyThird = all.filter((i) => i % 3 !== 1);
      expect(Array.from(orderByVoltage(v, everyThird.slice()))).toEqual(comparatorOrder(v, everyThird));
    }
  });

  it('leaves an ordered sweep as it is and handles empty and single rows', () => {
    const v = Float64Array.from([0.5, 0.5, 0.6, 0.6, 0.7]);
    expect(Array.from(orderByVoltage(v, Uint32Array.from([0, 1, 2, 3, 4])))).toEqual([0, 1, 2, 3, 4]);
    expect(Array.from(orderByVoltage(v, new Uint32Array(0)))).toEqual([]);
    expect(Array.from(orderByVoltage(v, Uint32Array.from([3])))).toEqual([3]);
  });
});
