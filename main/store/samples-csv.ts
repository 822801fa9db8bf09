/**
 * Reads samples.csv into columns (SampleColumns, app/contract/bench-api.ts).
 * A crash can leave the last line torn; a faulty disk can leave a broken line
 * anywhere. Such lines are dropped and reported, never misread: a line with
 * no trailing newline, the wrong number of fields, an unbalanced quote or a
 * number that does not parse.
 */
import type { SampleColumns } from '../../app/contract/bench-api.ts';
import { parseNumberCell, splitCsvLine } from './csv-cells.ts';

/** Columns that hold words, not numbers (CONTRACTS.md run folder). */
export const TEXT_COLUMNS: ReadonlySet<string> = new Set(['status', 'direction', 'note', 'phase']);

export interface DroppedLine {
  /** 1-based line number in the file (the header is line 1). */
  lineNumber: number;
  reason: 'no-newline' | 'field-count' | 'bad-quote' | 'bad-number';
  text: string;
}

/** The reference reader's result: plain arrays (see ./sample-table.ts for the fast columnar reader). */
export interface ParsedSamples extends SampleColumns {
  numeric: Record<string, number[]>;
  text: Record<string, string[]>;
  rowCount: number;
  dropped: DroppedLine[];
}

export interface ParseSamplesOptions {
  /** Extra text column names on top of TEXT_COLUMNS. */
  textColumns?: readonly string[];
}

/** One data line (line break and CR removed), or null for a blank line. */
export function dataLine(raw: string): string | null {
  const line = raw.charCodeAt(raw.length - 1) === 13 ? raw.slice(0, -1) : raw;
  return line.length === 0 || (line.charCodeAt(0) <= 32 && line.trim() === '') ? null : line;
}

export function parseSamplesCsv(text: string, options: ParseSamplesOptions = {}): ParsedSamples {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split('\n');
  // After the final '\n' split() leaves '' — anything else there is a torn line.
  const tail = lines.pop() ?? '';
  const headerLine = (lines.length > 0 ? lines[0] : tail) ?? '';
  const header = headerLine.replace(/\r$/, '');
  const names = header.trim() === '' ? [] : (splitCsvLine(header) ?? []).map((n) => n.trim());
  const width = names.length;
  const textNames = new Set([...TEXT_COLUMNS, ...(options.textColumns ?? [])]);
  const isText = names.map((name, c) => textNames.has(name) || mostlyNonNumeric(lines, width, c));

  const numeric: Record<string, number[]> = {};
  const textColumns: Record<string, string[]> = {};
  const numericOut: number[][] = [];
  const textOut: string[][] = [];
  names.forEach((name, c) => {
    if (isText[c]) textColumns[name] = textOut[c] = [];
    else numeric[name] = numericOut[c] = [];
  });
  const dropped: DroppedLine[] = [];
  // Each number is parsed once into a scratch row; the row is kept only if all parse.
  const scratch = new Float64Array(width);
  let rowCount = 0;
  for (let i = 1; i < lines.length; i++) {
    const line = dataLine(lines[i] as string);
    if (line === null) continue;
    const cells = splitCsvLine(line);
    if (cells === null) {
      dropped.push({ lineNumber: i + 1, reason: 'bad-quote', text: line });
      continue;
    }
    if (cells.length !== width) {
      dropped.push({ lineNumber: i + 1, reason: 'field-count', text: line });
      continue;
    }
    let ok = true;
    for (let c = 0; c < width && ok; c++) {
      if (isText[c]) continue;
      const value = parseNumberCell(cells[c] as string);
      if (value === null) ok = false;
      else scratch[c] = value;
    }
    if (!ok) {
      dropped.push({ lineNumber: i + 1, reason: 'bad-number', text: line });
      continue;
    }
    for (let c = 0; c < width; c++) {
      if (isText[c]) (textOut[c] as string[]).push(cells[c] as string);
      else (numericOut[c] as number[]).push(scratch[c] as number);
    }
    rowCount += 1;
  }
  if (lines.length > 0 && tail !== '') dropped.push({ lineNumber: lines.length + 1, reason: 'no-newline', text: tail });
  return { names, numeric, text: textColumns, rowCount, dropped };
}

/** Rows looked at to decide a column's type (enough for a stable majority, cheap on long logs). */
const TYPE_SAMPLE_ROWS = 200;

/** A column not known to be text is still text when most of its filled cells (in the first rows) are not numbers. */
export function mostlyNonNumeric(lines: readonly string[], width: number, column: number): boolean {
  let filled = 0;
  let words = 0;
  let looked = 0;
  for (let i = 1; i < lines.length && looked < TYPE_SAMPLE_ROWS; i++) {
    const line = dataLine(lines[i] as string);
    const cells = line === null ? null : splitCsvLine(line);
    if (cells === null || cells.length !== width) continue;
    looked += 1;
    const cell = cells[column] as string;
    if (cell.trim() === '') continue;
    filled += 1;
    if (parseNumberCell(cell) === null) words += 1;
  }
  return filled > 0 && words * 2 > filled;
}
