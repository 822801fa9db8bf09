/**
 * The slice of node:fs/promises the run store uses, injected so tests can
 * put a faulty file system under the writer (a failing write, a crash between
 * the temp write and the rename) without touching the real disk's behaviour.
 */
import * as fsp from 'node:fs/promises';

/** An open file: the writer keeps one per appended file. */
export interface StoreFileHandle {
  /** Writes at the end (files are opened in append mode); resolves with bytes written (may be fewer: a short write). */
  write(data: string | Uint8Array): Promise<{ bytesWritten: number }>;
  sync(): Promise<void>;
  truncate(lengthBytes: number): Promise<void>;
  close(): Promise<void>;
}

export interface StoreFs {
  mkdir(path: string, options?: { recursive?: boolean }): Promise<unknown>;
  /** flags as in fs.open: 'a' append, 'w' truncate, 'r' read (used to fsync a directory). */
  open(path: string, flags: 'a' | 'w' | 'r'): Promise<StoreFileHandle>;
  readFile(path: string): Promise<string>;
  /** flag 'wx' fails with EEXIST when the file exists (used to claim a run). */
  writeFile(path: string, text: string, options?: { flag?: 'w' | 'wx' }): Promise<void>;
  appendFile(path: string, text: string): Promise<void>;
  rename(from: string, to: string): Promise<void>;
  rm(path: string, options?: { recursive?: boolean; force?: boolean }): Promise<void>;
  readdir(path: string): Promise<string[]>;
  stat(path: string): Promise<{ isDirectory(): boolean; mtimeMs: number; size: number }>;
  /**
   * Writes `bytes` over the start of an existing file, never past its end, so the file needs no block it does
   * not already hold, then fsyncs it. Not atomic: only run.json's full-disk fallback (run-meta.ts) uses it.
   * Absent where a file system cannot write in place (the page's OPFS store): that fallback is then not taken.
   */
  overwriteStart?(path: string, bytes: Uint8Array): Promise<void>;
}

/** The real file system. */
export const nodeStoreFs: StoreFs = {
  mkdir: (path, options) => fsp.mkdir(path, options),
  async open(path, flags) {
    const handle = await fsp.open(path, flags);
    return {
      write: (data) => (typeof data === 'string' ? handle.write(data, null, 'utf8') : handle.write(data)),
      sync: () => handle.sync(),
      truncate: (lengthBytes) => handle.truncate(lengthBytes),
      close: () => handle.close(),
    };
  },
  readFile: (path) => fsp.readFile(path, 'utf8'),
  writeFile: (path, text, options) => fsp.writeFile(path, text, { encoding: 'utf8', flag: options?.flag ?? 'w' }),
  appendFile: (path, text) => fsp.appendFile(path, text, 'utf8'),
  rename: (from, to) => fsp.rename(from, to),
  rm: (path, options) => fsp.rm(path, options),
  readdir: (path) => fsp.readdir(path),
  stat: (path) => fsp.stat(path),
  async overwriteStart(path, bytes) {
    const handle = await fsp.open(path, 'r+');
    try {
      const { size } = await handle.stat();
      if (bytes.length > size) throw new RangeError(`${path}: ${bytes.length} bytes do not fit in its ${size}`);
      let done = 0;
      while (done < bytes.length) {
        const { bytesWritten } = await handle.write(bytes, done, bytes.length - done, done);
        if (!(bytesWritten > 0)) throw new Error(`${path}: short write at ${done} of ${bytes.length} bytes`);
        done += bytesWritten;
      }
      await handle.sync();
    } finally {
      await handle.close();
    }
  },
};

/** Error code of a Node system error, or undefined. */
export function errorCode(error: unknown): string | undefined {
  if (typeof error === 'object' && error !== null && 'code' in error) {
    const code = error.code;
    return typeof code === 'string' ? code : undefined;
  }
  return undefined;
}

/** A file's text, or '' when it does not exist; every other error (EACCES, EIO…) is thrown, never read as empty. */
export async function readFileIfExists(fs: StoreFs, path: string): Promise<string> {
  try {
    return await fs.readFile(path);
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return '';
    throw error;
  }
}
