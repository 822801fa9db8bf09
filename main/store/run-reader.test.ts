import { appendFile, readFile, readdir, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { readRunFolder, readRunStatus } from './run-reader.ts';
import { createRun } from './run-writer.ts';
import { parseSamplesCsv } from './samples-csv.ts';
import { deadPid } from './testing/dead-pid.ts';
import { faultyFs } from './testing/faulty-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';

function sweepRun(runsDir: string, clock: VirtualClock, fs?: ReturnType<typeof faultyFs>) {
  return createRun({
    runsDir,
    kind: 'sweep',
    dut: { id: 'clock-mult-vco-3' },
    instruments: [],
    plan: { start: 0.5, stop: 4.5, step: 0.5 },
    columns: ['time_s', 'control_v', 'frequency_hz', 'direction', 'status'],
    clock,
    ...(fs ? { fs } : {}),
  });
}

/** Points a running run's writer.lock at a process that no longer exists. */
async function killWriter(dir: string): Promise<number> {
  const pid = await deadPid();
  const lock = {
    pid,
    host: hostname(),
    startedAt: '2026-01-01T00:00:00.000Z',
    heartbeatAt: '2026-01-01T00:00:05.000Z',
  };
  await writeFile(join(dir, 'writer.lock'), JSON.stringify(lock));
  return pid;
}

describe('readRunFolder', () => {
  it('reads meta, the samples text and events of a finished run', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await sweepRun(runsDir, clock);
      writer.appendSample([0, 0.5, 10e6, 'up', 'ok']);
      writer.appendEvent({ type: 'retry', time_s: 0.05 });
      await writer.finish('complete');
      const run = await readRunFolder(writer.dir);
      expect(run.meta.status).toBe('complete');
      expect(parseSamplesCsv(run.samplesCsv).numeric.frequency_hz).toEqual([10e6]);
      expect(run.events).toEqual([{ time_s: 0.05, type: 'retry' }]);
    });
  });

  it('leaves the old run.json valid when the process dies between the temp write and the rename', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const plan: { failRenameTo?: string } = {};
      const writer = await sweepRun(runsDir, clock, faultyFs(plan));
      writer.appendSample([0, 0.5, 10e6, 'up', 'ok']);
      plan.failRenameTo = 'run.json';
      await expect(writer.finish('complete')).rejects.toThrow(/before rename/);
      // run.json is the old, whole file. (A rename that fails with an error removes its temp file; one cut
      // short by a real death leaves it, and readers never look at temp files.)
      const names = await readdir(writer.dir);
      expect(names.some((n) => n.startsWith('.run.json.') && n.endsWith('.tmp'))).toBe(false);
      const run = await readRunFolder(writer.dir);
      expect(run.meta.status).toBe('running'); // our own live writer still holds it
      expect(parseSamplesCsv(run.samplesCsv).rowCount).toBe(1);
    });
  });

  it('shows a run whose writer process is dead as interrupted, and the first reader records it once', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await sweepRun(runsDir, clock);
      writer.appendSample([0, 0.5, 10e6, 'up', 'ok']);
      writer.appendSample([0.5, 1, 11e6, 'up', 'ok']);
      await writer.flush();
      // The writer "dies": its lock now names a real pid that has exited.
      const pid = await killWriter(writer.dir);
      await appendFile(join(writer.dir, 'samples.csv'), '0.9,1.5,12'); // torn last line
      await appendFile(join(writer.dir, 'events.jsonl'), '{"time_s":0.9,"ty'); // torn event

      const [first, second] = await Promise.all([readRunFolder(writer.dir), readRunStatus(writer.dir)]);
      expect(first.meta.status).toBe('interrupted');
      expect(second.status).toBe('interrupted');
      expect(first.meta.endedAt).toBe('2026-01-01T00:00:05.000Z');
      const onDisk = JSON.parse(await readFile(join(writer.dir, 'run.json'), 'utf8')) as { status: string };
      expect(onDisk.status).toBe('interrupted');

      const again = await readRunFolder(writer.dir);
      const interruptions = again.events.filter((e) => e.type === 'interrupted');
      expect(interruptions).toHaveLength(1);
      expect(interruptions[0]).toMatchObject({ time_s: 0.5, writerPid: pid });
      expect(again.droppedEventLines).toEqual([1]);
      const samples = parseSamplesCsv(again.samplesCsv);
      expect(samples.numeric.frequency_hz).toEqual([10e6, 11e6]);
      expect(samples.dropped).toEqual([{ lineNumber: 4, reason: 'no-newline', text: '0.9,1.5,12' }]);
      expect((await readdir(writer.dir)).filter((n) => n === 'writer.lock' || n === 'interrupted.claim')).toEqual([]);
    });
  });

  it('treats a lock from another host as alive while its heartbeat is fresh', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await sweepRun(runsDir, clock);
      const lock = (heartbeatAt: string) =>
        JSON.stringify({ pid: 1, host: 'other-bench-pc', startedAt: heartbeatAt, heartbeatAt });
      const probe = {
        host: hostname(),
        pid: process.pid,
        nowMs: Date.parse('2026-01-01T00:10:00Z'),
        isPidAlive: () => true,
        procStartOf: () => null,
      };
      await writeFile(join(writer.dir, 'writer.lock'), lock('2026-01-01T00:09:30Z'));
      expect((await readRunStatus(writer.dir, { probe })).status).toBe('running');
      await writeFile(join(writer.dir, 'writer.lock'), lock('2026-01-01T00:08:00Z'));
      expect((await readRunStatus(writer.dir, { probe })).status).toBe('interrupted');
    });
  });

  it('sees through a reused pid on Linux: alive, but not the process that started the run', async () => {
    await withTempDir(async (runsDir) => {
      const writer = await sweepRun(runsDir, new VirtualClock());
      const lock = JSON.parse(await readFile(join(writer.dir, 'writer.lock'), 'utf8')) as { procStart?: string };
      // The lock names our parent: a live process that is certainly not the writer.
      const reused = { ...lock, pid: process.ppid };
      await writeFile(join(writer.dir, 'writer.lock'), JSON.stringify(reused));
      const onLinux = process.platform === 'linux';
      expect(lock.procStart === undefined).toBe(!onLinux);
      expect((await readRunStatus(writer.dir)).status).toBe(onLinux ? 'interrupted' : 'running');
    });
  });

  it('names the file and field of a bad run.json', async () => {
    await withTempDir(async (runsDir) => {
      await writeFile(join(runsDir, 'run.json'), JSON.stringify({ schema: 'tunebench.run/1', id: 'x', kind: 'soak' }));
      await expect(readRunFolder(runsDir)).rejects.toThrow(/run\.json: kind: .*status/s);
    });
  });
});
