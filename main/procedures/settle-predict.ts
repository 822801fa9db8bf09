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
 *
 * What is recorded is the mean of the point's n readings, and the tolerance
 * is on that mean. Reading k of n back-to-back gates starts at t + k·g and
 * misses by A·e^(−t/τ)·e^(−k·g/τ)·F; their mean misses by
 *   A·e^(−t/τ)·F·(1/n)·Σₖ e^(−k·g/τ) = A·e^(−t/τ)·(τ/(n·g))·(1 − e^(−n·g/τ)),
 * the mean of e^(−s/τ) over the n gates together (F with n·g for g). So the
 * first gate may open where THAT is within tolerance — earlier than where
 * the first reading alone would be, by τ·ln(F(g)/F(n·g)): 9 ms at τ = 50 ms,
 * g = 10 ms, n = 3; 48 ms at g = 100 ms. Link round trips between the gates
 * only make the later ones later and their error smaller: the bound holds.
 * The first reading then shows A and so the mean's error before the others
 * are read; it is checked at once, and the mean is what the tolerance is on.
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

/**
 * Seconds from the step to the start of the first of `readings` back-to-back
 * readings whose mean is held to the tolerance.
 */
export function predictedStartS(
  tauS: number,
  gateS: number,
  expectedStepHz: number,
  toleranceHz: number,
  readings = 1,
): number {
  const f = gateAverageFactor(tauS, readings * gateS);
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

/**
 * The error left in the mean of `readings` back-to-back readings, the first
 * of which started `startS` after the step and shows `frequencyHz − beforeHz`
 * of it: the step from the first reading (as readingErrorHz), then
 * A·e^(−t/τ)·F(τ, n·g). With one reading it is readingErrorHz.
 */
export function meanErrorHz(
  tauS: number,
  gateS: number,
  readings: number,
  startS: number,
  frequencyHz: number,
  beforeHz: number,
): number {
  const decay = Math.exp(-Math.max(0, startS) / tauS);
  const left = gateAverageFactor(tauS, gateS) * decay;
  if (!(left < 1)) return Number.POSITIVE_INFINITY;
  const stepHz = Math.abs(frequencyHz - beforeHz) / (1 - left);
  return stepHz * gateAverageFactor(tauS, readings * gateS) * decay;
}

/**
 * Error of the mean of readings already taken after a step, judged once τ
 * is known (the trial point of a sweep, read before τ was learned). Reading
 * i, its gate opening s_i after the step, keeps left_i = F·e^(−s_i/τ) of the
 * step A; each bounds A by |f_i − before| / (1 − left_i), and the largest is
 * taken; the mean keeps A·mean(left_i). Over a link the gate opened a little
 * before s_i (its reply's time less a gate): pass τ with a margin.
 */
export function takenMeanErrorHz(
  tauS: number,
  gateS: number,
  startsS: readonly number[],
  valuesHz: readonly number[],
  beforeHz: number,
): number {
  const f = gateAverageFactor(tauS, gateS);
  let stepHz = 0;
  let leftSum = 0;
  for (let i = 0; i < startsS.length; i++) {
    const left = f * Math.exp(-Math.max(0, startsS[i] as number) / tauS);
    if (!(left < 1)) return Number.POSITIVE_INFINITY;
    stepHz = Math.max(stepHz, Math.abs((valuesHz[i] as number) - beforeHz) / (1 - left));
    leftSum += left;
  }
  return startsS.length > 0 && Number.isFinite(stepHz) ? (stepHz * leftSum) / startsS.length : Number.POSITIVE_INFINITY;
}
