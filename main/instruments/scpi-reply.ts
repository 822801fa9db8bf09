/**
 * Parsers for SCPI / IEEE 488.2 response data. Every function either returns
 * a value of the asked-for kind or throws ReplyFormatError: a reply that does
 * not fit the grammar never turns into a number by accident.
 *
 * Special numbers (SCPI-99 vol. 1, 7.2.1.5 / 7.2.1.6, from memory):
 * 9.91E37 is not-a-number, +9.9E37 / -9.9E37 are plus / minus infinity.
 */
import { ReplyFormatError, type ScpiErrorEntry } from './errors.ts';
import type { InstrumentIdentity } from './roles.ts';

export type ScpiNumeric =
  { kind: 'finite'; value: number } | { kind: 'not-a-number' } | { kind: 'infinity'; sign: 1 | -1 };

export const SCPI_NAN = 9.91e37;
export const SCPI_INFINITY = 9.9e37;

// NR1 (integer), NR2 (fixed point), NR3 (exponent) with optional sign;
// compiled once. Leading/trailing blanks are tolerated (some instruments pad).
const NUMBER_RE = /^[ \t]*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?[ \t]*$/;
const ERROR_ENTRY_RE = /^[ \t]*([+-]?\d+)[ \t]*,[ \t]*"((?:[^"]|"")*)"[ \t]*$/;

/** Parses one numeric reply into a tagged value; NaN and infinities are tags, not numbers. */
export function parseNumeric(reply: string): ScpiNumeric {
  if (!NUMBER_RE.test(reply)) throw new ReplyFormatError('a number (NR1, NR2 or NR3)', reply);
  const value = Number(reply);
  if (value === SCPI_NAN) return { kind: 'not-a-number' };
  if (value === SCPI_INFINITY) return { kind: 'infinity', sign: 1 };
  if (value === -SCPI_INFINITY) return { kind: 'infinity', sign: -1 };
  if (!Number.isFinite(value)) throw new ReplyFormatError('a number within double range', reply);
  return { kind: 'finite', value };
}

/** A finite number or ReplyFormatError (NaN / infinity replies are refused here). */
export function parseFinite(reply: string): number {
  const parsed = parseNumeric(reply);
  if (parsed.kind !== 'finite') throw new ReplyFormatError('a finite number', reply);
  return parsed.value;
}

/** An NR1 integer within the safe-integer range. */
export function parseInteger(reply: string): number {
  const value = parseFinite(reply);
  if (!Number.isSafeInteger(value)) throw new ReplyFormatError('an integer', reply);
  return value;
}

/** Boolean response data: 0 / 1, and ON / OFF which some instruments send. */
export function parseBoolean(reply: string): boolean {
  const text = reply.trim().toUpperCase();
  if (text === '1' || text === '+1' || text === 'ON') return true;
  if (text === '0' || text === '+0' || text === 'OFF') return false;
  throw new ReplyFormatError('a boolean (0, 1, ON, OFF)', reply);
}

/** A quoted string ("..." with "" inside, or '...' with ''), unquoted. */
export function parseQuotedString(reply: string): string {
  const text = reply.trim();
  const quote = text[0];
  if ((quote !== '"' && quote !== "'") || text.length < 2 || text[text.length - 1] !== quote) {
    throw new ReplyFormatError('a quoted string', reply);
  }
  const body = text.slice(1, -1);
  let out = '';
  for (let i = 0; i < body.length; i += 1) {
    const ch = body[i];
    if (ch === quote) {
      if (body[i + 1] !== quote) throw new ReplyFormatError('a quoted string with doubled inner quotes', reply);
      i += 1;
    }
    out += ch;
  }
  return out;
}

/**
 * Splits a comma-separated reply, keeping commas inside quoted strings.
 * An empty reply is an error (an empty list is not a SCPI response).
 */
export function splitList(reply: string): string[] {
  if (reply.trim() === '') throw new ReplyFormatError('a comma-separated list', reply);
  const items: string[] = [];
  let start = 0;
  let quote: string | null = null;
  for (let i = 0; i < reply.length; i += 1) {
    const ch = reply[i];
    if (quote !== null) {
      if (ch === quote) quote = null;
    } else if (ch === '"' || ch === "'") {
      quote = ch;
    } else if (ch === ',') {
      items.push(reply.slice(start, i));
      start = i + 1;
    }
  }
  if (quote !== null) throw new ReplyFormatError('a list with closed quotes', reply);
  items.push(reply.slice(start));
  return items;
}

/** A comma-separated list of numbers, each tagged like parseNumeric. */
export function parseNumericList(reply: string): ScpiNumeric[] {
  return splitList(reply).map((item) => {
    try {
      return parseNumeric(item);
    } catch {
      throw new ReplyFormatError('a comma-separated list of numbers', reply);
    }
  });
}

/**
 * An arbitrary block: `#<n><len digits><len bytes>` (definite) or `#0<bytes>`
 * (indefinite; the framer already removed the terminator). The payload is
 * returned as a view over the input bytes, untouched.
 */
export function parseBlock(reply: Uint8Array | string): Uint8Array {
  const bytes = typeof reply === 'string' ? new TextEncoder().encode(reply) : reply;
  const shown = (): string => new TextDecoder().decode(bytes.subarray(0, 40));
  if (bytes.length < 2 || bytes[0] !== 0x23 /* # */) throw new ReplyFormatError('an arbitrary block (#...)', shown());
  const digitCount = (bytes[1] ?? 0) - 0x30;
  if (digitCount < 0 || digitCount > 9) throw new ReplyFormatError('a block header digit after #', shown());
  if (digitCount === 0) return bytes.subarray(2);
  if (bytes.length < 2 + digitCount) throw new ReplyFormatError('a complete block length field', shown());
  let length = 0;
  for (let i = 0; i < digitCount; i += 1) {
    const digit = (bytes[2 + i] ?? 0) - 0x30;
    if (digit < 0 || digit > 9) throw new ReplyFormatError('decimal digits in the block length', shown());
    length = length * 10 + digit;
  }
  const start = 2 + digitCount;
  if (bytes.length !== start + length) {
    throw new ReplyFormatError(`a block of exactly ${length} bytes (got ${bytes.length - start})`, shown());
  }
  return bytes.subarray(start);
}

/** One `SYST:ERR?` entry: `-113,"Undefined header"`. Code 0 means the queue is empty. */
export function parseErrorEntry(reply: string): ScpiErrorEntry {
  const match = ERROR_ENTRY_RE.exec(reply);
  if (match === null) throw new ReplyFormatError('an error entry like -113,"Undefined header"', reply);
  return { code: Number(match[1]), message: (match[2] ?? '').replaceAll('""', '"') };
}

/** `*IDN?`: manufacturer, model, serial, firmware (IEEE 488.2 10.14). Extra commas join the firmware field. */
export function parseIdentity(reply: string): InstrumentIdentity {
  const idn = reply.trim();
  const fields = idn.split(',').map((field) => field.trim());
  if (fields.length < 4 || (fields[0] ?? '') === '') {
    throw new ReplyFormatError('an *IDN? reply with four comma-separated fields', reply);
  }
  return {
    idn,
    manufacturer: fields[0] ?? '',
    model: fields[1] ?? '',
    serial: fields[2] ?? '',
    firmware: fields.slice(3).join(','),
  };
}

/**
 * Formats a number for a command (decimal numeric program data). Finite only:
 * a NaN or infinite setpoint is a programming error and must not reach an instrument.
 */
export function formatScpiNumber(value: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`cannot send non-finite number ${value} to an instrument`);
  // String() gives the shortest text that round-trips; SCPI accepts the E form.
  return String(value).replace('e', 'E');
}
