/**
 * Issue 9 item 8: the loop filter from the table's truth. Reproduction: the
 * loop-filter screen silently dropped the Kvco corner that was ≤ 0 and never
 * checked that N·f_ref lies on the VCO's tuning curve.
 */
import { describe, expect, it } from 'vitest';
import { loopOperatingPoint } from './loop-operating-point.ts';
import { analyzeSweep } from './sweep-analysis.ts';

// f = 4 MHz + 1 MHz/V·V − 50 kHz/V²·V² over 0.5…4.5 V (closed form: Kvco = 1 MHz/V − 100 kHz/V²·V).
const v = Float64Array.from({ length: 41 }, (_, i) => 0.5 + i * 0.1);
const sweep = analyzeSweep({ controlV: v, frequencyHz: v.map((x) => 4e6 + 1e6 * x - 5e4 * x * x) });

describe('loopOperatingPoint', () => {
  it('finds the lock point N·f_ref on the fitted curve and the local Kvco there (closed form)', () => {
    // 5.95 MHz = 4 MHz + 1 MHz·V − 50 kHz·V² → V = (1e6 − √(1e12 − 4·5e4·1.95e6))/(1e5) = 2.2583 V.
    const op = loopOperatingPoint(sweep, 1.19e6, 5);
    const vLock = (1e6 - Math.sqrt(1e12 - 4 * 5e4 * 1.95e6)) / 1e5;
    expect(op.inRange).toBe(true);
    expect(op.lockV).toBeCloseTo(vLock, 3);
    const lock = op.corners.find((c) => c.label === 'lock');
    expect(lock?.kvcoHzPerV).toBeCloseTo(1e6 - 1e5 * vLock, -2);
    expect(op.corners.map((c) => c.label)).toEqual(['min', 'lock', 'max']);
    expect(op.corners.every((c) => c.usable)).toBe(true);
  });
  it('says when N·f_ref lies outside the tuning range', () => {
    const far = loopOperatingPoint(sweep, 5e6, 4);
    expect(far.inRange).toBe(false);
    expect(far.message).toMatch(/N·f_ref = 20\.0000 MHz lies outside this run's tuning range/);
    expect(far.corners.find((c) => c.label === 'lock')?.usable).toBe(false);
  });
  it('keeps a corner with Kvco ≤ 0 and gives its reason instead of dropping it', () => {
    // A curve that rises then falls back (peak at 2 V) with the window over all of it.
    const w = Float64Array.from({ length: 31 }, (_, i) => i / 10);
    const folded = analyzeSweep(
      { controlV: w, frequencyHz: w.map((x) => 1e6 + 4e5 * x - 1e5 * x * x) },
      { window: { fromV: 0, toV: 3, source: 'flag' } },
    );
    expect(folded.kvco.minHzPerV).toBeLessThan(0);
    // df/dV = 4e5 − 2e5·V is negative exactly above 2 V: every grid point from 2.1 V on runs the wrong way.
    expect(folded.kvco.signChangeAtV).toHaveLength(10);
    folded.kvco.signChangeAtV.forEach((v, i) => expect(v).toBeCloseTo(2.1 + i / 10, 9));
    const op = loopOperatingPoint(folded, 1.2e6, 1);
    const min = op.corners.find((c) => c.label === 'min');
    expect(min?.usable).toBe(false);
    expect(min?.reason).toMatch(/no loop gain there/);
  });
});
