import { describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { formatClockDuration } from '../../app/analysis/format-clock.ts';
import { createProgressDisplay } from '../cli/progress-display.ts';
import { linearSlope, supplyLevels } from './pushing-math.ts';
import { TimeConstantEstimate, remainingBoundHz } from './settle.ts';
import { sweepSchedule } from './sweep-points.ts';

const limits = { maxControlV: 5, currentLimitA: 0.02 };

describe('sweepSchedule', () => {
  it('lands a 0.5–4.5 V range in 50 mV steps on both ends (by index, not by repeated addition)', () => {
    const s = sweepSchedule(sweepPlanSchema.parse({ start: 0.5, stop: 4.5, step: 0.05, limits }));
    expect(s.controlV.length).toBe(81);
    expect(s.controlV[80]).toBeCloseTo(4.5, 12);
    expect(s.controlV[40]).toBeCloseTo(2.5, 12);
  });

  it('adds the stop voltage when the step does not divide the range', () => {
    const s = sweepSchedule(sweepPlanSchema.parse({ start: 1, stop: 2, step: 0.3, limits }));
    expect(Array.from(s.controlV)).toEqual([1, 1 + 0.3, 1 + 2 * 0.3, 1 + 3 * 0.3, 2]);
  });

  it('visits up then down for up-down, down only for down, and sorts explicit lists', () => {
    const upDown = sweepSchedule(sweepPlanSchema.parse({ start: 1, stop: 2, step: 0.5, direction: 'up-down', limits }));
    expect(Array.from(upDown.controlV)).toEqual([1, 1.5, 2, 2, 1.5, 1]);
    expect(Array.from(upDown.pass)).toEqual([0, 0, 0, 1, 1, 1]);
    const down = sweepSchedule(sweepPlanSchema.parse({ points: [3, 1, 2, 2], direction: 'down', limits }));
    expect(Array.from(down.controlV)).toEqual([3, 2, 1]);
  });

  it('refuses negative voltages and oversize plans, naming the field', () => {
    expect(() => sweepSchedule(sweepPlanSchema.parse({ start: -1, stop: 2, step: 0.5, limits }))).toThrow(
      /start: -1 V is negative/,
    );
    expect(() => sweepSchedule(sweepPlanSchema.parse({ start: 0, stop: 5, step: 1e-6, limits }))).toThrow(
      /step: .* more than 100000 points/,
    );
  });
});

describe('settling arithmetic', () => {
  it('bounds the remaining error of a first-order lag from two readings (e^(−t/τ) decay, common practice)', () => {
    // rem at the later reading = d / (e^(Δ/τ) − 1): with A = 1000 Hz, τ = 50 ms, readings at 50 and 100 ms:
    const tau = 0.05;
    const f = (t: number): number => 1000 * Math.exp(-t / tau);
    const d = f(0.05) - f(0.1);
    expect(remainingBoundHz(d, 0, 0.05, tau)).toBeCloseTo(f(0.1), 9);
    // A larger assumed τ only loosens the bound.
    expect(remainingBoundHz(d, 0, 0.05, 2 * tau)).toBeGreaterThan(f(0.1));
  });

  it('learns τ from one point’s settling by a log-linear fit', () => {
    const est = new TimeConstantEstimate();
    const times = Float64Array.from([0.005, 0.015, 0.03, 0.05, 0.08, 0.12]);
    const values = times.map((t) => 20_000 - 3000 * Math.exp(-t / 0.05));
    est.fitPoint(times, values, times.length, 20_000, 10);
    expect(est.tauS).toBeCloseTo(0.05, 9);
  });
});

describe('pushing arithmetic and progress text', () => {
  it('steps the supply by index and fits the slope', () => {
    const levels = supplyLevels(3.0, 3.6, 0.1);
    expect(levels.length).toBe(7);
    expect(levels[6]).toBeCloseTo(3.6, 12);
    const ys = levels.map((v) => 1e6 + 250 * v);
    expect(linearSlope(levels, ys)?.slope).toBeCloseTo(250, 6);
    expect(Array.from(supplyLevels(5.5, 4.5, 0.5))).toEqual([5.5, 5, 4.5]);
  });

  it('prints plain lines off a terminal and a bar on one', () => {
    let text = '';
    const plain = createProgressDisplay({ write: (t: string) => (text += t), isTTY: false }, () => 0);
    plain.update({
      runId: 'r',
      kind: 'sweep',
      phase: 'reading',
      pointsDone: 5,
      pointsTotal: 10,
      etaS: 75,
      latest: { controlV: 1.5, frequencyHz: 12_345, status: 'ok' },
    });
    expect(text).toBe('reading 5/10 points  ETA 1 min 15 s  1.5000 V → 12.3450 kHz\n');
    text = '';
    const tty = createProgressDisplay({ write: (t: string) => (text += t), isTTY: true });
    tty.update({
      runId: 'r',
      kind: 'sweep',
      phase: 'reading',
      pointsDone: 5,
      pointsTotal: 10,
      etaS: null,
      latest: null,
    });
    expect(text).toMatch(/^\r\x1b\[2K\[#{12}\.{12}\] reading 5\/10 points {2}ETA —$/);
    expect(formatClockDuration(3 * 3600 + 125)).toBe('3 h 02 min');
  });
});
