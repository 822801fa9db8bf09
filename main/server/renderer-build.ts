/**
 * Builds out/renderer from the app/ sources, for the build step
 * (main/bin/build.mjs) and for tests that need a current build: built when missing, rebuilt when any source under
 * app/ is newer than the built index.html. Uses vite's build API with the
 * renderer settings of electron.vite.config.ts (root app/, React plugin).
 * The build goes to a fresh folder that then replaces the old one, so a
 * reader never sees half a build.
 */
import { mkdir, mkdtemp, readdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { writeSourceManifest } from '../bin/source-manifest.mjs';
import { APP_DIR, listAppSources, RENDERER_OUT_DIR, rendererIsStale, rendererSourcesFile } from './renderer-dir.ts';

export { APP_DIR, PROJECT_ROOT, RENDERER_OUT_DIR, rendererIsStale } from './renderer-dir.ts';

export interface EnsureRendererOptions {
  appDir?: string;
  outDir?: string;
  /** Where progress lines go (the CLI's stderr). */
  log?: (line: string) => void;
}

/** A lock older than this was left by a build that died. */
const STALE_LOCK_MS = 5 * 60_000;

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as { code?: string }).code === 'EPERM';
  }
}

/**
 * Runs `work` holding a lock file, so two processes (two test workers, two
 * `serve`s) never build into the same folder at once.
 */
async function withBuildLock<T>(lockPath: string, work: () => Promise<T>): Promise<T> {
  await mkdir(dirname(lockPath), { recursive: true });
  for (;;) {
    try {
      await writeFile(lockPath, String(process.pid), { flag: 'wx' });
      break;
    } catch (error) {
      if ((error as { code?: string }).code !== 'EEXIST') throw error;
      const age = await stat(lockPath).then(
        (info) => Date.now() - info.mtimeMs,
        () => 0,
      );
      const holder = Number(await readFile(lockPath, 'utf8').catch(() => ''));
      // A lock whose process is gone (killed mid-build) or that is very old is left over.
      if (age > STALE_LOCK_MS || (Number.isInteger(holder) && holder > 0 && !processAlive(holder)))
        await rm(lockPath, { force: true });
      else await new Promise((resolve) => setTimeout(resolve, 250));
    }
  }
  try {
    return await work();
  } finally {
    await rm(lockPath, { force: true });
  }
}

/** Builds the renderer now, whatever its state (the build step). */
export async function buildRendererNow(options: EnsureRendererOptions = {}): Promise<string> {
  const appDir = options.appDir ?? APP_DIR;
  const outDir = options.outDir ?? RENDERER_OUT_DIR;
  return withBuildLock(`${outDir}.lock`, async () => {
    await buildRenderer(appDir, outDir, options.log);
    return outDir;
  });
}

/** Builds the renderer when missing or stale (tests and the bench); returns its folder. */
export async function ensureRendererBuilt(options: EnsureRendererOptions = {}): Promise<string> {
  const appDir = options.appDir ?? APP_DIR;
  const outDir = options.outDir ?? RENDERER_OUT_DIR;
  if (!(await rendererIsStale(appDir, outDir))) return outDir;
  // Checked again under the lock: another process may have just built it.
  return withBuildLock(`${outDir}.lock`, async () => {
    if (await rendererIsStale(appDir, outDir)) await buildRenderer(appDir, outDir, options.log);
    return outDir;
  });
}

async function buildRenderer(appDir: string, outDir: string, log: ((line: string) => void) | undefined): Promise<void> {
  log?.(`building the app into ${outDir} …`);
  const parent = dirname(outDir);
  await mkdir(parent, { recursive: true });
  // We hold the lock, so any earlier temporary build folder is a leftover of a killed build.
  for (const name of await readdir(parent))
    if (name.startsWith('.renderer-')) await rm(join(parent, name), { recursive: true, force: true });
  const tempDir = await mkdtemp(join(parent, '.renderer-'));
  // Listed before the build: a source edited during it then reads as changed.
  const sources = await listAppSources(appDir);
  const [{ build }, { default: react }] = await Promise.all([import('vite'), import('@vitejs/plugin-react')]);
  try {
    await build({
      configFile: false,
      root: appDir,
      base: './',
      plugins: [react()],
      logLevel: 'warn',
      build: {
        outDir: tempDir,
        emptyOutDir: true,
        // One bundle by design (a local app); its size is not a concern worth a warning.
        chunkSizeWarningLimit: 4096,
        rollupOptions: {
          input: { index: join(appDir, 'index.html') },
          // zod's sources carry comments rollup cannot place; harmless, and noise on the CLI.
          onwarn: (warning, warn) => {
            if (warning.code !== 'INVALID_ANNOTATION') warn(warning);
          },
        },
      },
    });
    const oldDir = `${outDir}.old-${process.pid}-${Date.now()}`;
    await rename(outDir, oldDir).catch(() => undefined);
    await rename(tempDir, outDir);
    writeSourceManifest(rendererSourcesFile(outDir), appDir, sources);
    await rm(oldDir, { recursive: true, force: true });
  } catch (error) {
    await rm(tempDir, { recursive: true, force: true });
    throw error;
  }
}
