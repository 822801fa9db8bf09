/**
 * The rows of RowColumns (a sweep's `points` and `kvco.local`,
 * app/analysis/sweep-columns.ts) as the text JSON.stringify(rows, null, 2)
 * gives them at some depth, written straight into bytes: a million rows of a
 * distinct-voltage sweep are some 400 MB of text, and JSON.stringify spent
 * most of its time turning their numbers into strings (issue 15 item 9).
 * Numbers go through putJsonNumber (json-number.ts); a row's value equal to
 * the number just before it in the same row (a local Kvco that is its finite
 * difference) is copied rather than written again.
 */
import type { RowColumns, RowField } from '../../app/analysis/sweep-columns.ts';
import { MAX_NUMBER_BYTES, putJsonNumber } from './json-number.ts';

/** Bytes gathered before they are handed on as text. */
const FLUSH_BYTES = 1 << 16;
/** Room kept free past FLUSH_BYTES for the next piece. */
const SLACK = 1024;

const isAscii = (text: string): boolean => /^[\x00-\x7f]*$/.test(text);

/** A fixed piece of text as its bytes, or null when it is not ASCII (it then goes on as text). */
interface Piece {
  text: string;
  bytes: Uint8Array | null;
}
function piece(text: string): Piece {
  if (!isAscii(text)) return { text, bytes: null };
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  return { text, bytes };
}

/** ASCII bytes gathered in one buffer and handed on as text (Latin-1, one byte a character) when it fills. */
class ByteText {
  readonly bytes = new Uint8Array(FLUSH_BYTES + SLACK);
  private readonly view = Buffer.from(this.bytes.buffer, 0, this.bytes.length);
  at = 0;
  /** Start and end of the last number written, and its value (copied when the next equals it). */
  lastNumber = Number.NaN;
  lastStart = -1;
  lastEnd = -1;

  constructor(private readonly put: (text: string) => void) {}

  flush(): void {
    if (this.at > 0) this.put(this.view.toString('latin1', 0, this.at));
    this.at = 0;
    this.lastStart = -1;
  }

  piece(p: Piece): void {
    const b = p.bytes;
    if (b === null || this.at + b.length > FLUSH_BYTES + SLACK) {
      this.flush();
      this.put(p.text);
      return;
    }
    this.bytes.set(b, this.at); // a builtin copy: some 3 times a loop's speed for pieces of 20 bytes
    this.at += b.length;
  }

  number(value: number): void {
    if (this.at + MAX_NUMBER_BYTES > FLUSH_BYTES + SLACK) this.flush();
    if (value === this.lastNumber && this.lastStart >= 0) {
      this.bytes.copyWithin(this.at, this.lastStart, this.lastEnd);
      this.at += this.lastEnd - this.lastStart;
      return;
    }
    this.lastNumber = value;
    this.lastStart = this.at;
    this.at = putJsonNumber(this.bytes, this.at, value);
    this.lastEnd = this.at;
  }
}

/**
 * Writes the rows of `columns` as a JSON array at `indent` (the text after
 * the key, from "[" to "]") through `put`, in pieces of about 64 KiB, reading
 * each value from its typed column (RowColumns.fields).
 */
export function writeJsonRows(columns: RowColumns<object>, indent: string, put: (text: string) => void): void {
  if (columns.count === 0) {
    put('[]');
    return;
  }
  const sink = new ByteText(put);
  const rowIndent = `${indent}  `;
  const fields = columns.fields();
  // Per field, the text before its value after the row's first key and after a later one ([0], [1]);
  // a flag's or a choice's value is fixed text too, so it goes with its key: [first/later][value].
  const keyTexts = fields.map(({ key }) => [
    `\n${rowIndent}  ${JSON.stringify(key)}: `,
    `,\n${rowIndent}  ${JSON.stringify(key)}: `,
  ]);
  const before = keyTexts.map((texts) => texts.map(piece));
  const withValue = fields.map((field, k) => {
    const values =
      field.kind === 'flag'
        ? ['false', 'true']
        : field.kind === 'choice'
          ? field.texts.map((text) => JSON.stringify(text))
          : [];
    return (keyTexts[k] as string[]).map((keyText) => values.map((value) => piece(keyText + value)));
  });
  // A row's end goes with the next row's start (or the array's end) as one piece: [no key written / some].
  const closes = ['}', `\n${rowIndent}}`];
  const between = closes.map((close) => piece(`${close},\n${rowIndent}{`));
  const ends = closes.map((close) => piece(`${close}\n${indent}]`));
  const openFirst = piece(`[\n${rowIndent}{`);
  const nothing = piece('null');
  let later = 0; // 1 once the row has a key written
  for (let i = 0; i < columns.count; i++) {
    if (sink.at >= FLUSH_BYTES) sink.flush();
    sink.piece(i === 0 ? openFirst : (between[later] as Piece));
    later = 0;
    for (let k = 0; k < fields.length; k++) {
      const field = fields[k] as RowField;
      if (field.kind === 'number') {
        sink.piece((before[k] as Piece[])[later] as Piece);
        if (field.present !== undefined && field.present[i] !== 1) sink.piece(nothing);
        else sink.number(field.values[i] as number);
      } else if (field.kind === 'count') {
        sink.piece((before[k] as Piece[])[later] as Piece);
        sink.number(field.values[i] as number);
      } else {
        const value = field.values[i] as number;
        if (field.kind === 'flag' && value !== 1 && field.omitFalse === true) continue;
        sink.piece(((withValue[k] as Piece[][])[later] as Piece[])[value] as Piece);
      }
      later = 1;
    }
    sink.lastStart = -1; // copies are made only within one row
  }
  sink.piece(ends[later] as Piece);
  sink.flush();
}

/** An array of numbers (no holes) as JSON.stringify(values, null, 2) writes it at `indent`, through `put`. */
export function writeJsonNumbers(values: readonly number[], indent: string, put: (text: string) => void): void {
  if (values.length === 0) {
    put('[]');
    return;
  }
  const sink = new ByteText(put);
  const first = piece(`[\n${indent}  `);
  const next = piece(`,\n${indent}  `);
  for (let i = 0; i < values.length; i++) {
    if (sink.at >= FLUSH_BYTES) sink.flush();
    sink.piece(i === 0 ? first : next);
    sink.number(values[i] as number);
  }
  sink.piece(piece(`\n${indent}]`));
  sink.flush();
}
