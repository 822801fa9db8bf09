import { describe, expect, it } from 'vitest';
import { MAX_NUMBER_BYTES, jsonNumberText, putJsonNumber } from './json-number.ts';

// The reference is the engine's own JSON.stringify: ECMA-262 "Number::toString"
// (shortest digits that read back, the nearest of those, the even one on a tie)
// under "SerializeJSONProperty" (NaN and ±Infinity as null).
const reference = (x: number): string => JSON.stringify(x);

/** A seeded generator (mulberry32), so a failure names a value that comes back. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The values of `make(i)` whose text differs from JSON.stringify's (at most 5), and how many were checked. */
function mismatches(count: number, make: (i: number) => number): { bad: string[]; checked: number } {
  const bad: string[] = [];
  for (let i = 0; i < count; i++) {
    const x = make(i);
    const got = jsonNumberText(x);
    if (got !== reference(x) && bad.length < 5) bad.push(`${reference(x)} written ${got}`);
  }
  return { bad, checked: count };
}

describe('jsonNumberText: the text JSON.stringify gives a number', () => {
  it('edge values: -0, NaN, infinities, subnormals, the fixed/exponent boundaries 1e-6/1e-7 and 1e21, 2^50…2^53', () => {
    const edges = [
      0,
      -0,
      Number.NaN,
      Infinity,
      -Infinity,
      5e-324,
      -5e-324,
      2.2250738585072014e-308,
      2.225073858507201e-308,
      Number.MAX_VALUE,
      -Number.MAX_VALUE,
      Number.EPSILON,
      1e-6,
      9.999999999999999e-7,
      1.0000000000000002e-6,
      1e-7,
      1e21,
      1e21 - 65536,
      999999999999999900000,
      1e20,
      2 ** 50,
      2 ** 50 - 0.25,
      2 ** 50 + 0.5,
      2 ** 53,
      2 ** 53 + 2,
      Number.MAX_SAFE_INTEGER,
      -Number.MAX_SAFE_INTEGER,
      2 ** 31,
      2 ** 31 - 1,
      -(2 ** 31),
      0.1,
      0.2,
      0.30000000000000004,
      1.5,
      -1.5,
      9.999999999999998,
      9.999999999999999,
      1.0000000000000002,
      0.9999999999999999,
      123456789012.34567,
      1e15 + 0.125,
      999999999999999.9,
      772332724155316.75,
      4.35,
      0.000001234,
      5e-7,
      1 / 3,
      2 / 3,
      Math.PI,
      -Math.E,
      8999.6,
      17000.4,
      0.50004,
      49999.99999990452,
      -5000.0000000131895,
    ];
    for (const x of edges) expect(jsonNumberText(x), `${x}`).toBe(reference(x));
  });

  it('400,000 doubles of every kind from random bit patterns (subnormals, huge, tiny, negative)', () => {
    const next = random(15);
    const bits = new Float64Array(1);
    const words = new Uint32Array(bits.buffer);
    expect(
      mismatches(400_000, () => {
        words[0] = next() * 2 ** 32;
        words[1] = next() * 2 ** 32;
        return bits[0] as number;
      }),
    ).toEqual({ bad: [], checked: 400_000 });
  });

  it('what a bench writes: readings to 1-12 decimals, fitted values of 16-17 digits, sums just off a decimal, ties', () => {
    const next = random(9);
    const cases: [string, (i: number) => number][] = [
      ['decimals', () => Number((next() * 10 ** Math.floor(next() * 14 - 6)).toFixed(Math.floor(next() * 13)))],
      ['17 digits near a bench frequency', () => 8000 + next() * 9000],
      ['one ulp off a short decimal', (i) => Number((next() * 1e4).toFixed(3)) * (1 + (i % 2 ? 2 : -1) * 2 ** -52)],
      ['2^k scaled', () => (next() - 0.5) * 2 ** Math.floor(next() * 120 - 60)],
      ['halves of 16-digit numbers (ties)', () => Math.floor(next() * 2 ** 50) / 4],
      ['1 … 2^50, any digits', () => 10 ** (next() * 15.05)],
      ['below 1', () => next() * 10 ** -Math.floor(next() * 8)],
      ['to 15 significant digits', () => Number((next() * 10 ** Math.floor(next() * 20 - 8)).toPrecision(15))],
    ];
    for (const [name, make] of cases) expect(mismatches(60_000, make), name).toEqual({ bad: [], checked: 60_000 });
  });

  it('putJsonNumber writes the same ASCII bytes at an offset and returns where they end', () => {
    const out = new Uint8Array(8 + MAX_NUMBER_BYTES).fill(0x7e);
    for (const x of [-1.2345678901234567e-308, -123456789.12345679, 0.000001, 42, Number.NaN]) {
      const end = putJsonNumber(out, 8, x);
      expect(String.fromCharCode(...out.subarray(8, end))).toBe(reference(x));
      expect(end - 8).toBeLessThanOrEqual(MAX_NUMBER_BYTES);
      expect(out[7]).toBe(0x7e); // nothing written before the offset
    }
  });
});
