/**
 * The setpoints of a sweep plan, in the order they are visited. Linear
 * ranges are computed by index (start + i·step), never by repeated addition,
 * so 400 steps of 10 mV land on the stop voltage and not 3 µV beside it.
 */
import { MAX_PLAN_POINTS, type SweepPlan } from '../../app/contract/plans.ts';
import { LimitsError, checkControlV } from './limits.ts';

export type Direction = 'up' | 'down';

export interface SweepSchedule {
  /** Control voltage of each visit, V. */
  controlV: Float64Array;
  /** 0 = up pass, 1 = down pass. */
  pass: Uint8Array;
  /** Distinct setpoints, ascending. */
  levels: Float64Array;
}

/** A plan with more points than this is a typo, not a sweep. */
export const MAX_SWEEP_POINTS = MAX_PLAN_POINTS;

/** Ascending distinct levels of a plan (before direction). */
export function sweepLevels(plan: SweepPlan): Float64Array {
  if (plan.points !== undefined) {
    const sorted = Float64Array.from(plan.points).sort();
    let n = 0;
    for (let i = 0; i < sorted.length; i++) {
      if (n === 0 || (sorted[i] as number) !== sorted[n - 1]) sorted[n++] = sorted[i] as number;
    }
    return sorted.slice(0, n);
  }
  const start = plan.start as number;
  const stop = plan.stop as number;
  const step = plan.step as number;
  if (!(step > 0)) throw new LimitsError('step', `must be greater than 0, got ${step}`);
  const lo = Math.min(start, stop);
  const hi = Math.max(start, stop);
  // Half a micro-step of slack so 0.5..4.5 by 0.05 includes 4.5 despite rounding.
  const steps = Math.floor((hi - lo) / step + 1e-9);
  if (steps + 2 > MAX_SWEEP_POINTS) {
    throw new LimitsError('step', `${step} V over ${lo}..${hi} V gives more than ${MAX_SWEEP_POINTS} points`);
  }
  const last = lo + steps * step;
  const extra = hi - last > step * 1e-6 ? 1 : 0;
  const levels = new Float64Array(steps + 1 + extra);
  for (let i = 0; i <= steps; i++) levels[i] = lo + i * step;
  if (extra === 1) levels[steps + 1] = hi;
  return levels;
}

/** The full visiting order, with limits checked on every level. */
export function sweepSchedule(plan: SweepPlan): SweepSchedule {
  const levels = sweepLevels(plan);
  if (levels.length > MAX_SWEEP_POINTS) throw new LimitsError('points', `more than ${MAX_SWEEP_POINTS} points`);
  if (plan.points !== undefined) {
    plan.points.forEach((volts, i) => checkControlV(`points[${i}]`, volts, plan.limits));
  } else {
    // Every level lies between start and stop, so checking those two suffices.
    checkControlV('start', plan.start as number, plan.limits);
    checkControlV('stop', plan.stop as number, plan.limits);
  }
  const n = levels.length;
  const total = plan.direction === 'up-down' ? 2 * n : n;
  const controlV = new Float64Array(total);
  const pass = new Uint8Array(total);
  if (plan.direction === 'down') {
    for (let i = 0; i < n; i++) {
      controlV[i] = levels[n - 1 - i] as number;
      pass[i] = 1;
    }
  } else {
    controlV.set(levels, 0);
    if (plan.direction === 'up-down') {
      for (let i = 0; i < n; i++) {
        controlV[n + i] = levels[n - 1 - i] as number;
        pass[n + i] = 1;
      }
    }
  }
  return { controlV, pass, levels };
}
