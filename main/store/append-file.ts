/**
 * One append-only file of the run (samples.csv or events.jsonl) with its
 * pending text. Rows are buffered as one string and written with one write
 * per flush. If a write fails (disk full, a faulty file system) the text
 * stays pending and the next flush first cuts the file back to the last
 * whole write, so a partial write can never glue onto the retried row.
 */
import { type StoreFileHandle } from './store-fs.ts';

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
      const bytes = Buffer.byteLength(text, 'utf8');
      const { bytesWritten } = await this.handle.write(text);
      if (bytesWritten !== bytes) throw new Error(`short write: ${bytesWritten} of ${bytes} bytes`);
      this.committedBytes += bytes;
      this.linesWritten += lines;
    } catch (error) {
      // Keep the text (ahead of anything appended meanwhile) for the next flush.
      this.pending = text + this.pending;
      this.pendingLines += lines;
      this.dirty = true;
      throw error;
    }
  }

  sync(): Promise<void> {
    return this.handle.sync();
  }

  close(): Promise<void> {
    return this.handle.close();
  }
}
