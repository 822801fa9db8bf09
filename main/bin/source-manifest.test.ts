import { mkdtemp, rm, stat, utimes, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readSourceManifest, sourceChange, writeSourceManifest } from './source-manifest.mjs';

let dir: string;
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tunebench-manifest-'));
});
afterEach(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function setTime(path: string, ms: number): Promise<void> {
  await utimes(path, ms / 1000, ms / 1000);
}

describe('build source manifest', () => {
  it('takes a file with the same content as unchanged even when npm unpacked it after the build', async () => {
    await writeFile(join(dir, 'a.ts'), 'export const a = 1;\n');
    writeSourceManifest(join(dir, 'sources.json'), dir, ['a.ts']);
    const entry = readSourceManifest(join(dir, 'sources.json'))?.get('a.ts');
    expect(entry?.size).toBe(20);
    const builtMs = (await stat(join(dir, 'a.ts'))).mtimeMs - 60_000; // file newer than the build
    expect(sourceChange(dir, entry!, builtMs)).toBeNull();
  });

  it('reports an edit of the same size, a resize and a deleted file', async () => {
    await writeFile(join(dir, 'a.ts'), 'export const a = 1;\n');
    writeSourceManifest(join(dir, 'sources.json'), dir, ['a.ts']);
    const entry = readSourceManifest(join(dir, 'sources.json'))!.get('a.ts')!;
    const builtMs = Date.now() - 60_000;
    await writeFile(join(dir, 'a.ts'), 'export const a = 2;\n');
    expect(sourceChange(dir, entry, builtMs)).toBe('a.ts changed');
    await writeFile(join(dir, 'a.ts'), 'export const a = 22;\n');
    await setTime(join(dir, 'a.ts'), builtMs - 1000); // even when older than the build
    expect(sourceChange(dir, entry, builtMs)).toBe('a.ts changed');
    await rm(join(dir, 'a.ts'));
    expect(sourceChange(dir, entry, builtMs)).toBe('a.ts is gone');
  });

  it('refuses a manifest that is missing, torn or of another kind', async () => {
    expect(readSourceManifest(join(dir, 'none.json'))).toBeNull();
    await writeFile(join(dir, 'torn.json'), '{"schema":"tunebench.build-sources/1","entries":[{"path":"a.ts"');
    expect(readSourceManifest(join(dir, 'torn.json'))).toBeNull();
    await writeFile(join(dir, 'other.json'), '{"schema":"other/1","entries":[]}');
    expect(readSourceManifest(join(dir, 'other.json'))).toBeNull();
  });
});
