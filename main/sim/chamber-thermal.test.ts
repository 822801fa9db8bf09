/**
 * The simulated chamber's thermal truth against the textbook responses it
 * models: a first-order approach reaches 1 − 1/e (63.2 %) of a step after
 * one time constant; the ramp is limited to its rate; a second-order air
 * response overshoots by the fraction asked (peak overshoot
 * exp(−ζπ/√(1−ζ²)), standard control-theory result, common practice); the
 * DUT lags the air with its own time constant.
 */
import { describe, expect, it } from 'vitest';
import { ChamberThermal, dampingFromOvershoot } from './chamber-thermal.ts';

const flat = (c: number) => () => c;

describe('ChamberThermal', () => {
  it('ramps at the set rate, then approaches first-order; the DUT lags', () => {
    const th = new ChamberThermal(
      { ambientCAt: flat(20), airTauS: 60, dutTauS: 300, overshootFraction: 0, hardwareRampCPerMin: 10 },
      0,
    );
    th.setRamp(0, 2);
    th.setSetpoint(0, 60);
    th.setRunning(0, true);
    // Ramp: 2 °C/min for 20 min covers 40 °C.
    expect(th.state(600).rampTargetC).toBeCloseTo(40, 6);
    expect(th.state(1200).rampTargetC).toBeCloseTo(60, 6);
    expect(th.airCAt(5000)).toBeCloseTo(60, 3);
    expect(th.dutCAt(8000)).toBeCloseTo(60, 2);
  });

  it('a step (fast ramp) reaches 63.2 % after one air time constant', () => {
    const th = new ChamberThermal(
      { ambientCAt: flat(20), airTauS: 100, dutTauS: 1e6, overshootFraction: 0, hardwareRampCPerMin: 1e6 },
      0,
    );
    th.setRamp(0, 1e6);
    th.setSetpoint(0, 30);
    th.setRunning(0, true);
    expect((th.airCAt(100) - 20) / 10).toBeCloseTo(1 - Math.exp(-1), 2);
  });

  it('overshoots by the requested fraction', () => {
    expect(dampingFromOvershoot(0.1)).toBeCloseTo(0.5912, 3);
    const th = new ChamberThermal(
      { ambientCAt: flat(20), airTauS: 50, dutTauS: 1e6, overshootFraction: 0.1, hardwareRampCPerMin: 1e6 },
      0,
    );
    th.setRamp(0, 1e6);
    th.setSetpoint(0, 30);
    th.setRunning(0, true);
    let peak = 0;
    for (let t = 1; t < 2000; t++) peak = Math.max(peak, th.airCAt(t));
    expect((peak - 30) / 10).toBeGreaterThan(0.08);
    expect((peak - 30) / 10).toBeLessThan(0.12);
  });

  it('leaves the DUT in lab air until first run', () => {
    let c = 21;
    const th = new ChamberThermal(
      { ambientCAt: () => c, airTauS: 60, dutTauS: 300, overshootFraction: 0, hardwareRampCPerMin: 5 },
      0,
    );
    c = 24;
    expect(th.dutCAt(10)).toBe(24);
  });
});
