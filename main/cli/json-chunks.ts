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
 * sweep's `points` and `kvco.local`) are written as the array of their rows,
 * a block at a time through a few row objects reused from block to block, so a
 * million rows make no million objects.
 */
import { RowColumns } from '../../app/analysis/sweep-columns.ts';

/** Arrays at least this long are written a block of this many elements at a time. */
const LONG_ARRAY = 64;
/** Rows of RowColumns written per JSON.stringify call. */
const ROW_BLOCK = 256;
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

  /**
   * The rows of `columns` as an array at `indent`. Each block is stringified inside
   * indent/2 single-key wrappers, so JSON.stringify itself puts its rows at this
   * depth: the text between the wrappers' opening and closing lines is the rows,
   * already indented, with no second pass over it.
   */
  const emitRows = (columns: RowColumns<object>, indent: string): void => {
    if (columns.count === 0) {
      put('[]');
      return;
    }
    const block: Record<string, unknown>[] = [];
    let wrapped: unknown = block;
    let head = '[\n';
    let tail = '\n]';
    for (let depth = indent.length / 2; depth > 0; depth--) {
      wrapped = { '': wrapped };
      head = `{\n${' '.repeat(2 * depth)}"": ${head}`;
      tail = `${tail.replace(/\n/g, '\n  ')}\n}`;
    }
    put('[');
    for (let at = 0; at < columns.count; at += ROW_BLOCK) {
      const n = Math.min(ROW_BLOCK, columns.count - at);
      while (block.length < n) block.push(columns.blank());
      block.length = n;
      for (let k = 0; k < n; k++) columns.fill(at + k, block[k] as Record<string, unknown>);
      const text = JSON.stringify(wrapped, null, 2);
      put(`${at === 0 ? '\n' : ',\n'}${text.slice(head.length, text.length - tail.length)}`);
    }
    put(`\n${indent}]`);
  };

  /** Writes `value` at `indent`: walked, or as JSON.stringify's text (null where it leaves a value out). */
  const emit = (value: unknown, indent: string): void => {
    const inner = `${indent}  `;
    if (value instanceof RowColumns) {
      emitRows(value as RowColumns<object>, indent);
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
