/**
 * Binary column cache beside samples.csv (`samples.columns`), so a big run
 * opens without parsing its CSV again. The CSV stays the one source of
 * truth: the cache is keyed to the CSV's size and modification time, used
 * only when both match, and rebuilt (on the next open) when they do not.
 * A cache that is torn, truncated, of another format or version, or whose
 * parts do not add up is ignored, never half-read.
 *
 * Layout (little-endian):
 *   8 bytes   magic "TBCOLS1\n"
 *   4 bytes   header length H (uint32)
 *   H bytes   header JSON: key (csvSize, csvMtimeMs), rowCount, names,
 *             numeric [{name, offset}], text [{name, width, offset, levels}],
 *             dropped lines, dataBytes
 *   data      each column at its offset (a multiple of 8): Float64 values,
 *             or Uint8/16/32 codes into `levels`.
 */
import { open, readFile, rename, rm, stat } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import type { CodedTextColumn } from '../../app/contract/bench-api.ts';
import type { SampleTable } from './sample-table.ts';
import type { DroppedLine } from './samples-csv.ts';

export const COLUMN_CACHE_FILE = 'samples.columns';
const MAGIC = Buffer.from('TBCOLS1\n', 'latin1');

interface CacheHeader {
  csvSize: number;
  csvMtimeMs: number;
  rowCount: number;
  names: string[];
  numeric: { name: string; offset: number }[];
  text: { name: string; width: 1 | 2 | 4; offset: number; levels: string[] }[];
  dropped: DroppedLine[];
  /** Bytes of the data block (its columns, each padded to 8). */
  dataBytes: number;
}

export interface CsvKey {
  csvSize: number;
  csvMtimeMs: number;
}

/** The CSV's size and time, or null when it is missing. */
export async function csvKey(csvPath: string): Promise<CsvKey | null> {
  const info = await stat(csvPath).catch(() => null);
  return info === null ? null : { csvSize: info.size, csvMtimeMs: info.mtimeMs };
}

/** Whether two keys describe the same state of the CSV. */
export const sameCsvKey = (a: CsvKey, b: CsvKey): boolean => a.csvSize === b.csvSize && a.csvMtimeMs === b.csvMtimeMs;

const align8 = (n: number): number => Math.ceil(n / 8) * 8;

/** Encodes a table with its CSV key; the bytes of a whole cache file. */
export function encodeColumnCache(table: SampleTable, key: CsvKey): Buffer {
  return Buffer.concat(columnCacheParts(table, key));
}

/**
 * A cache file as consecutive parts: the magic and header, then each column as a view of the table's own
 * memory (no copy: a 10,000,000-row table is 330 MB) and its padding to 8 bytes.
 */
export function columnCacheParts(table: SampleTable, key: CsvKey): Buffer[] {
  const numericNames = Object.keys(table.numeric);
  const textNames = Object.keys(table.text);
  // Offsets are relative to the start of the data block; the block starts 8-aligned.
  let offset = 0;
  const numeric = numericNames.map((name) => {
    const entry = { name, offset };
    offset += align8((table.numeric[name] as Float64Array).byteLength);
    return entry;
  });
  const text = textNames.map((name) => {
    const column = table.text[name] as CodedTextColumn;
    const entry = { name, width: column.codes.BYTES_PER_ELEMENT as 1 | 2 | 4, offset, levels: column.levels };
    offset += align8(column.codes.byteLength);
    return entry;
  });
  const header: CacheHeader = {
    ...key,
    rowCount: table.rowCount,
    names: table.names,
    numeric,
    text,
    dropped: table.dropped,
    dataBytes: offset,
  };
  const headerJson = Buffer.from(JSON.stringify(header), 'utf8');
  const dataStart = align8(MAGIC.length + 4 + headerJson.length);
  const head = Buffer.alloc(dataStart);
  MAGIC.copy(head, 0);
  head.writeUInt32LE(headerJson.length, MAGIC.length);
  headerJson.copy(head, MAGIC.length + 4);
  const parts: Buffer[] = [head];
  const add = (view: ArrayBufferView): void => {
    parts.push(Buffer.from(view.buffer, view.byteOffset, view.byteLength));
    const pad = align8(view.byteLength) - view.byteLength;
    if (pad > 0) parts.push(Buffer.alloc(pad));
  };
  for (const { name } of numeric) add(table.numeric[name] as Float64Array);
  for (const { name } of text) add((table.text[name] as CodedTextColumn).codes);
  return parts;
}

function isHeader(value: unknown): value is CacheHeader {
  const h = value as CacheHeader;
  return (
    typeof h === 'object' &&
    h !== null &&
    Number.isFinite(h.csvSize) &&
    Number.isFinite(h.csvMtimeMs) &&
    Number.isInteger(h.rowCount) &&
    h.rowCount >= 0 &&
    Array.isArray(h.names) &&
    h.names.every((n) => typeof n === 'string') &&
    Array.isArray(h.numeric) &&
    h.numeric.every((c) => typeof c?.name === 'string' && Number.isInteger(c.offset) && c.offset % 8 === 0) &&
    Array.isArray(h.text) &&
    h.text.every(
      (c) =>
        typeof c?.name === 'string' &&
        [1, 2, 4].includes(c.width) &&
        Number.isInteger(c.offset) &&
        c.offset % 8 === 0 &&
        Array.isArray(c.levels) &&
        c.levels.every((l) => typeof l === 'string'),
    ) &&
    Array.isArray(h.dropped) &&
    Number.isInteger(h.dataBytes)
  );
}

/**
 * The table in a cache file's bytes when they are whole and belong to
 * `key`; null for anything else (another CSV state, torn, foreign).
 */
export function decodeColumnCache(bytes: Buffer, key: CsvKey): SampleTable | null {
  if (bytes.length < MAGIC.length + 4 || !bytes.subarray(0, MAGIC.length).equals(MAGIC)) return null;
  const headerLength = bytes.readUInt32LE(MAGIC.length);
  if (MAGIC.length + 4 + headerLength > bytes.length) return null;
  let header: unknown;
  try {
    header = JSON.parse(bytes.subarray(MAGIC.length + 4, MAGIC.length + 4 + headerLength).toString('utf8'));
  } catch {
    return null;
  }
  if (!isHeader(header)) return null;
  if (!sameCsvKey(header, key)) return null;
  const dataStart = align8(MAGIC.length + 4 + headerLength);
  if (dataStart + header.dataBytes !== bytes.length) return null;
  const n = header.rowCount;
  // Typed arrays need aligned memory; a large read is, a pooled small one may not be.
  const base = (bytes.byteOffset + dataStart) % 8 === 0 ? bytes : Buffer.from(bytes);
  const view = (offset: number, length: number): [ArrayBufferLike, number] | null =>
    dataStart + offset + length <= base.length ? [base.buffer, base.byteOffset + dataStart + offset] : null;
  const numeric: Record<string, Float64Array> = {};
  for (const c of header.numeric) {
    const at = view(c.offset, n * 8);
    if (at === null) return null;
    numeric[c.name] = new Float64Array(at[0], at[1], n);
  }
  const text: Record<string, CodedTextColumn> = {};
  for (const c of header.text) {
    const at = view(c.offset, n * c.width);
    if (at === null) return null;
    const codes =
      c.width === 1
        ? new Uint8Array(at[0], at[1], n)
        : c.width === 2
          ? new Uint16Array(at[0], at[1], n)
          : new Uint32Array(at[0], at[1], n);
    for (let i = 0; i < n; i++) if ((codes[i] as number) >= c.levels.length && c.levels.length > 0) return null;
    text[c.name] = { levels: c.levels, codes };
  }
  const columns = new Set([...Object.keys(numeric), ...Object.keys(text)]);
  if (header.names.length !== columns.size || !header.names.every((name) => columns.has(name))) return null;
  return { names: header.names, numeric, text, rowCount: n, dropped: header.dropped };
}

/** The cached table of `csvPath` when the cache matches the CSV as it is now, else null. */
export async function readColumnCache(csvPath: string): Promise<SampleTable | null> {
  const key = await csvKey(csvPath);
  if (key === null) return null;
  const bytes = await readFile(join(dirname(csvPath), COLUMN_CACHE_FILE)).catch(() => null);
  return bytes === null ? null : decodeColumnCache(bytes, key);
}

/**
 * Writes the cache for the table parsed from the CSV in the state `key`
 * (taken before it was read). Atomic (temporary file, then rename), so a
 * reader sees the old cache, the new one or none. Skipped when the CSV has
 * changed since: the cache would describe another file.
 */
export async function writeColumnCache(csvPath: string, table: SampleTable, key: CsvKey): Promise<boolean> {
  const now = await csvKey(csvPath);
  if (now === null || !sameCsvKey(now, key)) return false;
  const target = join(dirname(csvPath), COLUMN_CACHE_FILE);
  const temp = `${target}.${process.pid}.tmp`;
  try {
    const handle = await open(temp, 'w');
    try {
      // Part by part from the table's own memory: no second copy of the columns.
      // (writeFile on a handle writes from its current position and continues a short write.)
      for (const part of columnCacheParts(table, key)) await handle.writeFile(part);
    } finally {
      await handle.close();
    }
    await rename(temp, target);
    return true;
  } catch {
    await rm(temp, { force: true });
    return false;
  }
}

export const isColumnCacheName = (path: string): boolean => basename(path) === COLUMN_CACHE_FILE;
