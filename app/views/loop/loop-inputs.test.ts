import { describe, expect, it } from 'vitest';
import { loopOperatingPoint } from '../../analysis/loop-operating-point.ts';
import { analyzeSweep } from '../../analysis/sweep-analysis.ts';
import { simSweep } from '../../../test/testing/sim-sweep.ts';
import { designAtLock } from './loop-design.ts';
import { checkLoopDraft, DEFAULT_LOOP, suggestedLoop } from './loop-inputs.ts';

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

describe("the form's first lock point fits the chosen run (issue 11 item 13)", () => {
  const plan = {
    readingsPerPoint: 3,
    gateS: 0.1,
    settle: { mode: 'auto', maxS: 2 },
    safe: { controlV: 0, outputOff: true },
    start: 0.6,
    step: 0.2,
    direction: 'up',
  };

  it.each([
    ['relaxation', 4.8, 5],
    ['varactor', 10, 12],
  ] as const)(
    '%s DUT: lock point in the middle of its tuning window, a design with no error',
    async (dut, stop, max) => {
      const s = await simSweep(dut, 4, { ...plan, stop, limits: { maxControlV: max, currentLimitA: 0.02 } });
      const a = analyzeSweep(s.input);
      const suggestion = suggestedLoop(a);
      expect(suggestion).not.toBeNull();
      const { values } = checkLoopDraft({ ...DEFAULT_LOOP, ...suggestion });
      if (!values) throw new Error('the suggestion does not parse');
      const point = loopOperatingPoint(a, values.referenceHz, values.dividerN);
      expect(point.inRange).toBe(true);
      expect(point.message).toBeNull();
      // Near the window's middle: within a quarter of the window of it (the reference is rounded to 2 digits).
      const middle = (a.window.fromV + a.window.toV) / 2;
      expect(Math.abs((point.lockV ?? NaN) - middle)).toBeLessThan((a.window.toV - a.window.fromV) / 4);
      // A bandwidth a tenth of the reference (common practice ≤ f_ref/10).
      expect(values.loopBandwidthHz / values.referenceHz).toBeCloseTo(0.1, 6);
      const outcome = designAtLock(point, values);
      expect(outcome.ok).toBe(true);
    },
    60_000,
  );

  it("the example's 5 MHz (what a new user saw first) lies off the relaxation DUT's curve and says so", async () => {
    const s = await simSweep('relaxation', 4, { ...plan, stop: 4.8, limits: { maxControlV: 5, currentLimitA: 0.02 } });
    const a = analyzeSweep(s.input);
    const { values } = checkLoopDraft(DEFAULT_LOOP);
    const point = loopOperatingPoint(a, values?.referenceHz ?? NaN, values?.dividerN ?? NaN);
    expect(point.inRange).toBe(false);
    expect(point.message).toMatch(/outside this run's tuning range/);
  }, 60_000);
});
