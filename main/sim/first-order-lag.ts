/**
 * First-order lag x' = (u − x)/τ, advanced exactly over pieces where the
 * input u is linear in time (a supply output is a slew ramp or a constant).
 * For u(t) = u0 + s·t the exact solution is
 *   x(t) = u(t) − s·τ + (x0 − u0 + s·τ)·e^(−t/τ)
 * (standard first-order ODE solution, common practice). A step input reaches
 * 63.2 % (1 − 1/e) of its final change after one τ.
 */
export class FirstOrderLag {
  #x: number;
  readonly tauS: number;

  constructor(tauS: number, initial: number) {
    if (!(tauS > 0)) throw new RangeError(`FirstOrderLag: tauS must be > 0, got ${tauS}`);
    this.tauS = tauS;
    this.#x = initial;
  }

  get value(): number {
    return this.#x;
  }

  /** Advances by dtS while the input runs from u0 with slope s (per second). */
  step(dtS: number, u0: number, slopePerS = 0): number {
    if (dtS <= 0) return this.#x;
    const sTau = slopePerS * this.tauS;
    const decay = Math.exp(-dtS / this.tauS);
    this.#x = u0 + slopePerS * dtS - sTau + (this.#x - u0 + sTau) * decay;
    return this.#x;
  }
}
