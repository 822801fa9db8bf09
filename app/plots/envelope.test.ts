import { describe, expect, it } from 'vitest';
import { envelope, lowerBound } from './envelope.ts';

describe('min/max envelope of a dense trace', () => {
  // A 13.78 kHz oscillator read with a 0.1 s gate: whole counts are 10 Hz apart, so readings flip between 13 770 and 13 780 Hz.
  const n = 600;
  const x = Float64Array.from({ length: n }, (_, i) => i); // one reading a second for 10 min
  const f = Float64Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 13_770 : 13_780));

  it('cuts 600 readings into 100 slices of 6 s, each a band from 13 770 to 13 780 Hz around its mean', () => {
    const env = envelope(x, [f], n, 0, 599, 100, 200);
    expect(env.dense).toBe(true);
    expect(env.x).toHaveLength(100);
    const s = env.series[0];
    expect(s?.lo.every((v) => v === 13_770)).toBe(true);
    expect(s?.hi.every((v) => v === 13_780)).toBe(true);
    // Slice 0 holds t = 0…5 s: readings 13770, 13780, 13780, 13770, 13780, 13780 → mean 13 776.67 Hz.
    expect(s?.mid[0]).toBeCloseTo(13_776.667, 3);
    expect(env.x[0]).toBeCloseTo(2.5, 12);
  });

  it('zoomed in to 20 s it hands the readings themselves, one per point, with one neighbour each side', () => {
    const env = envelope(x, [f], n, 100, 119, 100, 200);
    expect(env.dense).toBe(false);
    expect(env.x[0]).toBe(99);
    expect(env.x.at(-1)).toBe(120);
    expect(env.series[0]?.mid.slice(0, 3)).toEqual([13_770, 13_780, 13_780]);
  });

  it('with four readings a slice at the least, 600 readings on a wide plot make 150 slices, not 400 single-reading ones', () => {
    const env = envelope(x, [f], n, 0, 599, 400, 200, 4);
    expect(env.dense).toBe(true);
    expect(env.x).toHaveLength(150);
    expect(env.series[0]?.lo.every((v) => v === 13_770)).toBe(true);
  });

  it('a slice with only failed readings is a gap (null), not a zero', () => {
    const withGap = Float64Array.from(f);
    for (let i = 60; i < 72; i += 1) withGap[i] = Number.NaN;
    const env = envelope(x, [withGap], n, 0, 599, 100, 200);
    expect(env.series[0]?.mid[10]).toBeNull();
    expect(env.series[0]?.mid[11]).toBeNull();
    expect(env.series[0]?.lo[12]).toBe(13_770);
  });

  it('a stretch with no readings at all (a pause) breaks the line instead of joining across it', () => {
    // Readings at 0…99 s and 200…299 s; nothing in between.
    const xs = Float64Array.from({ length: 200 }, (_, i) => (i < 100 ? i : i + 100));
    const fs = Float64Array.from({ length: 200 }, () => 13_780);
    const env = envelope(xs, [fs], 200, 0, 299, 30, 20);
    const gapSlices = env.x.filter((t, k) => t > 100 && t < 200 && env.series[0]?.mid[k] === null);
    expect(gapSlices.length).toBeGreaterThanOrEqual(9);
    expect(env.series[0]?.mid.filter((v) => v !== null).every((v) => v === 13_780)).toBe(true);
  });

  it('finds the first index at or after a time', () => {
    expect(lowerBound(x, 99.5)).toBe(100);
    expect(lowerBound(x, -1)).toBe(0);
    expect(lowerBound(x, 1e9)).toBe(n);
  });
});
