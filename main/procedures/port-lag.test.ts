/**
 * The tuning port's voltage from the control voltages written, for a first-order lag: each step ΔV at
 * t_k adds ΔV·(1 − e^(−(t − t_k)/τ)) (the step response of an RC low-pass; superposition holds for a
 * linear system — both textbook circuit theory, from memory).
 */
import { describe, expect, it } from 'vitest';
import { FirstOrderLag } from '../sim/first-order-lag.ts';
import { NO_SIGNAL_LEFT_FRACTION, PortHistory, stepLeftFraction } from './port-lag.ts';

describe('where the tuning port was', () => {
  it('follows one step from 0 V as 1 − e^(−t/τ)', () => {
    const h = new PortHistory();
    h.write(10, 2);
    expect(h.portV(9.99, 0.05)).toBe(0);
    expect(h.portV(10.05, 0.05)).toBeCloseTo(2 * (1 - Math.exp(-1)), 12);
    expect(h.portV(10.15, 0.05)).toBeCloseTo(2 * (1 - Math.exp(-3)), 12);
  });

  it('adds the steps still on their way, as the simulator’s own lag does', () => {
    const tauS = 0.05;
    const h = new PortHistory();
    // The simulator's lag (main/sim/first-order-lag.ts, the exact ODE solution) stepped through the same writes.
    const lag = new FirstOrderLag(tauS, 0);
    const writes: [number, number][] = [
      [0, 1.0],
      [0.03, 1.2],
      [0.06, 1.4],
      [0.09, 1.6],
    ];
    for (const [t, v] of writes) h.write(t, v);
    let nowS = 0;
    let target = 1.0; // written at t = 0, with the port at 0 V
    for (const checkS of [0.095, 0.12, 0.2, 0.4]) {
      for (const [t, v] of writes) {
        if (t <= nowS || t > checkS) continue;
        lag.step(t - nowS, target);
        nowS = t;
        target = v;
      }
      lag.step(checkS - nowS, target);
      nowS = checkS;
      expect(h.portV(checkS, tauS), `t = ${checkS} s`).toBeCloseTo(lag.value, 9);
    }
  });

  it('counts a point’s step as done only once the port is within 5 % of it, whatever came before', () => {
    const tauS = 0.05;
    const h = new PortHistory();
    h.write(0, 1.0);
    h.write(0.2, 1.2); // the same voltage written twice is no step
    h.write(0.2, 1.2);
    // 3τ after switch-on, but only 1τ after its own step: most of the 0.2 V still to go.
    expect(stepLeftFraction(h, 0.25, tauS)).toBeGreaterThan(0.3);
    expect(stepLeftFraction(h, 0.25, tauS)).toBeGreaterThan(NO_SIGNAL_LEFT_FRACTION);
    // Long after: done.
    expect(stepLeftFraction(h, 0.2 + 4 * tauS, tauS)).toBeLessThan(NO_SIGNAL_LEFT_FRACTION);
    expect(NO_SIGNAL_LEFT_FRACTION).toBeCloseTo(0.0498, 4);
  });
});
