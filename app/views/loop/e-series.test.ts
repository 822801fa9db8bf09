import { describe, expect, it } from 'vitest';
import { evaluateLoop } from '../../analysis/loop-filter-eval.ts';
import { designLoopFilter } from '../../analysis/loop-filter.ts';
import { nearestPreferred, roundFilter, seriesMantissas } from './e-series.ts';

describe('E-series rounding of loop-filter parts', () => {
  it('E96 from the formula holds the values printed on 1 % parts (IEC 60063, values from memory: e.g. 1.00, 1.02, 4.99, 9.76)', () => {
    const e96 = seriesMantissas('E96');
    expect(e96).toHaveLength(96);
    for (const printed of [1.0, 1.02, 1.05, 2.21, 3.32, 4.99, 6.81, 9.76]) expect(e96).toContain(printed);
  });

  it('rounds to the nearest preferred value on a log scale, across decades', () => {
    expect(nearestPreferred(37.58e-15, 'E6')).toBeCloseTo(33e-15, 27); // 37.58 fF: 33 is nearer than 47 in ratio
    expect(nearestPreferred(9_640, 'E12')).toBe(10_000); // 9.64 k → 10 k (ratio 1.037) not 8.2 k (1.176)
    expect(nearestPreferred(9_640, 'E24')).toBe(10_000); // 10 k (ratio 1.037) beats 9.1 k (1.059)
    expect(nearestPreferred(9_300, 'E24')).toBe(9_100);
    expect(nearestPreferred(9_640, 'E96')).toBe(9_530); // ratio 1.0115 against 9.76 k at 1.0124
    expect(nearestPreferred(4.6e-9, 'E12')).toBeCloseTo(4.7e-9, 21);
  });

  it('a rounded 2nd-order filter keeps close to the designed crossover and margin, recomputed on the rounded parts', () => {
    // A 100 kHz loop on a 9.7 kHz/V oscillator: scenario of our own.
    const spec = {
      referenceHz: 1e6,
      dividerN: 100,
      chargePumpA: 1e-3,
      kvcoHzPerV: 9.7e6,
      loopBandwidthHz: 20e3,
      phaseMarginDeg: 50,
    };
    const designed = designLoopFilter(spec).filter;
    const params = { dividerN: 100, chargePumpA: 1e-3, kvcoHzPerV: 9.7e6 };
    const exact = evaluateLoop(designed, params);
    const rounded = roundFilter(designed, 'E24', 'E12');
    const after = evaluateLoop(rounded, params);
    expect(rounded.r2Ohm).toBe(nearestPreferred(designed.r2Ohm, 'E24'));
    expect(exact.crossoverHz).toBeCloseTo(20e3, -2);
    // E12 capacitors are within ±9 % of any value: the crossover moves by roughly that much at most, the margin by a few degrees.
    expect(Math.abs(after.crossoverHz / exact.crossoverHz - 1)).toBeLessThan(0.15);
    expect(Math.abs(after.phaseMarginDeg - exact.phaseMarginDeg)).toBeLessThan(6);
    expect(after.crossoverHz).not.toBe(exact.crossoverHz);
  });
});
