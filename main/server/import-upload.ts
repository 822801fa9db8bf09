/**
 * Joins the parts of one streamed CSV import (app/contract/wire.ts) on one
 * socket. Parts must arrive in order, all but the last full-sized, and the
 * running total is refused the moment it passes the cap, so a page can never
 * make main hold more than the cap for one import.
 */
import { IMPORT_PART_CHARS, MAX_IMPORT_CHARS, MAX_IMPORT_TEXT } from '../../app/contract/wire.ts';

/** Most imports one socket may stream at once. */
const MAX_OPEN_UPLOADS = 2;

export type UploadStep =
  | { kind: 'more' }
  | { kind: 'done'; params: [unknown, string, unknown] }
  | { kind: 'refused'; message: string; field: string };

interface Upload {
  parts: number;
  next: number;
  chunks: string[];
  chars: number;
}

export class ImportUploads {
  readonly #open = new Map<number, Upload>();

  /** Takes one part of call `id`; `params` is the part's parameter array. */
  accept(id: number, part: number, parts: number, params: unknown[]): UploadStep {
    const refuse = (message: string, field = 'part'): UploadStep => {
      this.#open.delete(id);
      return { kind: 'refused', message: `importCsv: ${message}`, field };
    };
    const maxParts = Math.ceil(MAX_IMPORT_CHARS / IMPORT_PART_CHARS);
    if (parts > maxParts) return refuse(`csvText: is too large (at most ${MAX_IMPORT_TEXT}; ${parts} parts announced, at most ${maxParts})`, 'csvText');
    const text = params[1];
    if (params.length !== 3 || typeof text !== 'string') return refuse('params: each part must be [fileName, text, dutId] with the text a string', 'params');
    let upload = this.#open.get(id);
    if (!upload) {
      if (part !== 0) return refuse(`part ${part} arrived before part 0`);
      if (this.#open.size >= MAX_OPEN_UPLOADS) return refuse(`at most ${MAX_OPEN_UPLOADS} imports may stream at once on one connection`);
      upload = { parts, next: 0, chunks: [], chars: 0 };
      this.#open.set(id, upload);
    }
    if (part !== upload.next || parts !== upload.parts) return refuse(`expected part ${upload.next} of ${upload.parts}, got ${part} of ${parts}`);
    const last = part === parts - 1;
    if (!last && text.length !== IMPORT_PART_CHARS) return refuse(`part ${part} holds ${text.length} characters; every part but the last holds ${IMPORT_PART_CHARS}`);
    if (text.length > IMPORT_PART_CHARS) return refuse(`part ${part} is longer than ${IMPORT_PART_CHARS} characters`);
    upload.chars += text.length;
    if (upload.chars > MAX_IMPORT_CHARS) return refuse(`csvText: is too large (at most ${MAX_IMPORT_TEXT})`, 'csvText');
    upload.chunks.push(text);
    upload.next += 1;
    if (!last) return { kind: 'more' };
    this.#open.delete(id);
    return { kind: 'done', params: [params[0], upload.chunks.join(''), params[2]] };
  }

  /** Drops every unfinished upload (the socket closed). */
  clear(): void {
    this.#open.clear();
  }
}
