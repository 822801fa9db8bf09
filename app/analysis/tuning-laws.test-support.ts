/**
 * Closed-form tuning curves with known derivatives for the fit tests, and a
 * seeded Gaussian source. Test support only (not exported by index.ts).
 *
 * - RC charging law (textbook physics: v(t) = Vc + (v0 − Vc)·e^(−t/RC),
 *   Horowitz & Hill, The Art of Electronics, 3rd ed., §1.4 — from memory):
 *   a relaxation oscillator charging from V0 to V1 toward Vc has period
 *   T = RC·ln((Vc − V0)/(Vc − V1)) + Td, f = 1/T. The drive saturates softly:
 *   Vc = −s·ln(e^(−(a·V + b)/s) + e^(−Vs/s)) (a smooth minimum of the linear
 *   drive and the rail Vs), so f flattens but never falls.
 * - Junction-capacitance law (textbook physics: Cj = Cj0/(1 + V/φ)^γ, Sze & Ng,
 *   Physics of Semiconductor Devices, 3rd ed., ch. 2 — from memory) in an LC
 *   tank, f = 1/(2π√(L·(Cj + Cp))).
 */

export interface Law {
  f(v: number): number;
  dfdv(v: number): number;
}

export function rcSoftSaturatingLaw(
  p = { rc: 1e-4, v0: 1.1, v1: 2.0, td: 6e-6, a: 1, b: 0.45, vs: 4.7, s: 0.12 },
): Law {
  const vc = (v: number): number => -p.s * Math.log(Math.exp(-(p.a * v + p.b) / p.s) + Math.exp(-p.vs / p.s));
  const dvc = (v: number): number => {
    const x = p.a * v + p.b;
    return p.a / (1 + Math.exp((x - p.vs) / p.s));
  };
  const period = (v: number): number => p.rc * Math.log((vc(v) - p.v0) / (vc(v) - p.v1)) + p.td;
  return {
    f: (v) => 1 / period(v),
    dfdv: (v) => {
      const c = vc(v);
      // dT/dVc = RC·(1/(Vc − V0) − 1/(Vc − V1)); df/dV = −f²·dT/dVc·dVc/dV
      const dT = p.rc * (1 / (c - p.v0) - 1 / (c - p.v1));
      const f = 1 / period(v);
      return -f * f * dT * dvc(v);
    },
  };
}

export function junctionCapacitanceLaw(p = { l: 8e-9, cj0: 30e-12, phi: 0.7, gamma: 0.75, cp: 4e-12 }): Law {
  const cap = (v: number): number => p.cj0 / Math.pow(1 + v / p.phi, p.gamma) + p.cp;
  const f = (v: number): number => 1 / (2 * Math.PI * Math.sqrt(p.l * cap(v)));
  return {
    f,
    dfdv: (v) => {
      const dC = (-p.gamma * p.cj0) / p.phi / Math.pow(1 + v / p.phi, p.gamma + 1);
      return (-f(v) / (2 * cap(v))) * dC;
    },
  };
}

/** Park–Miller uniform in (0, 1) with Box–Muller normals: deterministic test noise. */
export function gaussian(seed: number): () => number {
  let n = seed;
  const uniform = (): number => {
    n = (16807 * n) % 2147483647;
    return n / 2147483647;
  };
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
}
