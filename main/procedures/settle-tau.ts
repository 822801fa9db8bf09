/**
 * The tuning port's time constant, learned from the sweep itself: each
 * point's settling readings are fitted once the point's end value is known.
 */

/** Learns the DUT's tuning-port time constant across points (median of recent estimates). */
export class TimeConstantEstimate {
  readonly #recent = new Float64Array(5);
  #count = 0;

  /** Seconds, or null before any estimate. The largest recent estimate: a short one reads early, a long one only costs time. */
  get tauS(): number | null {
    const n = Math.min(this.#count, this.#recent.length);
    if (n === 0) return null;
    let largest = 0;
    for (let i = 0; i < n; i++) largest = Math.max(largest, this.#recent[i] as number);
    return largest;
  }

  /**
   * Fits the settling seen at one point once its settled value is known:
   * ln|f∞ − f(t)| against t is a straight line of slope −1/τ for a first-
   * order lag; readings within two noise widths of f∞ carry no slope and are
   * left out. Needs three or more readings that moved.
   */
  fitPoint(times: Float64Array, values: Float64Array, n: number, settledHz: number, noiseHz: number): void {
    let k = 0;
    let sx = 0;
    let sy = 0;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < n; i++) {
      const gap = Math.abs(settledHz - (values[i] as number));
      if (!(gap > 2 * noiseHz)) continue;
      const x = times[i] as number;
      const y = Math.log(gap);
      k++;
      sx += x;
      sy += y;
      sxx += x * x;
      sxy += x * y;
    }
    if (k < 3) return;
    const slope = (k * sxy - sx * sy) / (k * sxx - sx * sx);
    const tau = -1 / slope;
    if (!(tau > 0) || !Number.isFinite(tau)) return;
    this.#recent[this.#count % this.#recent.length] = tau;
    this.#count++;
  }
}
