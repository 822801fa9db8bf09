/**
 * A listing in the writer's own process never takes a run being created for
 * an interrupted one. Found in the browser tests at load 18: listRuns read
 * run.json (`running`) while createRun was still fsyncing the folder after
 * the rename, before the writer was registered, so the live run was recorded
 * `interrupted` and its lock removed.
 */
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { readRunStatus } from './run-reader.ts';
import { createRun } from './run-writer.ts';
import { nodeStoreFs, type StoreFs } from './store-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';

describe('a run being created', () => {
  it('reads as running to a listing that comes between run.json and the writer', async () => {
    await withTempDir(async (runsDir) => {
      const seen: string[] = [];
      // The directory fsync after run.json's rename: the moment another caller in this process may list runs.
      const fs: StoreFs = {
        ...nodeStoreFs,
        async open(path, flags) {
          if (flags === 'r' && !path.endsWith('.json')) {
            const status = await readRunStatus(path).then(
              (meta) => meta.status,
              () => null,
            );
            if (status !== null) seen.push(status);
          }
          return nodeStoreFs.open(path, flags);
        },
      };
      const writer = await createRun({
        runsDir,
        kind: 'sweep',
        dut: { id: 'listed-early' },
        instruments: [],
        plan: {},
        columns: ['control_v', 'frequency_hz'],
        clock: new VirtualClock(),
        fs,
      });
      expect(seen.length).toBeGreaterThan(0);
      expect(seen).toEqual(seen.map(() => 'running'));
      expect((await readRunStatus(writer.dir)).status).toBe('running');
      await writer.finish('complete');
      expect((await readRunStatus(writer.dir)).status).toBe('complete');
    });
  });
});
