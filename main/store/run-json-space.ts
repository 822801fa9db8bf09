/**
 * Room for run.json's last word on a disk that fills. A run ends by
 * rewriting run.json with its status; on a completely full disk the atomic
 * replacement (temp file, rename) has nowhere to put the temp file's blocks,
 * and run.json would stay `running` for ever, read back as "interrupted"
 * with no reason. So while a run is `running` its run.json is padded with
 * trailing whitespace (JSON allows whitespace after the value, RFC 8259 §2)
 * to whole 4 KiB blocks with at least RESERVE_BYTES to spare: the disk
 * holds those blocks for the run from its start. When the atomic rewrite
 * then fails for want of space (ENOSPC, EDQUOT), and only then, the new text
 * is written over the old in place, inside the blocks the file already
 * holds, padded to the old length so no stale byte follows it.
 *
 * The in-place write is the fallback only, because it is not atomic: a
 * crash in its middle could leave a torn run.json, where the atomic path
 * always leaves the old or the new file whole. It is taken only when the
 * alternative is a run.json that never says how the run ended. On a
 * copy-on-write file system (btrfs, ZFS) even an overwrite needs new blocks;
 * the fallback then fails too and the original error stands.
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { jsonFileText } from './atomic-json.ts';
import { DiskError } from './store-error.ts';
import type { StoreFs } from './store-fs.ts';

/** File-system block size: 4 KiB on ext4, XFS, tmpfs and NTFS by default (common practice). */
export const BLOCK_BYTES = 4096;
/**
 * Spare room kept in a running run's run.json: what finishing adds (status, endedAt, conditions, a failure
 * message naming a path and the OS error) is a few hundred bytes; a renamed DUT or notes written during the run
 * re-pad the file when they are written.
 */
export const RESERVE_BYTES = 2048;

/** run.json's text: padded to whole blocks with RESERVE_BYTES to spare while the run is `running`, else bare. */
export function runJsonText(meta: RunMeta): string {
  const text = jsonFileText(meta);
  if (meta.status !== 'running') return text;
  const bytes = Buffer.byteLength(text, 'utf8');
  const total = Math.ceil((bytes + RESERVE_BYTES) / BLOCK_BYTES) * BLOCK_BYTES;
  // Spaces, then one newline so the file still ends a line.
  return `${text}${' '.repeat(total - bytes - 1)}\n`;
}

/** The atomic rewrite failed because the disk (or the user's quota) is full. */
export function isOutOfSpace(error: unknown): boolean {
  return error instanceof DiskError && (error.osCode === 'ENOSPC' || error.osCode === 'EDQUOT');
}

/**
 * The fallback: `meta` written over run.json in place, inside the blocks it holds. Resolves true when it fit
 * and was written; false when this file system cannot write in place or the text does not fit.
 */
export async function rewriteInPlace(fs: StoreFs, path: string, meta: RunMeta): Promise<boolean> {
  if (!fs.overwriteStart) return false;
  const size = (await fs.stat(path)).size;
  // Indented if it fits, else on one line (a run.json written before padding existed has less room).
  for (const text of [jsonFileText(meta), `${JSON.stringify(meta)}\n`]) {
    const bytes = Buffer.byteLength(text, 'utf8');
    if (bytes > size) continue;
    const padded = bytes === size ? text : `${text}${' '.repeat(size - bytes - 1)}\n`;
    await fs.overwriteStart(path, Buffer.from(padded, 'utf8'));
    return true;
  }
  return false;
}
