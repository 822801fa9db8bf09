import { readFile, readdir } from 'node:fs/promises';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it, vi } from 'vitest';
import { VirtualClock } from '../time/virtual-clock.ts';
import { createRun } from './run-writer.ts';
import { parseRunMeta } from './run-meta.ts';
import { parseSamplesCsv } from './samples-csv.ts';
import { parseEventsJsonl } from './events-jsonl.ts';
import { faultyFs } from './testing/faulty-fs.ts';
import { withTempDir } from './testing/temp-dir.ts';

const DRIFT_COLUMNS = ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status'] as const;

function driftRun(runsDir: string, clock: VirtualClock, extra: Partial<Parameters<typeof createRun>[0]> = {}) {
  return createRun({
    runsDir,
    kind: 'drift',
    dut: { id: 'Sensor osc A' },
    instruments: [{ role: 'counter', idn: 'SIM,COUNTER,0,1', address: 'sim' }],
    plan: { controlV: 2.5, intervalS: 0.25, durationS: 3600 },
    columns: DRIFT_COLUMNS,
    clock,
    ...extra,
  });
}

async function rowsOnDisk(dir: string): Promise<number> {
  return parseSamplesCsv(await readFile(join(dir, 'samples.csv'), 'utf8')).rowCount;
}

describe('createRun', () => {
  it('creates the run folder of CONTRACTS.md with a timestamp + DUT slug id', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock({ startWallIso: '2026-12-02T01:45:12.000Z' });
      const writer = await driftRun(runsDir, clock);
      expect(writer.id).toBe('20261202-014512-sensor-osc-a');
      expect((await readdir(writer.dir)).sort()).toEqual(['events.jsonl', 'run.json', 'samples.csv', 'writer.lock']);
      const meta = parseRunMeta(await readFile(join(writer.dir, 'run.json'), 'utf8'), 'run.json');
      expect(meta).toMatchObject({
        schema: 'tunebench.run/1',
        id: writer.id,
        kind: 'drift',
        status: 'running',
        startedAt: '2026-12-02T01:45:12.000Z',
        endedAt: null,
        dut: { id: 'Sensor osc A', notes: '' },
        software: { version: '0.1.0' },
      });
      expect(await readFile(join(writer.dir, 'samples.csv'), 'utf8')).toBe(
        'time_s,control_v,frequency_hz,temperature_c,status\n',
      );
      // A second run in the same second gets a suffix rather than sharing the folder.
      const second = await driftRun(runsDir, clock);
      expect(second.id).toBe('20261202-014512-sensor-osc-a-2');
      await writer.finish('complete');
      await second.finish('aborted');
    });
  });

  it('writes rows by index or by name with round-trip numbers, and events with time_s', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await driftRun(runsDir, clock);
      writer.appendSample([0.1, 2.5, 0.1 + 0.2, 25.125, 'ok']);
      writer.appendSample({ time_s: 1.1, control_v: 2.5, frequency_hz: Number.NaN, status: 'no-signal' });
      await clock.advance(2);
      writer.appendEvent({ type: 'fault', detail: 'counter timeout' });
      const meta = await writer.finish('complete');
      expect(meta.status).toBe('complete');
      expect(meta.endedAt).toBe('2026-01-01T00:00:02.000Z');
      const text = await readFile(join(writer.dir, 'samples.csv'), 'utf8');
      expect(text.split('\n').slice(1)).toEqual(['0.1,2.5,0.30000000000000004,25.125,ok', '1.1,2.5,,,no-signal', '']);
      const events = parseEventsJsonl(await readFile(join(writer.dir, 'events.jsonl'), 'utf8')).events;
      expect(events).toEqual([{ time_s: 2, type: 'fault', detail: 'counter timeout' }]);
      expect((await readdir(writer.dir)).includes('writer.lock')).toBe(false);
      expect(() => writer.appendSample([1])).toThrow(/already finished/);
    });
  });

  it('puts every row on disk within one second of clock time without an explicit flush', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await driftRun(runsDir, clock);
      const appendedAt: number[] = [];
      for (let step = 0; step < 40; step++) {
        appendedAt.push(clock.now());
        writer.appendSample([clock.now(), 2.5, 1e6 + step, 25, 'ok']);
        await clock.advance(0.125);
        // Every row appended at least 1 s ago must be on disk now.
        const due = appendedAt.filter((t) => t <= clock.now() - 1).length;
        await vi.waitFor(async () => expect(await rowsOnDisk(writer.dir)).toBeGreaterThanOrEqual(due), {
          timeout: 2000,
          interval: 5,
        });
      }
      // And flush() is there for the end of each point.
      await writer.flush();
      expect(await rowsOnDisk(writer.dir)).toBe(40);
      await writer.finish('complete');
    });
  });

  it('keeps a flush timer on the clock only while something is pending', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const writer = await driftRun(runsDir, clock);
      expect(clock.pendingTimers).toBe(0); // an idle writer never keeps virtual time moving
      writer.appendSample([0, 2.5, 1e6, 25, 'ok']);
      writer.appendSample([0.1, 2.5, 1e6, 25, 'ok']);
      writer.appendEvent({ type: 'retry' });
      expect(clock.pendingTimers).toBe(1);
      await clock.advance(1);
      await vi.waitFor(async () => expect(await rowsOnDisk(writer.dir)).toBe(2), { timeout: 2000, interval: 5 });
      expect(clock.pendingTimers).toBe(0);
      await writer.finish('complete');
      expect(clock.pendingTimers).toBe(0);
    });
  });

  it('keeps rows pending through a failed half write and never leaves a glued or torn row', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const plan = { failWrites: { pathEndsWith: 'samples.csv', count: 0 } };
      const writer = await driftRun(runsDir, clock, { fs: faultyFs(plan) });
      for (let i = 0; i < 5; i++) writer.appendSample([i, 2.5, 1000 + i, 25, 'ok']);
      await writer.flush();
      plan.failWrites.count = 2;
      for (let i = 5; i < 10; i++) writer.appendSample([i, 2.5, 1000 + i, 25, 'ok']);
      await expect(writer.flush()).rejects.toThrow(/ENOSPC/);
      expect(writer.pendingRows()).toBe(5);
      writer.appendSample([10, 2.5, 1010, 25, 'ok']);
      await expect(writer.flush()).rejects.toThrow(/ENOSPC/);
      await writer.flush();
      await writer.finish('complete');
      const parsed = parseSamplesCsv(await readFile(join(writer.dir, 'samples.csv'), 'utf8'));
      expect(parsed.dropped).toEqual([]);
      expect(parsed.numeric.time_s).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
      expect(parsed.numeric.frequency_hz).toEqual([1000, 1001, 1002, 1003, 1004, 1005, 1006, 1007, 1008, 1009, 1010]);
    });
  });

  it('reports timer flush failures through onError and recovers on the next tick', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const plan = { failWrites: { pathEndsWith: 'samples.csv', count: 0 } };
      const errors: Error[] = [];
      const writer = await driftRun(runsDir, clock, { fs: faultyFs(plan), onError: (e) => errors.push(e) });
      plan.failWrites.count = 1;
      writer.appendSample([0, 2.5, 1000, 25, 'ok']);
      await clock.advance(1);
      await vi.waitFor(() => expect(errors).toHaveLength(1), { timeout: 2000, interval: 5 });
      await clock.advance(1);
      await vi.waitFor(async () => expect(await rowsOnDisk(writer.dir)).toBe(1), { timeout: 2000, interval: 5 });
      await writer.finish('complete');
    });
  });

  it('fsyncs at most once per real second, only after new data, and beats the lock heartbeat every 10 s', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      let wallMs = Date.parse('2026-01-01T00:00:00Z');
      let syncs = 0;
      const counting = faultyFs({});
      const fs = {
        ...counting,
        async open(path: string, flags: 'a' | 'w' | 'r') {
          const handle = await counting.open(path, flags);
          return { ...handle, sync: () => ((syncs += path.endsWith('samples.csv') ? 1 : 0), handle.sync()) };
        },
      };
      const writer = await driftRun(runsDir, clock, { fs, wallNowMs: () => wallMs });
      const heartbeat = async () =>
        (JSON.parse(await readFile(join(writer.dir, 'writer.lock'), 'utf8')) as { heartbeatAt: string }).heartbeatAt;
      // 20 flushes 0.25 s apart in both clocks: 5 s of data → 5 syncs, not 20.
      for (let i = 0; i < 20; i++) {
        writer.appendSample([i * 0.25, 2.5, 1e6, 25, 'ok']);
        wallMs += 250;
        await writer.flush();
      }
      expect(syncs).toBe(5);
      // Nothing new: no more syncs, however much time passes.
      wallMs += 5000;
      await writer.flush();
      expect(syncs).toBe(5);
      expect(await heartbeat()).toBe('2026-01-01T00:00:10.000Z');
      await writer.finish('complete');
      expect(syncs).toBe(5); // finish syncs only if something is unsynced
    });
  });

  it('reads back exactly what was appended: any double, any text (property)', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      const rowArb = fc.tuple(fc.double(), fc.double(), fc.string({ unit: 'binary-ascii', maxLength: 12 }));
      await fc.assert(
        fc.asyncProperty(fc.array(rowArb, { maxLength: 30 }), async (rows) => {
          const writer = await createRun({
            runsDir,
            kind: 'sweep',
            dut: { id: 'prop' },
            instruments: [],
            plan: {},
            columns: ['time_s', 'frequency_hz', 'note'],
            clock,
          });
          for (const row of rows) writer.appendSample(row);
          await writer.finish('complete');
          const parsed = parseSamplesCsv(await readFile(join(writer.dir, 'samples.csv'), 'utf8'), {
            textColumns: ['note'],
          });
          expect(parsed.dropped).toEqual([]);
          expect(parsed.rowCount).toBe(rows.length);
          rows.forEach(([a, b, text], i) => {
            expect(Object.is(parsed.numeric.time_s?.[i], a)).toBe(true);
            expect(Object.is(parsed.numeric.frequency_hz?.[i], b)).toBe(true);
            // Line breaks inside a cell become spaces: one line per row, always.
            expect(parsed.text.note?.[i]).toBe(text.replace(/[\r\n]+/g, ' '));
          });
        }),
        { numRuns: 60 },
      );
    });
  });

  it('validates columns and DUT id, naming the field', async () => {
    await withTempDir(async (runsDir) => {
      const clock = new VirtualClock();
      await expect(driftRun(runsDir, clock, { columns: ['time_s', 'time_s'] })).rejects.toThrow(
        /columns: "time_s" appears twice/,
      );
      await expect(driftRun(runsDir, clock, { columns: ['bad,name'] })).rejects.toThrow(/columns:/);
      await expect(driftRun(runsDir, clock, { dut: { id: '  ' } })).rejects.toThrow(/dut id: must not be empty/);
      expect(await readdir(runsDir)).toEqual([]);
      // A disk that fails while the folder is being made leaves no half-made run behind.
      const failing = faultyFs({ failWrites: { pathEndsWith: 'samples.csv', count: 1 } });
      await expect(driftRun(runsDir, clock, { fs: failing })).rejects.toThrow(/ENOSPC/);
      expect(await readdir(runsDir)).toEqual([]);
    });
  });
});
