/**
 * Issue 15 item 6: disk faults. A full disk names the file and the OS error
 * (not "short write") and leaves run.json `failed` with the reason; a run
 * folder deleted mid-run is noticed at the next flush and the run stops there,
 * with the simulated supply left in the safe state (read back from the sim).
 */
import { readdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { assembleBench } from '../bench/assemble.ts';
import { driftPlanSchema } from '../../app/contract/plans.ts';
import { recordDrift, recordSweep } from '../procedures/recorded-run.ts';
import { RunControl } from '../procedures/run-control.ts';
import { SHORT_SWEEP_PLAN } from '../procedures/testing/short-sweep-plan.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { createRun } from './run-writer.ts';
import { DiskError, RunFolderGoneError } from './store-error.ts';
import { type StoreFs, nodeStoreFs } from './store-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';

/** samples.csv fills the disk: the OS takes part of a write, then refuses the rest with ENOSPC (as Linux does). */
function fillingDisk(): { fs: StoreFs; full: { on: boolean } } {
  const full = { on: false };
  const fs: StoreFs = {
    ...nodeStoreFs,
    async open(path, flags) {
      const handle = await nodeStoreFs.open(path, flags);
      let partialDone = false;
      return {
        ...handle,
        async write(data) {
          if (!full.on || !path.endsWith('samples.csv')) return handle.write(data);
          if (!partialDone) {
            partialDone = true;
            const bytes = typeof data === 'string' ? Buffer.from(data) : data;
            return handle.write(bytes.subarray(0, Math.floor(bytes.length / 3)));
          }
          throw Object.assign(new Error('ENOSPC: no space left on device, write'), {
            code: 'ENOSPC',
            syscall: 'write',
          });
        },
      };
    },
  };
  return { fs, full };
}

type SimBench = Awaited<ReturnType<typeof assembleBench>>;
interface RecordHooks {
  onRunStarted: (meta: unknown, runDir: string) => void;
  onSample: () => void;
}

/**
 * Records on the simulated bench (virtual clock) and deletes the run's folder once `atRow` readings are in; gives
 * the recording's error, the folder, how many readings came after the deletion and the supply's real state.
 */
async function withFolderDeletedAt(
  atRow: number,
  record: (bench: SimBench, clock: VirtualClock, hooks: RecordHooks) => Promise<unknown>,
) {
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation' } });
  let dir = '';
  let rows = 0;
  const deletions: Promise<void>[] = [];
  const error = await record(bench, clock, {
    onRunStarted: (_meta, runDir) => (dir = runDir),
    onSample: () => {
      rows++;
      if (rows === atRow) deletions.push(rm(dir, { recursive: true, force: true }));
    },
  }).catch((e: unknown) => e);
  await Promise.all(deletions);
  const control = bench.sim?.supply.state(1);
  await bench.close();
  return { error, dir, rowsAfterDelete: rows - atRow, control };
}

describe('disk faults while recording', () => {
  it('a full disk names samples.csv and ENOSPC, and run.json ends failed with the reason', async () => {
    await withTempDir(async (runsDir) => {
      const { fs, full } = fillingDisk();
      const writer = await createRun({
        runsDir,
        kind: 'sweep',
        dut: { id: 'disk-probe' },
        instruments: [],
        plan: {},
        columns: ['control_v', 'frequency_hz', 'status'],
        clock: new VirtualClock(),
        fs,
      });
      writer.appendSample([1, 1000, 'ok']);
      await writer.flush();
      full.on = true;
      for (let i = 0; i < 20; i++) writer.appendSample([1 + i / 10, 1000 + i, 'ok']);
      const error = await writer.flush().catch((e: unknown) => e);
      expect(error).toBeInstanceOf(DiskError);
      expect((error as DiskError).osCode).toBe('ENOSPC');
      expect((error as Error).message).toBe(
        `cannot write ${join(writer.dir, 'samples.csv')}: ENOSPC: no space left on device, write`,
      );
      await expect(writer.finish('complete')).rejects.toThrow(/samples\.csv: ENOSPC/);
      const meta = JSON.parse(await readFile(join(writer.dir, 'run.json'), 'utf8')) as {
        status: string;
        failure: string;
      };
      expect(meta.status).toBe('failed');
      expect(meta.failure).toMatch(/samples\.csv: ENOSPC/);
      // The partial write was cut back: the file holds whole rows only.
      expect(await readFile(join(writer.dir, 'samples.csv'), 'utf8')).toBe(
        'control_v,frequency_hz,status\n1,1000,ok\n',
      );
    });
  });

  it('a disk that fills while run.json is replaced: ENOSPC ends in place, a short write is a DiskError naming run.json with the old file whole; no temp left', async () => {
    // Found by re-probing on a real 1 MiB tmpfs: finishing a drift log failed with "Error: ENOSPC: no space left
    // on device, write" (no path) and left an empty .run.json.*.tmp. A short write (the OS took part of the
    // text, as Linux does on a filling disk) must never be renamed over run.json as a torn file either.
    for (const mode of ['short', 'refused'] as const) {
      await withTempDir(async (runsDir) => {
        const full = { on: false };
        const fs: StoreFs = {
          ...nodeStoreFs,
          async open(path, flags) {
            const handle = await nodeStoreFs.open(path, flags);
            if (!/\.run\.json\..*\.tmp$/.test(path)) return handle;
            let calls = 0;
            return {
              ...handle,
              async write(data) {
                if (!full.on) return handle.write(data);
                calls++;
                const bytes = typeof data === 'string' ? Buffer.from(data) : data;
                if (mode === 'short' && calls === 1)
                  return handle.write(bytes.subarray(0, Math.floor(bytes.length / 3)));
                if (mode === 'short') return { bytesWritten: 0 };
                throw Object.assign(new Error('ENOSPC: no space left on device, write'), {
                  code: 'ENOSPC',
                  syscall: 'write',
                });
              },
            };
          },
        };
        const writer = await createRun({
          runsDir,
          kind: 'drift',
          dut: { id: 'full-at-finish' },
          instruments: [],
          plan: {},
          columns: ['frequency_hz', 'status'],
          clock: new VirtualClock(),
          fs,
        });
        writer.appendSample([1000, 'ok']);
        await writer.flush();
        const before = await readFile(join(writer.dir, 'run.json'), 'utf8');
        full.on = true;
        const error = await writer.finish('complete').catch((e: unknown) => e);
        if (mode === 'refused') {
          // ENOSPC: the final status goes in place into the blocks run.json reserved at the start
          // (run-json-space.ts), the file's length unchanged, its JSON whole.
          expect(error, mode).not.toBeInstanceOf(Error);
          const after = await readFile(join(writer.dir, 'run.json'), 'utf8');
          expect(Buffer.byteLength(after)).toBe(Buffer.byteLength(before));
          expect(JSON.parse(after)).toMatchObject({ status: 'complete', id: writer.id });
        } else {
          // A short write with no OS error is not known to be a full disk: no in-place fallback.
          expect(error, mode).toBeInstanceOf(DiskError);
          expect((error as Error).message).toContain(`cannot write ${join(writer.dir, 'run.json')}: `);
          expect((error as Error).message).toMatch(/short write/);
          // The old run.json stays whole (a reader finds the run interrupted).
          expect(await readFile(join(writer.dir, 'run.json'), 'utf8')).toBe(before);
        }
        // No temp file is left behind.
        expect((await readdir(writer.dir)).filter((name) => name.endsWith('.tmp'))).toEqual([]);
      });
    }
  });

  it('a run folder deleted mid-sweep is noticed at the next flush; the sweep stops there and leaves the supply safe', async () => {
    await withTempDir(async (runsDir) => {
      const plan = SHORT_SWEEP_PLAN;
      const { error, dir, rowsAfterDelete, control } = await withFolderDeletedAt(6, (bench, clock, hooks) =>
        recordSweep({ bench, plan, clock, runsDir, dutId: 'vanishing-folder', ...hooks }),
      );
      expect(error).toBeInstanceOf(RunFolderGoneError);
      expect((error as Error).message).toContain(dir);
      // Stopped at the next flush (the end of the point): at most one point's readings after the deletion.
      expect(rowsAfterDelete).toBeLessThanOrEqual(plan.readingsPerPoint);
      expect(control?.outputOn).toBe(false);
      expect(control?.setpointV).toBeCloseTo(0.5, 9);
    });
  });

  it('a run folder deleted mid-drift stops the log within a flush period (not at its end), through the safe state', async () => {
    // Re-probe of item 6: a drift log flushes on the writer's own 1 s timer, whose failure was only reported;
    // the log ran to its planned end writing into nothing and noticed at finish.
    await withTempDir(async (runsDir) => {
      const plan = driftPlanSchema.parse({
        controlV: 2.5,
        intervalS: 0.1,
        durationS: 60,
        gateS: 0.05,
        settle: { mode: 'fixed', seconds: 0.05 },
        limits: { maxControlV: 5, currentLimitA: 0.02 },
        safe: { controlV: 0.5, outputOff: true },
      });
      const { error, rowsAfterDelete, control } = await withFolderDeletedAt(20, (bench, clock, hooks) =>
        recordDrift({ bench, plan, clock, control: new RunControl(), runsDir, dutId: 'vanishing-folder', ...hooks }),
      );
      expect(error).toBeInstanceOf(RunFolderGoneError);
      // The writer flushes at least once a second on the procedure's clock: ten 0.1 s readings, plus one in flight.
      expect(rowsAfterDelete).toBeLessThanOrEqual(12);
      expect(control?.outputOn).toBe(false);
      expect(control?.setpointV).toBeCloseTo(0.5, 9);
    });
  });
});
