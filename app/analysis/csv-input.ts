/**
 * Plain CSV text → named columns, with line-numbered errors (CONTRACTS.md
 * "Plain CSV input"). Header row required; columns by name (case-insensitive),
 * any order; blank lines and lines starting with '#' are skipped; quoted
 * fields ("a,b", "" for a quote) are understood.
 */

/** A malformed file: `line` is 1-based in the original text. */
export class CsvError extends Error {
  override name = 'CsvError';
  constructor(
    message: string,
    readonly line: number,
  ) {
    super(`line ${line}: ${message}`);
  }
}

export interface CsvTable {
  /** Column names, trimmed and lower-cased. */
  header: string[];
  rows: string[][];
  /** 1-based source line of each row. */
  lineOf: number[];
  /** Line of the header. */
  headerLine: number;
}

function splitFields(line: string, delimiter: string, lineNo: number): string[] {
  if (!line.includes('"')) return line.split(delimiter).map((s) => s.trim());
  const out: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i] as string;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        field += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === delimiter) {
      out.push(field.trim());
      field = '';
    } else field += ch;
  }
  if (quoted) throw new CsvError('a quoted field is not closed', lineNo);
  out.push(field.trim());
  return out;
}

export function parseCsv(text: string): CsvTable {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  let delimiter = ',';
  let header: string[] | null = null;
  let headerLine = 0;
  const rows: string[][] = [];
  const lineOf: number[] = [];
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i] as string;
    const line = raw.trim();
    if (line === '' || line.startsWith('#')) continue;
    const lineNo = i + 1;
    if (!header) {
      if (!line.includes(',')) delimiter = line.includes('\t') ? '\t' : line.includes(';') ? ';' : ',';
      header = splitFields(raw, delimiter, lineNo).map((h) => h.toLowerCase());
      headerLine = lineNo;
      const seen = new Set<string>();
      for (const h of header) {
        if (h === '') throw new CsvError('the header has an empty column name', lineNo);
        if (seen.has(h)) throw new CsvError(`the header names column "${h}" twice`, lineNo);
        seen.add(h);
      }
      continue;
    }
    const fields = splitFields(raw, delimiter, lineNo);
    if (fields.length !== header.length) {
      throw new CsvError(`${fields.length} fields, but the header has ${header.length}`, lineNo);
    }
    rows.push(fields);
    lineOf.push(lineNo);
  }
  if (!header) throw new CsvError('no header row (expected column names such as control_v,frequency_hz)', 1);
  return { header, rows, lineOf, headerLine };
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Parses one numeric field: empty and NaN → NaN; anything else not a number throws. */
export function parseNumberField(text: string, column: string, line: number): number {
  if (text === '' || /^[+-]?nan$/i.test(text)) return NaN;
  if (/^[+-]?inf(inity)?$/i.test(text)) return text.startsWith('-') ? -Infinity : Infinity;
  if (!NUMBER.test(text)) throw new CsvError(`column ${column}: "${text}" is not a number`, line);
  return Number(text);
}

/** A numeric column by name, or null when the header lacks it. */
export function numericColumn(table: CsvTable, name: string): Float64Array | null {
  const c = table.header.indexOf(name);
  if (c < 0) return null;
  const out = new Float64Array(table.rows.length);
  for (let r = 0; r < table.rows.length; r++) {
    out[r] = parseNumberField((table.rows[r] as string[])[c] as string, name, table.lineOf[r] as number);
  }
  return out;
}

/** A text column by name, or null when the header lacks it. */
export function textColumn(table: CsvTable, name: string): string[] | null {
  const c = table.header.indexOf(name);
  if (c < 0) return null;
  return table.rows.map((row) => row[c] as string);
}

/** Requires a column; the error names the header line and what was expected. */
export function requireNumeric(table: CsvTable, name: string, purpose: string): Float64Array {
  const col = numericColumn(table, name);
  if (!col) {
    throw new CsvError(`missing column "${name}" (${purpose}); header has: ${table.header.join(', ')}`, table.headerLine);
  }
  return col;
}
