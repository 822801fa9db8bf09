import { readdir, readFile, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { deleteRun, listTrash } from './run-store.ts';
import { createRun } from './run-writer.ts';
import { withTempDir } from './testing/temp-dir.ts';

describe('deleteRun moves the folder by its own name (issue 14.5)', () => {
  it('refuses a folder whose run.json carries another id, such as a path out of the runs folder', async () => {
    await withTempDir(async (root) => {
      const runsDir = join(root, 'runs');
      const writer = await createRun({
        runsDir,
        kind: 'sweep',
        dut: { id: 'planted' },
        instruments: [],
        plan: {},
        columns: ['time_s', 'control_v'],
        clock: new VirtualClock({ startWallIso: '2026-12-01T09:00:00Z' }),
      });
      writer.appendSample([0, 1]);
      await writer.finish('complete');
      // A planted run.json: the id inside points outside the runs folder.
      const metaPath = join(runsDir, writer.id, 'run.json');
      const meta = JSON.parse(await readFile(metaPath, 'utf8')) as { id: string };
      await writeFile(metaPath, JSON.stringify({ ...meta, id: '../../x/escaped-run' }));
      await rename(join(runsDir, writer.id), join(runsDir, 'planted-run'));
      await expect(deleteRun(runsDir, 'planted-run')).rejects.toThrow(/whose id differs; it was not moved/);
      expect(await readdir(runsDir)).toContain('planted-run');
      expect(await readdir(root)).toEqual(['runs']); // nothing escaped to root/x, where the planted id pointed
    });
  });

  it('still moves an ordinary run to the trash under its folder name', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await createRun({
        runsDir,
        kind: 'sweep',
        dut: { id: 'plain' },
        instruments: [],
        plan: {},
        columns: ['time_s', 'control_v'],
        clock: new VirtualClock({ startWallIso: '2026-12-01T09:00:00Z' }),
      });
      await writer.finish('complete');
      await deleteRun(runsDir, writer.id);
      expect((await listTrash(runsDir)).map((run) => run.id)).toEqual([writer.id]);
    });
  });
});
