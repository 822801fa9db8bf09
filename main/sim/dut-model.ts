/**
 * The DUT as a function of its conditions: core physics (relaxation or
 * varactor-LC) plus the environment terms every oscillator has —
 * temperature coefficient, warm-up drift after power-on and supply pushing.
 * Stateless; the time-dependent parts (tuning lag, wander) live in DutRuntime.
 */
import type { DutParams } from './dut-params.ts';
import { relaxationCore, type OscillatorCore } from './dut-relaxation.ts';
import { varactorCore } from './dut-varactor.ts';

export interface DutConditions {
  /** Voltage at the tuning node (after the port's settling lag). */
  tuneNodeV: number;
  /** Voltage at the DUT's supply pin. */
  supplyV: number;
  temperatureC: number;
  /** Seconds since the DUT supply came up; null while unpowered. */
  poweredForS: number | null;
  /** Slow random-walk wander, ppm (from the runtime). */
  wanderPpm?: number;
}

export function coreOf(p: DutParams, tuneV: number, supplyV: number): OscillatorCore {
  if (supplyV < p.supply.minV) return { oscillating: false, frequencyHz: 0, cycleJitter: 0 };
  return p.kind === 'relaxation' ? relaxationCore(p, tuneV, supplyV) : varactorCore(p, tuneV, supplyV);
}

/** The tuning voltage the core sees at a temperature (tuningTempcoPpmPerC scales it). */
export function tuneVAt(p: DutParams, tuneNodeV: number, temperatureC: number): number {
  return tuneNodeV * (1 + (p.tuningTempcoPpmPerC ?? 0) * 1e-6 * (temperatureC - p.referenceC));
}

/** Noise-free frequency under the given conditions; 0 when not oscillating. */
export function dutFrequencyHz(p: DutParams, c: DutConditions): number {
  if (c.poweredForS === null) return 0;
  const core = coreOf(p, tuneVAt(p, c.tuneNodeV, c.temperatureC), c.supplyV);
  if (!core.oscillating) return 0;
  const fractionalPpm =
    p.tempcoPpmPerC * (c.temperatureC - p.referenceC) +
    p.warmup.offsetPpm * Math.exp(-Math.max(0, c.poweredForS) / p.warmup.tauS) +
    (c.wanderPpm ?? 0);
  const frequencyHz = core.frequencyHz * (1 + fractionalPpm * 1e-6) + p.pushingHzPerV * (c.supplyV - p.supply.nominalV);
  return Math.max(0, frequencyHz);
}
