import { describe, expect, it } from 'vitest';
import { kthSmallestInPlace } from './select-kth.ts';

function lcg(seed: number): () => number {
  let n = seed;
  return () => {
    n = (16807 * n) % 2147483647;
    return n / 2147483647;
  };
}

describe('kthSmallestInPlace', () => {
  it('matches the sorted array at every k, with and without repeated values', () => {
    const rnd = lcg(3);
    for (const [n, distinct] of [
      [1, 1],
      [2, 2],
      [7, 3],
      [100, 100],
      [1001, 4],
      [5000, 5000],
    ] as const) {
      const values = Float64Array.from({ length: n }, () => Math.floor(rnd() * distinct) * 0.25 - 3);
      const sorted = values.slice().sort();
      for (const k of [0, n >> 1, (n - 1) >> 1, n - 1]) expect(kthSmallestInPlace(values.slice(), k)).toBe(sorted[k]);
    }
  });

  it('a log of equal intervals and adversarial orders (sorted, reversed, organ pipe)', () => {
    const n = 4097;
    const shapes = [
      new Float64Array(n).fill(1),
      Float64Array.from({ length: n }, (_, i) => i),
      Float64Array.from({ length: n }, (_, i) => n - i),
      Float64Array.from({ length: n }, (_, i) => Math.min(i, n - i)),
    ];
    for (const values of shapes) {
      const sorted = values.slice().sort();
      expect(kthSmallestInPlace(values.slice(), (n - 1) >> 1)).toBe(sorted[(n - 1) >> 1]);
    }
  });

  it('refuses k outside the array', () => {
    expect(() => kthSmallestInPlace(new Float64Array(3), 3)).toThrow(RangeError);
  });
});
