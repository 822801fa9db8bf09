/**
 * Streamed CSV imports on one socket (binary parts, app/contract/wire.ts).
 * Each part's header is checked; its bytes go straight on to the import's
 * worker thread. Parts must arrive in order, all but the last full-sized, and
 * an import is refused the moment its bytes pass the cap, so a page can never
 * make main hold or parse a file.
 */
import { z } from 'zod';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { dutIdSchema, fileNameSchema } from '../../app/contract/bench-api-schemas.ts';
import { IMPORT_PART_BYTES, MAX_IMPORT_BYTES, MAX_IMPORT_TEXT } from '../../app/contract/wire.ts';
import { splitImportPart } from '../../app/contract/wire-upload.ts';
import type { ImportStream } from '../service/import-off-thread.ts';

/** Starts an import fed slice by slice (the service's openImport). */
export type OpenImport = (fileName: string, dutId: string) => ImportStream;

/** Most imports one socket may stream at once. */
const MAX_OPEN_UPLOADS = 2;
const MAX_PARTS = Math.ceil(MAX_IMPORT_BYTES / IMPORT_PART_BYTES);

const headerSchema = z.object({
  id: z.number().int().nonnegative().max(Number.MAX_SAFE_INTEGER),
  method: z.literal('importCsv'),
  fileName: fileNameSchema,
  dutId: dutIdSchema,
  part: z.number().int().nonnegative(),
  parts: z.number().int().min(1),
});

export type UploadStep =
  | { kind: 'more' }
  | { kind: 'done'; id: number; result: Promise<RunMeta> }
  | { kind: 'refused'; id: number; message: string; field: string };

interface Upload {
  stream: ImportStream;
  parts: number;
  next: number;
  bytes: number;
}

export class ImportUploads {
  readonly #open = new Map<number, Upload>();
  readonly #start: OpenImport | undefined;

  constructor(start: OpenImport | undefined) {
    this.#start = start;
  }

  /** Takes one binary message; never throws. */
  accept(message: Uint8Array): UploadStep {
    const split = splitImportPart(message);
    if (split === null)
      return {
        kind: 'refused',
        id: -1,
        field: 'message',
        message: 'message: a binary message must be an import part (see app/contract/wire.ts)',
      };
    const parsed = headerSchema.safeParse(split.header);
    const rawId = (split.header as { id?: unknown } | null)?.id;
    const headerId = typeof rawId === 'number' && Number.isSafeInteger(rawId) && rawId >= 0 ? rawId : -1;
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const field = issue && issue.path.length > 0 ? issue.path.map(String).join('.') : 'message';
      this.#drop(headerId);
      return { kind: 'refused', id: headerId, field, message: `importCsv: ${field}: ${issue?.message ?? 'invalid'}` };
    }
    const header = parsed.data;
    const refuse = (text: string, field = 'part'): UploadStep => {
      this.#drop(header.id);
      return { kind: 'refused', id: header.id, field, message: `importCsv: ${text}` };
    };
    if (header.parts > MAX_PARTS)
      return refuse(
        `csvText: is too large (at most ${MAX_IMPORT_TEXT}; ${header.parts} parts announced, at most ${MAX_PARTS})`,
        'csvText',
      );
    let upload = this.#open.get(header.id);
    if (!upload) {
      if (header.part !== 0) return refuse(`part ${header.part} arrived before part 0`);
      if (!this.#start) return refuse('imports are not available here', 'method');
      if (this.#open.size >= MAX_OPEN_UPLOADS)
        return refuse(`at most ${MAX_OPEN_UPLOADS} imports may stream at once on one connection`);
      upload = { stream: this.#start(header.fileName, header.dutId), parts: header.parts, next: 0, bytes: 0 };
      this.#open.set(header.id, upload);
    }
    if (header.part !== upload.next || header.parts !== upload.parts)
      return refuse(`expected part ${upload.next} of ${upload.parts}, got ${header.part} of ${header.parts}`);
    const last = header.part === header.parts - 1;
    const size = split.bytes.byteLength;
    if (size > IMPORT_PART_BYTES || (!last && size !== IMPORT_PART_BYTES))
      return refuse(`part ${header.part} holds ${size} bytes; every part but the last holds ${IMPORT_PART_BYTES}`);
    upload.bytes += size;
    if (upload.bytes > MAX_IMPORT_BYTES) return refuse(`csvText: is too large (at most ${MAX_IMPORT_TEXT})`, 'csvText');
    upload.stream.push(split.bytes);
    upload.next += 1;
    if (!last) return { kind: 'more' };
    this.#open.delete(header.id);
    return { kind: 'done', id: header.id, result: upload.stream.finish() };
  }

  #drop(id: number): void {
    this.#open.get(id)?.stream.abort();
    this.#open.delete(id);
  }

  /** Drops every unfinished upload (the socket closed). */
  clear(): void {
    for (const upload of this.#open.values()) upload.stream.abort();
    this.#open.clear();
  }
}
