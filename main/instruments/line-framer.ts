/**
 * Splits a byte stream into lines on a terminator, for the transports that
 * hand over bytes (TCP, sim, Web Serial in the page; serial frames with
 * @serialport/parser-readline, see readline-lines.ts). The same logic as the
 * readline parser, but synchronous, free of Node streams, and aware of IEEE
 * 488.2 definite-length blocks at the start of a line, whose payload may
 * contain the terminator byte.
 *
 * Lines are split on bytes and decoded by the consumer, so a multi-byte UTF-8
 * character split across two chunks arrives whole.
 *
 * The readline parser alone cuts a definite block that holds newline bytes
 * apart; line-framer-vs-readline.test.ts shows that, and holds this framer to
 * the parser's output on every ordinary reply.
 */
import { definiteBlockEnd } from './definite-block.ts';

export interface LineFramerOptions {
  /** Line terminator; default "\n" (common practice for SCPI over sockets and serial). */
  terminator?: string;
  /** With a "\n" terminator, also drop a "\r" before it (instruments that send CR LF). Default true. */
  trimCarriageReturn?: boolean;
  /** Treat `#<n><len>` at a line start as a definite block and skip its payload. Default true. */
  definiteBlocks?: boolean;
  /** Longest line kept; a longer partial line is dropped and `onOverflow` called. Default 16 MiB. */
  maxLineBytes?: number;
  onOverflow?: (droppedBytes: number) => void;
}

const HASH = 0x23;
const CR = 0x0d;

export class LineFramer {
  private pending: Buffer | null = null;
  private readonly terminator: Buffer;
  private readonly trimCr: boolean;
  private readonly blocks: boolean;
  private readonly maxLineBytes: number;
  private readonly onOverflow: ((droppedBytes: number) => void) | undefined;

  /** `onLine` receives a view that is valid only during the call (copy it to keep it). */
  constructor(
    private readonly onLine: (line: Buffer) => void,
    options: LineFramerOptions = {},
  ) {
    const terminator = options.terminator ?? '\n';
    if (terminator.length === 0) throw new TypeError('terminator: must not be empty');
    this.terminator = Buffer.from(terminator, 'utf8');
    this.trimCr = (options.trimCarriageReturn ?? true) && terminator === '\n';
    this.blocks = options.definiteBlocks ?? true;
    this.maxLineBytes = options.maxLineBytes ?? 16 * 1024 * 1024;
    if (!(this.maxLineBytes > 0)) throw new TypeError('maxLineBytes: must be positive');
    this.onOverflow = options.onOverflow;
  }

  /** Bytes held while waiting for a terminator. */
  get pendingBytes(): number {
    return this.pending === null ? 0 : this.pending.length;
  }

  /** Forgets any partial line (after a reconnect or a resync). */
  reset(): void {
    this.pending = null;
  }

  push(chunk: Uint8Array): void {
    let data = Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    if (this.pending !== null) {
      data = Buffer.concat([this.pending, data]);
      this.pending = null;
    }
    const term = this.terminator;
    let start = 0;
    while (start < data.length) {
      let searchFrom = start;
      if (this.blocks && data[start] === HASH) {
        const blockEnd = definiteBlockEnd(data, start);
        if (blockEnd === -1) break; // block header or payload incomplete: wait for more bytes
        searchFrom = blockEnd;
      }
      const at = data.indexOf(term, searchFrom);
      if (at === -1) break;
      let end = at;
      if (this.trimCr && end > searchFrom && data[end - 1] === CR) end -= 1;
      this.onLine(data.subarray(start, end));
      start = at + term.length;
    }
    if (start < data.length) {
      const rest = data.length - start;
      if (rest > this.maxLineBytes) {
        this.onOverflow?.(rest);
        return;
      }
      // Copy: the caller may reuse its chunk buffer (serial reads are pooled).
      this.pending = Buffer.from(data.subarray(start));
    }
  }
}
