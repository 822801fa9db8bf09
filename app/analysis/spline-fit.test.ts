import { describe, expect, it } from 'vitest';
import { fitSpline, splineSlope, splineSlopeSd, splineValue } from './spline-fit.ts';
import { gaussian, junctionCapacitanceLaw, rcSoftSaturatingLaw, type Law } from './tuning-laws.test-support.ts';

/** A sweep of a law: `perPoint` readings per point with Gaussian scatter, rounded to whole counts of a 0.1 s gate. */
function sample(law: Law, v0: number, v1: number, step: number, perPoint: number, sdHz: number, seed: number) {
  const rnd = gaussian(seed);
  const n = Math.round((v1 - v0) / step) + 1;
  const v = new Float64Array(n);
  const f = new Float64Array(n);
  const u = new Float64Array(n);
  let pooled = 0;
  for (let i = 0; i < n; i++) {
    v[i] = v0 + i * step;
    const r: number[] = [];
    for (let k = 0; k < perPoint; k++) r.push(Math.round((law.f(v[i] as number) + sdHz * rnd()) / 10) * 10);
    const m = r.reduce((a, b) => a + b) / perPoint;
    const sd = Math.sqrt(r.reduce((a, b) => a + (b - m) ** 2, 0) / (perPoint - 1));
    f[i] = m;
    // Same per-point uncertainty as the sweep analysis: scatter of the mean and ±1 count rectangular.
    u[i] = Math.sqrt((sd * sd) / perPoint + 100 / 3);
    pooled += (u[i] as number) ** 2;
  }
  return { v, f, u, n, pooled: Math.sqrt(pooled / n) };
}

/**
 * Worst relative Kvco error at the inner points. At the two end points a
 * spline's slope rests on one side only; there it passes within 2 % or
 * within 2σ of its own stated uncertainty.
 */
function worstSlopeError(law: Law, fit: ReturnType<typeof fitSpline>, v: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < v.length; i++) {
    const x = v[i] as number;
    const err = splineSlope(fit, x) - law.dfdv(x);
    if (i === 0 || i === v.length - 1)
      expect(Math.abs(err)).toBeLessThanOrEqual(Math.max(2 * splineSlopeSd(fit, x), 0.02 * Math.abs(law.dfdv(x))));
    else worst = Math.max(worst, Math.abs(err / law.dfdv(x)));
  }
  return worst;
}

describe('P-spline tuning curve on closed-form laws (textbook physics)', () => {
  // RC charging law with a softly saturating drive (Horowitz & Hill §1.4, from memory):
  // the curve flattens toward the rail but never falls.
  const rc = rcSoftSaturatingLaw();
  // Junction-capacitance law of a varactor in an LC tank (Sze & Ng ch. 2, from memory).
  const jc = junctionCapacitanceLaw();

  for (const seed of [3, 7, 11]) {
    it(`RC charging law, 0.05 V steps, 10 readings, seed ${seed}: residual SD ≤ 1.5× pooled scatter, Kvco within 2 %`, () => {
      const s = sample(rc, 1.8, 4.4, 0.05, 10, 3, seed);
      const fit = fitSpline(s.v, s.f, s.u, 0, s.n, { monotone: 'rising' });
      expect(fit.residualStdDev).toBeLessThanOrEqual(1.5 * s.pooled);
      expect(worstSlopeError(rc, fit, s.v)).toBeLessThan(0.02);
    });
    it(`junction-capacitance law, 0.05 V steps, seed ${seed}: residual SD ≤ 1.5× pooled scatter, Kvco within 2 %`, () => {
      const s = sample(jc, 0.5, 4.5, 0.05, 3, 8, seed);
      const fit = fitSpline(s.v, s.f, s.u, 0, s.n, { monotone: 'rising' });
      expect(fit.residualStdDev).toBeLessThanOrEqual(1.5 * s.pooled);
      expect(worstSlopeError(jc, fit, s.v)).toBeLessThan(0.02);
    });
  }

  it('never gives a negative slope on a curve that only flattens (monotone constraint)', () => {
    const s = sample(rc, 1.8, 5.5, 0.1, 3, 3, 5); // far into the flat top, where noise would make a free fit fall
    const fit = fitSpline(s.v, s.f, s.u, 0, s.n, { monotone: 'rising' });
    for (let x = 1.8; x <= 5.5; x += 0.01) expect(splineSlope(fit, x)).toBeGreaterThanOrEqual(0);
  });

  it('reproduces a straight line and a parabola exactly (the penalty null space)', () => {
    const v = Float64Array.from({ length: 20 }, (_, i) => 0.5 + i * 0.2);
    const f = v.map((x) => 1e6 + 3e5 * x - 2e4 * x * x);
    const fit = fitSpline(v, f, new Float64Array(20), 0, 20);
    for (const x of [0.5, 1.23, 2.9, 4.3]) {
      expect(splineValue(fit, x)).toBeCloseTo(1e6 + 3e5 * x - 2e4 * x * x, 4);
      expect(splineSlope(fit, x)).toBeCloseTo(3e5 - 4e4 * x, 4);
    }
  });

  it('gives a slope uncertainty that covers the true error (band from the fit covariance)', () => {
    let inside = 0;
    let total = 0;
    for (const seed of [21, 22, 23, 24, 25]) {
      const s = sample(jc, 0.5, 4.5, 0.05, 3, 8, seed);
      const fit = fitSpline(s.v, s.f, s.u, 0, s.n, { monotone: 'rising' });
      for (const x of s.v) {
        total++;
        if (Math.abs(splineSlope(fit, x) - jc.dfdv(x)) <= 2 * splineSlopeSd(fit, x)) inside++;
      }
    }
    // A 2σ Bayesian band covers about 95 % on average across the curve (Nychka 1988); allow slack.
    expect(inside / total).toBeGreaterThan(0.8);
  });
});
