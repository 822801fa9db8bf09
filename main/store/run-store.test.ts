import { mkdir, readFile, readdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import {
  addNote,
  deleteRun,
  listRuns,
  listRunsDetailed,
  listTrash,
  openRun,
  renameDut,
  restoreRun,
} from './run-store.ts';
import { createRun } from './run-writer.ts';
import { withTempDir } from './testing/temp-dir.ts';

async function finishedRun(runsDir: string, wallIso: string, dutId: string) {
  const writer = await createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: dutId },
    instruments: [],
    plan: {},
    columns: ['time_s', 'control_v', 'frequency_hz', 'status'],
    clock: new VirtualClock({ startWallIso: wallIso }),
  });
  writer.appendSample([0, 1, 2e6, 'ok']);
  writer.appendSample([0.2, 1.5, 2.5e6, 'ok']);
  await writer.finish('complete');
  return writer.id;
}

describe('run store', () => {
  it('lists runs newest first, skipping foreign folders and reporting broken ones', async () => {
    await withTempDir(async (runsDir) => {
      const older = await finishedRun(runsDir, '2026-11-30T10:00:00Z', 'sensor-osc-a');
      const newer = await finishedRun(runsDir, '2026-12-01T09:00:00Z', 'clock-mult-vco');
      await mkdir(join(runsDir, 'notes'));
      await mkdir(join(runsDir, '20261201-000000-broken'));
      await writeFile(join(runsDir, '20261201-000000-broken', 'run.json'), '{"schema":"tunebench.run/1"');
      const { runs, problems } = await listRunsDetailed(runsDir);
      expect(runs.map((r) => r.id)).toEqual([newer, older]);
      expect(problems.map((p) => p.name)).toEqual(['20261201-000000-broken', 'notes']);
      expect(problems[0]?.message).toMatch(/not valid JSON/);
      expect(await listRuns(join(runsDir, 'absent'))).toEqual([]);
    });
  });

  it('opens a run as columns', async () => {
    await withTempDir(async (runsDir) => {
      const id = await finishedRun(runsDir, '2026-12-01T09:00:00Z', 'sensor-osc-a');
      const run = await openRun(runsDir, id);
      expect(run.samples.numeric.control_v).toEqual(new Float64Array([1, 1.5]));
      expect(run.samples.text.status).toEqual({ levels: ['ok'], codes: new Uint8Array([0, 0]) });
      await expect(openRun(runsDir, '../etc')).rejects.toThrow(/run id/);
      await expect(openRun(runsDir, 'no-such-run')).rejects.toMatchObject({ reason: 'not-found' });
    });
  });

  it('renames the DUT and appends notes to run.json and as note events', async () => {
    await withTempDir(async (runsDir) => {
      const id = await finishedRun(runsDir, '2026-12-01T09:00:00Z', 'sensor-osc-a');
      const renamed = await renameDut(runsDir, id, 'sensor-osc-A rev2');
      expect(renamed.dut.id).toBe('sensor-osc-A rev2');
      expect(renamed.id).toBe(id); // the folder keeps its id
      await Promise.all([addNote(runsDir, id, 'bench at 23 °C'), addNote(runsDir, id, 'counter gate 100 ms')]);
      const run = await openRun(runsDir, id);
      expect(run.meta.dut).toEqual({ id: 'sensor-osc-A rev2', notes: 'bench at 23 °C\ncounter gate 100 ms' });
      expect(run.events.filter((e) => e.type === 'note').map((e) => [e.text, e.time_s])).toEqual([
        ['bench at 23 °C', 0.2],
        ['counter gate 100 ms', 0.2],
      ]);
      await expect(addNote(runsDir, id, '   ')).rejects.toThrow(/note: must not be empty/);
      await expect(renameDut(runsDir, id, '')).rejects.toThrow(/dut id/);
    });
  });

  it('deletes to a recoverable trash and restores, refusing to overwrite', async () => {
    await withTempDir(async (runsDir) => {
      const id = await finishedRun(runsDir, '2026-12-01T09:00:00Z', 'sensor-osc-a');
      const before = await readFile(join(runsDir, id, 'samples.csv'), 'utf8');
      await deleteRun(runsDir, id);
      expect(await listRuns(runsDir)).toEqual([]);
      expect((await listTrash(runsDir)).map((r) => r.id)).toEqual([id]);
      const restored = await restoreRun(runsDir, id);
      expect(restored.id).toBe(id);
      expect(await readFile(join(runsDir, id, 'samples.csv'), 'utf8')).toBe(before);
      expect(await readdir(join(runsDir, '.trash'))).toEqual([]);
      await expect(restoreRun(runsDir, id)).rejects.toMatchObject({ reason: 'not-found' });
      await expect(restoreRun(runsDir, '../x')).rejects.toMatchObject({ reason: 'bad-input' });
    });
  });

  it('refuses to delete a run that is still being written', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await createRun({
        runsDir,
        kind: 'drift',
        dut: { id: 'osc' },
        instruments: [],
        plan: {},
        columns: ['time_s', 'frequency_hz'],
        clock: new VirtualClock(),
      });
      await expect(deleteRun(runsDir, writer.id)).rejects.toMatchObject({ reason: 'busy' });
      await writer.finish('complete');
      await deleteRun(runsDir, writer.id);
    });
  });
});
