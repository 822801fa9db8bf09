/**
 * Frequency and Kvco of one sweep at one control voltage, from the sweep's
 * own points: a weighted-free quadratic least-squares fit over the points
 * within ±halfWidthV of the voltage (at least 5), f and df/dV read at the
 * centre. Local, so the tuning curve's shape far away does not bias it; the
 * central derivative of a quadratic over symmetric points is exact to the
 * curve's third-derivative term (Taylor, common practice). Uncertainties are
 * the fit's standard errors from its residuals.
 */
import { fitPolynomial, evalPoly, evalPolyDerivative, derivativeStdDev } from './poly-fit.ts';

export interface SweepPointLite {
  v: number;
  meanHz: number;
  readings: number;
  noOscillation: number;
}

export interface LocalFigures {
  frequencyHz: number;
  frequencyUncertaintyHz: number;
  kvcoHzPerV: number;
  kvcoUncertaintyHzPerV: number;
}

export function localFigures(points: readonly SweepPointLite[], atV: number, halfWidthV = 0.3): LocalFigures | null {
  const ok = points.filter((p) => p.noOscillation === 0 && Number.isFinite(p.meanHz) && p.meanHz > 0);
  let near = ok.filter((p) => Math.abs(p.v - atV) <= halfWidthV);
  if (near.length < 5) near = [...ok].sort((a, b) => Math.abs(a.v - atV) - Math.abs(b.v - atV)).slice(0, 5);
  if (near.length < 4) return null;
  const lo = Math.min(...near.map((p) => p.v));
  const hi = Math.max(...near.map((p) => p.v));
  if (atV < lo || atV > hi) return null;
  const x = Float64Array.from(near, (p) => p.v);
  const y = Float64Array.from(near, (p) => p.meanHz);
  const fit = fitPolynomial(x, y, 0, near.length, 2);
  const fSe = fit.residualStdDev / Math.sqrt(near.length);
  return {
    frequencyHz: evalPoly(fit, atV),
    frequencyUncertaintyHz: fSe,
    kvcoHzPerV: evalPolyDerivative(fit, atV),
    kvcoUncertaintyHzPerV: derivativeStdDev(fit, atV),
  };
}

/** Control voltage where the sweep's points cross `targetHz` (linear between neighbours); null if they never do. */
export function voltageForFrequency(points: readonly SweepPointLite[], targetHz: number): number | null {
  const ok = points.filter((p) => p.noOscillation === 0 && p.meanHz > 0).sort((a, b) => a.v - b.v);
  for (let i = 1; i < ok.length; i++) {
    const a = ok[i - 1] as SweepPointLite;
    const b = ok[i] as SweepPointLite;
    if ((a.meanHz - targetHz) * (b.meanHz - targetHz) <= 0 && a.meanHz !== b.meanHz) {
      return a.v + ((targetHz - a.meanHz) * (b.v - a.v)) / (b.meanHz - a.meanHz);
    }
  }
  return null;
}
