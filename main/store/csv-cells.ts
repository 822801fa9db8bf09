/**
 * One CSV cell in, one out. Numbers use the shortest text that reads back
 * as the same double (String(x), ECMA-262 Number::toString); NaN, null and
 * undefined become an empty cell. Text is quoted as RFC 4180 says (wrapped in
 * quotes when it holds a comma or quote, inner quotes doubled); line breaks
 * inside a cell become spaces, so one physical line is always one row — that
 * is what lets a reader spot a torn last line.
 */

export type CellValue = number | string | null | undefined;

export function formatCell(value: CellValue): string {
  if (typeof value === 'number') {
    if (Number.isNaN(value)) return '';
    // String(-0) is "0"; keep the sign so every double reads back the same.
    return Object.is(value, -0) ? '-0' : String(value);
  }
  if (value === null || value === undefined) return '';
  const flat = value.replace(/[\r\n]+/g, ' ');
  return /[",]/.test(flat) ? `"${flat.replace(/"/g, '""')}"` : flat;
}

/**
 * Splits one line (no line break) into cells, RFC 4180 quoting; null when a
 * quote is unbalanced. The one CSV line splitter: samples.csv (commas) and
 * users' plain CSV files (comma, semicolon or tab) both go through it.
 */
export function splitCsvLine(line: string, delimiter = ','): string[] | null {
  if (!line.includes('"')) return line.split(delimiter);
  const cells: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let cell = '';
      i += 1;
      for (;;) {
        const q = line.indexOf('"', i);
        if (q < 0) return null;
        cell += line.slice(i, q);
        if (line[q + 1] === '"') {
          cell += '"';
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      cells.push(cell);
      if (i === line.length) return cells;
      if (line[i] !== delimiter) return null;
      i += 1;
    } else {
      const comma = line.indexOf(delimiter, i);
      const end = comma < 0 ? line.length : comma;
      const cell = line.slice(i, end);
      if (cell.includes('"')) return null;
      cells.push(cell);
      if (comma < 0) return cells;
      i = comma + 1;
    }
  }
}

/** A plain decimal number, optionally signed, with an optional exponent. */
export const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** A numeric cell: empty or NaN → NaN; a decimal or ±Infinity → its value; anything else → null. */
export function parseNumberCell(cell: string): number | null {
  // Fast path for what the writer writes: plain decimals, no spaces.
  const first = cell.charCodeAt(0);
  if ((first >= 48 && first <= 57) || first === 45) {
    const value = Number(cell);
    // Number() also takes "0x1f", "1e", " 1" forms; the regex below settles the rare doubt.
    if (!Number.isNaN(value) && !/[^0-9eE.+-]/.test(cell)) return DECIMAL.test(cell) ? value : null;
  }
  const text = cell.trim();
  if (text === '' || text === 'NaN') return Number.NaN;
  if (DECIMAL.test(text)) return Number(text);
  if (text === 'Infinity' || text === '+Infinity') return Number.POSITIVE_INFINITY;
  if (text === '-Infinity') return Number.NEGATIVE_INFINITY;
  return null;
}

/**
 * A number cell of a file a person wrote: as parseNumberCell, and also
 * surrounding spaces, any case of NaN, and inf/infinity with a sign.
 */
export function parseLooseNumberCell(cell: string): number | null {
  const strict = parseNumberCell(cell);
  if (strict !== null) return strict;
  const text = cell.trim().toLowerCase();
  if (/^[+-]?nan$/.test(text)) return Number.NaN;
  if (/^[+-]?inf(inity)?$/.test(text))
    return text.startsWith('-') ? Number.NEGATIVE_INFINITY : Number.POSITIVE_INFINITY;
  return null;
}
