import { describe, expect, it } from 'vitest';
import { builtinDut } from './builtin-duts.ts';
import type { DutParams } from './dut-params.ts';
import { DutRuntime, type DutDrive } from './dut-runtime.ts';
import { FirstOrderLag } from './first-order-lag.ts';
import { createRng } from './prng.ts';

function steppedDrive(stepAtS: number, fromV: number, toV: number): DutDrive {
  return {
    tuneSourceAt: (t) =>
      t < stepAtS ? { v: fromV, slopeVPerS: 0, untilS: stepAtS } : { v: toV, slopeVPerS: 0, untilS: Infinity },
    supplyVAt: () => 5,
    poweredSinceS: () => -1e6,
    temperatureCAt: () => 25,
  };
}

function quietRelaxation(): DutParams {
  const p = builtinDut('relaxation');
  return { ...p, noise: { whiteFmAt1s: 0, randomWalkPpmPerSqrtHour: 0 } };
}

describe('tuning-port settling lag', () => {
  it('a step reaches 63.2 % at t = τ (first-order system, common practice)', () => {
    const p = quietRelaxation();
    const tau = p.tuning.settleTauS;
    const dut = new DutRuntime(p, steppedDrive(1, 2, 3), createRng(1), 0);
    dut.advanceTo(1 + tau);
    expect(dut.tuneNodeV).toBeCloseTo(2 + (1 - Math.exp(-1)), 9);
    dut.advanceTo(1 + 10 * tau);
    expect(dut.tuneNodeV).toBeCloseTo(3, 4);
  });

  it('tracks a ramp with a lag of slope·τ (common practice)', () => {
    const lag = new FirstOrderLag(0.01, 0);
    for (let i = 0; i < 100; i++) lag.step(0.01, i * 0.01 * 5, 5);
    expect(5 * 1 - lag.value).toBeCloseTo(5 * 0.01, 6);
  });

  it('a gate opened during settling reads between the old and the new frequency', () => {
    const p = quietRelaxation();
    const dut = new DutRuntime(p, steppedDrive(1, 2, 3), createRng(1), 0);
    const before = dut.frequencyHzAt(0.9);
    const during = dut.gate(1, p.tuning.settleTauS);
    const after = dut.frequencyHzAt(2);
    expect(during.status).toBe('ok');
    if (during.status === 'ok') {
      expect(during.frequencyHz).toBeGreaterThan(before);
      expect(during.frequencyHz).toBeLessThan(after);
    }
  });
});

describe('counter gate', () => {
  it('readings are whole counts: multiples of 1/gate (±1 count quantisation)', () => {
    const dut = new DutRuntime(builtinDut('relaxation'), steppedDrive(0, 3, 3), createRng(7), 0);
    const gateS = 0.01;
    const values = new Set<number>();
    for (let i = 0; i < 50; i++) {
      const r = dut.gate(i * gateS, gateS);
      expect(r.status).toBe('ok');
      if (r.status === 'ok') {
        expect(r.frequencyHz * gateS).toBeCloseTo(Math.round(r.frequencyHz * gateS), 6);
        values.add(r.frequencyHz);
      }
    }
    // The true frequency lies between counts: both neighbours appear.
    expect(values.size).toBeGreaterThanOrEqual(2);
  });

  it('reports no signal below the stall edge', () => {
    const dut = new DutRuntime(builtinDut('relaxation'), steppedDrive(0, 1.2, 1.2), createRng(7), 0);
    expect(dut.gate(1, 0.1)).toEqual({ status: 'no-signal' });
  });

  it('is deterministic for a seed and differs between seeds', () => {
    const run = (seed: number): number[] => {
      const dut = new DutRuntime(builtinDut('relaxation'), steppedDrive(0, 1.6, 1.6), createRng(seed), 0);
      const out: number[] = [];
      for (let i = 0; i < 20; i++) {
        const r = dut.gate(i, 0.1);
        out.push(r.status === 'ok' ? r.frequencyHz : -1);
      }
      return out;
    };
    expect(run(42)).toEqual(run(42));
    expect(run(42)).not.toEqual(run(43));
  });

  it('scatter grows near the stall edge (jitter)', () => {
    const spread = (tuneV: number): number => {
      const dut = new DutRuntime(quietRelaxation(), steppedDrive(0, tuneV, tuneV), createRng(3), 0);
      const xs: number[] = [];
      for (let i = 0; i < 200; i++) {
        const r = dut.gate(i, 0.1);
        if (r.status === 'ok') xs.push(r.frequencyHz);
      }
      const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
      const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
      return sd / mean;
    };
    expect(spread(1.56)).toBeGreaterThan(5 * spread(4.0));
  });
});
