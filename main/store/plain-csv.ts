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
import { EXACT, NOT_PLAIN, scan, scanNumber } from './number-scan.ts';

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
    super(
      `${source}: ${problems.map((p) => `line ${p.line}${p.column ? `, column ${p.column}` : ''}: ${p.message}`).join('; ')}`,
    );
  }
}

/** Columns read as numbers; every other column but the words below is ignored. */
export const PLAIN_NUMERIC_COLUMNS: readonly string[] = [
  'time_s',
  'control_v',
  'frequency_hz',
  'temperature_c',
  'supply_v',
];
/** Columns read as words, checked against the reading-status and direction rules. */
const WORD_COLUMNS: Readonly<Record<string, (cell: string) => string | null>> = {
  status: (cell) => readingStatus(cell),
  direction: (cell) => {
    const d = sweepDirection(cell);
    return d === null ? null : d === 1 ? 'up' : 'down';
  },
};
const WORD_EXPECTED: Readonly<Record<string, string>> = {
  status: 'ok, no-signal, timeout or error',
  direction: 'up or down',
};

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

function codeOf(levels: string[], word: string): number {
  const k = levels.indexOf(word);
  return k >= 0 ? k : levels.push(word) - 1;
}

function grown<T extends Float64Array | Uint32Array>(array: T, length: number): T {
  const next = new (array.constructor as new (n: number) => T)(length);
  next.set(array);
  return next;
}

/** The first `rows` values: the array itself when it holds exactly that many (the usual case), else a copy. */
function trimmed<T extends Float64Array | Uint32Array>(array: T, rows: number): T {
  return array.length === rows ? array : (array.slice(0, rows) as T);
}

export function readPlainCsv(text: string, source: string): PlainCsvTable {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
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

  // The header is the first line that is neither blank nor a comment.
  let headerStart = 0;
  let headerLine = 1;
  for (;;) {
    const le = body.indexOf('\n', headerStart);
    const line = body.slice(headerStart, le < 0 ? body.length : le).trim();
    if (line !== '' && !line.startsWith('#')) break;
    if (le < 0) {
      problem({ line: 1, message: 'no header row (expected column names such as control_v,frequency_hz)' });
      fail();
    }
    headerStart = le + 1;
    headerLine += 1;
  }
  const headerEnd = body.indexOf('\n', headerStart);
  const headerText = body.slice(headerStart, headerEnd < 0 ? body.length : headerEnd).replace(/\r$/, '');
  const delimiter = headerText.includes(',')
    ? ','
    : headerText.includes('\t')
      ? '\t'
      : headerText.includes(';')
        ? ';'
        : ',';
  const header = (splitCsvLine(headerText, delimiter) ?? []).map((name) => name.trim().toLowerCase());
  const seen = new Set<string>();
  header.forEach((name, c) => {
    if (name === '') problem({ line: headerLine, message: `the header has an empty column name (column ${c + 1})` });
    else if (seen.has(name)) problem({ line: headerLine, message: `the header names column "${name}" twice` });
    seen.add(name);
  });
  if (problems.length > 0) fail();

  // One row per remaining line at most: counting them first sizes the columns once (no doubling, no copy at the end).
  let capacity = body.endsWith('\n') ? 0 : 1;
  if (headerEnd >= 0)
    for (let at = body.indexOf('\n', headerEnd + 1); at >= 0; at = body.indexOf('\n', at + 1)) capacity++;
  capacity = Math.max(1, capacity);
  const readings: Reading[] = [];
  header.forEach((name, column) => {
    if (PLAIN_NUMERIC_COLUMNS.includes(name))
      readings.push({ column, name, values: new Float64Array(capacity), words: null });
    else if (name in WORD_COLUMNS)
      readings.push({ column, name, values: null, words: { levels: [], codes: new Uint32Array(capacity) } });
  });
  const readingOf: (Reading | null)[] = header.map((_, c) => readings.find((r) => r.column === c) ?? null);
  let lineOf = new Uint32Array(capacity);
  let rows = 0;
  const width = header.length;

  /** The full per-line reading (quotes, spaces, other delimiters, anything the fast path is unsure of). */
  const slowLine = (line: string, lineNo: number): boolean => {
    const cells = splitCsvLine(line, delimiter);
    if (cells === null) {
      problem({ line: lineNo, message: 'a quoted field is not closed' });
      return false;
    }
    if (cells.length !== width) {
      problem({ line: lineNo, message: `${cells.length} fields, but the header has ${width}` });
      return false;
    }
    let ok = true;
    for (const reading of readings) {
      const cell = cells[reading.column] as string;
      if (reading.values) {
        const value = parseLooseNumberCell(cell);
        if (value === null) {
          problem({ line: lineNo, column: reading.name, message: `"${cell}" is not a number` });
          ok = false;
        } else reading.values[rows] = value;
      } else if (reading.words) {
        const word = (WORD_COLUMNS[reading.name] as (cell: string) => string | null)(cell);
        if (word === null) {
          problem({
            line: lineNo,
            column: reading.name,
            message: `"${cell}" is not one of ${WORD_EXPECTED[reading.name] ?? ''}`,
          });
          ok = false;
        } else reading.words.codes[rows] = codeOf(reading.words.levels, word);
      }
    }
    return ok;
  };

  /** Fast path for comma-separated lines of plain numbers: no per-line or per-cell strings. */
  const fastLine = (ls: number, end: number): boolean => {
    if (delimiter !== ',') return false;
    let p = ls;
    for (let c = 0; c < width; c++) {
      const reading = readingOf[c];
      let fieldEnd: number;
      if (reading?.values) {
        const answer = scanNumber(body, p, end);
        if (answer === NOT_PLAIN) return false;
        fieldEnd = scan.end;
        reading.values[rows] = answer === EXACT ? scan.value : Number(body.slice(p, fieldEnd));
      } else {
        fieldEnd = p;
        while (fieldEnd < end && body.charCodeAt(fieldEnd) !== 44) {
          if (body.charCodeAt(fieldEnd) === 34) return false;
          fieldEnd++;
        }
        if (reading?.words) {
          const word = (WORD_COLUMNS[reading.name] as (cell: string) => string | null)(body.slice(p, fieldEnd));
          if (word === null) return false;
          reading.words.codes[rows] = codeOf(reading.words.levels, word);
        }
      }
      // The last field must end the line; every other one must end at a comma.
      if (c === width - 1 ? fieldEnd !== end : fieldEnd === end) return false;
      p = fieldEnd + 1;
    }
    return true;
  };

  let lineNo = headerLine;
  for (let ls = body.indexOf('\n', headerStart) + 1; ls > 0 && ls < body.length;) {
    let le = body.indexOf('\n', ls);
    if (le < 0) le = body.length;
    lineNo += 1;
    const end = le > ls && body.charCodeAt(le - 1) === 13 ? le - 1 : le;
    const next = le + 1;
    const first = body.charCodeAt(ls);
    if (end === ls || first === 35 || (first <= 32 && /^\s*(#.*)?$/.test(body.slice(ls, end)))) {
      ls = next;
      continue;
    }
    if (rows === capacity) {
      capacity *= 2;
      lineOf = grown(lineOf, capacity);
      for (const reading of readings) {
        if (reading.values) reading.values = grown(reading.values, capacity);
        if (reading.words) reading.words.codes = grown(reading.words.codes, capacity);
      }
    }
    if (fastLine(ls, end) || slowLine(body.slice(ls, end), lineNo)) {
      lineOf[rows] = lineNo;
      rows += 1;
    }
    ls = next;
  }
  if (problems.length > 0) fail();

  const numeric: Record<string, Float64Array> = {};
  const textColumns: Record<string, CodedTextColumn> = {};
  for (const reading of readings) {
    if (reading.values) numeric[reading.name] = trimmed(reading.values, rows);
    else if (reading.words)
      textColumns[reading.name] = {
        levels: reading.words.levels,
        codes: Uint8Array.from(reading.words.codes.subarray(0, rows)),
      };
  }
  return { names: header, numeric, text: textColumns, rowCount: rows, lineOf: trimmed(lineOf, rows), headerLine };
}
