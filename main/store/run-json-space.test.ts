import { readFile, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BLOCK_BYTES, RESERVE_BYTES, rewriteInPlace, runJsonText } from './run-json-space.ts';
import { readRunMeta, RUN_JSON } from './run-meta.ts';
import { startingRunMeta } from './starting-meta.ts';
import { nodeStoreFs } from './store-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';

const running = startingRunMeta(
  { kind: 'sweep', dut: { id: 'space-probe' }, instruments: [], plan: { start: 1, stop: 2 } },
  { id: '20260301-120000-space-probe', startedAt: '2026-03-01T12:00:00.000Z', dutId: 'space-probe' },
);

describe("run.json's reserved blocks", () => {
  it('a running run is padded with trailing whitespace to whole 4 KiB blocks, 2 KiB to spare, and still reads', async () => {
    const text = runJsonText(running);
    const bytes = Buffer.byteLength(text);
    const bare = Buffer.byteLength(`${JSON.stringify(running, null, 2)}\n`);
    expect(bytes % BLOCK_BYTES).toBe(0);
    expect(bytes - bare).toBeGreaterThanOrEqual(RESERVE_BYTES);
    expect(text.endsWith('\n')).toBe(true);
    // RFC 8259 §2: whitespace may follow the value.
    expect(JSON.parse(text)).toEqual(running);
    await withTempDir(async (dir) => {
      await writeFile(join(dir, RUN_JSON), text);
      expect(await readRunMeta(nodeStoreFs, dir)).toEqual(running);
    });
    // A finished run is written bare.
    const done = { ...running, status: 'complete' as const, endedAt: '2026-03-01T12:05:00.000Z' };
    expect(runJsonText(done)).toBe(`${JSON.stringify(done, null, 2)}\n`);
  });

  it('the in-place fallback keeps the file length, leaves no stale byte, and declines what does not fit', async () => {
    await withTempDir(async (dir) => {
      const path = join(dir, RUN_JSON);
      await writeFile(path, runJsonText(running));
      const size = (await stat(path)).size;
      const failed = {
        ...running,
        status: 'failed' as const,
        endedAt: '2026-03-01T12:05:00.000Z',
        failure: `cannot write ${join(dir, 'samples.csv')}: ENOSPC: no space left on device, write`,
      };
      expect(await rewriteInPlace(nodeStoreFs, path, failed)).toBe(true);
      const after = await readFile(path, 'utf8');
      expect(Buffer.byteLength(after)).toBe(size);
      expect(JSON.parse(after)).toEqual(failed);
      expect(after.trimEnd()).toBe(JSON.stringify(failed, null, 2));
      // A file with no room (written before padding existed, say): one line if that fits, else declined.
      await writeFile(path, `${JSON.stringify(running)}\n`);
      expect(
        await rewriteInPlace(nodeStoreFs, path, { ...running, dut: { id: 'space-probe', notes: 'x'.repeat(40) } }),
      ).toBe(false);
      expect(JSON.parse(await readFile(path, 'utf8'))).toEqual(running);
      await writeFile(path, `${JSON.stringify(running, null, 2)}\n`);
      expect(await rewriteInPlace(nodeStoreFs, path, { ...running, status: 'failed' })).toBe(true);
      expect(JSON.parse(await readFile(path, 'utf8'))).toMatchObject({ status: 'failed' });
      // Without an in-place write (the page's OPFS store) there is no fallback.
      expect(await rewriteInPlace({ ...nodeStoreFs, overwriteStart: undefined }, path, running)).toBe(false);
    });
  });
});
