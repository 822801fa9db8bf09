import { appendFile, readFile, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { readRunFolder } from './run-reader.ts';
import { createRun } from './run-writer.ts';
import { reopenRun } from './reopen-run.ts';
import { parseSamplesCsv } from './samples-csv.ts';
import { deadPid } from './testing/dead-pid.ts';
import { withTempDir } from './testing/temp-dir.ts';

describe('reopenRun', () => {
  it('resumes an interrupted drift log in the same folder: torn tails cut, gap recorded, time axis continued', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock({ startWallIso: '2026-12-02T00:00:00.000Z' });
      const writer = await createRun({
        runsDir,
        kind: 'drift',
        dut: { id: 'sensor-osc-a' },
        instruments: [],
        plan: { controlV: 2.5, intervalS: 1, durationS: 3600 },
        columns: ['time_s', 'frequency_hz', 'status'],
        clock,
      });
      for (let i = 0; i < 3; i++) writer.appendSample([i, 1e6 + i, 'ok']);
      await writer.flush();
      // Crash: the writer's process is gone and both files end in a torn line.
      await writeFile(
        join(writer.dir, 'writer.lock'),
        JSON.stringify({
          pid: await deadPid(),
          host: hostname(),
          startedAt: 'x',
          heartbeatAt: '2026-12-02T00:00:02.000Z',
        }),
      );
      await appendFile(join(writer.dir, 'samples.csv'), '3,1000');
      await appendFile(join(writer.dir, 'events.jsonl'), '{"time_s":3,');

      // A new process, an hour later by the wall clock.
      const later = new VirtualClock({ startS: 50, startWallIso: '2026-12-02T01:00:00.000Z' });
      const resumed = await reopenRun({ runsDir, id: writer.id, clock: later });
      expect(resumed.dir).toBe(writer.dir);
      expect(resumed.elapsedS()).toBe(3600);
      resumed.appendSample([resumed.elapsedS(), 1.5e6, 'ok']);
      await later.advance(1);
      resumed.appendSample([resumed.elapsedS(), 1.6e6, 'ok']);
      await resumed.finish('complete');

      const run = await readRunFolder(writer.dir);
      expect(run.meta.status).toBe('complete');
      const samples = parseSamplesCsv(run.samplesCsv);
      expect(samples.dropped).toEqual([]);
      expect(samples.numeric.time_s).toEqual([0, 1, 2, 3600, 3601]);
      // The torn event was closed off by the reader that recorded the interruption: still dropped, never read.
      expect(run.droppedEventLines).toEqual([1]);
      expect(run.events.map((e) => e.type)).toEqual(['interrupted', 'gap']);
      expect(run.events[1]).toMatchObject({ time_s: 3600, fromS: 2, toS: 3600 });
      expect(await readFile(join(writer.dir, 'samples.csv'), 'utf8')).toBe(
        'time_s,frequency_hz,status\n0,1000000,ok\n1,1000001,ok\n2,1000002,ok\n3600,1500000,ok\n3601,1600000,ok\n',
      );
    });
  });

  it('refuses complete runs, live runs and hostile ids', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await createRun({
        runsDir,
        kind: 'drift',
        dut: { id: 'osc' },
        instruments: [],
        plan: {},
        columns: ['time_s'],
        clock,
      });
      await expect(reopenRun({ runsDir, id: writer.id, clock })).rejects.toMatchObject({ reason: 'busy' });
      await writer.finish('complete');
      await expect(reopenRun({ runsDir, id: writer.id, clock })).rejects.toThrow(
        /is complete; only an interrupted run can be resumed/,
      );
      await expect(reopenRun({ runsDir, id: '../../tmp', clock })).rejects.toMatchObject({ reason: 'bad-input' });
    });
  });
});
