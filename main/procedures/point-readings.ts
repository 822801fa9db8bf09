/**
 * How many readings a sweep point takes: a fixed `readingsPerPoint`, or
 * adaptive (`readings: {min, max, targetHz}`): at least min, at most max,
 * stopping once the standard error of the point's mean is at most targetHz.
 *
 * Standard error of the mean s/√n (common practice), with s never taken
 * below the counter's quantisation, resolution/√12 (the standard deviation
 * of a uniform ±½-count error, common practice): readings that all show the
 * same count do not make the mean more certain than the count allows.
 */
import type { SweepPlan } from '../../app/contract/plans.ts';
import { scatterHz } from './context.ts';

export interface ReadingsRule {
  min: number;
  max: number;
  /** Target standard error of a point's mean, Hz; null for a fixed count. */
  targetHz: number | null;
}

export function readingsRule(plan: SweepPlan): ReadingsRule {
  if (plan.readings) return { min: plan.readings.min, max: plan.readings.max, targetHz: plan.readings.targetHz };
  return { min: plan.readingsPerPoint, max: plan.readingsPerPoint, targetHz: null };
}

/** Standard error of the mean of the non-NaN values (Infinity with fewer than two). */
export function standardErrorHz(values: Float64Array, n: number, resolutionHz: number): number {
  const count = okCount(values, n);
  if (count < 2) return Number.POSITIVE_INFINITY;
  return Math.max(scatterHz(values, n), resolutionHz / Math.sqrt(12)) / Math.sqrt(count);
}

function okCount(values: Float64Array, n: number): number {
  let ok = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) ok++;
  return ok;
}

/** True once `taken` readings are enough under the rule. */
export function enoughReadings(rule: ReadingsRule, values: Float64Array, taken: number, resolutionHz: number): boolean {
  if (taken >= rule.max) return true;
  if (taken < rule.min) return false;
  if (rule.targetHz === null) return true;
  // Fewer than two oscillating readings by min: a stalled point, nothing to average.
  if (okCount(values, taken) < 2) return true;
  return standardErrorHz(values, taken, resolutionHz) <= rule.targetHz;
}
