// Where the prebuilt CLI lives and whether it is current. Shared by the
// launcher (tunebench.mjs) and the build step (build.mjs); plain JavaScript
// so the launcher needs no compiler to decide.
import { statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { readSourceManifest, sourceChange } from './source-manifest.mjs';

export const PROJECT_ROOT = fileURLToPath(new URL('../../', import.meta.url));
// Two folders deep like main/<layer>/, so the sources' `../../resources/…`
// URLs resolve the same from the bundle.
export const BUNDLE_FILE = fileURLToPath(new URL('../../out/cli/tunebench.mjs', import.meta.url));
// The project files the bundle was built from, with their sizes and hashes.
export const INPUTS_FILE = fileURLToPath(new URL('../../out/cli/sources.json', import.meta.url));

/**
 * Why the bundle cannot be used, or null when it is current: missing, or
 * a source it was built from has changed since (a checkout being edited).
 */
export function bundleStaleReason() {
  let builtMs;
  try {
    builtMs = statSync(BUNDLE_FILE).mtimeMs;
  } catch {
    return 'not built';
  }
  const manifest = readSourceManifest(INPUTS_FILE);
  if (manifest === null) return 'no source list';
  for (const entry of manifest.values()) {
    const change = sourceChange(PROJECT_ROOT, entry, builtMs);
    if (change !== null) return change;
  }
  return null;
}
