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
    try {
      if (this.dirty) {
        await this.handle.truncate(this.committedBytes);
        this.dirty = false;
      }
      if (text === '') return;
      const buffer = Buffer.from(text, 'utf8');
      let done = 0;
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
}
