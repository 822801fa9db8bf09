/**
 * Atomic replacement of a JSON file: write a temp file beside it, fsync it,
 * rename over the target, then fsync the directory where the platform allows
 * it. A crash at any point leaves either the old or the new file whole —
 * never a mix (POSIX rename is atomic within a file system).
 */
import { dirname, join, basename } from 'node:path';
import { asDiskError } from './append-file.ts';
import { DiskError } from './store-error.ts';
import { type StoreFs } from './store-fs.ts';

let tempCounter = 0;

/** The text a JSON file is written as: two-space indents and a final newline. */
export function jsonFileText(value: unknown): string {
  return `${JSON.stringify(value, null, 2)}\n`;
}

export function writeJsonAtomic(fs: StoreFs, path: string, value: unknown): Promise<void> {
  return writeTextAtomic(fs, path, jsonFileText(value));
}

/** Replaces `path` with `text` atomically (temp, fsync, rename, fsync the directory). */
export async function writeTextAtomic(fs: StoreFs, path: string, text: string): Promise<void> {
  // pid + counter keeps two writers (or a reader recording `interrupted`)
  // from sharing a temp file.
  tempCounter += 1;
  const tempPath = join(dirname(path), `.${basename(path)}.${process.pid}.${tempCounter}.tmp`);
  const bytes = Buffer.from(text, 'utf8');
  try {
    const handle = await fs.open(tempPath, 'w');
    try {
      // A filling disk takes part of a write and refuses the rest: continue a short write, and never rename
      // a temp file that is not whole over the target.
      let done = 0;
      while (done < bytes.length) {
        const { bytesWritten } = await handle.write(bytes.subarray(done));
        if (!(bytesWritten > 0))
          throw new DiskError(path, undefined, `short write: ${done} of ${bytes.length} bytes, then nothing`);
        done += bytesWritten;
      }
      await handle.sync();
    } finally {
      await handle.close();
    }
    await fs.rename(tempPath, path);
  } catch (error) {
    await fs.rm(tempPath, { force: true }).catch(() => undefined);
    // Name the file the caller meant and the OS error (ENOSPC, EIO, EROFS…).
    throw asDiskError(path, error);
  }
  await syncDirectory(fs, dirname(path));
}

/** fsync a directory so a rename survives power loss; Windows cannot, and that is fine. */
export async function syncDirectory(fs: StoreFs, dir: string): Promise<void> {
  let handle;
  try {
    handle = await fs.open(dir, 'r');
    await handle.sync();
  } catch {
    // EISDIR/EPERM on Windows, EINVAL on some file systems: best effort only.
  } finally {
    await handle?.close().catch(() => undefined);
  }
}
