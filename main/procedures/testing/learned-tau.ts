/**
 * A time-constant estimate as a sweep learns it from one step's readings,
 * here fitted to the exact first-order lag (a 3 kHz step toward 20 kHz, nine
 * readings over 220 ms), for settling tests that start with τ already known.
 */
import { TimeConstantEstimate } from '../settle.ts';

const STEP_TIMES_S = Float64Array.from([0.005, 0.015, 0.03, 0.05, 0.08, 0.12, 0.2, 0.21, 0.22]);

export function tauLearnedFromExactLag(tauS: number): TimeConstantEstimate {
  const tau = new TimeConstantEstimate();
  tau.fitStep(
    STEP_TIMES_S,
    STEP_TIMES_S.map((t) => 20_000 - 3000 * Math.exp(-t / tauS)),
    STEP_TIMES_S.length,
    1000,
  );
  return tau;
}
