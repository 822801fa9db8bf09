/**
 * The loop-filter form: text fields → a checked LoopSpec (less Kvco, which
 * comes from the picked run), naming the field that is wrong.
 */
import { siPrefixFor } from '../../analysis/format-si.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { parseSiNumber } from '../../contract/si.ts';
import { alongCurve } from '../sweep/sweep-figures.ts';

export interface LoopDraft {
  referenceHz: string;
  dividerN: string;
  chargePumpA: string;
  loopBandwidthHz: string;
  phaseMarginDeg: string;
  order: '2' | '3';
}

// The form before a run is chosen; the chosen run's own lock point replaces reference, divider and bandwidth
// (suggestedLoop). Our own example: a clock multiplier locking ~5 MHz to a 1.25 MHz reference.
export const DEFAULT_LOOP: LoopDraft = {
  referenceHz: '1.25M',
  dividerN: '4',
  chargePumpA: '100u',
  loopBandwidthHz: '20k',
  phaseMarginDeg: '50',
  order: '2',
};

export interface LoopValues {
  referenceHz: number;
  dividerN: number;
  chargePumpA: number;
  loopBandwidthHz: number;
  phaseMarginDeg: number;
  order: 2 | 3;
}

export function checkLoopDraft(draft: LoopDraft): {
  values: LoopValues | null;
  errors: Partial<Record<keyof LoopDraft, string>>;
} {
  const errors: Partial<Record<keyof LoopDraft, string>> = {};
  const positive = (key: keyof LoopDraft, example: string): number => {
    const value = parseSiNumber(draft[key]);
    if (value === null || !(value > 0)) {
      errors[key] = `expected a positive number, e.g. ${example}`;
      return Number.NaN;
    }
    return value;
  };
  const referenceHz = positive('referenceHz', '1.25M');
  const dividerN = positive('dividerN', '4');
  if (Number.isFinite(dividerN) && !Number.isInteger(dividerN)) errors.dividerN = 'the divider is a whole number';
  const chargePumpA = positive('chargePumpA', '100u (100 µA)');
  const loopBandwidthHz = positive('loopBandwidthHz', '20k');
  const phaseMarginDeg = positive('phaseMarginDeg', '50');
  if (Number.isFinite(phaseMarginDeg) && phaseMarginDeg >= 90) errors.phaseMarginDeg = 'must be below 90°';
  if (Object.keys(errors).length > 0) return { values: null, errors };
  return {
    values: { referenceHz, dividerN, chargePumpA, loopBandwidthHz, phaseMarginDeg, order: draft.order === '3' ? 3 : 2 },
    errors,
  };
}

/** Divider of the suggested loop: a reference a decade below the VCO, as in a simple integer-N multiplier. */
const SUGGESTED_DIVIDER = 10;
/**
 * Loop bandwidth a tenth of the comparison frequency: the usual ceiling for a
 * sampled phase detector to behave as the continuous loop it is designed as
 * (Gardner's stability limit lies near f_ref/π; common practice keeps ≤ f_ref/10).
 */
const BANDWIDTH_PER_REFERENCE = 0.1;

/** A value as the form's fields take it: two significant digits and an SI prefix ("1.6k"). */
function fieldText(value: number, digits = 2): string {
  const { scale, symbol } = siPrefixFor(value);
  return `${Number((value / scale).toPrecision(digits))}${symbol}`;
}

/** The fitted tuning curve's frequency at `v`. */
function curveHzAt(sweep: SweepAnalysis, v: number): number {
  return alongCurve(sweep.fit.curve.v, sweep.fit.curve.hz, v);
}

/**
 * Reference, divider and bandwidth that fit the chosen run: the lock point at
 * the middle of its tuning window (the window Kvco is quoted over), a round
 * reference a decade below it (two significant digits, three if two would move
 * the lock point out of the window), the bandwidth a tenth of the reference.
 * Null when the run has no fitted curve to place a lock point on.
 */
export function suggestedLoop(
  sweep: SweepAnalysis,
): Pick<LoopDraft, 'referenceHz' | 'dividerN' | 'loopBandwidthHz'> | null {
  const { fromV, toV } = sweep.window;
  if (sweep.fit.curve.v.length < 2 || !(toV > fromV)) return null;
  const middleHz = curveHzAt(sweep, (fromV + toV) / 2);
  const edges = [curveHzAt(sweep, fromV), curveHzAt(sweep, toV)];
  const [lo, hi] = [Math.min(...edges), Math.max(...edges)];
  if (!(middleHz > 0)) return null;
  for (const digits of [2, 3, 4]) {
    const reference = parseSiNumber(fieldText(middleHz / SUGGESTED_DIVIDER, digits)) ?? NaN;
    const lock = reference * SUGGESTED_DIVIDER;
    if (lock > lo && lock < hi)
      return {
        referenceHz: fieldText(reference, digits),
        dividerN: String(SUGGESTED_DIVIDER),
        loopBandwidthHz: fieldText(reference * BANDWIDTH_PER_REFERENCE),
      };
  }
  return null;
}
