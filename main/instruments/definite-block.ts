/**
 * Where an IEEE 488.2 definite-length block (`#<n><len><payload>`) ends, so a
 * framer can skip its payload, which may hold the terminator byte. Shared by
 * LineFramer (bytes) and ReadlineLines (lines the readline parser already cut).
 * Pure, no Node built-ins: the Web Serial transport frames with it in the page.
 */

const HASH = 0x23;
const DIGIT_0 = 0x30;

/**
 * Index just past a definite block's payload starting at `start`, `start`
 * itself when the bytes there do not open a definite block (`#0` indefinite,
 * `#H…`, text), or -1 when more bytes are needed to tell.
 */
export function definiteBlockEnd(data: Uint8Array, start: number): number {
  if (data[start] !== HASH) return start;
  if (start + 1 >= data.length) return -1;
  const digitCount = (data[start + 1] ?? 0) - DIGIT_0;
  if (digitCount < 1 || digitCount > 9) return start;
  const lengthStart = start + 2;
  if (lengthStart + digitCount > data.length) return -1;
  let length = 0;
  for (let i = lengthStart; i < lengthStart + digitCount; i += 1) {
    const digit = (data[i] ?? 0) - DIGIT_0;
    if (digit < 0 || digit > 9) return start;
    length = length * 10 + digit;
  }
  const payloadEnd = lengthStart + digitCount + length;
  return payloadEnd > data.length ? -1 : payloadEnd;
}
