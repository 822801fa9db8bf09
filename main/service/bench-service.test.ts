import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { BenchEvent, ConnectionState } from '../../app/contract/bench-api.ts';
import { parseCallParams } from '../../app/contract/bench-api-schemas.ts';
import { fakeBench, FakeThermometer } from '../procedures/testing/fake-bench.ts';
import { ScaledClock } from '../time/scaled-clock.ts';
import { createBenchService, type BenchService } from './bench-service.ts';
import { driftPort, storePort, sweepPort } from './default-ports.ts';

const CONNECTED: ConnectionState = {
  connected: true,
  simulated: true,
  roles: [
    { role: 'supply', address: 'sim', idn: 'TEST,FAKE,0,1', simulated: true },
    { role: 'counter', address: 'sim', idn: 'TEST,FAKE,0,1', simulated: true },
  ],
  error: null,
};

function validated(method: 'startSweep' | 'startDrift', plan: unknown): [never, string] {
  const result = parseCallParams(method, [plan, 'clock-mult-vco-1']);
  if (!result.ok) throw new Error(result.message);
  return result.args as [never, string];
}

// A 1 V…3 V sweep over the toy DUT (stalls below 1 V): 11 points, fixed settle.
const SWEEP = {
  start: 0.6,
  stop: 2.6,
  step: 0.2,
  readingsPerPoint: 2,
  gateS: 0.1,
  settle: { mode: 'fixed', seconds: 0.05 },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: 0.05 },
};

describe('BenchApi service', () => {
  let runsDir: string;
  let service: BenchService;
  let events: BenchEvent[];
  let closed = 0;

  beforeEach(async () => {
    runsDir = await mkdtemp(join(tmpdir(), 'tunebench-service-'));
    // 200× real time: the sweep takes well under a second of real time.
    const clock = new ScaledClock(200);
    events = [];
    service = createBenchService({
      runsDir,
      openBench: async () => ({
        roles: { ...fakeBench(clock), thermometer: new FakeThermometer(clock) },
        connection: CONNECTED,
        clock,
        close: async () => {
          closed++;
        },
      }),
      listSerialPorts: async () => [],
      listProfiles: async () => [],
      store: storePort(runsDir),
      procedures: { sweep: sweepPort, drift: driftPort },
      livePeriodMs: 50,
      batchMs: 100,
    });
    service.subscribe((event) => events.push(event));
  });

  afterEach(async () => {
    await service.close();
    await rm(runsDir, { recursive: true, force: true });
  });

  it('refuses to start a run before a bench is connected', async () => {
    await expect(service.startSweep(...validated('startSweep', SWEEP))).rejects.toThrow(/no bench connected/);
  });

  it('connects, pushes the connection and live readouts while idle', async () => {
    await expect(service.connect('sim')).resolves.toEqual(CONNECTED);
    expect(events.find((e) => e.type === 'connection')).toEqual({ type: 'connection', state: CONNECTED });
    await new Promise((resolve) => setTimeout(resolve, 200));
    const live = events.filter((e) => e.type === 'live');
    expect(live.length).toBeGreaterThanOrEqual(2);
    const first = live[0];
    if (first?.type !== 'live') throw new Error('no live readout');
    expect(first.readout.controlSetV).toBe(0);
    expect(first.readout.temperatureC).toEqual(expect.any(Number));
    await service.disconnect();
    expect(closed).toBe(1);
    expect(events.at(-1)).toMatchObject({ type: 'connection', state: { connected: false } });
  });

  it("a plan refused by its limits or the counter's gate range leaves no run folder", async () => {
    await service.connect('sim');
    await expect(service.startSweep(...validated('startSweep', { ...SWEEP, stop: 6 }))).rejects.toThrow(
      /stop: 6 V exceeds limits\.maxControlV/,
    );
    await expect(service.startSweep(...validated('startSweep', { ...SWEEP, gateS: '20s' }))).rejects.toThrow(
      /gateS: 20 s is outside the counter's gate range/,
    );
    expect(await readdir(runsDir)).toEqual([]);
    expect(events.some((e) => e.type === 'run-started')).toBe(false);
  });

  it('runs one sweep at a time, batches samples, records the run, and pushes its end', async () => {
    await service.connect('sim');
    const meta = await service.startSweep(...validated('startSweep', SWEEP));
    expect(meta).toMatchObject({ kind: 'sweep', status: 'running', dut: { id: 'clock-mult-vco-1' } });
    await expect(service.startSweep(...validated('startSweep', SWEEP))).rejects.toThrow(/already in progress/);
    const ended = await waitFor(() => events.find((e) => e.type === 'run-ended'));
    expect(ended).toMatchObject({ type: 'run-ended', meta: { id: meta.id, status: 'complete' } });

    const batches = events.filter((e) => e.type === 'samples');
    const rows = batches.flatMap((e) => (e.type === 'samples' ? e.rows : []));
    expect(rows).toHaveLength(11 * 2); // 11 setpoints × 2 readings
    expect(batches.length).toBeLessThan(rows.length); // batched, not one event per reading
    expect(events.some((e) => e.type === 'progress')).toBe(true);
    expect(events.some((e) => e.type === 'run-event' && e.event.type === 'output-on')).toBe(true);
    const startIndex = events.findIndex((e) => e.type === 'run-started');
    expect(startIndex).toBeGreaterThanOrEqual(0);
    expect(startIndex).toBeLessThan(events.findIndex((e) => e.type === 'samples'));

    const csv = await readFile(join(runsDir, meta.id, 'samples.csv'), 'utf8');
    expect(csv.trim().split('\n')).toHaveLength(1 + 22);
    const listed = await service.listRuns();
    expect(listed.map((run) => run.id)).toEqual([meta.id]);
    const detail = await service.openRun(meta.id);
    expect(detail.samples.numeric.control_v).toHaveLength(22);
    expect(detail.meta.status).toBe('complete');
  });

  it('starts only one of two runs requested at the same moment', async () => {
    await service.connect('sim');
    const outcomes = await Promise.allSettled([
      service.startSweep(...validated('startSweep', SWEEP)),
      service.startSweep(...validated('startSweep', SWEEP)),
    ]);
    expect(outcomes.map((o) => o.status).sort()).toEqual(['fulfilled', 'rejected']);
    await waitFor(() => events.find((e) => e.type === 'run-ended'));
    expect(events.filter((e) => e.type === 'run-started')).toHaveLength(1);
  });

  it('stops a drift log cleanly: it ends complete, and live readouts resume', async () => {
    await service.connect('sim');
    const meta = await service.startDrift(
      ...validated('startDrift', {
        controlV: 2,
        intervalS: 1,
        durationS: '8h',
        limits: { maxControlV: 5, currentLimitA: 0.05 },
      }),
    );
    await waitFor(() => events.find((e) => e.type === 'samples'));
    await service.pauseRun();
    await service.resumeRun();
    await service.stopRun();
    const ended = await waitFor(() => events.find((e) => e.type === 'run-ended'));
    expect(ended).toMatchObject({ meta: { id: meta.id, status: 'complete' } });
    const afterEnd = events.length;
    await waitFor(() => events.slice(afterEnd).find((e) => e.type === 'live'));
    await expect(service.pauseRun()).rejects.toThrow(/no run in progress/);
  });

  it('publishes the bench status from the run itself: output on and its frequency, then the safe state', async () => {
    await service.connect('sim');
    await waitFor(() =>
      events.find((e) => e.type === 'bench-status' && e.status.source === 'idle' && e.status.output === false),
    );
    await service.startDrift(
      ...validated('startDrift', {
        controlV: 2,
        intervalS: 1,
        durationS: '8h',
        limits: { maxControlV: 5, currentLimitA: 0.05 },
      }),
    );
    const samples = await waitFor(() => events.find((e) => e.type === 'samples'));
    const during = await service.getBenchStatus();
    expect(during).toMatchObject({ source: 'run', output: true, controlSetV: 2 });
    // The strip's frequency is the run's own last reading, not a second query.
    expect(samples.type === 'samples' ? samples.rows.length : 0).toBeGreaterThan(0);
    const runRows = events.flatMap((e) => (e.type === 'samples' ? e.rows : []));
    expect(Number.isFinite(during.frequencyHz)).toBe(true);
    expect(runRows.map((row) => row.frequency_hz)).toContain(during.frequencyHz);
    await service.pauseRun();
    await waitFor(() => events.find((e) => e.type === 'bench-status' && e.status.paused !== null));
    expect((await service.getBenchStatus()).paused).toMatchObject({ controlV: 2 });
    const stoppedAtMs = Date.now();
    await service.stopRun();
    // The run's end is recorded, then the status goes back to the idle poll.
    await waitFor(() =>
      events.find((e) => e.type === 'bench-status' && e.status.source === 'idle' && e.status.safeState !== null),
    );
    const after = await service.getBenchStatus();
    expect(after).toMatchObject({
      source: 'idle',
      output: false,
      controlSetV: 0,
      paused: null,
      safeState: { reached: true, outputOff: true, failures: [] },
    });
    // The time the safe state was reached: after the stop was asked, on the wall clock (ISO 8601).
    const safeAtMs = Date.parse(after.safeState?.at ?? '');
    expect(safeAtMs).toBeGreaterThanOrEqual(stoppedAtMs);
    expect(safeAtMs).toBeLessThanOrEqual(Date.now());
  });
});

async function waitFor<T>(find: () => T | undefined, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = find();
    if (found !== undefined) return found;
    if (Date.now() > deadline) throw new Error('timed out waiting');
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}
