/**
 * A decimal scanner for the plain numbers the run writer writes
 * (-?digits[.digits][e[+-]digits]), exact or silent: it answers only when
 * the significand fits in 2^53 and the power of ten is at most 22, where one
 * IEEE multiplication or division of two exact doubles is correctly rounded
 * (Clinger's fast path, "How to read floating point numbers accurately",
 * PLDI 1990) — the same double Number() gives. A plain number outside that
 * (17 digits, a large exponent) is still recognised and the caller reads
 * that token with Number(); anything else (a sign it does not expect,
 * spaces, "Infinity") is left to the caller's full cell parser.
 */

/** scanNumber's answers. */
export const NOT_PLAIN = 0;
export const EXACT = 1;
export const PLAIN_INEXACT = 2;

/** Result of the last successful scanNumber (no allocation per cell). */
export const scan = { value: 0, end: 0 };

const POW10 = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20,
  1e21, 1e22,
];
/** Below this, m·10 + 9 stays under 2^53 (every integer there is exact). */
const SAFE_ACCUMULATE = 900_719_925_474_099;

/**
 * Reads the number starting at p, which must end at a comma or at `end`.
 * Empty is NaN (an empty cell). EXACT: scan.value holds it; PLAIN_INEXACT:
 * text[p, scan.end) is a plain decimal for Number(); scan.end is the comma or
 * `end`. NOT_PLAIN: the caller must decide.
 */
export function scanNumber(text: string, p: number, end: number): number {
  let i = p;
  if (i === end || text.charCodeAt(i) === 44) {
    scan.value = Number.NaN;
    scan.end = i;
    return EXACT;
  }
  let negative = false;
  if (text.charCodeAt(i) === 45) {
    negative = true;
    i += 1;
  }
  let ch = i < end ? text.charCodeAt(i) : -1;
  if (ch < 48 || ch > 57) return NOT_PLAIN;
  let m = 0;
  let scale = 0;
  let inexact = false;
  while (ch >= 48 && ch <= 57) {
    if (m >= SAFE_ACCUMULATE) inexact = true;
    else m = m * 10 + (ch - 48);
    i += 1;
    ch = i < end ? text.charCodeAt(i) : -1;
  }
  if (ch === 46) {
    i += 1;
    ch = i < end ? text.charCodeAt(i) : -1;
    while (ch >= 48 && ch <= 57) {
      if (m >= SAFE_ACCUMULATE) inexact = true;
      else {
        m = m * 10 + (ch - 48);
        scale -= 1;
      }
      i += 1;
      ch = i < end ? text.charCodeAt(i) : -1;
    }
  }
  if (ch === 101 || ch === 69) {
    i += 1;
    ch = i < end ? text.charCodeAt(i) : -1;
    let expNegative = false;
    if (ch === 43 || ch === 45) {
      expNegative = ch === 45;
      i += 1;
      ch = i < end ? text.charCodeAt(i) : -1;
    }
    if (ch < 48 || ch > 57) return NOT_PLAIN;
    let exponent = 0;
    while (ch >= 48 && ch <= 57) {
      if (exponent > 1000) inexact = true;
      else exponent = exponent * 10 + (ch - 48);
      i += 1;
      ch = i < end ? text.charCodeAt(i) : -1;
    }
    scale += expNegative ? -exponent : exponent;
  }
  if (ch !== -1 && ch !== 44) return NOT_PLAIN;
  scan.end = i;
  if (inexact) return PLAIN_INEXACT;
  let value: number;
  if (m === 0 || scale === 0) value = m;
  else if (scale > 0 && scale <= 22) value = m * (POW10[scale] as number);
  else if (scale < 0 && scale >= -22) value = m / (POW10[-scale] as number);
  else return PLAIN_INEXACT;
  scan.value = negative ? -value : value;
  return EXACT;
}
