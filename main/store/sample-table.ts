/**
 * The fast reader of samples.csv: one pass over the text straight into
 * Float64Array numeric columns and dictionary-coded text columns, with no
 * per-cell strings for the usual rows. It gives exactly what parseSamplesCsv
 * (the reference, ./samples-csv.ts) gives — same names, types, values, row
 * count and dropped lines with the same reasons — which a property test
 * checks on random whole and corrupted files. A line the scanner is not sure
 * of (quotes, spaces, "+1", "Infinity", a bad cell, a wrong field count) is
 * handed to the reference's own per-line code, so the fast path only ever
 * accepts lines that are plainly right.
 */
import type { CodedTextColumn } from '../../app/contract/bench-api.ts';
import { parseNumberCell, splitCsvLine } from './csv-cells.ts';
import { type DroppedLine, type ParseSamplesOptions, TEXT_COLUMNS, dataLine, mostlyNonNumeric } from './samples-csv.ts';
import { EXACT, NOT_PLAIN, scan as scanResult, scanNumber as scanNumberImport } from './number-scan.ts';

// Local bindings: an imported binding read in the hot loop can cost a getter call per cell once transpiled.
const scan = scanResult;
const scanNumber = scanNumberImport;

export interface SampleTable {
  names: string[];
  numeric: Record<string, Float64Array>;
  text: Record<string, CodedTextColumn>;
  rowCount: number;
  dropped: DroppedLine[];
}

/** Rows of the type sample (as parseSamplesCsv's mostlyNonNumeric looks at). */
const TYPE_SAMPLE_ROWS = 200;

interface TextBuilder {
  levels: string[];
  codes: Uint32Array;
}

/** Dictionary code of text[a, b), adding a level when new. */
function codeOf(builder: TextBuilder, text: string, a: number, b: number): number {
  const { levels } = builder;
  const length = b - a;
  for (let k = 0; k < levels.length; k += 1) {
    const level = levels[k] as string;
    if (level.length === length && text.startsWith(level, a)) return k;
  }
  levels.push(text.slice(a, b));
  return levels.length - 1;
}

function codeOfCell(builder: TextBuilder, cell: string): number {
  const k = builder.levels.indexOf(cell);
  if (k >= 0) return k;
  builder.levels.push(cell);
  return builder.levels.length - 1;
}

function packCodes(builder: TextBuilder, rows: number): CodedTextColumn {
  const used = builder.codes.subarray(0, rows);
  const count = builder.levels.length;
  const codes = count <= 256 ? Uint8Array.from(used) : count <= 65_536 ? Uint16Array.from(used) : used.slice();
  return { levels: builder.levels, codes };
}

function grown<T extends Float64Array | Uint32Array>(array: T, make: (n: number) => T): T {
  const next = make(array.length * 2);
  next.set(array);
  return next;
}

export function readSampleTable(text: string, options: ParseSamplesOptions = {}): SampleTable {
  const start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const lastNl = text.lastIndexOf('\n');
  const hasLines = lastNl >= start;
  const firstNl = hasLines ? text.indexOf('\n', start) : text.length;
  const header = text.slice(start, firstNl).replace(/\r$/, '');
  const names = header.trim() === '' ? [] : (splitCsvLine(header) ?? []).map((n) => n.trim());
  const width = names.length;

  // Column types, decided exactly as the reference does: known text names, or mostly words in the first valid rows.
  const sampleLines: string[] = [header];
  for (let ls = firstNl + 1; hasLines && ls <= lastNl && sampleLines.length <= TYPE_SAMPLE_ROWS;) {
    const le = text.indexOf('\n', ls);
    const line = dataLine(text.slice(ls, le));
    const cells = line === null ? null : splitCsvLine(line);
    if (line !== null && cells !== null && cells.length === width) sampleLines.push(line);
    ls = le + 1;
  }
  const textNames = new Set([...TEXT_COLUMNS, ...(options.textColumns ?? [])]);
  const isText = names.map((name, c) => textNames.has(name) || mostlyNonNumeric(sampleLines, width, c));

  // A first guess at the row count from the sampled lines' mean length, so columns rarely grow or sit half empty.
  let sampledChars = 0;
  for (let k = 1; k < sampleLines.length; k += 1) sampledChars += (sampleLines[k] as string).length + 1;
  const meanLine = sampleLines.length > 1 ? sampledChars / (sampleLines.length - 1) : 8;
  const guess = Math.max(16, Math.ceil(((text.length - firstNl) / Math.max(2, meanLine)) * 1.02));
  let numericCols: Float64Array[] = names.map((_, c) => new Float64Array(isText[c] ? 0 : guess));
  const textCols: (TextBuilder | null)[] = names.map((_, c) =>
    isText[c] ? { levels: [], codes: new Uint32Array(guess) } : null,
  );
  let capacity = guess;
  const numberScratch = new Float64Array(width);
  const codeScratch = new Uint32Array(width);
  const dropped: DroppedLine[] = [];
  let rows = 0;
  let lineNumber = 1;

  /** The reference's handling of one line; true when the row was kept (scratch filled). */
  const slowLine = (line: string): boolean => {
    const cells = splitCsvLine(line);
    if (cells === null) {
      dropped.push({ lineNumber, reason: 'bad-quote', text: line });
      return false;
    }
    if (cells.length !== width) {
      dropped.push({ lineNumber, reason: 'field-count', text: line });
      return false;
    }
    for (let c = 0; c < width; c += 1) {
      if (isText[c]) continue;
      const value = parseNumberCell(cells[c] as string);
      if (value === null) {
        dropped.push({ lineNumber, reason: 'bad-number', text: line });
        return false;
      }
      numberScratch[c] = value;
    }
    for (let c = 0; c < width; c += 1) {
      const builder = textCols[c];
      if (builder) codeScratch[c] = codeOfCell(builder, cells[c] as string);
    }
    return true;
  };

  for (let ls = firstNl + 1; hasLines && ls <= lastNl;) {
    const le = text.indexOf('\n', ls);
    lineNumber += 1;
    const end = le > ls && text.charCodeAt(le - 1) === 13 ? le - 1 : le;
    const next = le + 1;
    if (end === ls || (text.charCodeAt(ls) <= 32 && text.slice(ls, end).trim() === '')) {
      ls = next;
      continue;
    }
    // Fast path: fields separated by commas, no quotes, every number plain.
    let p = ls;
    let sure = width > 0;
    for (let c = 0; c < width && sure; c += 1) {
      const builder = textCols[c];
      let fieldEnd: number;
      if (!builder) {
        const answer = scanNumber(text, p, end);
        if (answer === EXACT) {
          numberScratch[c] = scan.value;
          fieldEnd = scan.end;
        } else if (answer !== NOT_PLAIN) {
          // A plain decimal the fast path cannot round exactly: Number() reads it as parseNumberCell would.
          fieldEnd = scan.end;
          numberScratch[c] = Number(text.slice(p, fieldEnd));
        } else {
          fieldEnd = fieldEndFrom(text, p, end);
          const cell = fieldEnd < 0 ? null : parseNumberCell(text.slice(p, fieldEnd));
          if (cell === null) sure = false;
          else numberScratch[c] = cell;
        }
      } else {
        fieldEnd = fieldEndFrom(text, p, end);
        if (fieldEnd >= 0) codeScratch[c] = codeOf(builder, text, p, fieldEnd);
        else sure = false;
      }
      if (!sure) break;
      // The last field must end the line; every other one must end at a comma.
      if (c === width - 1 ? fieldEnd !== end : fieldEnd === end) sure = false;
      p = fieldEnd + 1;
    }
    if (!sure && !slowLine(text.slice(ls, end))) {
      ls = next;
      continue;
    }
    if (rows === capacity) {
      capacity *= 2;
      numericCols = numericCols.map((col, c) => (isText[c] ? col : grown(col, (n) => new Float64Array(n))));
      for (const builder of textCols) if (builder) builder.codes = grown(builder.codes, (n) => new Uint32Array(n));
    }
    for (let c = 0; c < width; c += 1) {
      const builder = textCols[c];
      if (builder) builder.codes[rows] = codeScratch[c] as number;
      else (numericCols[c] as Float64Array)[rows] = numberScratch[c] as number;
    }
    rows += 1;
    ls = next;
  }
  if (hasLines && lastNl + 1 < text.length)
    dropped.push({ lineNumber: lineNumber + 1, reason: 'no-newline', text: text.slice(lastNl + 1) });

  const numeric: Record<string, Float64Array> = {};
  const textOut: Record<string, CodedTextColumn> = {};
  names.forEach((name, c) => {
    const builder = textCols[c];
    if (builder) textOut[name] = packCodes(builder, rows);
    else {
      const col = numericCols[c] as Float64Array;
      // slice, not subarray: a view would carry the unused tail across IPC (structured clone copies the whole buffer).
      numeric[name] = col.length === rows ? col : col.slice(0, rows);
    }
  });
  return { names, numeric, text: textOut, rowCount: rows, dropped };
}

/** Index of the comma (or line end) ending the field at p; -1 when a quote shows the line needs the full splitter. */
function fieldEndFrom(text: string, p: number, end: number): number {
  for (let i = p; i < end; i += 1) {
    const ch = text.charCodeAt(i);
    if (ch === 44) return i;
    if (ch === 34) return -1;
  }
  return end;
}
