/**
 * The text JSON.stringify gives a number, written as ASCII bytes, for the
 * million-row columns of `analyze --json` (issue 15 item 9). JSON writes a
 * finite number as ECMAScript's Number::toString (ECMA-262, "Number::toString",
 * and "SerializeJSONProperty": NaN and ±Infinity are null): the fewest
 * significant digits that read back as the same double, the nearest such
 * decimal when there are several, the even one of two equally near. V8 does
 * the conversion in C++ behind a string cache that a million distinct values
 * only thrash, and each result is a new string: some 300-600 ns a number on
 * this machine. The paths here are exact, need no string, and whatever they
 * cannot decide for certain goes to `String(x)`:
 *
 * - integers below 2^53 in size: their digits;
 * - at most about 15 significant digits (a voltage a CSV gave as 0.500004, a
 *   mean of 9000.2 Hz): the first count of decimals d whose nearest candidate
 *   m / 10^d divides back to x. Division is correctly rounded, so
 *   `m / 10^d === x` is exactly "the decimal reads back as x"; with m below
 *   2^50, candidates at one d lie further apart than x's rounding interval is
 *   wide, so the one that reads back is the only one, and the first d that has
 *   one has the fewest digits;
 * - 16 or 17 significant digits at 1 <= |x| < 2^50 (a fitted curve's value):
 *   the decimals of the fraction are made exactly, a piece at a time (Dekker's
 *   exact product: every remainder is the true one), and the nearest 16-digit
 *   decimal is kept when it lies strictly inside x's rounding interval (half a
 *   unit in the last place either side: x is no power of two), else the
 *   nearest 17-digit one; a case on an edge goes to `String(x)`.
 */

/** Bytes a number's text can take (24: "-1.2345678901234567e-308"), rounded up. */
export const MAX_NUMBER_BYTES = 32;

const POW10 = Array.from({ length: 23 }, (_, d) => Number(`1e${d}`));
/** Candidates below this many units of their last place are unique within x's rounding interval. */
const FAST_LIMIT = 2 ** 50;
/** Veltkamp's splitter for doubles: 2^27 + 1. */
const SPLITTER = 134217729;
/** 2^k for k = -POW2_BIAS … 0. */
const POW2_BIAS = 64;
const POW2 = Array.from({ length: POW2_BIAS + 1 }, (_, i) => 2 ** (i - POW2_BIAS));
const MINUS = 45;
const DOT = 46;
const ZERO = 48;

const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);
/** Index of the high 32-bit word of a double in `words` (1 on little-endian machines). */
const HIGH = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;

/** The low part of a·b: a·b = product + result exactly (Dekker 1971, Veltkamp's split; no overflow here). */
function productError(a: number, b: number, product: number): number {
  let c = SPLITTER * a;
  const aHigh = c - (c - a);
  const aLow = a - aHigh;
  c = SPLITTER * b;
  const bHigh = c - (c - b);
  const bLow = b - bHigh;
  return aHigh * bHigh - product + aHigh * bLow + aLow * bHigh + aLow * bLow;
}

// One step of the exact expansion (set by nextDigits): the next decimals of a fraction, and what is left.
let stepDigits = 0;
let stepRest = 0;

/**
 * The next `count` decimals (count <= 8) of r in [0, 1), whose lowest bit is
 * 2^-52 or above: then the true r·10^count less its whole part is a double,
 * and the sums below are exact.
 */
function nextDigits(r: number, count: number): void {
  const scale = POW10[count] as number;
  const product = r * scale;
  const low = productError(r, scale, product);
  let whole = Math.floor(product);
  let rest = product - whole + low;
  if (rest < 0) {
    whole -= 1;
    rest += 1;
  } else if (rest >= 1) {
    whole += 1;
    rest -= 1;
  }
  stepDigits = whole;
  stepRest = rest;
}

/** Number of decimal digits of a whole number 0 <= value < 10^22 (1 for 0). */
function digitCount(value: number): number {
  let n = 1;
  while (n < 22 && value >= (POW10[n] as number)) n++;
  return n;
}

/** Writes the whole number `value` (< 2^53) as exactly `width` digits (zeros in front) ending before `end`. */
function putDigits(out: Uint8Array, end: number, value: number, width: number): void {
  let v = value;
  let at = end;
  while (v >= 2147483648 && at > end - width) {
    const q = Math.floor(v / 10);
    out[--at] = ZERO + (v - q * 10);
    v = q;
  }
  let small = v | 0; // below 2^31 now: integer division
  while (at > end - width) {
    const q = (small / 10) | 0;
    out[--at] = ZERO + (small - q * 10);
    small = q;
  }
}

/** Writes "-"? whole "." and the decimals given as up to three pieces; returns the end. */
function putFixed(
  out: Uint8Array,
  at: number,
  negative: boolean,
  whole: number,
  piece1: number,
  width1: number,
  piece2: number,
  width2: number,
  piece3: number,
  width3: number,
): number {
  let end = at;
  if (negative) out[end++] = MINUS;
  const wholeWidth = digitCount(whole);
  end += wholeWidth;
  putDigits(out, end, whole, wholeWidth);
  if (width1 + width2 + width3 === 0) return end;
  out[end++] = DOT;
  end += width1;
  putDigits(out, end, piece1, width1);
  end += width2;
  putDigits(out, end, piece2, width2);
  end += width3;
  putDigits(out, end, piece3, width3);
  return end;
}

/** 16 or 17 significant digits of a = |x| (1 <= a < 2^50, not an integer) at `at`; -1 when undecided. */
function putLong(out: Uint8Array, at: number, negative: boolean, a: number): number {
  bits[0] = a;
  const exponent = (((words[HIGH] as number) >>> 20) & 0x7ff) - 1023;
  const halfUlp = POW2[exponent - 53 + POW2_BIAS] as number;
  const whole = Math.floor(a);
  const d16 = 16 - digitCount(whole);
  if (d16 === 0) return -1; // no 16-digit fraction to try (a >= 10^15): left to String()
  // The first 16 digits' decimals in two pieces (each product below 2^53), then the 17th.
  const width1 = d16 < 8 ? d16 : 8;
  const width2 = d16 - width1;
  nextDigits(a - whole, width1);
  const piece1 = stepDigits;
  if (width2 > 0) nextDigits(stepRest, width2);
  const piece2 = width2 > 0 ? stepDigits : 0;
  const rest = stepRest;
  const last = width2 > 0 ? piece2 : piece1;
  const half16 = halfUlp * (POW10[d16] as number); // exact: a power of two times 10^d
  // Halfway between two candidates: both read back or neither; ECMA-262 then takes the even one.
  const up = rest > 0.5 || (rest === 0.5 && last % 2 === 1);
  const distance = up ? 1 - rest : rest;
  if (distance < half16) {
    const rounded = up ? last + 1 : last;
    if (rounded % 10 === 0) return -1; // ends in 0 (or carries): a shorter form exists
    return width2 > 0
      ? putFixed(out, at, negative, whole, piece1, width1, rounded, width2, 0, 0)
      : putFixed(out, at, negative, whole, rounded, width1, 0, 0, 0, 0);
  }
  if (distance === half16) return -1; // on the interval's edge: the parse's tie rule decides
  nextDigits(rest, 1);
  if (stepRest === 0.5) return -1;
  const digit17 = stepDigits + (stepRest > 0.5 ? 1 : 0);
  if (digit17 === 10 || digit17 === 0) return -1; // carries or ends in 0
  return putFixed(out, at, negative, whole, piece1, width1, piece2, width2, digit17, 1);
}

/** Copies ASCII text into `out` at `at`; returns the end. */
function putAscii(out: Uint8Array, at: number, text: string): number {
  for (let i = 0; i < text.length; i++) out[at + i] = text.charCodeAt(i);
  return at + text.length;
}

/**
 * Writes what JSON.stringify writes for the number x into `out` at `at`
 * (room for MAX_NUMBER_BYTES needed); returns where the text ends.
 */
export function putJsonNumber(out: Uint8Array, at: number, x: number): number {
  if (x !== x || x === Infinity || x === -Infinity) return putAscii(out, at, 'null');
  const negative = x < 0;
  const a = negative ? -x : x;
  if (Number.isInteger(a)) {
    if (a > 9007199254740991) return putAscii(out, at, String(x));
    return putFixed(out, at, negative, a, 0, 0, 0, 0, 0, 0); // -0 is written 0, as JSON does
  }
  // Fixed notation (no exponent) holds for 1e-6 <= a < 1e21.
  if (a >= 1e-6 && a < FAST_LIMIT) {
    // At 1 or more, a decimal of at most 15 digits that reads back is also one at 15 digits exactly, so
    // when 15 digits' nearest candidate is out of reach the loop has nothing to find.
    const last = a >= 1 ? 15 - digitCount(Math.floor(a)) : 22;
    if (a >= 1 && !near(a * (POW10[last] as number))) return longOrString(out, at, negative, a, x);
    for (let d = 1; d <= last; d++) {
      const p = POW10[d] as number;
      const scaled = a * p;
      if (scaled >= FAST_LIMIT) break;
      if (!near(scaled)) continue;
      const m = Math.round(scaled);
      if (m / p !== a) continue;
      const whole = Math.floor(m / p); // exact: m < 2^50
      return putFixed(out, at, negative, whole, m - whole * p, d, 0, 0, 0, 0);
    }
    if (a >= 1) return longOrString(out, at, negative, a, x);
  }
  return putAscii(out, at, String(x));
}

function longOrString(out: Uint8Array, at: number, negative: boolean, a: number, x: number): number {
  const end = putLong(out, at, negative, a);
  return end >= 0 ? end : putAscii(out, at, String(x));
}

/**
 * Whether a·10^d (given as its double, `scaled`) is near enough to a whole
 * number m for m / 10^d to read back as a: a cheap filter before the division.
 * Such an m is within half a unit in a's last place (at most a·2^-53) times
 * 10^d of a·10^d, and the product's own rounding adds as much again: 2^-52
 * of it in all, below the 2.3e-16 allowed.
 */
function near(scaled: number): boolean {
  const off = scaled - Math.round(scaled);
  return off <= scaled * 2.3e-16 && -off <= scaled * 2.3e-16;
}

const scratch = new Uint8Array(MAX_NUMBER_BYTES);

/** The same as text (for tests and single values). */
export function jsonNumberText(x: number): string {
  const end = putJsonNumber(scratch, 0, x);
  return String.fromCharCode(...scratch.subarray(0, end));
}
