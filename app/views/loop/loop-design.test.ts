import { describe, expect, it } from 'vitest';
import { openLoopAt } from '../../analysis/loop-filter-eval.ts';
import type { KvcoCorner, OperatingPoint } from '../../analysis/loop-operating-point.ts';
import type { RunMeta } from '../../contract/bench-api.ts';
import { bodeRange, degreesText, marginBar } from './bode-options.ts';
import { designAtLock, frequencyPoints, offeredSweeps } from './loop-design.ts';
import type { LoopValues } from './loop-inputs.ts';

// Scenario of our own: a 5 MHz clock multiplier (N = 4 from 1.25 MHz) on a VCO of about 2 MHz/V.
const corner = (label: KvcoCorner['label'], kvcoHzPerV: number, usable = true): KvcoCorner => ({
  label,
  v: 1.5,
  kvcoHzPerV,
  uncertaintyHzPerV: 1e3,
  usable,
  reason: usable ? null : 'no loop gain there (the curve is flat or folds over)',
});
const point = (corners: KvcoCorner[]): OperatingPoint => ({
  targetHz: 5e6,
  inRange: true,
  message: null,
  lockV: 1.5,
  lockUncertaintyV: 0.001,
  corners,
});
const values: LoopValues = {
  referenceHz: 1.25e6,
  dividerN: 4,
  chargePumpA: 100e-6,
  loopBandwidthHz: 20e3,
  phaseMarginDeg: 50,
  order: 2,
};

describe('the loop design step', () => {
  it('designs at the lock point and checks every usable corner: crossover where |G·H| = 1, margin = 180° + phase there', () => {
    const outcome = designAtLock(point([corner('min', 1.6e6), corner('lock', 2e6), corner('max', 2.4e6)]), values);
    if (!outcome.ok) throw new Error(outcome.error);
    expect(outcome.checks.map((c) => c.label)).toEqual([
      'Kvco min (window)',
      'Kvco at the lock point',
      'Kvco max (window)',
    ]);
    const lock = outcome.checks[1];
    // Designed for its bandwidth at the lock point's Kvco (Banerjee's equations put crossover at the target).
    expect(lock?.crossoverHz).toBeCloseTo(20e3, -2);
    for (const check of outcome.checks) {
      // Textbook definition of crossover and phase margin (common practice): recomputed from the response itself.
      const at = openLoopAt(outcome.design.filter, { ...values, kvcoHzPerV: check.kvcoHzPerV }, check.crossoverHz);
      expect(at.magnitude).toBeCloseTo(1, 6);
      expect(180 + at.phaseDeg).toBeCloseTo(check.phaseMarginDeg, 6);
    }
    // More Kvco, more loop gain: the crossover moves up.
    expect(outcome.checks[2]?.crossoverHz ?? 0).toBeGreaterThan(outcome.checks[0]?.crossoverHz ?? 0);
  });

  it('a lock point off the tuning curve is refused at the reference field, with the reason', () => {
    const off = point([corner('min', 1.6e6), corner('lock', Number.NaN, false), corner('max', 2.4e6)]);
    const outcome = designAtLock(off, values);
    expect(outcome).toMatchObject({ ok: false, field: 'referenceHz' });
    expect(outcome.ok ? '' : outcome.error).toMatch(/no loop gain there/);
  });

  it("the designer's refusals are placed at the field they concern, in the designer's words", () => {
    const lock = point([corner('lock', 2e6)]);
    const margin = designAtLock(lock, { ...values, phaseMarginDeg: 95 });
    expect(margin).toMatchObject({ ok: false, field: 'phaseMarginDeg' });
    expect(margin.ok ? '' : margin.error).toMatch(/phaseMarginDeg must lie between 0 and 90/);
    expect(designAtLock(lock, { ...values, loopBandwidthHz: 0 })).toMatchObject({
      ok: false,
      field: 'loopBandwidthHz',
    });
    expect(designAtLock(lock, { ...values, chargePumpA: -1 })).toMatchObject({ ok: false, field: 'chargePumpA' });
  });
});

describe('sweeps offered to the loop screen', () => {
  const meta = (id: string, kind: RunMeta['kind'], status: RunMeta['status']) => ({ id, kind, status }) as RunMeta;
  it('offers finished and stopped sweeps with readings; not running, failed, other kinds, or sweeps with no points', () => {
    const runs = [
      meta('a', 'sweep', 'complete'),
      meta('b', 'sweep', 'aborted'),
      meta('c', 'sweep', 'running'),
      meta('d', 'sweep', 'failed'),
      meta('e', 'drift', 'complete'),
      meta('f', 'sweep', 'aborted'),
    ];
    expect(offeredSweeps(runs, new Set(['f'])).map((r) => r.id)).toEqual(['a', 'b']);
  });

  it('counts only readings with a frequency (status ok, finite, above 0)', () => {
    const f = [Number.NaN, 0, 1e6, 1.1e6, 1.2e6];
    const status = [1, 1, 0, 3, 0]; // no-signal, no-signal, ok, error, ok
    expect(frequencyPoints(f, status, 5)).toBe(2);
    expect(frequencyPoints(f, status, 2)).toBe(0);
    expect(frequencyPoints([], [], 0)).toBe(0);
  });
});

describe('Bode plot marks', () => {
  it('keeps 0 dB and −180° in view and puts the margin bar from −180° to the phase at crossover', () => {
    expect(bodeRange('magnitude', 10, 60)).toEqual([-6, 60]);
    expect(bodeRange('phase', -170, -120)).toEqual([-190, -120]);
    expect(bodeRange('phase', -200, -100)).toEqual([-200, -100]);
    expect(marginBar({ label: 'lock', crossoverHz: 2e4, phaseMarginDeg: 48.5 })).toEqual({
      x: 2e4,
      fromDeg: -180,
      toDeg: -131.5,
    });
    expect(degreesText(48.53)).toBe('48.5°');
  });
});
