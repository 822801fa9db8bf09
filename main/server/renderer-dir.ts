/**
 * Where the built renderer lives and whether it is current. Browser mode
 * serves out/renderer as built by the build step (`npm run build:renderer`,
 * run by `npm install`); it never builds at start-up, so `serve` needs no
 * devDependency (vite) and works from an install without them.
 */
import { readdir, stat } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const APP_DIR = join(PROJECT_ROOT, 'app');
export const RENDERER_OUT_DIR = join(PROJECT_ROOT, 'out', 'renderer');

const SOURCE_FILE = /\.(tsx?|css|html|svg|json)$/;

async function newestSourceMs(dir: string): Promise<number> {
  let newest = 0;
  for (const entry of await readdir(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, await newestSourceMs(path));
    else if (SOURCE_FILE.test(entry.name) && !entry.name.endsWith('.test.ts')) newest = Math.max(newest, (await stat(path)).mtimeMs);
  }
  return newest;
}

/** True when out/renderer is missing or any app/ source is newer than its index.html. */
export async function rendererIsStale(appDir = APP_DIR, outDir = RENDERER_OUT_DIR): Promise<boolean> {
  let builtMs: number;
  try {
    builtMs = (await stat(join(outDir, 'index.html'))).mtimeMs;
  } catch {
    return true;
  }
  const sourcesMs = await newestSourceMs(appDir).catch(() => 0);
  return sourcesMs > builtMs;
}

export class RendererMissingError extends Error {
  override readonly name = 'RendererMissingError';
}

/**
 * The folder to serve. Refuses when there is no build; a build older than
 * the app/ sources (a checkout being edited) is served with a warning.
 */
export async function builtRendererDir(log: (line: string) => void, appDir = APP_DIR, outDir = RENDERER_OUT_DIR): Promise<string> {
  try {
    await stat(join(outDir, 'index.html'));
  } catch {
    throw new RendererMissingError(
      `the app is not built: ${join(outDir, 'index.html')} is missing; run \`npm run build:renderer\` in ${PROJECT_ROOT} (needs the devDependencies), or install from a packed tarball`,
    );
  }
  if (await rendererIsStale(appDir, outDir)) {
    log(`warning: ${outDir} is older than the sources in ${appDir}; serving it anyway — run \`npm run build:renderer\` to rebuild`);
  }
  return outDir;
}
