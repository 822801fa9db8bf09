/**
 * Frequency–temperature loop: when temperature goes one way and comes back,
 * the two branches of f(T) need not coincide (thermal lag, hysteresis).
 */
import { evalPoly, fitPolynomial } from './poly-fit.ts';

export interface FtLoop {
  /** 'up-down' when temperature rose then fell; 'down-up' for the reverse. */
  shape: 'up-down' | 'down-up';
  turnTemperatureC: number;
  /** Temperature where the branches are compared (middle of their overlap). */
  atTemperatureC: number;
  /** f(outgoing branch) − f(returning branch) there. */
  widthHz: number;
  widthPpm: number;
  outgoingHzPerC: number;
  returningHzPerC: number;
}

/**
 * Finds an up-and-back excursion in the first m samples and compares straight
 * lines fitted to each branch. Needs a return of at least half the excursion
 * and 0.5 °C overall, else null.
 */
export function frequencyTemperatureLoop(
  temp: Float64Array,
  f: Float64Array,
  m: number,
  meanHz: number,
): FtLoop | null {
  let iMax = -1;
  let iMin = -1;
  for (let i = 0; i < m; i++) {
    const c = temp[i] as number;
    if (!Number.isFinite(c)) return null; // a loop needs every sample's temperature
    if (iMax < 0 || c > (temp[iMax] as number)) iMax = i;
    if (iMin < 0 || c < (temp[iMin] as number)) iMin = i;
  }
  if (iMax < 0) return null;
  const first = temp[0] as number;
  const last = temp[m - 1] as number;
  const hi = temp[iMax] as number;
  const lo = temp[iMin] as number;
  if (hi - lo < 0.5) return null;
  const upDown = hi - Math.max(first, last) >= 0.5 * (hi - lo);
  const downUp = Math.min(first, last) - lo >= 0.5 * (hi - lo);
  if (!upDown && !downUp) return null;
  const turn = upDown ? iMax : iMin;
  if (turn < 3 || m - turn < 4) return null;
  const outgoing = fitPolynomial(temp, f, 0, turn + 1, 1);
  const returning = fitPolynomial(temp, f, turn + 1, m, 1); // the turn sample belongs to the outgoing branch
  const overlapLo = upDown ? Math.max(first, last) : Math.min(first, last);
  const at = (overlapLo + (temp[turn] as number)) / 2;
  const width = evalPoly(outgoing, at) - evalPoly(returning, at);
  return {
    shape: upDown ? 'up-down' : 'down-up',
    turnTemperatureC: temp[turn] as number,
    atTemperatureC: at,
    widthHz: width,
    widthPpm: (width / meanHz) * 1e6,
    outgoingHzPerC: outgoing.coefficients[1] as number,
    returningHzPerC: returning.coefficients[1] as number,
  };
}
