import { writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createRun } from '../store/run-writer.ts';
import { deadPid } from '../store/testing/dead-pid.ts';
import { withTempDir } from '../store/testing/temp-dir.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { runsCommand } from './cmd-runs.ts';
import { UsageError } from './types.ts';

function capture(env: Record<string, string | undefined> = {}) {
  const out = { stdout: '', stderr: '' };
  const io = {
    stdout: { write: (text: string) => ((out.stdout += text), true) },
    stderr: { write: (text: string) => ((out.stderr += text), true) },
    env,
  };
  return { out, io };
}

async function makeRuns(runsDir: string) {
  const sweep = await createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: 'clock-mult-vco' },
    instruments: [],
    plan: {},
    columns: ['time_s', 'control_v', 'frequency_hz', 'status'],
    clock: new VirtualClock({ startWallIso: '2026-12-01T08:00:00.000Z' }),
  });
  await sweep.finish('complete');
  const drift = await createRun({
    runsDir,
    kind: 'drift',
    dut: { id: 'sensor osc A' },
    instruments: [],
    plan: {},
    columns: ['time_s', 'frequency_hz'],
    clock: new VirtualClock({ startWallIso: '2026-12-02T01:00:00.000Z' }),
  });
  await drift.flush();
  // Its process "died": the lock names a pid that has exited.
  await writeFile(
    join(drift.dir, 'writer.lock'),
    JSON.stringify({ pid: await deadPid(), host: hostname(), startedAt: 'x', heartbeatAt: '2026-12-02T01:00:09.000Z' }),
  );
}

describe('tunebench runs', () => {
  it('prints one line per run, newest first, with the dead writer shown as interrupted', async () => {
    await withTempDir(async (runsDir) => {
      await makeRuns(runsDir);
      const { out, io } = capture();
      expect(await runsCommand.run(['--runs', runsDir], io)).toBe(0);
      expect(out.stdout).toBe(
        [
          '20261202-010000-sensor-osc-a    drift  interrupted  sensor osc A    2026-12-02T01:00:00.000Z',
          '20261201-080000-clock-mult-vco  sweep  complete     clock-mult-vco  2026-12-01T08:00:00.000Z',
          '',
        ].join('\n'),
      );
    });
  });

  it('prints run.json objects with --json and takes the folder from TUNEBENCH_RUNS', async () => {
    await withTempDir(async (runsDir) => {
      await makeRuns(runsDir);
      const { out, io } = capture({ TUNEBENCH_RUNS: runsDir });
      expect(await runsCommand.run(['--json'], io)).toBe(0);
      const runs = JSON.parse(out.stdout) as { id: string; status: string; schema: string }[];
      expect(runs.map((r) => [r.id, r.status, r.schema])).toEqual([
        ['20261202-010000-sensor-osc-a', 'interrupted', 'tunebench.run/1'],
        ['20261201-080000-clock-mult-vco', 'complete', 'tunebench.run/1'],
      ]);
    });
  });

  it('rejects stray arguments as a usage error', async () => {
    const { io } = capture();
    await expect(runsCommand.run(['extra'], io)).rejects.toThrow(UsageError);
    await expect(runsCommand.run(['--bogus'], io)).rejects.toThrow(/unknown option --bogus/);
  });
});
