import { describe, expect, it } from 'vitest';
import { checkLoopDraft, DEFAULT_LOOP } from './loop-inputs.ts';

describe('loop-filter form', () => {
  it('reads SI-prefixed entries', () => {
    const { values } = checkLoopDraft(DEFAULT_LOOP);
    expect(values).toMatchObject({
      referenceHz: 1.25e6,
      dividerN: 4,
      loopBandwidthHz: 20e3,
      phaseMarginDeg: 50,
      order: 2,
    });
    expect(values?.chargePumpA).toBeCloseTo(100e-6, 15); // "100u": 100 × 1e-6 in binary floating point
  });

  it('names each bad field', () => {
    const { values, errors } = checkLoopDraft({
      ...DEFAULT_LOOP,
      dividerN: '4.5',
      phaseMarginDeg: '95',
      chargePumpA: 'lots',
    });
    expect(values).toBeNull();
    expect(errors.dividerN).toMatch(/whole number/);
    expect(errors.phaseMarginDeg).toMatch(/below 90/);
    expect(errors.chargePumpA).toMatch(/positive number/);
    expect(errors.referenceHz).toBeUndefined();
  });
});
