/**
 * Limits, checked before the first write and applied before the output is
 * switched on. A plan that would drive the DUT past them is refused whole,
 * with a message that names the value and the limit — never clipped quietly.
 */
import { HIGH_CURRENT_LIMIT_A, type Limits, type SafeState } from '../../app/contract/plans.ts';
import type { Supply } from '../instruments/roles.ts';
import { UnsupportedOperationError } from '../instruments/errors.ts';

/** The plan asks for more than its limits allow. Nothing has been written. */
export class LimitsError extends Error {
  override readonly name = 'LimitsError';
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.field = field;
  }
}

/** Over-voltage protection level: the plan's, else max control voltage + 10 % (plans.ts). */
export function ovpLevelV(limits: Limits): number {
  return limits.ovpV ?? limits.maxControlV * 1.1;
}

/** Checks the limits themselves and the safe state against them. */
export function checkLimits(limits: Limits, safe: SafeState): void {
  if (!(limits.maxControlV > 0))
    throw new LimitsError('limits.maxControlV', `must be greater than 0 V, got ${limits.maxControlV}`);
  if (!(limits.currentLimitA > 0))
    throw new LimitsError('limits.currentLimitA', `must be greater than 0 A, got ${limits.currentLimitA}`);
  if (limits.currentLimitA > HIGH_CURRENT_LIMIT_A && limits.acknowledgeHighCurrent !== true) {
    throw new LimitsError(
      'limits.currentLimitA',
      `${limits.currentLimitA} A is above ${HIGH_CURRENT_LIMIT_A * 1000} mA, far more than a tuning port draws; add "acknowledgeHighCurrent": true to limits if it is meant`,
    );
  }
  if (limits.ovpV !== undefined && !(limits.ovpV >= limits.maxControlV)) {
    throw new LimitsError(
      'limits.ovpV',
      `${limits.ovpV} V is below limits.maxControlV (${limits.maxControlV} V); protection would trip inside the plan`,
    );
  }
  checkControlV('safe.controlV', safe.controlV, limits);
}

/** One control voltage against the limits. */
export function checkControlV(field: string, volts: number, limits: Limits): void {
  if (!Number.isFinite(volts)) throw new LimitsError(field, `expected a finite voltage, got ${volts}`);
  if (volts < 0) throw new LimitsError(field, `${volts} V is negative; control voltages must be ≥ 0 V`);
  if (volts > limits.maxControlV) {
    throw new LimitsError(
      field,
      `${volts} V exceeds limits.maxControlV (${limits.maxControlV} V); the plan is refused`,
    );
  }
}

export type LimitStep = 'current-limit' | 'over-voltage-protection';

/**
 * Declares maxControlV as `channel`'s ceiling in the supply driver (which
 * then refuses any write above it, whatever asks), and sets current limit
 * and over-voltage protection on it. Call before the output is switched on.
 * A supply without OVP is allowed (the driver's ceiling still holds) but the
 * caller is told, so it can record it.
 */
export async function applyLimits(supply: Supply, channel: number, limits: Limits): Promise<{ ovpApplied: boolean }> {
  supply.limitChannel(channel, 'control', limits.maxControlV);
  await supply.setCurrentLimit(channel, limits.currentLimitA);
  if (!supply.capabilities.overVoltageProtection) return { ovpApplied: false };
  try {
    await supply.setOverVoltageProtection(channel, ovpLevelV(limits));
    return { ovpApplied: true };
  } catch (error) {
    if (error instanceof UnsupportedOperationError) return { ovpApplied: false };
    throw error;
  }
}
