/**
 * The binary reply frame of the WebSocket wire (format in ./wire.ts): a
 * reply whose result holds typed arrays (a stored run's Float64Array
 * columns and coded text) travels as one binary message — a JSON header
 * with a placeholder for each array, then the arrays' bytes, little-endian,
 * each block 8-byte aligned so the page views them in place (no copy, no
 * per-cell decoding). Pure: used by main (encode) and the page (decode).
 */

export const TYPED_KEY = '$typedArray';
export type TypedKind = 'f64' | 'u8' | 'u16' | 'u32';
export type WireTypedArray = Float64Array | Uint8Array | Uint16Array | Uint32Array;

/** What stands in the JSON header for one array: its kind and where its bytes are in the data part. */
export interface TypedPlaceholder {
  [TYPED_KEY]: TypedKind;
  byteOffset: number;
  byteLength: number;
}

/**
 * An evenly spaced array sent as its rule instead of its bytes: value i is
 * exactly start + i·step (checked value by value when encoding, and computed
 * the same way when decoding, so every double comes back bit for bit). A
 * constant column (a drift log's control voltage, all-`ok` status codes,
 * an absent reading as NaN) is step 0. Numbers that JSON cannot hold
 * (-0, NaN, ±Infinity) go as strings.
 */
export interface RampPlaceholder {
  [TYPED_KEY]: TypedKind;
  byteLength: number;
  start: number | string;
  step: number | string;
}

/** Largest array a placeholder may ask the page to allocate. */
const MAX_GENERATED_BYTES = 1 << 30;

function toJsonNumber(x: number): number | string {
  return Number.isFinite(x) && !Object.is(x, -0) ? x : Object.is(x, -0) ? '-0' : String(x);
}

function fromJsonNumber(x: unknown): number | null {
  if (typeof x === 'number') return x;
  if (x === '-0') return -0;
  if (x === 'NaN') return Number.NaN;
  if (x === 'Infinity') return Number.POSITIVE_INFINITY;
  if (x === '-Infinity') return Number.NEGATIVE_INFINITY;
  return null;
}

/** Value i of a ramp; the encoder checks with this and the decoder generates with it. */
const rampValue = (start: number, step: number, i: number): number =>
  i === 0 || step === 0 ? start : start + i * step;

function isRamp(array: WireTypedArray, start: number, step: number): boolean {
  for (let i = 0; i < array.length; i += 1) {
    const value = array[i] as number;
    const expected = rampValue(start, step, i);
    if (value !== expected || (value === 0 && !Object.is(value, expected))) return false;
  }
  return true;
}

/** start and step when every value is exactly rampValue(start, step, i) (all NaN counts: NaN, 0); null otherwise. */
function rampOf(array: WireTypedArray): { start: number; step: number } | null {
  const n = array.length;
  if (n < 2) return null;
  const start = array[0] as number;
  if (Number.isNaN(start)) {
    for (let i = 1; i < n; i += 1) if (!Number.isNaN(array[i])) return null;
    return { start, step: 0 };
  }
  if (!(array instanceof Float64Array)) return isRamp(array, start, 0) ? { start, step: 0 } : null;
  // Two guesses at the step: the first difference, and the mean one (which is exact more often for decimal steps).
  for (const step of [(array[1] as number) - start, ((array[n - 1] as number) - start) / (n - 1)]) {
    if (Number.isFinite(step) && isRamp(array, start, step)) return { start, step };
  }
  return null;
}

function generated(kind: TypedKind, n: number, start: number, step: number): WireTypedArray {
  if (kind === 'f64') {
    const out = new Float64Array(n);
    if (step === 0) out.fill(start);
    else for (let i = 0; i < n; i += 1) out[i] = rampValue(start, step, i);
    return out;
  }
  const out = kind === 'u8' ? new Uint8Array(n) : kind === 'u16' ? new Uint16Array(n) : new Uint32Array(n);
  return out.fill(start);
}

const BYTES: Record<TypedKind, number> = { f64: 8, u8: 1, u16: 2, u32: 4 };
/** Bytes before the header: its length, then the whole frame's length, as little-endian uint32s. */
export const PREFIX_BYTES = 8;
const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

function kindOf(value: unknown): TypedKind | null {
  if (value instanceof Float64Array) return 'f64';
  if (value instanceof Uint8Array) return 'u8';
  if (value instanceof Uint16Array) return 'u16';
  if (value instanceof Uint32Array) return 'u32';
  return null;
}

const align8 = (n: number): number => Math.ceil(n / 8) * 8;

/**
 * The binary frame for a reply, or null when it holds no typed arrays (then
 * it goes as JSON text, as every other message does). Placeholders hold
 * offsets into the data part, which starts at the first multiple of 8 after
 * the header.
 */
export function encodeBinaryReply(reply: unknown): Uint8Array | null {
  const blocks: { array: WireTypedArray; at: number }[] = [];
  let dataBytes = 0;
  const header = JSON.stringify(reply, (_key, value: unknown) => {
    const kind = kindOf(value);
    if (kind === null) return value;
    const array = value as WireTypedArray;
    const ramp = rampOf(array);
    if (ramp !== null) {
      const rule: RampPlaceholder = {
        [TYPED_KEY]: kind,
        byteLength: array.byteLength,
        start: toJsonNumber(ramp.start),
        step: toJsonNumber(ramp.step),
      };
      return rule;
    }
    const placeholder: TypedPlaceholder = { [TYPED_KEY]: kind, byteOffset: dataBytes, byteLength: array.byteLength };
    blocks.push({ array, at: dataBytes });
    dataBytes = align8(dataBytes + array.byteLength);
    return placeholder;
  });
  if (blocks.length === 0 && !header.includes(`"${TYPED_KEY}"`)) return null;
  const encodedHeader = new TextEncoder().encode(header);
  const dataStart = align8(PREFIX_BYTES + encodedHeader.length);
  const frame = new Uint8Array(dataStart + dataBytes);
  const prefix = new DataView(frame.buffer);
  prefix.setUint32(0, encodedHeader.length, true);
  prefix.setUint32(4, frame.byteLength, true);
  frame.set(encodedHeader, PREFIX_BYTES);
  for (const { array, at } of blocks) writeLittleEndian(frame, dataStart + at, array);
  return frame;
}

function writeLittleEndian(frame: Uint8Array, at: number, array: WireTypedArray): void {
  if (LITTLE_ENDIAN || array instanceof Uint8Array) {
    frame.set(new Uint8Array(array.buffer, array.byteOffset, array.byteLength), at);
    return;
  }
  const view = new DataView(frame.buffer, at, array.byteLength);
  for (let i = 0; i < array.length; i += 1) {
    const value = array[i] as number;
    if (array instanceof Float64Array) view.setFloat64(i * 8, value, true);
    else if (array instanceof Uint16Array) view.setUint16(i * 2, value, true);
    else view.setUint32(i * 4, value, true);
  }
}

export class WireFrameError extends Error {
  override name = 'WireFrameError';
  /** The reply's call id, when the header could be read (so that call can fail rather than wait). */
  id: number | null = null;
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
  }
}

function viewOf(frame: ArrayBuffer, kind: TypedKind, byteOffset: number, byteLength: number): WireTypedArray {
  const n = byteLength / BYTES[kind];
  if (LITTLE_ENDIAN || kind === 'u8') {
    if (kind === 'f64') return new Float64Array(frame, byteOffset, n);
    if (kind === 'u16') return new Uint16Array(frame, byteOffset, n);
    if (kind === 'u32') return new Uint32Array(frame, byteOffset, n);
    return new Uint8Array(frame, byteOffset, n);
  }
  const view = new DataView(frame, byteOffset, byteLength);
  if (kind === 'f64') return Float64Array.from({ length: n }, (_, i) => view.getFloat64(i * 8, true));
  if (kind === 'u16') return Uint16Array.from({ length: n }, (_, i) => view.getUint16(i * 2, true));
  return Uint32Array.from({ length: n }, (_, i) => view.getUint32(i * 4, true));
}

/**
 * Reads a binary frame back into the reply, each placeholder replaced by a
 * typed-array view on the frame. Every offset and length is checked (inside
 * the frame, 8-byte aligned, a whole number of elements); a bad one is a
 * WireFrameError naming the field.
 */
export function decodeBinaryReply(frame: ArrayBuffer): unknown {
  if (frame.byteLength < PREFIX_BYTES) throw new WireFrameError('binary frame shorter than its header length', 'frame');
  const headerLength = new DataView(frame).getUint32(0, true);
  const total = new DataView(frame).getUint32(4, true);
  if (total !== frame.byteLength)
    throw new WireFrameError(`frame says ${total} bytes but holds ${frame.byteLength}`, 'frame');
  if (PREFIX_BYTES + headerLength > frame.byteLength)
    throw new WireFrameError(`header length ${headerLength} runs past the frame`, 'frame');
  let header: unknown;
  try {
    header = JSON.parse(new TextDecoder().decode(new Uint8Array(frame, PREFIX_BYTES, headerLength)));
  } catch {
    throw new WireFrameError('binary frame header is not JSON', 'frame');
  }
  const dataStart = align8(PREFIX_BYTES + headerLength);
  const revive = (value: unknown, path: string): unknown => {
    if (Array.isArray(value)) return value.map((item, i) => revive(item, `${path}.${i}`));
    if (value === null || typeof value !== 'object') return value;
    const record = value as Record<string, unknown>;
    if (TYPED_KEY in record) return typedFrom(frame, record, path, dataStart);
    const out: Record<string, unknown> = {};
    for (const [key, item] of Object.entries(record)) out[key] = revive(item, path === '' ? key : `${path}.${key}`);
    return out;
  };
  try {
    return revive(header, '');
  } catch (error) {
    const id = (header as { id?: unknown } | null)?.id;
    if (error instanceof WireFrameError && typeof id === 'number') error.id = id;
    throw error;
  }
}

function typedFrom(
  frame: ArrayBuffer,
  record: Record<string, unknown>,
  path: string,
  dataStart: number,
): WireTypedArray {
  const kind = record[TYPED_KEY];
  const { byteOffset, byteLength } = record;
  if (kind !== 'f64' && kind !== 'u8' && kind !== 'u16' && kind !== 'u32')
    throw new WireFrameError(`unknown array kind ${String(kind)}`, path);
  if ('start' in record) {
    const start = fromJsonNumber(record.start);
    const step = fromJsonNumber(record.step);
    if (
      typeof byteLength !== 'number' ||
      !Number.isInteger(byteLength) ||
      byteLength < 0 ||
      byteLength % BYTES[kind] !== 0 ||
      byteLength > MAX_GENERATED_BYTES
    ) {
      throw new WireFrameError(
        `byteLength must be a whole number of ${BYTES[kind]}-byte ${kind} values, got ${String(byteLength)}`,
        path,
      );
    }
    if (start === null || step === null || (kind !== 'f64' && (step !== 0 || !Number.isInteger(start) || start < 0))) {
      throw new WireFrameError(
        'start and step must be numbers (a whole, non-negative start and step 0 for codes)',
        path,
      );
    }
    return generated(kind, byteLength / BYTES[kind], start, step);
  }
  if (typeof byteOffset !== 'number' || !Number.isInteger(byteOffset) || byteOffset < 0 || byteOffset % 8 !== 0) {
    throw new WireFrameError(
      `byteOffset must be an 8-byte aligned offset into the data, got ${String(byteOffset)}`,
      path,
    );
  }
  if (
    typeof byteLength !== 'number' ||
    !Number.isInteger(byteLength) ||
    byteLength < 0 ||
    byteLength % BYTES[kind] !== 0
  ) {
    throw new WireFrameError(
      `byteLength must be a whole number of ${BYTES[kind]}-byte ${kind} values, got ${String(byteLength)}`,
      path,
    );
  }
  if (dataStart + byteOffset + byteLength > frame.byteLength)
    throw new WireFrameError('array runs past the end of the frame', path);
  return viewOf(frame, kind, dataStart + byteOffset, byteLength);
}
