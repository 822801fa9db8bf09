/**
 * Issue 10 item 2: an I/O error other than "no such file" is never read as
 * "no writer" or "empty file". A lock we cannot read (EACCES, EIO) must not
 * turn a live run interrupted and delete its lock; an events file we cannot
 * read must not be rewritten as if empty.
 */
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { readRunStatus } from './run-reader.ts';
import { addNote } from './run-store.ts';
import { createRun } from './run-writer.ts';
import { type StoreFs, nodeStoreFs } from './store-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';
import { readLock } from './writer-lock.ts';

function failingReads(suffix: string, code: string): StoreFs {
  return {
    ...nodeStoreFs,
    async readFile(path) {
      if (path.endsWith(suffix)) throw Object.assign(new Error(`${code}: injected on ${path}`), { code });
      return nodeStoreFs.readFile(path);
    },
  };
}

async function runningRun(runsDir: string) {
  const writer = await createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: 'lock-probe' },
    instruments: [],
    plan: {},
    columns: ['time_s', 'control_v', 'frequency_hz', 'status'],
    clock: new VirtualClock(),
  });
  writer.appendSample([0, 1, 1000, 'ok']);
  await writer.flush();
  return writer;
}

describe('store reads that fail for a reason other than ENOENT', () => {
  it('readLock throws EACCES instead of reporting no writer; a missing lock is still null', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await runningRun(runsDir);
      await expect(readLock(failingReads('writer.lock', 'EACCES'), writer.dir)).rejects.toThrow(/EACCES/);
      await expect(readLock(nodeStoreFs, join(runsDir, 'no-such-run'))).resolves.toBeNull();
      await writer.finish('complete');
    });
  });

  it('a run whose lock cannot be read is not marked interrupted and keeps its lock', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await runningRun(runsDir);
      // A probe that would call the writer dead if asked: only the unreadable lock stands between.
      await expect(readRunStatus(writer.dir, { fs: failingReads('writer.lock', 'EIO') })).rejects.toThrow(/EIO/);
      const meta = JSON.parse(await readFile(join(writer.dir, 'run.json'), 'utf8')) as { status: string };
      expect(meta.status).toBe('running');
      await expect(stat(join(writer.dir, 'writer.lock'))).resolves.toBeTruthy();
      await writer.finish('complete');
    });
  });

  it('addNote refuses when events.jsonl cannot be read, leaving the events untouched', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await runningRun(runsDir);
      writer.appendEvent({ type: 'retry', time_s: 0 });
      await writer.finish('complete');
      const before = await readFile(join(writer.dir, 'events.jsonl'), 'utf8');
      await expect(addNote(runsDir, writer.id, 'checked', { fs: failingReads('events.jsonl', 'EIO') })).rejects.toThrow(
        /EIO/,
      );
      expect(await readFile(join(writer.dir, 'events.jsonl'), 'utf8')).toBe(before);
    });
  });
});

describe('concurrent edits of one run (issue 10 item 3)', () => {
  it('applies notes in call order even when the first call finds its run more slowly', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await runningRun(runsDir);
      await writer.finish('complete');
      let statCalls = 0;
      // The first existence check is slow: the old code joined the queue after it, so the second note went first.
      const slowFirstStat: StoreFs = {
        ...nodeStoreFs,
        async stat(path) {
          statCalls += 1;
          if (statCalls === 1) await new Promise((resolve) => setTimeout(resolve, 40));
          return nodeStoreFs.stat(path);
        },
      };
      await Promise.all([
        addNote(runsDir, writer.id, 'first', { fs: slowFirstStat }),
        addNote(runsDir, writer.id, 'second', { fs: slowFirstStat }),
      ]);
      const meta = JSON.parse(await readFile(join(writer.dir, 'run.json'), 'utf8')) as { dut: { notes: string } };
      expect(meta.dut.notes).toBe('first\nsecond');
    });
  });
});
