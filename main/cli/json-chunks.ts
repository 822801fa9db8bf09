/**
 * JSON.stringify(value, null, 2), written in chunks instead of returned as
 * one string. `analyze --json` of a sweep of a million points is some
 * hundreds of MB of text; built whole it doubled the command's peak memory
 * (issue 15 item 9). The text is byte for byte what JSON.stringify gives:
 * plain objects and long arrays are walked here, everything else (and each
 * block of a long array's elements) goes through JSON.stringify itself,
 * re-indented. (A block's elements see their index within the block as the
 * key of a toJSON(key) call; no value tunebench writes has such a toJSON.)
 * Columns that hand out rows (RowColumns, app/analysis/sweep-columns.ts: a
 * sweep's `points` and `kvco.local`) are written as the array of their rows
 * by json-rows.ts straight from their typed columns, so a million rows make
 * no million objects; a long array of numbers the same way.
 */
import { RowColumns } from '../../app/analysis/sweep-columns.ts';
import { writeJsonNumbers, writeJsonRows } from './json-rows.ts';

/** Arrays at least this long are written a block of this many elements at a time. */
const LONG_ARRAY = 64;
/** Text is handed to `write` in pieces of about this many characters. */
const CHUNK_CHARS = 1 << 16;

function isPlainObject(value: unknown): value is Record<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) return false;
  const proto = Object.getPrototypeOf(value) as unknown;
  return (proto === Object.prototype || proto === null) && typeof (value as { toJSON?: unknown }).toJSON !== 'function';
}

/** JSON.stringify's text of `value` at `indent` (undefined where JSON.stringify leaves the value out). */
function leaf(value: unknown, indent: string): string | undefined {
  const text = JSON.stringify(value, null, 2) as string | undefined;
  if (text === undefined || indent === '' || !text.includes('\n')) return text;
  return text.replaceAll('\n', `\n${indent}`); // strings inside JSON text escape their newlines
}

/** Every element a number (a hole is not: JSON writes it null). */
function allNumbers(values: unknown[]): boolean {
  for (let i = 0; i < values.length; i++) if (typeof values[i] !== 'number') return false;
  return true;
}

export function writeJsonChunks(value: unknown, write: (text: string) => void): void {
  let buffer = '';
  const put = (text: string): void => {
    buffer += text;
    if (buffer.length >= CHUNK_CHARS) {
      write(buffer);
      buffer = '';
    }
  };

  const walked = (value: unknown): boolean =>
    (Array.isArray(value) && value.length >= LONG_ARRAY) || value instanceof RowColumns || isPlainObject(value);

  /** Writes `value` at `indent`: walked, or as JSON.stringify's text (null where it leaves a value out). */
  const emit = (value: unknown, indent: string): void => {
    const inner = `${indent}  `;
    if (value instanceof RowColumns) {
      writeJsonRows(value as RowColumns<object>, indent, put);
      return;
    }
    if (Array.isArray(value) && value.length >= LONG_ARRAY && allNumbers(value)) {
      writeJsonNumbers(value as number[], indent, put); // a sweep's `kvco.signChangeAtV`: up to a number a point
      return;
    }
    if (Array.isArray(value) && value.length >= LONG_ARRAY) {
      // A block of elements at a time through JSON.stringify: its text between "[\n" and "\n]"
      // is the elements at two spaces, re-indented to this depth.
      put('[');
      for (let at = 0; at < value.length; at += LONG_ARRAY) {
        const block = JSON.stringify(value.slice(at, at + LONG_ARRAY), null, 2);
        const body = block.slice(2, -2);
        put(`${at === 0 ? '' : ','}\n${indent}${indent === '' ? body : body.replaceAll('\n', `\n${indent}`)}`);
      }
      put(`\n${indent}]`);
      return;
    }
    if (isPlainObject(value)) {
      let first = true;
      for (const key of Object.keys(value)) {
        const item = value[key];
        const text = walked(item) ? '' : leaf(item, inner);
        if (text === undefined) continue; // JSON.stringify leaves the key out
        put(`${first ? '{' : ','}\n${inner}${JSON.stringify(key)}: ${text}`);
        first = false;
        if (text === '') emit(item, inner);
      }
      put(first ? '{}' : `\n${indent}}`);
      return;
    }
    put(leaf(value, indent) ?? 'null');
  };

  if (walked(value)) emit(value, '');
  else put(leaf(value, '') ?? ''); // undefined at the top: nothing, as JSON.stringify gives no text
  if (buffer !== '') write(buffer);
}
