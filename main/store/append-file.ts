/**
 * One append-only file of the run (samples.csv or events.jsonl) with its
 * pending text. Rows are buffered as one string and written with one write
 * per flush. If a write fails (disk full, a faulty file system) the text
 * stays pending and the next flush first cuts the file back to the last
 * whole write, so a partial write can never glue onto the retried row.
 * A short write (the OS took part of the text, as on a filling disk) is
 * continued; the error that ends it is raised as a DiskError naming the file
 * and the OS error.
 */
import { DiskError } from './store-error.ts';
import { type StoreFileHandle, errorCode } from './store-fs.ts';

/** `error` as a DiskError naming `path` (kept as is when it already is one). */
export function asDiskError(path: string, error: unknown): DiskError {
  if (error instanceof DiskError) return error;
  const code = errorCode(error);
  return new DiskError(path, code, error instanceof Error ? error.message : String(error), { cause: error });
}

export class AppendFile {
  private pending = '';
  private pendingLines = 0;
  /** Bytes of the file known to be complete lines. */
  private committedBytes: number;
  private dirty = false;
  /** Of a failed write: bytes after committedBytes that end a whole line (what a write that stops here may keep). */
  private wholeAfterFailure = 0;
  private linesAfterFailure = 0;
  linesWritten = 0;

  constructor(
    private readonly handle: StoreFileHandle,
    startBytes: number,
    /** The file's path, for error messages. */
    readonly path: string,
  ) {
    this.committedBytes = startBytes;
  }

  /** `line` must end with '\n'. */
  push(line: string): void {
    this.pending += line;
    this.pendingLines += 1;
  }

  get pendingCount(): number {
    return this.pendingLines;
  }

  async drain(): Promise<void> {
    if (this.pending === '' && !this.dirty) return;
    const text = this.pending;
    const lines = this.pendingLines;
    this.pending = '';
    this.pendingLines = 0;
    // What this drain put down before a failure: its bytes and how many of them reached the file.
    let buffer: Buffer | null = null;
    let done = 0;
    try {
      if (this.dirty) {
        await this.handle.truncate(this.committedBytes);
        this.dirty = false;
      }
      if (text === '') return;
      buffer = Buffer.from(text, 'utf8');
      while (done < buffer.length) {
        const { bytesWritten } = await this.handle.write(done === 0 ? text : buffer.subarray(done));
        // No progress and no error: report it rather than spin.
        if (bytesWritten <= 0)
          throw new DiskError(this.path, undefined, `short write: ${done} of ${buffer.length} bytes, then nothing`);
        done += bytesWritten;
      }
      this.committedBytes += buffer.length;
      this.linesWritten += lines;
    } catch (error) {
      // Keep the text (ahead of anything appended meanwhile) for the next flush.
      this.pending = text + this.pending;
      this.pendingLines += lines;
      this.dirty = true;
      // The whole lines a partial write did put down, should the writer stop here (closeAtWholeLine).
      // (No buffer: the cut-back before it failed, and the earlier failure's figures still hold.)
      if (buffer !== null) {
        const whole = done > 0 ? buffer.lastIndexOf(0x0a, done - 1) + 1 : 0;
        this.wholeAfterFailure = whole;
        this.linesAfterFailure = 0;
        for (let i = 0; i < whole; i++) if (buffer[i] === 0x0a) this.linesAfterFailure += 1;
      }
      throw asDiskError(this.path, error);
    }
  }

  async sync(): Promise<void> {
    try {
      await this.handle.sync();
    } catch (error) {
      throw asDiskError(this.path, error);
    }
  }

  close(): Promise<void> {
    return this.handle.close();
  }

  /**
   * Closes a file the writer gives up on (the disk refused it): a failed write's partial last line is cut
   * off, the whole lines it wrote stay, so the file ends with a whole row, not a torn one. Truncating frees
   * blocks, so a full disk allows it.
   */
  async closeAtWholeLine(): Promise<void> {
    try {
      if (this.dirty) {
        await this.handle.truncate(this.committedBytes + this.wholeAfterFailure);
        this.committedBytes += this.wholeAfterFailure;
        this.linesWritten += this.linesAfterFailure;
        this.wholeAfterFailure = 0;
        this.linesAfterFailure = 0;
        this.dirty = false;
      }
    } finally {
      await this.handle.close();
    }
  }
}
