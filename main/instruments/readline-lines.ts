/**
 * Line framing for the serial transport with @serialport/parser-readline
 * (issue 10 item 8): the readline parser cuts the byte stream at the
 * terminator, and this class keeps only what the parser cannot do.
 *
 * - IEEE 488.2 definite-length blocks (`#<n><len><payload>`, section 8.7.9 —
 *   from memory) may hold the terminator byte in their payload, and the
 *   parser, which knows only its delimiter, cuts them apart
 *   (line-framer-vs-readline.test.ts shows it). A line that starts with `#`
 *   is therefore handed, with its terminator, to tunebench's own
 *   LineFramer, which rejoins the block; once the framer holds nothing, lines
 *   go straight through again. The output is the framer's, line for line.
 * - A CR before an LF terminator is dropped, as LineFramer does.
 * - The parser buffers without limit; a partial line longer than
 *   `maxLineBytes` is dropped and reported, as LineFramer does.
 *
 * Lines are Buffers (the parser runs without an encoding), so a UTF-8
 * character split across reads arrives whole and blocks stay bytes.
 */
import { ReadlineParser } from '@serialport/parser-readline';
import { LineFramer, type LineFramerOptions } from './line-framer.ts';

const HASH = 0x23;
const CR = 0x0d;

export class ReadlineLines {
  private parser: ReadlineParser;
  private readonly terminator: Buffer;
  private readonly trimCr: boolean;
  private readonly blocks: boolean;
  private readonly maxLineBytes: number;
  private readonly blockFramer: LineFramer;

  /** `onLine` receives a view that is valid only during the call (copy it to keep it). */
  constructor(
    private readonly onLine: (line: Buffer) => void,
    private readonly options: LineFramerOptions = {},
  ) {
    // LineFramer checks the options and rejoins blocks with the same settings.
    this.blockFramer = new LineFramer(onLine, options);
    const terminator = options.terminator ?? '\n';
    this.terminator = Buffer.from(terminator, 'utf8');
    this.trimCr = (options.trimCarriageReturn ?? true) && terminator === '\n';
    this.blocks = options.definiteBlocks ?? true;
    this.maxLineBytes = options.maxLineBytes ?? 16 * 1024 * 1024;
    this.parser = this.newParser();
  }

  /** Bytes held while waiting for a terminator (in the parser or in a block being rejoined). */
  get pendingBytes(): number {
    return this.parser.buffer.length + this.blockFramer.pendingBytes;
  }

  /** Feeds bytes read from the port; complete lines are delivered before this returns. */
  push(chunk: Uint8Array): void {
    this.parser.write(chunk);
    const held = this.parser.buffer.length;
    if (held > this.maxLineBytes) {
      this.parser = this.newParser();
      this.options.onOverflow?.(held);
    }
  }

  /** Forgets any partial line (after a reconnect). */
  reset(): void {
    this.parser = this.newParser();
    this.blockFramer.reset();
  }

  private newParser(): ReadlineParser {
    // No encoding: lines stay bytes. With the delimiter included no line is empty: a stream drops an
    // empty chunk, so an empty reply (or a block's payload ending in the terminator) would vanish.
    // The parser calls back synchronously from write().
    const parser = new ReadlineParser({ delimiter: this.terminator, includeDelimiter: true, encoding: undefined });
    parser.on('data', (line: Buffer) => this.onParsed(line));
    return parser;
  }

  /** `line` ends with the terminator. */
  private onParsed(line: Buffer): void {
    if (this.blockFramer.pendingBytes > 0 || (this.blocks && line[0] === HASH)) {
      this.blockFramer.push(line);
      return;
    }
    let end = line.length - this.terminator.length;
    if (this.trimCr && end > 0 && line[end - 1] === CR) end -= 1;
    this.onLine(line.subarray(0, end));
  }
}
