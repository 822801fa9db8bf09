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
    this.#add(tau);
  }

  /**
   * Fits one step's readings with the end value free: f(t) = f∞ + b·e^(−t/τ),
   * least squares in (f∞, b) for each τ, golden-section search on ln τ. A
   * fixed f∞ taken from readings that still carry a little of the step
   * makes the log-linear fit steepen at its tail and τ come out short (it
   * did by about 8 % on the simulated bench); a free f∞ does not. Needs
   * four readings spanning at least `minStepHz` (below that the counter's
   * quantisation decides the fit, not the lag). Returns τ or null.
   */
  fitStep(times: Float64Array, values: Float64Array, n: number, minStepHz: number): number | null {
    const tau = fitStepTau(times, values, n, minStepHz);
    if (tau !== null) this.#add(tau);
    return tau;
  }

  /** Takes one estimate found elsewhere (fitStepTau on a step watched to its end). */
  accept(tauS: number): void {
    if (tauS > 0 && Number.isFinite(tauS)) this.#add(tauS);
  }

  #add(tau: number): void {
    this.#recent[this.#count % this.#recent.length] = tau;
    this.#count++;
  }
}

/** TimeConstantEstimate.fitStep's fit alone: τ or null, nothing learned. */
export function fitStepTau(times: Float64Array, values: Float64Array, n: number, minStepHz: number): number | null {
  return fitStepCurve(times, values, n, minStepHz)?.tauS ?? null;
}

/** The fitted step f(t) = endHz + stepHz·e^(−t/τ) (stepHz the part left at t = 0), or null (see fitStep). */
export function fitStepCurve(
  times: Float64Array,
  values: Float64Array,
  n: number,
  minStepHz: number,
): { tauS: number; stepHz: number; endHz: number } | null {
  if (n < 4) return null;
  let tMax = 0;
  let vMin = Number.POSITIVE_INFINITY;
  let vMax = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    tMax = Math.max(tMax, times[i] as number);
    vMin = Math.min(vMin, values[i] as number);
    vMax = Math.max(vMax, values[i] as number);
  }
  // The readings themselves must have moved by the minimum step: a fitted amplitude
  // extrapolated back to the step (with a tiny τ) proves nothing.
  if (!(tMax > 0) || !(vMax - vMin >= minStepHz)) return null;
  // τ shows only in the shape of the approach, else any τ fits them: at least three readings on
  // the way (off the latest one by more than a tenth of the minimum step), or two that each still
  // show the whole minimum step. Two such readings Δt apart fix τ = Δt / ln(e₁/e₂) once the settled
  // tail (n ≥ 4) fixes the end value; each is off by at most a count or so in ten, so τ comes out
  // within a few per cent — where the third reading, at a gate of 2τ, is already within a count of
  // the end and whether it counts as moving is the quantisation's toss.
  let latest = 0;
  for (let i = 1; i < n; i++) if ((times[i] as number) > (times[latest] as number)) latest = i;
  let moving = 0;
  let showingStep = 0;
  for (let i = 0; i < n; i++) {
    const offHz = Math.abs((values[i] as number) - (values[latest] as number));
    if (offHz > minStepHz / 10) moving++;
    if (offHz >= minStepHz) showingStep++;
  }
  if (moving < 3 && showingStep < 2) return null;
  // τ between a hundredth and the whole of the time covered, searched on a log scale.
  let lo = Math.log(tMax / 100);
  let hi = Math.log(tMax);
  const ratio = (Math.sqrt(5) - 1) / 2;
  let x1 = hi - ratio * (hi - lo);
  let x2 = lo + ratio * (hi - lo);
  let c1 = stepFit(times, values, n, Math.exp(x1)).cost;
  let c2 = stepFit(times, values, n, Math.exp(x2)).cost;
  for (let iteration = 0; iteration < 40; iteration++) {
    if (c1 <= c2) {
      hi = x2;
      x2 = x1;
      c2 = c1;
      x1 = hi - ratio * (hi - lo);
      c1 = stepFit(times, values, n, Math.exp(x1)).cost;
    } else {
      lo = x1;
      x1 = x2;
      c1 = c2;
      x2 = lo + ratio * (hi - lo);
      c2 = stepFit(times, values, n, Math.exp(x2)).cost;
    }
  }
  const tau = Math.exp((lo + hi) / 2);
  const fit = stepFit(times, values, n, tau);
  // A minimum at either end of the range is no estimate; nor is a step lost in the noise.
  if (!(Math.abs(fit.b) >= minStepHz) || tau <= (tMax / 100) * 1.05 || tau >= tMax * 0.95) return null;
  return { tauS: tau, stepHz: fit.b, endHz: fit.c };
}

/** Least squares of values on [1, e^(−t/τ)]: the step's size b (at t = 0) and the sum of squared residuals. */
function stepFit(
  times: Float64Array,
  values: Float64Array,
  n: number,
  tauS: number,
): { b: number; c: number; cost: number } {
  let su = 0;
  let suu = 0;
  let sy = 0;
  let suy = 0;
  for (let i = 0; i < n; i++) {
    const u = Math.exp(-(times[i] as number) / tauS);
    const y = values[i] as number;
    su += u;
    suu += u * u;
    sy += y;
    suy += u * y;
  }
  const det = n * suu - su * su;
  if (!(det > 0)) return { b: 0, c: Number.NaN, cost: Number.POSITIVE_INFINITY };
  const b = (n * suy - su * sy) / det;
  const c = (sy - b * su) / n;
  let cost = 0;
  for (let i = 0; i < n; i++) {
    const r = (values[i] as number) - c - b * Math.exp(-(times[i] as number) / tauS);
    cost += r * r;
  }
  return { b, c, cost };
}
