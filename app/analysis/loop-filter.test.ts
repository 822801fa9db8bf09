import { describe, expect, it } from 'vitest';
import { designLoopFilter, type LoopSpec } from './loop-filter.ts';
import { evaluateLoop, logFrequencies, loopAcrossKvco, openLoopResponse } from './loop-filter-eval.ts';
import { loopFromSweep } from './loop-filter-sweep.ts';
import { analyzeSweep } from './sweep-analysis.ts';

// Scenario of our own: a 400 MHz varactor VCO locked to a 1 MHz comparison frequency.
const base: LoopSpec = {
  referenceHz: 1e6,
  dividerN: 400,
  chargePumpA: 1e-3,
  kvcoHzPerV: 20e6,
  loopBandwidthHz: 20e3,
  phaseMarginDeg: 50,
};

describe('designLoopFilter (Banerjee design equations, from memory) verified on the exact circuit', () => {
  it.each([
    [2, 50, 20e3],
    [2, 65, 5e3],
    [3, 50, 20e3],
    [3, 45, 50e3],
  ] as const)('order %d, %d° at %d Hz: crossover and margin within 1 %%', (order, pm, bw) => {
    const design = designLoopFilter({ ...base, order, phaseMarginDeg: pm, loopBandwidthHz: bw });
    const f = design.filter;
    expect(f.c1F).toBeGreaterThan(0);
    expect(f.c2F).toBeGreaterThan(0);
    expect(f.r2Ohm).toBeGreaterThan(0);
    if (order === 3) {
      expect(f.r3Ohm).toBeGreaterThan(0);
      expect(f.c3F).toBeGreaterThan(0);
    }
    const check = evaluateLoop(f, base);
    // The design equations are exact for this circuit: what is left is rounding (about 1e-16 measured).
    expect(Math.abs(check.crossoverHz / bw - 1)).toBeLessThan(1e-12);
    expect(Math.abs(check.phaseMarginDeg / pm - 1)).toBeLessThan(1e-12);
  });

  it('second order: PM is the phase peak (zero and pole straddle the crossover geometrically)', () => {
    const f = designLoopFilter(base).filter;
    // T1·T2 = 1/ωc² (design rule): the phase maximum sits at the crossover.
    const wc = 2 * Math.PI * base.loopBandwidthHz;
    expect(f.t1S * f.t2S * wc * wc).toBeCloseTo(1, 12);
    const pmNear = [0.9, 1.1].map((s) => evaluateLoop(f, { ...base, kvcoHzPerV: base.kvcoHzPerV * s }).phaseMarginDeg);
    for (const pm of pmNear) expect(pm).toBeLessThan(50);
  });

  it('bandwidth follows Kvco across the measured range; margin drops on both sides', () => {
    const f = designLoopFilter(base).filter;
    const rows = loopAcrossKvco(f, base, [10e6, 20e6, 40e6]);
    expect(rows[0]?.crossoverHz).toBeLessThan(20e3);
    expect(rows[2]?.crossoverHz).toBeGreaterThan(20e3);
    expect(rows[1]?.phaseMarginDeg).toBeCloseTo(50, 6);
    expect(rows[0]?.phaseMarginDeg).toBeLessThan(50);
    expect(rows[2]?.phaseMarginDeg).toBeLessThan(50);
  });

  it('Bode arrays: 0 dB at the crossover, −180° + PM there, −40 dB/decade far below', () => {
    const f = designLoopFilter(base).filter;
    const freqs = logFrequencies(20, 20e3, 4);
    const bode = openLoopResponse(f, base, freqs);
    expect(bode.magnitudeDb[3]).toBeCloseTo(0, 6);
    expect(bode.phaseDeg[3]).toBeCloseTo(-130, 6);
    expect((bode.magnitudeDb[0] as number) - (bode.magnitudeDb[1] as number)).toBeCloseTo(40, 0);
  });

  it('rejects impossible specifications, naming the field', () => {
    expect(() => designLoopFilter({ ...base, phaseMarginDeg: 95 })).toThrow(/phaseMarginDeg/);
    expect(() => designLoopFilter({ ...base, chargePumpA: 0 })).toThrow(/chargePumpA/);
    expect(designLoopFilter({ ...base, loopBandwidthHz: 200e3 }).warnings[0]).toMatch(/1\/10/);
  });
});

describe('loopFromSweep', () => {
  it('designs at the measured nominal Kvco and reports the spread at min/max', () => {
    // Varactor-like curve: f = 380 MHz + 20 MHz/V·V − 2 MHz/V²·V², Kvco 18 … 10 MHz/V over 0.5 … 2.5 V.
    const v = Float64Array.from({ length: 21 }, (_, i) => 0.5 + i / 10);
    const sweep = analyzeSweep(
      { controlV: v, frequencyHz: v.map((x) => 380e6 + 20e6 * x - 2e6 * x * x) },
      { nominalV: 1.5 },
    );
    const r = loopFromSweep(sweep, {
      referenceHz: 1e6,
      dividerN: 400,
      chargePumpA: 1e-3,
      loopBandwidthHz: 20e3,
      phaseMarginDeg: 50,
    });
    expect(r.designKvcoHzPerV).toBeCloseTo(14e6, 0);
    const [lo, nom, hi] = r.acrossKvco;
    expect(lo?.kvcoHzPerV).toBeCloseTo(10e6, 0);
    expect(hi?.kvcoHzPerV).toBeCloseTo(18e6, 0);
    expect(Math.abs((nom?.crossoverHz ?? 0) / 20e3 - 1)).toBeLessThan(0.01);
    expect(lo?.crossoverHz).toBeLessThan(20e3);
    expect(hi?.crossoverHz).toBeGreaterThan(20e3);
  });
});
