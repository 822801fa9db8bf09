import { describe, expect, it } from 'vitest';
import { builtinDut } from './builtin-duts.ts';
import { parseDutParams, type DutParams } from './dut-params.ts';
import { coreOf } from './dut-model.ts';
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

describe('near the stall edge the model is physics (issue 15 item 8)', () => {
  /** A DUT held at `tuneV` for long enough that its tuning port has settled. */
  function heldAt(tuneV: number, seed: number): DutRuntime {
    const drive: DutDrive = {
      tuneSourceAt: () => ({ v: tuneV, slopeVPerS: 0, untilS: Infinity }),
      supplyVAt: () => 5,
      poweredSinceS: () => -1e6,
      temperatureCAt: () => 25,
    };
    const dut = new DutRuntime(builtinDut('relaxation'), drive, createRng(seed), 0);
    dut.advanceTo(1);
    return dut;
  }

  function readings(tuneV: number, n: number): number[] {
    const out: number[] = [];
    for (let seed = 1; seed <= n; seed++) {
      const result = heldAt(tuneV, seed).gate(1, 0.02);
      out.push(result.status === 'ok' ? result.frequencyHz : 0);
    }
    return out;
  }

  it('20 ms gates just above the edge read a few kHz at most, never MHz or THz, and below the reading at 2 V', () => {
    // The built-in DUT stalls where gain·V + offset reaches the 2.0 V threshold: V = 1.55 V.
    const edgeV = 2.0 - 0.45;
    const at2V = readings(2.0, 20);
    const minAt2V = Math.min(...at2V);
    expect(minAt2V).toBeGreaterThan(8000);
    // Noise-free ceiling a little way above the edge: the charging law at 1.56 V (≈ 2.2 kHz).
    const ceilingHz = coreOf(builtinDut('relaxation'), 1.56, 5).frequencyHz;
    expect(ceilingHz).toBeGreaterThan(2000);
    expect(ceilingHz).toBeLessThan(2500);
    for (const offsetV of [1e-15, 1e-9, 1e-5, 1e-4]) {
      for (const f of readings(edgeV + offsetV, 40)) {
        expect(Number.isFinite(f)).toBe(true);
        expect(f).toBeLessThan(ceilingHz);
        expect(f).toBeLessThan(minAt2V);
      }
    }
  });

  it('the mean reading falls toward zero as the edge is approached from above', () => {
    const mean = (values: number[]) => values.reduce((a, b) => a + b, 0) / values.length;
    const means = [0.1, 0.01, 1e-3, 1e-5].map((offsetV) => mean(readings(1.55 + offsetV, 30)));
    for (let i = 1; i < means.length; i++) expect(means[i] as number).toBeLessThan(means[i - 1] as number);
  });

  it('DUT files with values outside physical ranges are refused, naming the field', () => {
    const base = builtinDut('relaxation');
    if (base.kind !== 'relaxation') throw new Error('expected the relaxation DUT');
    expect(() => parseDutParams({ ...base, noise: { ...base.noise, whiteFmAt1s: 1e308 } })).toThrow(
      /noise\.whiteFmAt1s: noise\.whiteFmAt1s must be ≤ 0\.001/,
    );
    expect(() => parseDutParams({ ...base, tuning: { ...base.tuning, settleTauS: 1e308 } })).toThrow(
      /tuning\.settleTauS: .*≤ 1000/,
    );
    expect(() => parseDutParams({ ...base, timing: { ...base.timing, capacitanceF: Infinity } })).toThrow(
      /timing\.capacitanceF/,
    );
    expect(parseDutParams(base)).toEqual(base);
  });
});
