import { describe, expect, it } from 'vitest';
import { AnalysisError } from './analysis-error.ts';
import { analyzeSweep } from './sweep-analysis.ts';
import type { SweepInput } from './sweep-points.ts';

interface Reading {
  v: number;
  f: number;
  dir?: 1 | -1;
}

function toInput(readings: Reading[], gateS?: number): SweepInput {
  return {
    controlV: Float64Array.from(readings, (r) => r.v),
    frequencyHz: Float64Array.from(readings, (r) => r.f),
    direction: Int8Array.from(readings, (r) => r.dir ?? 1),
    gateS,
  };
}

/** Exact straight line f = 100 kHz + 200 kHz/V, stalled at and below 0.5 V, 0..3 V in 0.1 V steps. */
function lineSweep(
  opts: { scatterBelow?: number; dir?: 1 | -1; offsetHz?: number; stallAtOrBelow?: number } = {},
): Reading[] {
  const out: Reading[] = [];
  const stall = opts.stallAtOrBelow ?? 0.5;
  for (let k = 0; k <= 30; k++) {
    const v = Math.round(k) / 10;
    const f = 1e5 + 2e5 * v + (opts.offsetHz ?? 0);
    for (let r = 0; r < 4; r++) {
      const wiggle = [1, -1, 1, -1][r] as number;
      let value = f + wiggle; // ±1 Hz, a tenth of the 10 Hz counter floor at 0.1 s
      if (opts.scatterBelow !== undefined && v < opts.scatterBelow) value = f * (1 + 0.05 * wiggle);
      out.push({ v, f: v <= stall + 1e-9 ? NaN : value, dir: opts.dir });
    }
  }
  return out;
}

describe('analyzeSweep on an exact straight line with a stall edge', () => {
  const result = analyzeSweep(toInput(lineSweep(), 0.1));
  it('puts the stall edge halfway between the last stalled and first oscillating point', () => {
    expect(result.stall.stalled).toBe(true);
    expect(result.stall.thresholdV).toBeCloseTo(0.55, 12);
    expect(result.stall.thresholdUncertaintyV).toBeCloseTo(0.05, 12);
    expect(result.stall.unstableBelowV).toBeNull();
  });
  it('finds Kvco = 200 kHz/V everywhere', () => {
    expect(result.kvco.linear.slopeHzPerV).toBeCloseTo(2e5, 6);
    expect(result.kvco.linear.interceptHz).toBeCloseTo(1e5, 4);
    expect(result.kvco.linear.r2).toBeCloseTo(1, 12);
    expect(result.kvco.linear.maxLinearityErrorPct).toBeLessThan(1e-6);
    expect(result.kvco.linear.fromV).toBeCloseTo(0.6, 12);
    expect(result.kvco.linear.toV).toBeCloseTo(3, 12);
    expect(result.kvco.minHzPerV).toBeCloseTo(2e5, 4);
    expect(result.kvco.maxHzPerV).toBeCloseTo(2e5, 4);
    expect(result.fit.model).toBe('spline');
    // The polynomial option still picks the straight line (AICc).
    const poly = analyzeSweep(toInput(lineSweep(), 0.1), { fit: 'auto' });
    expect(poly.fit.degree).toBe(1);
    expect(poly.fit.coefficients[0]).toBeCloseTo(1e5, 4);
    expect(poly.fit.coefficients[1]).toBeCloseTo(2e5, 4);
  });
  it('gives a local entry at every oscillating point, finite differences agreeing', () => {
    expect(result.kvco.local).toHaveLength(25);
    for (const e of result.kvco.local) {
      expect(e.hzPerV).toBeCloseTo(2e5, 3);
      expect(e.fdHzPerV).toBeCloseTo(2e5, 3);
      expect(e.unstable).toBe(false);
    }
  });
  it('reports the tuning range and the whole range as linear within 5 %', () => {
    expect(result.tuningRange.fMinHz).toBeCloseTo(2.2e5, 6);
    expect(result.tuningRange.vAtFMin).toBeCloseTo(0.6, 12);
    expect(result.tuningRange.fMaxHz).toBeCloseTo(7e5, 6);
    expect(result.tuningRange.vAtFMax).toBe(3);
    expect(result.kvco.widestLinearRange?.fromV).toBeCloseTo(0.6, 9);
    expect(result.kvco.widestLinearRange?.toV).toBeCloseTo(3, 9);
  });
  it('carries ±1 count in 0.1 s into the uncertainties', () => {
    // Per point: scatter (sd 1.155 Hz over 4 readings) and 10 Hz/√3 rectangular.
    const perPoint = Math.sqrt(4 / 3 / 4 + 100 / 3);
    expect(result.tuningRange.fMinUncertaintyHz).toBeCloseTo(perPoint, 9);
    // Straight-line slope: σ/√Sxx with σ the per-point uncertainty (it exceeds the ±1 Hz residuals) and
    // Sxx = Σ(v − v̄)² = n(n² − 1)h²/12 = 13 V² for 25 points 0.1 V apart (least squares, common practice).
    expect(result.kvco.linear.slopeUncertaintyHzPerV).toBeCloseTo(perPoint / Math.sqrt(13), 9);
  });
});

describe('analyzeSweep: unstable region, intermittent edge, hysteresis', () => {
  it('flags the scattered points above the edge and starts the usable range above them', () => {
    const result = analyzeSweep(toInput(lineSweep({ scatterBelow: 0.75 }), 0.1));
    expect(result.stall.unstableBelowV).toBeCloseTo(0.75, 12);
    expect(result.stall.unstableBelowUncertaintyV).toBeCloseTo(0.05, 12);
    expect(result.kvco.linear.fromV).toBeCloseTo(0.8, 12);
    const flagged = result.kvco.local.filter((e) => e.unstable).map((e) => e.v);
    expect(flagged).toEqual([0.6, 0.7]);
    expect(result.kvco.local).toHaveLength(25);
  });
  it('interpolates the edge through an intermittent point', () => {
    const readings = lineSweep().map((r, i) => (r.v === 0.5 && i % 2 === 0 ? { ...r, f: 1e5 + 2e5 * 0.5 } : r));
    const result = analyzeSweep(toInput(readings, 0.1));
    expect(result.stall.thresholdV).toBeCloseTo(0.5, 12);
    expect(result.kvco.local.find((e) => e.v === 0.5)?.unstable).toBe(true);
  });
  it('reports up/down hysteresis of the edge and the curve', () => {
    const readings = [...lineSweep({ dir: 1 }), ...lineSweep({ dir: -1, offsetHz: 500, stallAtOrBelow: 0.3 })];
    const result = analyzeSweep(toInput(readings, 0.1));
    expect(result.primaryDirection).toBe('up');
    expect(result.hysteresis?.upThresholdV).toBeCloseTo(0.55, 12);
    expect(result.hysteresis?.downThresholdV).toBeCloseTo(0.35, 12);
    expect(result.hysteresis?.thresholdDeltaV).toBeCloseTo(0.2, 12);
    expect(result.hysteresis?.thresholdDeltaUncertaintyV).toBeCloseTo(0.1, 12);
    expect(result.hysteresis?.curveMaxDeltaHz).toBeCloseTo(500, 6);
    expect(result.hysteresis?.commonPoints).toBe(25);
  });
  it('treats 0 and 9.91E37 as no oscillation', () => {
    const readings = lineSweep().map((r, i) => (Number.isNaN(r.f) ? { ...r, f: i % 2 ? 0 : 9.91e37 } : r));
    expect(analyzeSweep(toInput(readings)).stall.thresholdV).toBeCloseTo(0.55, 12);
  });
  it('fails as work failed when the whole range stalls', () => {
    const readings = lineSweep({ stallAtOrBelow: 5 });
    expect(() => analyzeSweep(toInput(readings))).toThrow(AnalysisError);
    try {
      analyzeSweep(toInput(readings));
    } catch (e) {
      expect((e as AnalysisError).workFailed).toBe(true);
    }
  });
});

describe('analyzeSweep on a quadratic tuning curve', () => {
  // f = 1 MHz + 300 kHz/V·V − 20 kHz/V²·V², 0.5..4.5 V: Kvco(V) = 300k − 40k·V exactly.
  const readings: Reading[] = [];
  for (let k = 0; k <= 40; k++) {
    const v = 0.5 + k / 10;
    readings.push({ v, f: 1e6 + 3e5 * v - 2e4 * v * v });
  }
  const result = analyzeSweep(toInput(readings), { nominalV: 2.5 });
  it('chooses degree 2 and recovers the closed-form Kvco', () => {
    // A parabola lies in the spline penalty's null space: the spline reproduces it exactly.
    expect(result.fit.model).toBe('spline');
    expect(analyzeSweep(toInput(readings), { fit: 'auto' }).fit.coefficients[2]).toBeCloseTo(-2e4, 5);
    expect(result.kvco.maxHzPerV).toBeCloseTo(3e5 - 4e4 * 0.5, 4);
    expect(result.kvco.minHzPerV).toBeCloseTo(3e5 - 4e4 * 4.5, 4);
    expect(result.kvco.nominal.hzPerV).toBeCloseTo(2e5, 4);
    expect(result.kvco.maxToMinRatio).toBeCloseTo(280 / 120, 9);
    expect(result.stall.stalled).toBe(false);
    expect(result.stall.thresholdV).toBeNull();
  });
  it('linearity error matches the closed form for a parabola', () => {
    // Best line to a·V² on a uniform grid: worst error at the ends; checked against the
    // discrete least-squares residual computed independently here.
    const vs = readings.map((r) => r.v);
    const fs = readings.map((r) => r.f);
    const vm = vs.reduce((a, b) => a + b) / vs.length;
    const fm = fs.reduce((a, b) => a + b) / fs.length;
    const slope =
      vs.reduce((s, v, i) => s + (v - vm) * ((fs[i] as number) - fm), 0) / vs.reduce((s, v) => s + (v - vm) ** 2, 0);
    const worst = Math.max(...vs.map((v, i) => Math.abs((fs[i] as number) - (fm + slope * (v - vm)))));
    const span = Math.max(...fs) - Math.min(...fs);
    expect(result.kvco.linear.maxLinearityErrorPct).toBeCloseTo((100 * worst) / span, 9);
    const widest = result.kvco.widestLinearRange;
    expect(widest).not.toBeNull();
    if (result.kvco.linear.maxLinearityErrorPct > 5) expect((widest?.toV ?? 9) - (widest?.fromV ?? 0)).toBeLessThan(4);
    expect(widest?.maxLinearityErrorPct).toBeLessThanOrEqual(5);
  });
  it('widest ±5 % range matches the continuous closed form (derived here)', () => {
    // Window [0.5, b] of a·V² curvature: best-line error a·L²/6 at the ends, span
    // L·(300k − 20k·(b + 0.5)); error/span = 5 % gives L = 8.4e4/2.6e4 → b = 3.7308 V.
    // The grid search is discrete (step 4 V/256), so allow one grid step.
    const widest = result.kvco.widestLinearRange;
    expect(widest?.fromV).toBeCloseTo(0.5, 12);
    expect(Math.abs((widest?.toV ?? 0) - (0.5 + 8.4e4 / 2.6e4))).toBeLessThan(4 / 256);
  });
});

describe('analyzeSweep where a polynomial cannot follow the curve', () => {
  // Relaxation-type onset: f = 10 kHz / ln(V / (V − 1 V)), stalled at ≤ 1 V; f'(V) = 10k / (V·(V−1)·ln²),
  // unbounded at the edge. Coarse 0.5 V … 4 V in 0.1 V steps plus refined points 1.0125, 1.025, 1.05 V.
  const f = (v: number): number => 1e4 / Math.log(v / (v - 1));
  const df = (v: number): number => 1e4 / (v * (v - 1) * Math.log(v / (v - 1)) ** 2);
  const vs = [...Array.from({ length: 36 }, (_, k) => Math.round(5 + k) / 10), 1.0125, 1.025, 1.05];
  const input = { controlV: Float64Array.from(vs), frequencyHz: Float64Array.from(vs, (v) => (v <= 1 ? NaN : f(v))) };
  // The stall edge's zone switched off: the fit then reaches down to the edge.
  const result = analyzeSweep(input, { edgeSlopeChange: 0 });
  it('uses the local slope where the fit disagrees, and says so', () => {
    const first = result.kvco.local[0];
    expect(first?.v).toBe(1.0125);
    expect(first?.fitDisagrees).toBe(true);
    expect(first?.source).toBe('finite-difference');
    // A least-squares slope over [1.0125, 1.05] is a weighted mean of f' there (f' falls monotonically).
    expect(first?.hzPerV).toBeLessThanOrEqual(df(1.0125));
    expect(first?.hzPerV).toBeGreaterThanOrEqual(df(1.05));
    expect(result.kvco.maxHzPerV).toBe(first?.hzPerV);
    expect(result.warnings.some((w) => /misses the local slope/.test(w))).toBe(true);
    expect(result.stall.thresholdV).toBeCloseTo(1.00625, 12);
  });
  it('keeps the fit where it agrees (far from the edge)', () => {
    const far = result.kvco.local.find((e) => e.v === 3);
    expect(far?.source).toBe('fit');
    // A degree ≤ 6 polynomial only approximates this log-shaped curve: within 3 % here.
    expect(Math.abs((far?.hzPerV ?? 0) / df(3) - 1)).toBeLessThan(0.03);
  });
});

describe("analyzeSweep leaves the stall edge's zone out of the usable range", () => {
  // The same onset by default: Kvco grows without bound toward the edge (RC charging law, textbook physics:
  // T = RC·ln(V/(V − V1)) — Horowitz & Hill, The Art of Electronics, 3rd ed., §1.4, from memory), so the
  // steep points must neither set the headline Kvco max nor bend the fit.
  const f = (v: number): number => 1e4 / Math.log(v / (v - 1));
  const df = (v: number): number => 1e4 / (v * (v - 1) * Math.log(v / (v - 1)) ** 2);
  const vs = [...Array.from({ length: 36 }, (_, k) => Math.round(5 + k) / 10), 1.0125, 1.025, 1.05];
  const result = analyzeSweep({
    controlV: Float64Array.from(vs),
    frequencyHz: Float64Array.from(vs, (v) => (v <= 1 ? NaN : f(v))),
  });
  it('starts the usable range where the slope changes by under 5 % per step, and says why the rest is out', () => {
    // Chord slopes 0.1 V either side of 1.3 V differ by (f(1.3)−f(1.2))/(f(1.4)−f(1.3)) − 1 ≈ 10 % (> 5 %),
    // of 1.4 V by ≈ 4.8 % (derived here from f): the range starts at 1.4 V.
    const change13 = (f(1.3) - f(1.2)) / (f(1.4) - f(1.3)) - 1;
    const change14 = (f(1.4) - f(1.3)) / (f(1.5) - f(1.4)) - 1;
    expect(change13).toBeGreaterThan(0.05);
    expect(change14).toBeLessThan(0.05);
    expect(result.usableRange.fromV).toBe(1.4);
    expect(result.usableRange.edgeZone?.fromV).toBe(1.0125);
    expect(result.usableRange.edgeZone?.toV).toBe(1.3);
    expect(result.usableRange.edgeZone?.limitPct).toBe(5);
    expect(result.usableRange.edgeZone?.reason).toMatch(/stall edge .* changes by up to \d+ % per 100 mV step/);
    expect(result.fit.fromV).toBe(1.4);
  });
  it("keeps the zone's points visible and marked, with their local Kvco", () => {
    const marked = result.points.filter((p) => p.edgeZone).map((p) => p.v);
    expect(marked).toEqual([1.0125, 1.025, 1.05, 1.1, 1.2, 1.3]);
    expect(result.kvco.local.find((e) => e.v === 1.0125)?.hzPerV).toBeGreaterThan(2e4);
  });
  it('takes the headline Kvco max at the start of the usable range, within 2 % of the derivative', () => {
    expect(result.kvco.vAtMax).toBe(1.4);
    expect(Math.abs(result.kvco.maxHzPerV / df(1.4) - 1)).toBeLessThan(0.02);
    for (const e of result.kvco.local)
      if (e.v >= 1.4) expect(Math.abs(e.hzPerV / df(e.v) - 1), `at ${e.v} V`).toBeLessThan(0.02);
  });
  it('has no zone on a straight line that stalls (the slope does not change)', () => {
    expect(analyzeSweep(toInput(lineSweep(), 0.1)).usableRange.edgeZone).toBeNull();
  });
});

describe('analyzeSweep on a falling tuning curve', () => {
  it('reports negative Kvco and a magnitude ratio', () => {
    // f = 5 MHz − 1 MHz/V·V + 100 kHz/V²·V², 0.5 … 3 V: Kvco = −1 MHz/V + 200 kHz/V²·V (−900k … −400k).
    const v = Float64Array.from({ length: 26 }, (_, i) => 0.5 + i / 10);
    const r = analyzeSweep({ controlV: v, frequencyHz: v.map((x) => 5e6 - 1e6 * x + 1e5 * x * x) });
    expect(r.kvco.minHzPerV).toBeCloseTo(-9e5, 3);
    expect(r.kvco.maxHzPerV).toBeCloseTo(-4e5, 3);
    expect(r.kvco.maxToMinRatio).toBeCloseTo(9 / 4, 9);
    expect(r.tuningRange.vAtFMax).toBe(0.5);
    expect(r.kvco.linear.slopeHzPerV).toBeLessThan(0);
  });
});

describe('analyzeSweep on a tuning curve that turns back', () => {
  // f = 1 MHz + 400 kHz/V·v − 100 kHz/V²·v² rises to its peak at 2 V and falls
  // after it (a fold-over such as a supply-limited tuning port shows). Past
  // the peak the loop gain changes sign, so the usable range must end there
  // (common practice in PLL design: Kvco must keep one sign over the lock range).
  const readings: Reading[] = [];
  for (let k = 0; k <= 30; k++) {
    const v = k / 10;
    const f = 1e6 + 4e5 * v - 1e5 * v * v;
    for (const wiggle of [1, -1, 1]) readings.push({ v, f: f + wiggle });
  }
  const result = analyzeSweep(toInput(readings, 0.1));

  it('ends the usable range at the peak and keeps Kvco positive over it', () => {
    expect(result.kvco.turnsBackAboveV).toBeCloseTo(2, 12);
    // Just below the peak Kvco falls under 10 % of its median, so the flat-top
    // rule may end the range one step earlier; never past the peak.
    expect(result.kvco.linear.toV).toBeGreaterThanOrEqual(1.9 - 1e-12);
    expect(result.kvco.linear.toV).toBeLessThanOrEqual(2 + 1e-12);
    expect(result.kvco.minHzPerV).toBeGreaterThanOrEqual(-1e-6 * 4e5);
    // The derivative 400 kHz/V − 200 kHz/V²·v is largest at the bottom of the range.
    expect(result.kvco.maxHzPerV).toBeCloseTo(4e5, -2);
    expect(result.tuningRange.vAtFMax).toBeCloseTo(result.kvco.linear.toV, 12);
    expect(result.warnings.some((w) => /turns back above 2 V/.test(w))).toBe(true);
  });

  it('still reports a local Kvco entry at every oscillating point, negative past the turn', () => {
    expect(result.kvco.local).toHaveLength(31);
    const last = result.kvco.local.at(-1);
    expect(last?.v).toBeCloseTo(3, 12);
    expect(last?.hzPerV).toBeLessThan(0);
  });

  it('reports no turn for a monotonic curve', () => {
    expect(analyzeSweep(toInput(lineSweep(), 0.1)).kvco.turnsBackAboveV).toBeNull();
  });
});

describe('analyzeSweep on a tuning curve that saturates', () => {
  // f rises at 10 kHz/V up to 3 V, then stays at 130 kHz (a tuning port clamped
  // at its rail): Kvco ≈ 0 there, so the usable range ends at 3 V.
  const readings: Reading[] = [];
  for (let k = 0; k <= 40; k++) {
    const v = k / 10;
    const f = 1e5 + 1e4 * Math.min(v, 3);
    for (const wiggle of [1, -1, 1]) readings.push({ v, f: f + wiggle });
  }
  const result = analyzeSweep(toInput(readings, 0.1));
  it('ends the usable range where the curve goes flat', () => {
    expect(result.kvco.flatAboveV).toBeCloseTo(3, 12);
    expect(result.kvco.linear.toV).toBeCloseTo(3, 12);
    expect(result.kvco.linear.slopeHzPerV).toBeCloseTo(1e4, 0);
    // The last usable point sits on the knee, where the smoothed local slope
    // straddles the flat part: half the slope, still positive.
    expect(result.kvco.minHzPerV).toBeGreaterThan(0.45e4);
    expect(result.kvco.maxHzPerV).toBeCloseTo(1e4, -1);
    expect(result.warnings.some((w) => /flattens above 3.000 V/.test(w))).toBe(true);
  });
  it('keeps the whole range when the rule is switched off', () => {
    const all = analyzeSweep(toInput(readings, 0.1), { flatKvcoFraction: 0 });
    expect(all.kvco.flatAboveV).toBeNull();
    expect(all.kvco.linear.toV).toBeCloseTo(4, 12);
  });
});
