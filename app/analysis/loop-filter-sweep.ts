/**
 * Loop filter from a measured tuning curve: designed at the nominal Kvco,
 * then evaluated at the lowest and highest Kvco of the usable range, which
 * is where bandwidth and phase margin move to as the VCO is tuned.
 */
import { designLoopFilter, type LoopDesign, type LoopSpec } from './loop-filter.ts';
import { loopAcrossKvco, type LoopCheck } from './loop-filter-eval.ts';
import type { SweepAnalysis } from './sweep-types.ts';

export interface LoopFromSweep {
  design: LoopDesign;
  /** Kvco used for the design (the sweep's nominal point), Hz/V. */
  designKvcoHzPerV: number;
  acrossKvco: { label: 'min' | 'nominal' | 'max'; kvcoHzPerV: number; crossoverHz: number; phaseMarginDeg: number }[];
}

export function loopFromSweep(sweep: SweepAnalysis, spec: Omit<LoopSpec, 'kvcoHzPerV'>): LoopFromSweep {
  // A falling tuning curve has negative Kvco; the loop only sees its magnitude (polarity is a wiring choice).
  const nominal = Math.abs(sweep.kvco.nominal.hzPerV);
  const ends = [Math.abs(sweep.kvco.minHzPerV), Math.abs(sweep.kvco.maxHzPerV)].sort((a, b) => a - b);
  const design = designLoopFilter({ ...spec, kvcoHzPerV: nominal });
  const labels = ['min', 'nominal', 'max'] as const;
  const checks: (LoopCheck & { kvcoHzPerV: number })[] = loopAcrossKvco(design.filter, spec, [
    ends[0] as number,
    nominal,
    ends[1] as number,
  ]);
  return {
    design,
    designKvcoHzPerV: nominal,
    acrossKvco: checks.map((c, i) => ({ label: labels[i] as (typeof labels)[number], ...c })),
  };
}
