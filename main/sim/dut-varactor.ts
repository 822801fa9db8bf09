/**
 * Varactor-tuned LC oscillator: f = 1/(2π·√(L·C)) with
 * C = Cj(V) + Cp and the junction-capacitance law
 * Cj(V) = Cj0 / (1 + V/φ)^γ for reverse bias V (γ = 1/2 abrupt junction;
 * Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2 — from memory;
 * γ > 1/2 for hyperabrupt tuning diodes, common practice).
 */
import type { VaractorDutParams } from './dut-params.ts';
import type { OscillatorCore } from './dut-relaxation.ts';

export function junctionCapacitanceF(
  reverseV: number,
  cj0F: number,
  builtInV: number,
  gradingExponent: number,
): number {
  return cj0F / Math.pow(1 + reverseV / builtInV, gradingExponent);
}

export function lcResonanceHz(inductanceH: number, capacitanceF: number): number {
  return 1 / (2 * Math.PI * Math.sqrt(inductanceH * capacitanceF));
}

export function varactorCore(p: VaractorDutParams, tuneV: number, supplyV: number): OscillatorCore {
  if (tuneV < p.varactor.minReverseV || supplyV < p.supply.minV) {
    return { oscillating: false, frequencyHz: 0, cycleJitter: 0 };
  }
  const cjF = junctionCapacitanceF(tuneV, p.varactor.cj0F, p.varactor.builtInV, p.varactor.gradingExponent);
  const frequencyHz = lcResonanceHz(p.tank.inductanceH, cjF + p.tank.parasiticCapacitanceF);
  // An LC oscillator's cycle-to-cycle jitter is tiny against a counter gate;
  // the white-FM term in the noise block dominates, so none is added here.
  return { oscillating: true, frequencyHz, cycleJitter: 0 };
}
