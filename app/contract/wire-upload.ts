/**
 * The binary parts of a streamed CSV import (format in ./wire.ts): the page
 * cuts them, main reads each one's small JSON header and passes the bytes on
 * without ever parsing the text.
 */
import { IMPORT_PART_BYTES } from './wire.ts';

export interface ImportPartHeader {
  id: number;
  method: 'importCsv';
  fileName: string;
  dutId: string;
  part: number;
  parts: number;
}

const HEADER_PREFIX = 4;
/** A header is a few hundred bytes at most (file name and DUT id are capped by their schemas). */
export const MAX_PART_HEADER_BYTES = 4096;

/** The binary messages that carry `text` as one import call. */
export function encodeImportParts(call: { id: number; fileName: string; dutId: string }, text: string): Uint8Array[] {
  const bytes = new TextEncoder().encode(text);
  const parts = Math.max(1, Math.ceil(bytes.byteLength / IMPORT_PART_BYTES));
  const messages: Uint8Array[] = [];
  for (let part = 0; part < parts; part += 1) {
    const slice = bytes.subarray(part * IMPORT_PART_BYTES, Math.min(bytes.byteLength, (part + 1) * IMPORT_PART_BYTES));
    const header = new TextEncoder().encode(
      JSON.stringify({
        id: call.id,
        method: 'importCsv',
        fileName: call.fileName,
        dutId: call.dutId,
        part,
        parts,
      } satisfies ImportPartHeader),
    );
    const message = new Uint8Array(HEADER_PREFIX + header.byteLength + slice.byteLength);
    new DataView(message.buffer).setUint32(0, header.byteLength, true);
    message.set(header, HEADER_PREFIX);
    message.set(slice, HEADER_PREFIX + header.byteLength);
    messages.push(message);
  }
  return messages;
}

/** Splits one binary message into its header (still `unknown`: the caller validates it) and its bytes; null when the framing is broken. */
export function splitImportPart(message: Uint8Array): { header: unknown; bytes: Uint8Array } | null {
  if (message.byteLength < HEADER_PREFIX) return null;
  const length = new DataView(message.buffer, message.byteOffset, message.byteLength).getUint32(0, true);
  if (length === 0 || length > MAX_PART_HEADER_BYTES || HEADER_PREFIX + length > message.byteLength) return null;
  try {
    const header: unknown = JSON.parse(
      new TextDecoder('utf-8', { fatal: true }).decode(message.subarray(HEADER_PREFIX, HEADER_PREFIX + length)),
    );
    return { header, bytes: message.subarray(HEADER_PREFIX + length) };
  } catch {
    return null;
  }
}
