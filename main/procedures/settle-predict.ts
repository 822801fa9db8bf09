/**
 * Settling by prediction, once the tuning port's time constant τ is learned
 * and the sweep's steps are regular: wait once, for as long as the physics
 * says, and let the point's first reading confirm it — no readings spent
 * watching. The rule (first-order lag, common practice):
 *
 * A reading integrates its gate g. Started t after a step of A Hz, its
 * mean still misses the settled value by A·e^(−t/τ)·F, with
 * F = (τ/g)·(1 − e^(−g/τ)), the mean of e^(−s/τ) over the gate (F → 1 for a
 * short gate, 0.43 for g = 2τ). So the first reading may start at
 *   t = τ·ln(F·A / (target·tol))
 * with A predicted from the previous step (on a smooth curve steps are
 * alike) times a margin, and target < 1 leaving room for the prediction to
 * be off. The reading confirms itself: the part of the step it shows done,
 * f − f_before = A·(1 − F·e^(−t/τ)), gives the real A and so its own error;
 * within tolerance, it is the point's first reading, else the watching rules
 * (settle.ts) take over from it.
 */

/** Mean of e^(−s/τ) over a gate of g seconds starting at s = 0. */
export function gateAverageFactor(tauS: number, gateS: number): number {
  const x = gateS / tauS;
  return x < 1e-9 ? 1 : -Math.expm1(-x) / x;
}

/** The predicted step is taken this much larger (a curve's steps change slowly). */
export const STEP_MARGIN = 1.15;

/** The first reading is placed where its error should be this fraction of the tolerance. */
export const TARGET_FRACTION = 0.5;

/** Seconds from the step to the start of the first reading. */
export function predictedStartS(tauS: number, gateS: number, expectedStepHz: number, toleranceHz: number): number {
  const f = gateAverageFactor(tauS, gateS);
  return Math.max(0, tauS * Math.log((f * STEP_MARGIN * expectedStepHz) / (TARGET_FRACTION * toleranceHz)));
}

/**
 * The error left in a reading's mean that started `startS` after the step,
 * from what it shows of the step (`frequencyHz − beforeHz`). Nothing is
 * taken off for noise: it may only err towards reading again.
 */
export function readingErrorHz(
  tauS: number,
  gateS: number,
  startS: number,
  frequencyHz: number,
  beforeHz: number,
): number {
  const left = gateAverageFactor(tauS, gateS) * Math.exp(-Math.max(0, startS) / tauS);
  if (!(left < 1)) return Number.POSITIVE_INFINITY;
  const stepHz = Math.abs(frequencyHz - beforeHz) / (1 - left);
  return stepHz * left;
}
