// Where the prebuilt CLI lives, whether it is current, and how it loads.
// Shared by the launcher (tunebench.mjs) and the build step (build.mjs);
// plain JavaScript so the launcher needs no compiler to decide.
import { isAscii } from 'node:buffer';
import { readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { createRequire, Module } from 'node:module';
import { dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import v8 from 'node:v8';
import vm from 'node:vm';
import { readSourceManifest, sourceChange } from './source-manifest.mjs';

export const PROJECT_ROOT = fileURLToPath(new URL('../../', import.meta.url));
// Two folders deep like main/<layer>/, so the sources' `../../resources/…`
// URLs resolve the same from the bundle.
export const BUNDLE_FILE = fileURLToPath(new URL('../../out/cli/tunebench.cjs', import.meta.url));
// The project files the bundle was built from, with their sizes and hashes.
export const INPUTS_FILE = fileURLToPath(new URL('../../out/cli/sources.json', import.meta.url));

/**
 * V8 set for a short command: its young generation starts at 1 MB and
 * doubles as a start allocates, and every page it grows into is memory the
 * process touches for the first time (a page fault each, which a virtual
 * machine makes dear); kept at its first size, a short command runs in the
 * pages it already has. A command with big work to do puts V8's own setting
 * back (main/cli/v8-tuning.ts). (Turning the optimising compiler off as well
 * saved CPU time but cost the main thread more, which is what a waiting user
 * sees on an idle machine.) V8 keys its code cache to its flags: the cache is
 * always made and read with these set.
 */
// (--concurrent-osr is V8's default, set again for the code cache: a big analysis turns it off, v8-tuning.ts.)
export const START_FLAGS = '--semi-space-growth-factor=1 --concurrent-osr';
/** V8's own setting, which main/cli/v8-tuning.ts puts back the same way. */
export const BIG_WORK_FLAGS = '--semi-space-growth-factor=2';

export function useStartFlags() {
  v8.setFlagsFromString(START_FLAGS);
}

export function tuneForBigWork() {
  v8.setFlagsFromString(BIG_WORK_FLAGS);
}

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

/**
 * Loads the bundle (CommonJS) with V8's code cache: compiling the 1 MB
 * bundle is a third of a start otherwise (Node 20 has no module compile
 * cache). The cache is named after the bundle's size and time, since V8
 * itself only checks the source length. Returns the bundle's exports and a
 * `saveCache()` to call once the command has run (so the functions it
 * compiled are in the cache); saving is best effort (a read-only install
 * just starts a little slower).
 */
export function loadBundle() {
  useStartFlags();
  // The build escapes every non-ASCII character: read as Latin-1, the bytes become V8's one-byte
  // string without UTF-8 decoding's extra copy (a third fewer pages touched). Checked all the same.
  const bytes = readFileSync(BUNDLE_FILE);
  const source = isAscii(bytes) ? bytes.toString('latin1') : bytes.toString('utf8');
  const info = statSync(BUNDLE_FILE);
  const cacheFile = `${BUNDLE_FILE}.${info.size}-${Math.trunc(info.mtimeMs)}.v8cache`;
  let cachedData;
  try {
    cachedData = readFileSync(cacheFile);
  } catch {
    cachedData = undefined;
  }
  const script = new vm.Script(Module.wrap(source), { filename: BUNDLE_FILE, cachedData });
  const module = { exports: {} };
  script
    .runInThisContext()
    .call(module.exports, module.exports, createRequire(BUNDLE_FILE), module, BUNDLE_FILE, dirname(BUNDLE_FILE));
  const saveCache = () => {
    if (cachedData !== undefined && !script.cachedDataRejected) return;
    try {
      useStartFlags(); // the command may have tuned V8 for big work; the cache is keyed to the start flags
      const temp = `${cacheFile}.${process.pid}.tmp`;
      writeFileSync(temp, script.createCachedData());
      renameSync(temp, cacheFile);
    } catch {
      // read-only install: no cache
    }
  };
  return { exports: module.exports, saveCache };
}
