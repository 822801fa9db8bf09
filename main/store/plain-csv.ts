/**
 * The one reader for a plain CSV a person brings (CONTRACTS.md "Plain CSV
 * input"), used by `analyze`/`datasheet` and by the import into the runs
 * list. Header row required; columns by name (case and spaces ignored), any
 * order, extra columns ignored; blank lines and lines starting with `#` are
 * skipped; fields are separated by commas, or by semicolons or tabs when the
 * header has no comma; RFC 4180 quotes are understood; NaN/inf in any case.
 * Unlike samples.csv (our own file, where a bad line is a crash artefact and
 * is dropped), every problem here is an error with its line number, and all
 * of them (up to MAX_PROBLEMS) are reported at once: the user can fix the file.
 *
 * Reads straight into Float64Array columns (a million-row file must not
 * become a million string arrays).
 */
import type { CodedTextColumn } from '../../app/contract/bench-api.ts';
import type { ColumnTable } from '../../app/contract/column-table.ts';
import { readingStatus, sweepDirection } from '../../app/contract/reading-status.ts';
import { parseLooseNumberCell, splitCsvLine } from './csv-cells.ts';
import { EXACT, scan, scanNumber } from './number-scan.ts';

export interface CsvProblem {
  line: number;
  column?: string;
  message: string;
}

export class CsvImportError extends Error {
  override name = 'CsvImportError';
  constructor(
    readonly problems: CsvProblem[],
    source: string,
  ) {
    super(`${source}: ${problems.map((p) => `line ${p.line}${p.column ? `, column ${p.column}` : ''}: ${p.message}`).join('; ')}`);
  }
}

/** Columns read as numbers; every other column but the words below is ignored. */
export const PLAIN_NUMERIC_COLUMNS: readonly string[] = ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'supply_v'];
/** Columns read as words, checked against the reading-status and direction rules. */
const WORD_COLUMNS: Readonly<Record<string, (cell: string) => string | null>> = {
  status: (cell) => readingStatus(cell),
  direction: (cell) => {
    const d = sweepDirection(cell);
    return d === null ? null : d === 1 ? 'up' : 'down';
  },
};
const WORD_EXPECTED: Readonly<Record<string, string>> = { status: 'ok, no-signal, timeout or error', direction: 'up or down' };

export interface PlainCsvTable extends ColumnTable {
  lineOf: Uint32Array;
  headerLine: number;
}

export const MAX_PROBLEMS = 20;

interface Reading {
  column: number;
  name: string;
  values: Float64Array | null;
  words: { levels: string[]; codes: Uint32Array } | null;
}

export function readPlainCsv(text: string, source: string): PlainCsvTable {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split('\n');
  const problems: CsvProblem[] = [];
  const fail = (): never => {
    throw new CsvImportError(problems, source);
  };
  const problem = (p: CsvProblem): void => {
    problems.push(p);
    if (problems.length >= MAX_PROBLEMS) {
      problems.push({ line: p.line, message: `stopped after ${MAX_PROBLEMS} problems` });
      fail();
    }
  };

  let headerIndex = -1;
  for (let i = 0; i < lines.length && headerIndex < 0; i++) {
    const line = (lines[i] as string).trim();
    if (line !== '' && !line.startsWith('#')) headerIndex = i;
  }
  if (headerIndex < 0) {
    problem({ line: 1, message: 'no header row (expected column names such as control_v,frequency_hz)' });
    fail();
  }
  const headerLine = headerIndex + 1;
  const headerText = (lines[headerIndex] as string).replace(/\r$/, '');
  const delimiter = headerText.includes(',') ? ',' : headerText.includes('\t') ? '\t' : headerText.includes(';') ? ';' : ',';
  const header = (splitCsvLine(headerText, delimiter) ?? []).map((name) => name.trim().toLowerCase());
  const seen = new Set<string>();
  header.forEach((name, c) => {
    if (name === '') problem({ line: headerLine, message: `the header has an empty column name (column ${c + 1})` });
    else if (seen.has(name)) problem({ line: headerLine, message: `the header names column "${name}" twice` });
    seen.add(name);
  });
  if (problems.length > 0) fail();

  const guess = Math.max(16, lines.length - headerIndex);
  const readings: Reading[] = [];
  header.forEach((name, column) => {
    if (PLAIN_NUMERIC_COLUMNS.includes(name)) readings.push({ column, name, values: new Float64Array(guess), words: null });
    else if (name in WORD_COLUMNS) readings.push({ column, name, values: null, words: { levels: [], codes: new Uint32Array(guess) } });
  });
  const lineOf = new Uint32Array(guess);
  let rows = 0;
  const width = header.length;

  for (let i = headerIndex + 1; i < lines.length; i++) {
    const raw = lines[i] as string;
    const line = raw.charCodeAt(raw.length - 1) === 13 ? raw.slice(0, -1) : raw;
    const first = line.charCodeAt(0);
    if (line.length === 0 || first === 35 || (first <= 32 && (line.trim() === '' || line.trim().startsWith('#')))) continue;
    const lineNo = i + 1;
    const cells = splitCsvLine(line, delimiter);
    if (cells === null) {
      problem({ line: lineNo, message: 'a quoted field is not closed' });
      continue;
    }
    if (cells.length !== width) {
      problem({ line: lineNo, message: `${cells.length} fields, but the header has ${width}` });
      continue;
    }
    let ok = true;
    for (const reading of readings) {
      const cell = cells[reading.column] as string;
      if (reading.values) {
        // Fast path: the exact scanner; anything it is unsure of goes to the full cell parser.
        const value = scanNumber(cell, 0, cell.length) === EXACT && scan.end === cell.length ? scan.value : parseLooseNumberCell(cell);
        if (value === null) {
          problem({ line: lineNo, column: reading.name, message: `"${cell}" is not a number` });
          ok = false;
        } else reading.values[rows] = value;
      } else if (reading.words) {
        const word = (WORD_COLUMNS[reading.name] as (cell: string) => string | null)(cell);
        if (word === null) {
          problem({ line: lineNo, column: reading.name, message: `"${cell}" is not one of ${WORD_EXPECTED[reading.name] ?? ''}` });
          ok = false;
        } else {
          let code = reading.words.levels.indexOf(word);
          if (code < 0) code = reading.words.levels.push(word) - 1;
          reading.words.codes[rows] = code;
        }
      }
    }
    if (!ok) continue;
    lineOf[rows] = lineNo;
    rows += 1;
  }
  if (problems.length > 0) fail();

  const numeric: Record<string, Float64Array> = {};
  const textColumns: Record<string, CodedTextColumn> = {};
  for (const reading of readings) {
    if (reading.values) numeric[reading.name] = reading.values.slice(0, rows);
    else if (reading.words) textColumns[reading.name] = { levels: reading.words.levels, codes: Uint8Array.from(reading.words.codes.subarray(0, rows)) };
  }
  return { names: header, numeric, text: textColumns, rowCount: rows, lineOf: lineOf.slice(0, rows), headerLine };
}
