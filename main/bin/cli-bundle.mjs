// Where the prebuilt CLI lives and whether it is current. Shared by the
// launcher (tunebench.mjs) and the build step (build.mjs); plain JavaScript
// so the launcher needs no compiler to decide.
import { readFileSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = fileURLToPath(new URL('../../', import.meta.url));
// Two folders deep like main/<layer>/, so the sources' `../../resources/…`
// URLs resolve the same from the bundle.
export const BUNDLE_FILE = fileURLToPath(new URL('../../out/cli/tunebench.mjs', import.meta.url));
// The project files the bundle was built from (relative to the project root).
export const INPUTS_FILE = fileURLToPath(new URL('../../out/cli/inputs.json', import.meta.url));

/**
 * Why the bundle cannot be used, or null when it is current: missing, or
 * any source it was built from is newer than it (a checkout being edited).
 * Equal times count as current: npm gives every file of an installed
 * package the same time.
 */
export function bundleStaleReason() {
  let builtMs;
  let inputs;
  try {
    builtMs = statSync(BUNDLE_FILE).mtimeMs;
    inputs = JSON.parse(readFileSync(INPUTS_FILE, 'utf8'));
  } catch {
    return 'not built';
  }
  if (!Array.isArray(inputs)) return 'input list unreadable';
  for (const input of inputs) {
    if (typeof input !== 'string') return 'input list unreadable';
    let sourceMs;
    try {
      sourceMs = statSync(PROJECT_ROOT + input).mtimeMs;
    } catch {
      return `${input} is gone`;
    }
    if (sourceMs > builtMs) return `${input} is newer`;
  }
  return null;
}
