/**
 * Relaxation-type VCO: a timing capacitor charges through R toward a
 * charging voltage Vc that follows the control voltage, until it reaches the
 * comparator's upper threshold V1; a discharge path then pulls it toward a
 * rail until it reaches the lower threshold V0, and the cycle repeats.
 *
 * Each segment follows the RC charging law v(t) = Vt + (v0 − Vt)·e^(−t/RC)
 * (Horowitz & Hill, The Art of Electronics, 3rd ed., §1.4 — from memory), so
 * the time to move from `fromV` to `toV` while heading for `targetV` is
 * RC·ln((targetV − fromV)/(targetV − toV)).
 */
import type { RelaxationDutParams } from './dut-params.ts';

export interface OscillatorCore {
  oscillating: boolean;
  /** 0 when not oscillating. */
  frequencyHz: number;
  /** σ of one period divided by the period (per-cycle jitter, fractional). */
  cycleJitter: number;
}

/** Time for an RC node to move from fromV to toV while heading for targetV; Infinity if it never gets there. */
export function rcTransitS(rcS: number, fromV: number, toV: number, targetV: number): number {
  const start = targetV - fromV;
  const end = targetV - toV;
  // toV must lie strictly between fromV and targetV.
  if (start === 0 || end === 0 || Math.sign(start) !== Math.sign(end) || Math.abs(end) > Math.abs(start)) {
    return Number.POSITIVE_INFINITY;
  }
  return rcS * Math.log(start / end);
}

/** Charging voltage the current source/resistor heads for, limited by the DUT supply's headroom. */
export function chargeVoltage(p: RelaxationDutParams, tuneV: number, supplyV: number): number {
  const wanted = p.chargeDrive.gain * tuneV + p.chargeDrive.offsetV;
  return Math.min(wanted, supplyV - p.chargeDrive.headroomV);
}

/**
 * `upperShiftV` moves the upper threshold (threshold noise, averaged over a
 * gate, enters here as a voltage — see DutRuntime.gate): a shifted threshold
 * can never make the oscillator faster than the charging law allows, so near
 * the stall edge the frequency still falls toward zero.
 */
export function relaxationCore(
  p: RelaxationDutParams,
  tuneV: number,
  supplyV: number,
  upperShiftV = 0,
): OscillatorCore {
  const { lowerV, noiseV } = p.thresholds;
  const upperV = p.thresholds.upperV + upperShiftV;
  const chargeRcS = p.timing.chargeResistanceOhm * p.timing.capacitanceF;
  const dischargeRcS = p.timing.dischargeResistanceOhm * p.timing.capacitanceF;
  const vc = chargeVoltage(p, tuneV, supplyV);
  // Stall: the charging voltage no longer reaches the upper threshold (common practice).
  if (vc <= upperV) return { oscillating: false, frequencyHz: 0, cycleJitter: 0 };
  const chargeS = rcTransitS(chargeRcS, lowerV, upperV, vc);
  const dischargeS = rcTransitS(dischargeRcS, upperV, lowerV, p.timing.dischargeTargetV);
  const periodS = chargeS + dischargeS;
  if (!Number.isFinite(periodS) || periodS <= 0) return { oscillating: false, frequencyHz: 0, cycleJitter: 0 };
  // Threshold noise becomes timing noise through the slope at each crossing:
  // σt = σv / |dv/dt|. On the charge segment dv/dt at V1 is (Vc − V1)/RC,
  // which goes to zero at the stall edge — the physical reason jitter grows there.
  const chargeSlope = (vc - upperV) / chargeRcS;
  const dischargeSlope = Math.abs(lowerV - p.timing.dischargeTargetV) / dischargeRcS;
  const jitterS = noiseV * Math.hypot(1 / chargeSlope, 1 / dischargeSlope);
  return { oscillating: true, frequencyHz: 1 / periodS, cycleJitter: jitterS / periodS };
}
