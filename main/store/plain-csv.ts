/**
 * Strict reader for a plain CSV the user brings (CONTRACTS.md "Plain CSV
 * input"): header row required, columns by name in any order, extra columns
 * ignored. Sweep: control_v, frequency_hz. Drift: time_s, frequency_hz,
 * optional temperature_c. A frequency that is empty, NaN, 0 or the SCPI
 * not-a-number 9.91E37 means "no oscillation measured" — the analysis's own
 * rule (`isNoOscillation`), so an imported run reads as `analyze` reads the
 * file. Unlike samples.csv (our own file, where a bad line is a crash
 * artefact), every problem here is an error with its line number: the user
 * can fix the file.
 */
import type { RunKind } from '../../app/contract/bench-api.ts';
import { isNoOscillation } from '../../app/analysis/sweep-points.ts';
import { parseNumberCell, splitCsvLine } from './csv-cells.ts';

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

export interface PlainCsvData {
  kind: Exclude<RunKind, 'pushing'>;
  /** Output columns in order; values per column. */
  columns: string[];
  rows: (number | string)[][];
}

const MAX_PROBLEMS = 20;

export function parsePlainCsv(text: string, source: string, forceKind?: 'sweep' | 'drift'): PlainCsvData {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split('\n').map((line) => line.replace(/\r$/, ''));
  const headerIndex = lines.findIndex((line) => line.trim() !== '');
  if (headerIndex < 0) throw new CsvImportError([{ line: 1, message: 'empty file; expected a header row' }], source);
  const header = (splitCsvLine(lines[headerIndex] as string) ?? []).map((name) => name.trim().toLowerCase());
  const col = (name: string): number => header.indexOf(name);
  const hasSweep = col('control_v') >= 0 && col('frequency_hz') >= 0;
  const hasDrift = col('time_s') >= 0 && col('frequency_hz') >= 0;
  const headerLine = headerIndex + 1;
  if ((forceKind === 'sweep' && !hasSweep) || (forceKind === 'drift' && !hasDrift) || (!hasSweep && !hasDrift)) {
    const hint = (lines[headerIndex] as string).includes(';') ? ' (fields must be separated by commas)' : '';
    const want = forceKind === 'sweep' ? 'control_v and frequency_hz' : forceKind === 'drift' ? 'time_s and frequency_hz' : 'control_v and frequency_hz (sweep) or time_s and frequency_hz (drift)';
    throw new CsvImportError([{ line: headerLine, message: `header: expected columns ${want}, found ${header.join(', ') || 'none'}${hint}` }], source);
  }

  const wanted = ['time_s', 'control_v', 'frequency_hz', 'temperature_c'].filter((name) => col(name) >= 0);
  const problems: CsvProblem[] = [];
  const values: number[][] = [];
  for (let i = headerIndex + 1; i < lines.length && problems.length < MAX_PROBLEMS; i++) {
    const line = lines[i] as string;
    if (line.trim() === '') continue;
    const cells = splitCsvLine(line);
    if (cells === null) {
      problems.push({ line: i + 1, message: 'unbalanced quote' });
      continue;
    }
    if (cells.length !== header.length) {
      problems.push({ line: i + 1, message: `expected ${header.length} fields like the header, found ${cells.length}` });
      continue;
    }
    const row: number[] = [];
    for (const name of wanted) {
      const cell = cells[col(name)] as string;
      const value = parseNumberCell(cell);
      if (value === null) problems.push({ line: i + 1, column: name, message: `expected a number, got ${JSON.stringify(cell)}` });
      else if (Number.isNaN(value) && (name === 'control_v' || name === 'time_s')) problems.push({ line: i + 1, column: name, message: 'must not be empty' });
      row.push(value ?? Number.NaN);
    }
    values.push(row);
  }
  if (problems.length > 0) throw new CsvImportError(problems, source);
  if (values.length === 0) throw new CsvImportError([{ line: headerLine + 1, message: 'no data rows after the header' }], source);

  const at = (name: string): number => wanted.indexOf(name);
  let kind: 'sweep' | 'drift' = forceKind ?? (hasSweep ? 'sweep' : 'drift');
  if (!forceKind && hasSweep && hasDrift) {
    // A drift log also carries control_v, but holds it fixed.
    const first = values[0]?.[at('control_v')];
    if (values.every((row) => row[at('control_v')] === first)) kind = 'drift';
  }
  const columns = [...wanted, 'status'];
  const fIndex = at('frequency_hz');
  const rows = values.map((row) => {
    const silent = isNoOscillation(row[fIndex] as number);
    const out: (number | string)[] = row.map((value, c) => (c === fIndex && silent ? Number.NaN : value));
    out.push(silent ? 'no-signal' : 'ok');
    return out;
  });
  return { kind, columns, rows };
}
