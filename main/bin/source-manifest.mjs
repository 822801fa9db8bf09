// A build's record of the sources it was made from (path, size, SHA-1), so
// a launcher can tell whether the build is current. Times alone cannot say:
// npm gives an installed package's files the time they were unpacked, in no
// particular order. A file whose time is not newer than the build is taken
// as unchanged without reading it; a newer one is compared by size, then by
// content.
import { readFileSync, statSync, writeFileSync, renameSync } from 'node:fs';
import { join, sep } from 'node:path';

// node:crypto loads only when a file needs hashing: a launcher that finds every source unchanged
// by time and size (the usual start) never pays for it.
function sha1(path) {
  const { createHash } = process.getBuiltinModule('node:crypto');
  return createHash('sha1').update(readFileSync(path)).digest('hex');
}

/** Writes the manifest of `paths` (relative to `root`) to `file`, atomically. */
export function writeSourceManifest(file, root, paths) {
  const entries = paths.map((path) => {
    const full = join(root, path);
    return { path, size: statSync(full).size, sha1: sha1(full) };
  });
  const temp = `${file}.${process.pid}.tmp`;
  writeFileSync(temp, `${JSON.stringify({ schema: 'tunebench.build-sources/1', entries })}\n`);
  renameSync(temp, file);
}

/** Reads a manifest; null when it is missing or not one. */
export function readSourceManifest(file) {
  let data;
  try {
    data = JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    return null;
  }
  if (data?.schema !== 'tunebench.build-sources/1' || !Array.isArray(data.entries)) return null;
  const valid = data.entries.every(
    (e) => typeof e?.path === 'string' && Number.isInteger(e.size) && typeof e.sha1 === 'string',
  );
  return valid ? new Map(data.entries.map((e) => [e.path, e])) : null;
}

/**
 * Why the file at `path` differs from its manifest entry, or null when it
 * does not: missing, resized, or newer than the build with other content.
 */
export function sourceChange(root, entry, builtMs) {
  // Plain concatenation, not path.join: this runs for every source at every start, and join's
  // normalising doubles the check's cost (Windows takes '/' too).
  const path = root.endsWith('/') || root.endsWith(sep) ? root + entry.path : `${root}/${entry.path}`;
  const info = statSync(path, { throwIfNoEntry: false });
  if (info === undefined) return `${entry.path} is gone`;
  if (info.size !== entry.size) return `${entry.path} changed`;
  if (info.mtimeMs <= builtMs) return null;
  return sha1(path) === entry.sha1 ? null : `${entry.path} changed`;
}
