/**
 * Where the built renderer lives and whether it is current. Browser mode
 * serves out/renderer as built by the build step (`npm run build:renderer`,
 * run by `npm install`); it never builds at start-up, so `serve` needs no
 * devDependency (vite) and works from an install without them.
 */
import { readdir, stat } from 'node:fs/promises';
import { readSourceManifest, sourceChange } from '../bin/source-manifest.mjs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const APP_DIR = join(PROJECT_ROOT, 'app');
export const RENDERER_OUT_DIR = join(PROJECT_ROOT, 'out', 'renderer');

/** The record of the app/ sources a renderer build in `outDir` was made from (beside it, so it is not served). */
export function rendererSourcesFile(outDir: string): string {
  return `${outDir}.sources.json`;
}

const SOURCE_FILE = /\.(tsx?|css|html|svg|json)$/;

/** The renderer's source files under `dir`, relative to it, tests left out. */
export async function listAppSources(dir: string, prefix = ''): Promise<string[]> {
  const found: string[] = [];
  for (const entry of await readdir(join(dir, prefix), { withFileTypes: true })) {
    const path = prefix === '' ? entry.name : `${prefix}/${entry.name}`;
    if (entry.isDirectory()) found.push(...(await listAppSources(dir, path)));
    else if (SOURCE_FILE.test(entry.name) && !entry.name.endsWith('.test.ts')) found.push(path);
  }
  return found;
}

/**
 * True when out/renderer is missing or was built from other app/ sources
 * than those now present (one added, gone or changed). Compared by content
 * where times disagree, since an installed package's file times are only
 * the time it was unpacked.
 */
export async function rendererIsStale(
  appDir = APP_DIR,
  outDir = RENDERER_OUT_DIR,
  sourcesFile = rendererSourcesFile(outDir),
): Promise<boolean> {
  let builtMs: number;
  try {
    builtMs = (await stat(join(outDir, 'index.html'))).mtimeMs;
  } catch {
    return true;
  }
  const manifest = readSourceManifest(sourcesFile);
  const sources = await listAppSources(appDir).catch(() => null);
  if (manifest === null || sources === null) return true;
  if (sources.length !== manifest.size) return true;
  for (const path of sources) {
    const entry = manifest.get(path);
    if (entry === undefined || sourceChange(appDir, entry, builtMs) !== null) return true;
  }
  return false;
}

export class RendererMissingError extends Error {
  override readonly name = 'RendererMissingError';
}

/**
 * The folder to serve. Refuses when there is no build; a build older than
 * the app/ sources (a checkout being edited) is served with a warning.
 */
export async function builtRendererDir(
  log: (line: string) => void,
  appDir = APP_DIR,
  outDir = RENDERER_OUT_DIR,
): Promise<string> {
  try {
    await stat(join(outDir, 'index.html'));
  } catch {
    throw new RendererMissingError(
      `the app is not built: ${join(outDir, 'index.html')} is missing; run \`npm run build:renderer\` in ${PROJECT_ROOT} (needs the devDependencies), or install from a packed tarball`,
    );
  }
  if (await rendererIsStale(appDir, outDir)) {
    log(
      `warning: ${outDir} is older than the sources in ${appDir}; serving it anyway — run \`npm run build:renderer\` to rebuild`,
    );
  }
  return outDir;
}
