import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { solveQuadraticScaled } from './poly-fit-quadratic.ts';
import { fitPolynomialAuto } from './poly-fit-auto.ts';
import { derivativeStdDev, evalPoly, evalPolyDerivative, fitPolynomial } from './poly-fit.ts';

interface StrdFile {
  source: string;
  degree: number;
  x: number[];
  y: number[];
  certified: { coefficients: number[]; coefficientStdDev: number[]; residualStdDev: number; rSquared: number };
}

function load(name: string): StrdFile {
  return JSON.parse(readFileSync(new URL(`../../test/fixtures/${name}`, import.meta.url), 'utf8')) as StrdFile;
}

/** Number of agreeing significant digits, as NIST StRD scores them (LRE = −log10 |rel err|). */
function lre(got: number, want: number): number {
  if (got === want) return 16;
  return -Math.log10(Math.abs(got - want) / Math.abs(want));
}

describe.each([
  ['nist-strd-norris.json', 'NIST StRD Norris (linear, certified values)'],
  ['nist-strd-pontius.json', 'NIST StRD Pontius (quadratic, certified values)'],
])('%s — %s', (file) => {
  const data = load(file);
  const fit = fitPolynomial(Float64Array.from(data.x), Float64Array.from(data.y), 0, data.x.length, data.degree);

  it('coefficients to ≥ 9 significant digits', () => {
    data.certified.coefficients.forEach((want, i) =>
      expect(lre(fit.coefficients[i] as number, want)).toBeGreaterThanOrEqual(9),
    );
  });
  it('coefficient standard deviations to ≥ 9 significant digits', () => {
    data.certified.coefficientStdDev.forEach((want, i) =>
      expect(lre(fit.coefficientStdDev[i] as number, want)).toBeGreaterThanOrEqual(9),
    );
  });
  it('residual SD and R² to ≥ 9 significant digits', () => {
    expect(lre(fit.residualStdDev, data.certified.residualStdDev)).toBeGreaterThanOrEqual(9);
    expect(lre(fit.rSquared, data.certified.rSquared)).toBeGreaterThanOrEqual(9);
  });
});

describe('fitPolynomial on closed-form curves', () => {
  const xs = new Float64Array(21);
  const ys = new Float64Array(21);
  for (let i = 0; i < 21; i++) {
    const x = 0.5 + 0.2 * i;
    xs[i] = x;
    ys[i] = 1e6 + 2e5 * x - 3e3 * x * x + 50 * x * x * x;
  }
  it('recovers an exact cubic and its derivative', () => {
    const fit = fitPolynomial(xs, ys, 0, 21, 3);
    const want = [1e6, 2e5, -3e3, 50];
    want.forEach((c, i) => expect(fit.coefficients[i]).toBeCloseTo(c, 6));
    expect(evalPoly(fit, 2)).toBeCloseTo(1e6 + 4e5 - 12e3 + 400, 5);
    expect(evalPolyDerivative(fit, 2)).toBeCloseTo(2e5 - 12e3 + 600, 5);
    expect(derivativeStdDev(fit, 2)).toBeLessThan(1e-6);
  });
  it('honours the index window', () => {
    const fit = fitPolynomial(xs, ys, 5, 15, 3);
    expect(fit.n).toBe(10);
    expect(fit.coefficients[3]).toBeCloseTo(50, 6);
  });
  it('AICc picks the true degree of exact data', () => {
    expect(fitPolynomialAuto(xs, ys, 0, 21).fit.degree).toBe(3);
  });
  it('rejects too few points and repeated x', () => {
    expect(() => fitPolynomial(xs, ys, 0, 2, 2)).toThrow(/at least 3 points/);
    const same = new Float64Array([1, 1, 1, 1]);
    expect(() => fitPolynomial(same, same, 0, 4, 1)).toThrow(/distinct/);
  });
});

describe('fitPolynomial recovers random exact polynomials (property)', () => {
  it('degree 1–6 on 40 points over an offset, wide voltage range', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }),
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 7, maxLength: 7 }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        (degree, raw, offsetV) => {
          const coef = raw.slice(0, degree + 1);
          const xs = Float64Array.from({ length: 40 }, (_, i) => offsetV + i * 0.1);
          const ys = xs.map((x) => coef.reduceRight((s, c) => s * x + c, 0));
          const fit = fitPolynomial(xs, ys, 0, 40, degree);
          // Compare the curves (coefficients of a high-degree fit far from 0 V are ill-determined).
          const scale = Math.max(...ys.map(Math.abs), 1);
          return Array.from(xs).every((x, i) => Math.abs(evalPoly(fit, x) - (ys[i] as number)) <= 1e-9 * scale);
        },
      ),
    );
  });
});

const finite = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true });

/**
 * Property: the matrix-free path of `degree` gives exactly the general QR path's fit (or the same refusal), on
 * random points with x from `xArb`, from a random start index. Equality is exact (toEqual on every number and
 * Float64Array element), not a tolerance: the matrix-free paths claim the same floating-point operations.
 */
function sameAsGeneralPath(degree: number, xArb: fc.Arbitrary<number>): void {
  fc.assert(
    fc.property(
      fc.array(fc.tuple(xArb, finite(-1e12, 1e12)), { minLength: degree + 1, maxLength: 60 }),
      fc.nat(3),
      (pairs, skip) => {
        const xs = Float64Array.from(pairs, (p) => p[0]);
        const ys = Float64Array.from(pairs, (p) => p[1]);
        const i0 = Math.min(skip, pairs.length - degree - 1);
        const run = (general: boolean): unknown => {
          try {
            return fitPolynomial(xs, ys, i0, pairs.length, degree, general);
          } catch (error) {
            return String(error);
          }
        };
        expect(run(false)).toEqual(run(true));
      },
    ),
    { numRuns: 400 },
  );
}

describe('fitPolynomial: the matrix-free straight line', () => {
  it('is bit-for-bit the general QR path (property, incl. offsets, wide ranges and windows)', () => {
    sameAsGeneralPath(1, finite(-1e9, 1e9));
  });

  it('same on a long, drift-like record, and the same refusal when every x is equal', () => {
    const n = 20_000;
    const t = Float64Array.from({ length: n }, (_, i) => 1e6 + i);
    const f = Float64Array.from({ length: n }, (_, i) => 1e7 + 1e-3 * i + ((i * 7919) % 13) * 1e-3);
    expect(fitPolynomial(t, f, 17, n, 1)).toEqual(fitPolynomial(t, f, 17, n, 1, true));
    const flat = new Float64Array(5).fill(2);
    expect(() => fitPolynomial(flat, f, 0, 5, 1)).toThrow('needs 2 distinct x values');
  });
});

describe('fitPolynomial: the matrix-free quadratic', () => {
  it('is bit-for-bit the general QR path (property, incl. offsets, wide ranges, windows and repeated x)', () => {
    sameAsGeneralPath(2, fc.oneof(finite(-1e9, 1e9), fc.integer({ min: -3, max: 3 })));
  });

  it('same on a long tuning-curve-like record, and the same refusal with two distinct x', () => {
    const n = 20_000;
    const v = Float64Array.from({ length: n }, (_, i) => 0.5 + i * 4e-6);
    const f = Float64Array.from(
      { length: n },
      (_, i) => 8000 + 2000 * (v[i] as number) + 30 * (v[i] as number) ** 2 + Math.sin(i * 12.9898) * 0.5,
    );
    const fit = fitPolynomial(v, f, 5, n, 2);
    expect(fit).toEqual(fitPolynomial(v, f, 5, n, 2, true));
    expect(fit.coefficients[2]).toBeCloseTo(30, 0); // the curvature put in, within the ripple
    expect(solveQuadraticScaled(v, f, 5, n)?.coefficients).toEqual(fit.scaledCoefficients); // the matrix-free path ran
    const two = Float64Array.from([1, 2, 1, 2, 1]);
    expect(() => fitPolynomial(two, f, 0, 5, 2)).toThrow('needs 3 distinct x values');
  });
});
