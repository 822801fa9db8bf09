import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { writeSourceManifest } from '../bin/source-manifest.mjs';
import {
  builtRendererDir,
  listAppSources,
  RendererMissingError,
  rendererIsStale,
  rendererSourcesFile,
} from './renderer-dir.ts';

let root: string;
let appDir: string;
let outDir: string;
beforeEach(async () => {
  root = await mkdtemp(join(tmpdir(), 'tunebench-renderer-dir-'));
  appDir = join(root, 'app');
  outDir = join(root, 'out', 'renderer');
  await mkdir(join(appDir, 'views'), { recursive: true });
  await writeFile(join(appDir, 'index.html'), '<!doctype html>');
  await writeFile(join(appDir, 'views', 'main.tsx'), 'export {};');
  await writeFile(join(appDir, 'views', 'main.test.ts'), 'export {};');
});
afterEach(async () => {
  await rm(root, { recursive: true, force: true });
});

async function fakeBuild(): Promise<void> {
  await mkdir(outDir, { recursive: true });
  await writeFile(join(outDir, 'index.html'), '<!doctype html><script src="./assets/x.js"></script>');
  writeSourceManifest(rendererSourcesFile(outDir), appDir, await listAppSources(appDir));
}

describe('built renderer folder', () => {
  it('refuses to serve when nothing was built, naming the build command', async () => {
    await expect(builtRendererDir(() => undefined, appDir, outDir)).rejects.toThrow(RendererMissingError);
    await expect(builtRendererDir(() => undefined, appDir, outDir)).rejects.toThrow(/npm run build:renderer/);
  });

  it('serves a current build silently, and a build older than its sources with a warning', async () => {
    await fakeBuild();
    const lines: string[] = [];
    expect(await builtRendererDir((l) => lines.push(l), appDir, outDir)).toBe(outDir);
    expect(lines).toEqual([]);
    expect(await rendererIsStale(appDir, outDir)).toBe(false);
    await writeFile(join(appDir, 'views', 'main.tsx'), 'export const x = 1;');
    expect(await rendererIsStale(appDir, outDir)).toBe(true);
    expect(await builtRendererDir((l) => lines.push(l), appDir, outDir)).toBe(outDir);
    expect(lines.join('\n')).toMatch(/older than the sources/);
  });

  it('sees an added source as stale and ignores tests', async () => {
    await fakeBuild();
    await writeFile(join(appDir, 'views', 'other.test.ts'), 'export {};');
    expect(await rendererIsStale(appDir, outDir)).toBe(false);
    await writeFile(join(appDir, 'views', 'extra.ts'), 'export {};');
    expect(await rendererIsStale(appDir, outDir)).toBe(true);
  });
});
