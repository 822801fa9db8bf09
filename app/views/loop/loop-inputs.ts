/**
 * The loop-filter form: text fields → a checked LoopSpec (less Kvco, which
 * comes from the picked run), naming the field that is wrong.
 */
import { parseSiNumber } from '../../contract/si.ts';

export interface LoopDraft {
  referenceHz: string;
  dividerN: string;
  chargePumpA: string;
  loopBandwidthHz: string;
  phaseMarginDeg: string;
  order: '2' | '3';
}

// Our own example: a clock multiplier locking ~5 MHz to a 1.25 MHz reference.
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
