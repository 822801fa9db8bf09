/**
 * Numerical check of a loop filter: the open-loop transfer function of the
 * exact circuit (not the design approximation), its unity-gain crossover and
 * phase margin, Bode arrays for plotting, and how both move with Kvco.
 */
import type { LoopFilter } from './loop-filter.ts';

export interface LoopParams {
  dividerN: number;
  chargePumpA: number;
  kvcoHzPerV: number;
}

/**
 * s·Z(s) at s = jω for the exact filter, returned as [re, im]; Z is the
 * transimpedance from charge-pump current to VCO tuning voltage.
 */
function sTimesZ(f: LoopFilter, w: number): [number, number] {
  // Admittances at node 1: C1, and the R2–C2 branch; then R3 into C3 (third order).
  const y1re = 0;
  const y1im = w * f.c1F;
  // Branch R2 + 1/(jωC2): impedance (R2, −1/(ωC2)); admittance = conj / |.|².
  const zbRe = f.r2Ohm;
  const zbIm = -1 / (w * f.c2F);
  const zb2 = zbRe * zbRe + zbIm * zbIm;
  let yRe = y1re + zbRe / zb2;
  let yIm = y1im - zbIm / zb2;
  let divRe = 1;
  let divIm = 0;
  if (f.order === 3 && f.r3Ohm !== null && f.c3F !== null) {
    // R3 + 1/(jωC3) to ground loads node 1; the output is across C3: V3 = V1/(1 + jωR3C3).
    const zcRe = f.r3Ohm;
    const zcIm = -1 / (w * f.c3F);
    const zc2 = zcRe * zcRe + zcIm * zcIm;
    yRe += zcRe / zc2;
    yIm += -zcIm / zc2;
    divRe = 1;
    divIm = w * f.r3Ohm * f.c3F;
  }
  // Z = 1 / (Y · div); s·Z = jω / (Y · div)
  const dRe = yRe * divRe - yIm * divIm;
  const dIm = yRe * divIm + yIm * divRe;
  const d2 = dRe * dRe + dIm * dIm;
  // jω · conj(d) / |d|² = jω (dRe − j dIm)/d2 = (ω dIm + j ω dRe)/d2
  return [(w * dIm) / d2, (w * dRe) / d2];
}

/** |G(j2πf)| and arg G in degrees (continuous: −180° + arg(sZ), arg(sZ) ∈ (−180°, 90°)). */
export function openLoopAt(f: LoopFilter, p: LoopParams, frequencyHz: number): { magnitude: number; phaseDeg: number } {
  const w = 2 * Math.PI * frequencyHz;
  const [re, im] = sTimesZ(f, w);
  const k = (p.chargePumpA * p.kvcoHzPerV) / p.dividerN;
  // G = K·Z/s = K·(sZ)/s², s² = −ω².
  return { magnitude: (k * Math.hypot(re, im)) / (w * w), phaseDeg: (Math.atan2(im, re) * 180) / Math.PI - 180 };
}

export interface LoopCheck {
  crossoverHz: number;
  phaseMarginDeg: number;
}

/** Unity-gain frequency (|G| falls monotonically for these filters: bisection on log f) and the margin there. */
export function evaluateLoop(f: LoopFilter, p: LoopParams): LoopCheck {
  // Bracket around the natural scale of the filter's time constants.
  let lo = 1e-6 / (2 * Math.PI * f.t2S);
  let hi = 1e6 / (2 * Math.PI * f.t1S);
  for (let i = 0; i < 200; i++) {
    const mid = Math.sqrt(lo * hi);
    if (openLoopAt(f, p, mid).magnitude > 1) lo = mid;
    else hi = mid;
  }
  const crossoverHz = Math.sqrt(lo * hi);
  return { crossoverHz, phaseMarginDeg: 180 + openLoopAt(f, p, crossoverHz).phaseDeg };
}

/** Bode data of the open loop over given frequencies (for plotting). */
export function openLoopResponse(
  f: LoopFilter,
  p: LoopParams,
  frequenciesHz: Float64Array,
): { magnitudeDb: Float64Array; phaseDeg: Float64Array } {
  const magnitudeDb = new Float64Array(frequenciesHz.length);
  const phaseDeg = new Float64Array(frequenciesHz.length);
  for (let i = 0; i < frequenciesHz.length; i++) {
    const g = openLoopAt(f, p, frequenciesHz[i] as number);
    magnitudeDb[i] = 20 * Math.log10(g.magnitude);
    phaseDeg[i] = g.phaseDeg;
  }
  return { magnitudeDb, phaseDeg };
}

/** n log-spaced frequencies from fromHz to toHz inclusive. */
export function logFrequencies(fromHz: number, toHz: number, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = fromHz * Math.pow(toHz / fromHz, n > 1 ? i / (n - 1) : 0);
  return out;
}

/** Crossover and margin at each Kvco (e.g. the measured min, nominal and max). */
export function loopAcrossKvco(
  f: LoopFilter,
  p: Omit<LoopParams, 'kvcoHzPerV'>,
  kvcosHzPerV: readonly number[],
): (LoopCheck & { kvcoHzPerV: number })[] {
  return kvcosHzPerV.map((kvcoHzPerV) => ({ kvcoHzPerV, ...evaluateLoop(f, { ...p, kvcoHzPerV }) }));
}
