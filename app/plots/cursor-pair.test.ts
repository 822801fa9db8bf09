import { describe, expect, it } from 'vitest';
import { cursorDeltas, markAt } from './cursor-pair.ts';

describe('two cursors', () => {
  it('between 1.5 V / 9.42 kHz and 3.5 V / 28.79 kHz on a tuning curve: ΔV 2 V, Δf 19.37 kHz, slope 9.685 kHz/V', () => {
    const d = cursorDeltas({ x: 1.5, y: 9_420 }, { x: 3.5, y: 28_790 });
    expect(d.dx).toBeCloseTo(2, 12);
    expect(d.dy).toBeCloseTo(19_370, 9);
    expect(d.slope).toBeCloseTo(9_685, 9);
  });

  it('a drift rate from two readings 600 s apart: −12 Hz over 10 min is −0.02 Hz/s', () => {
    expect(cursorDeltas({ x: 60, y: 13_780 }, { x: 660, y: 13_768 }).slope).toBeCloseTo(-0.02, 12);
  });

  it('no slope for two cursors at one setpoint (rising and falling readings)', () => {
    expect(cursorDeltas({ x: 2, y: 1_000_120 }, { x: 2, y: 1_000_000 })).toEqual({ dx: 0, dy: -120, slope: null });
  });

  it('a click takes the first series with a reading at that row', () => {
    const data = [
      [1, 2, 3],
      [null, null, 5],
      [7, null, 8],
    ];
    expect(markAt(data, 0)).toEqual({ x: 1, y: 7 });
    expect(markAt(data, 1)).toBeNull();
    expect(markAt(data, 2)).toEqual({ x: 3, y: 5 });
    expect(markAt(data, null)).toBeNull();
  });
});
