/**
 * Zip archives of run folders (PKWARE APPNOTE.TXT 6.3: local headers,
 * central directory, end record; no zip64). The writer stores entries
 * uncompressed (method 0) with UTF-8 names; the reader takes stored entries
 * and deflated ones (method 8, through the platform's DecompressionStream)
 * so a folder zipped by the operating system opens too, and checks every
 * entry's CRC-32. Limits keep a hostile archive small: 64 MiB in all, 64
 * entries, names without `..` or a leading slash.
 */
import { crc32 } from './crc32.ts';

export interface ZipEntry {
  /** Path inside the archive, `/`-separated. */
  name: string;
  bytes: Uint8Array;
}

export class ZipError extends Error {
  override name = 'ZipError';
}

export const ZIP_LIMITS = { totalBytes: 64 * 1024 * 1024, entries: 64 };

const LOCAL = 0x04034b50;
const CENTRAL = 0x02014b50;
const END = 0x06054b50;
const UTF8_NAMES = 0x0800;

/** MS-DOS time and date of a Date (local fields, as zip tools write them). */
function dosTime(date: Date): { time: number; date: number } {
  const year = Math.min(Math.max(date.getFullYear(), 1980), 2107);
  return {
    time: (date.getHours() << 11) | (date.getMinutes() << 5) | Math.floor(date.getSeconds() / 2),
    date: ((year - 1980) << 9) | ((date.getMonth() + 1) << 5) | date.getDate(),
  };
}

export function writeZip(entries: readonly ZipEntry[], modified = new Date()): Uint8Array {
  const encoder = new TextEncoder();
  const stamp = dosTime(modified);
  const parts: Uint8Array[] = [];
  const central: Uint8Array[] = [];
  let offset = 0;
  for (const entry of entries) {
    const name = encoder.encode(entry.name);
    const crc = crc32(entry.bytes);
    const local = new DataView(new ArrayBuffer(30));
    local.setUint32(0, LOCAL, true);
    local.setUint16(4, 20, true);
    local.setUint16(6, UTF8_NAMES, true);
    local.setUint16(8, 0, true);
    local.setUint16(10, stamp.time, true);
    local.setUint16(12, stamp.date, true);
    local.setUint32(14, crc, true);
    local.setUint32(18, entry.bytes.length, true);
    local.setUint32(22, entry.bytes.length, true);
    local.setUint16(26, name.length, true);
    local.setUint16(28, 0, true);
    const head = new DataView(new ArrayBuffer(46));
    head.setUint32(0, CENTRAL, true);
    head.setUint16(4, 20, true);
    head.setUint16(6, 20, true);
    head.setUint16(8, UTF8_NAMES, true);
    head.setUint16(10, 0, true);
    head.setUint16(12, stamp.time, true);
    head.setUint16(14, stamp.date, true);
    head.setUint32(16, crc, true);
    head.setUint32(20, entry.bytes.length, true);
    head.setUint32(24, entry.bytes.length, true);
    head.setUint16(28, name.length, true);
    head.setUint32(42, offset, true);
    parts.push(new Uint8Array(local.buffer), name, entry.bytes);
    central.push(new Uint8Array(head.buffer), name);
    offset += 30 + name.length + entry.bytes.length;
  }
  const centralSize = central.reduce((n, p) => n + p.length, 0);
  const end = new DataView(new ArrayBuffer(22));
  end.setUint32(0, END, true);
  end.setUint16(8, entries.length, true);
  end.setUint16(10, entries.length, true);
  end.setUint32(12, centralSize, true);
  end.setUint32(16, offset, true);
  const all = [...parts, ...central, new Uint8Array(end.buffer)];
  const out = new Uint8Array(all.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const part of all) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}

async function inflateRaw(bytes: Uint8Array, expected: number, name: string): Promise<Uint8Array> {
  const stream = new Blob([bytes as Uint8Array<ArrayBuffer>])
    .stream()
    .pipeThrough(new DecompressionStream('deflate-raw'));
  const out = new Uint8Array(await new Response(stream).arrayBuffer());
  if (out.length !== expected)
    throw new ZipError(`${name}: inflated to ${out.length} bytes, the directory says ${expected}`);
  return out;
}

/** Every file entry of a zip (folders left out), each checked against its CRC-32. */
export async function readZip(zip: Uint8Array): Promise<ZipEntry[]> {
  if (zip.length > ZIP_LIMITS.totalBytes) throw new ZipError(`the zip is larger than ${ZIP_LIMITS.totalBytes} bytes`);
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  let endAt = -1;
  for (let i = zip.length - 22; i >= Math.max(0, zip.length - 22 - 0xffff); i--) {
    if (view.getUint32(i, true) === END) {
      endAt = i;
      break;
    }
  }
  if (endAt < 0) throw new ZipError('not a zip file (no end-of-central-directory record)');
  const count = view.getUint16(endAt + 10, true);
  if (count > ZIP_LIMITS.entries) throw new ZipError(`the zip holds ${count} entries; at most ${ZIP_LIMITS.entries}`);
  let at = view.getUint32(endAt + 16, true);
  const decoder = new TextDecoder();
  const entries: ZipEntry[] = [];
  let total = 0;
  for (let n = 0; n < count; n++) {
    if (at + 46 > zip.length || view.getUint32(at, true) !== CENTRAL)
      throw new ZipError(`central directory entry ${n + 1}: damaged`);
    const method = view.getUint16(at + 10, true);
    const flags = view.getUint16(at + 8, true);
    const crc = view.getUint32(at + 16, true);
    const size = view.getUint32(at + 20, true);
    const usize = view.getUint32(at + 24, true);
    const nameLen = view.getUint16(at + 28, true);
    const extraLen = view.getUint16(at + 30, true);
    const commentLen = view.getUint16(at + 32, true);
    const localAt = view.getUint32(at + 42, true);
    const name = decoder.decode(zip.subarray(at + 46, at + 46 + nameLen));
    at += 46 + nameLen + extraLen + commentLen;
    if (name.endsWith('/')) continue;
    if (name.startsWith('/') || name.split('/').includes('..') || name.includes('\\'))
      throw new ZipError(`${name}: a path outside the archive's folder`);
    if (flags & 1) throw new ZipError(`${name}: encrypted entries are not read`);
    total += usize;
    if (total > ZIP_LIMITS.totalBytes)
      throw new ZipError(`the zip unpacks to more than ${ZIP_LIMITS.totalBytes} bytes`);
    if (localAt + 30 > zip.length || view.getUint32(localAt, true) !== LOCAL)
      throw new ZipError(`${name}: local header damaged`);
    const dataAt = localAt + 30 + view.getUint16(localAt + 26, true) + view.getUint16(localAt + 28, true);
    const data = zip.subarray(dataAt, dataAt + size);
    if (data.length !== size) throw new ZipError(`${name}: cut short`);
    let bytes: Uint8Array;
    if (method === 0) bytes = data.slice();
    else if (method === 8) bytes = await inflateRaw(data, usize, name);
    else throw new ZipError(`${name}: compression method ${method}; stored (0) and deflate (8) are read`);
    if (crc32(bytes) !== crc) throw new ZipError(`${name}: CRC-32 does not match (damaged archive)`);
    entries.push({ name, bytes });
  }
  return entries;
}
