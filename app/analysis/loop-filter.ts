/**
 * Passive loop filter for a charge-pump PLL, from the measured VCO gain.
 *
 * Design equations for the passive second-order filter (C1 ∥ (R2 + C2)) and
 * the third-order one (plus R3 in series, C3 to ground), with the loop
 * bandwidth taken as the open-loop unity-gain frequency and the phase margin
 * placed there: Dean Banerjee, "PLL Performance, Simulation and Design",
 * 5th ed., chapters on loop-filter coefficients and components — written down
 * from memory, then checked numerically by loop-filter-eval.ts against the
 * exact circuit (tests assert crossover and phase margin to 1 %).
 *
 * Open loop: G(s) = Icp·Kvco·Z(s)/(N·s) with Icp in A and Kvco in Hz/V
 * (Kφ = Icp/2π A/rad and 2π·Kvco rad/s/V: the 2π cancel).
 */

export interface LoopSpec {
  /** Phase-detector comparison frequency (Hz); used to check the bandwidth. */
  referenceHz: number;
  /** Feedback divider N. */
  dividerN: number;
  /** Charge-pump current (A). */
  chargePumpA: number;
  /** VCO gain at the operating point (Hz/V), e.g. the measured Kvco. */
  kvcoHzPerV: number;
  /** Target loop bandwidth = unity-gain (crossover) frequency (Hz). */
  loopBandwidthHz: number;
  phaseMarginDeg: number;
  /** 2 (C1, R2, C2) or 3 (adds R3, C3). Default 2. */
  order?: 2 | 3;
  /** Third order: T3/T1, the extra pole relative to the main one (0 < r < 1). Default 0.25. */
  poleRatio?: number;
}

export interface LoopFilter {
  order: 2 | 3;
  c1F: number;
  r2Ohm: number;
  c2F: number;
  r3Ohm: number | null;
  c3F: number | null;
  /** Time constants: zero T2, poles T1 (and T3). */
  t1S: number;
  t2S: number;
  t3S: number | null;
}

export interface LoopDesign {
  filter: LoopFilter;
  source: string;
  warnings: string[];
}

const SOURCE =
  'Dean Banerjee, "PLL Performance, Simulation and Design", 5th ed., passive 2nd/3rd-order loop filter equations (from memory), verified numerically';

function checkSpec(spec: LoopSpec): void {
  const positive: (keyof LoopSpec)[] = ['referenceHz', 'dividerN', 'chargePumpA', 'kvcoHzPerV', 'loopBandwidthHz'];
  for (const key of positive) {
    const v = spec[key];
    if (typeof v !== 'number' || !(v > 0) || !Number.isFinite(v))
      throw new RangeError(`${key} must be a positive number (got ${String(v)})`);
  }
  if (!(spec.phaseMarginDeg > 0 && spec.phaseMarginDeg < 90)) {
    throw new RangeError(`phaseMarginDeg must lie between 0 and 90 (got ${spec.phaseMarginDeg})`);
  }
  const r = spec.poleRatio ?? 0.25;
  if (!(r > 0 && r < 1)) throw new RangeError(`poleRatio must lie between 0 and 1 (got ${r})`);
}

export function designLoopFilter(spec: LoopSpec): LoopDesign {
  checkSpec(spec);
  const warnings: string[] = [];
  if (spec.loopBandwidthHz > spec.referenceHz / 10) {
    // Continuous-time analysis holds only well below the comparison frequency (common practice: ≤ 1/10).
    warnings.push(
      'loop bandwidth is above 1/10 of the comparison frequency: the continuous-time design is unreliable there',
    );
  }
  const wc = 2 * Math.PI * spec.loopBandwidthHz;
  const phi = (spec.phaseMarginDeg * Math.PI) / 180;
  const k = (spec.chargePumpA * spec.kvcoHzPerV) / spec.dividerN;
  if ((spec.order ?? 2) === 2) {
    const t1 = (1 / Math.cos(phi) - Math.tan(phi)) / wc;
    const t2 = 1 / (wc * wc * t1);
    const a0 = (k / (wc * wc)) * Math.sqrt((1 + wc * wc * t2 * t2) / (1 + wc * wc * t1 * t1));
    const c1 = (a0 * t1) / t2;
    const c2 = a0 - c1;
    return {
      filter: { order: 2, c1F: c1, r2Ohm: t2 / c2, c2F: c2, r3Ohm: null, c3F: null, t1S: t1, t2S: t2, t3S: null },
      source: SOURCE,
      warnings,
    };
  }
  const ratio = spec.poleRatio ?? 0.25;
  const gamma = 1;
  // φ(T1) = atan(γ/(ωc·T1·(1+r))) − atan(ωc·T1) − atan(ωc·T1·r) falls monotonically: bisect on log T1.
  const phaseAt = (t1: number): number =>
    Math.atan(gamma / (wc * t1 * (1 + ratio))) - Math.atan(wc * t1) - Math.atan(wc * t1 * ratio);
  let lo = 1e-9 / wc;
  let hi = 1e3 / wc;
  for (let i = 0; i < 200; i++) {
    const mid = Math.sqrt(lo * hi);
    if (phaseAt(mid) > phi) lo = mid;
    else hi = mid;
  }
  const t1 = Math.sqrt(lo * hi);
  const t3 = ratio * t1;
  const t2 = gamma / (wc * wc * (t1 + t3));
  const a0 = (k / (wc * wc)) * Math.sqrt((1 + wc * wc * t2 * t2) / ((1 + wc * wc * t1 * t1) * (1 + wc * wc * t3 * t3)));
  const a1 = a0 * (t1 + t3);
  const a2 = a0 * t1 * t3;
  const c1 = (a2 / (t2 * t2)) * (1 + Math.sqrt(1 + (t2 / a2) * (t2 * a0 - a1)));
  const c3 = (-t2 * t2 * c1 * c1 + t2 * a1 * c1 - a2 * a0) / (t2 * t2 * c1 - a2);
  const c2 = a0 - c1 - c3;
  const r2 = t2 / c2;
  const r3 = a2 / (c1 * c3 * t2);
  if (!(c1 > 0 && c2 > 0 && c3 > 0 && r2 > 0 && r3 > 0)) {
    throw new RangeError('no positive third-order components for this phase margin and pole ratio; lower either');
  }
  return {
    filter: { order: 3, c1F: c1, r2Ohm: r2, c2F: c2, r3Ohm: r3, c3F: c3, t1S: t1, t2S: t2, t3S: t3 },
    source: SOURCE,
    warnings,
  };
}
