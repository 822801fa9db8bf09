/**
 * What the drift plots' cursor read-outs may say: times to the gate a reading
 * spans, frequencies to the counter's 1/gate, temperatures to the
 * thermometer's resolution, and each Allan deviation with its confidence
 * (app/plots/readout.ts). Pure, so a test scans the texts on real logs.
 */
import type { DriftAnalysis } from '../../analysis/drift-analysis.ts';
import { celsiusReadout, counterReadout, type Readout } from '../../plots/readout.ts';

export interface DriftReadouts {
  time: Readout;
  frequency: Readout;
  temperature: Readout;
  tau: Readout;
  adev: Readout;
}

/**
 * 1σ of each overlapping Allan deviation: the simple estimate σ/√N of NIST
 * SP 1065 §5.3 (from memory), with N the count of non-overlapping differences
 * (terms/m), since overlapping terms are not independent — wider than the
 * χ² interval the edf gives, never narrower.
 */
export function adevUncertainty(a: DriftAnalysis): number[] {
  const tau0 = a.allan.tau0S;
  return a.adev.map((p) => {
    const m = tau0 > 0 ? Math.max(1, Math.round(p.tauS / tau0)) : 1;
    return p.adev / Math.sqrt(Math.max(1, Math.floor(p.terms / m)));
  });
}

export function driftReadouts(gateS: number | null | undefined, analysis: DriftAnalysis | null): DriftReadouts {
  const adevU = analysis ? adevUncertainty(analysis) : [];
  return {
    // A reading stands for its gate: a time finer than the gate (or than 1 s, the clock label's step) says nothing.
    time: { unit: 's', clock: true, resolution: gateS && gateS < 1 ? 10 ** Math.floor(Math.log10(gateS)) : 1 },
    frequency: counterReadout(gateS),
    temperature: celsiusReadout,
    // τ = m·τ0 with τ0 the median sample interval: 3 digits tell the octave steps apart and no more.
    tau: { unit: 's', digits: 3 },
    adev: { unit: '', exponent: true, uncertaintyAt: (i) => adevU[i] ?? null, digits: 2 },
  };
}
