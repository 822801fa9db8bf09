import { describe, expect, it, vi } from 'vitest';
import type { BenchApi, BenchEvent, RunMeta } from '../contract/bench-api.ts';
import { connectStores, createAppStores } from './app-stores.ts';

// Stores are plain functions: React must never be needed.
vi.mock('react', () => ({}));

function meta(id: string, startedAt: string, overrides: Partial<RunMeta> = {}): RunMeta {
  return {
    schema: 'tunebench.run/1',
    id,
    kind: 'sweep',
    status: 'running',
    startedAt,
    endedAt: null,
    dut: { id: 'clock-mult-02', notes: '' },
    instruments: [],
    plan: {},
    software: { version: '0.1.0' },
    ...overrides,
  };
}

function fakeBench() {
  let listener: ((event: BenchEvent) => void) | null = null;
  const deleted = new Set<string>();
  const runs = [
    meta('a', '2026-01-01T00:00:00Z', { status: 'complete' }),
    meta('b', '2026-02-01T00:00:00Z', { status: 'complete' }),
  ];
  // Mocks the tests inspect, kept as plain properties (expect() takes them, never unbound methods).
  const mocks = {
    restoreRun: vi.fn(async (id: string) => {
      deleted.delete(id);
      const found = runs.find((r) => r.id === id);
      if (!found) throw new Error('gone');
      return found;
    }),
    openRun: vi.fn(async (id: string) => ({
      meta: runs.find((r) => r.id === id) ?? meta(id, 'x'),
      samples: {
        names: ['time_s', 'frequency_hz', 'status'],
        numeric: { time_s: [0, 1, 2], frequency_hz: [1, 2, 3] },
        text: { status: ['ok', 'ok', 'ok'] },
      },
      events: [],
    })),
    connect: vi.fn(async (_which: string): Promise<never> => {
      throw new Error('supply.address: cannot open /dev/ttyUSB9');
    }),
  };
  const bench = {
    subscribe: (l: (event: BenchEvent) => void) => {
      listener = l;
      return () => (listener = null);
    },
    listRuns: vi.fn(async () => runs.filter((r) => !deleted.has(r.id))),
    deleteRun: vi.fn(async (id: string) => void deleted.add(id)),
    ...mocks,
    renameRun: vi.fn(async (id: string, dutId: string) => ({
      ...meta(id, '2026-01-01T00:00:00Z'),
      dut: { id: dutId, notes: '' },
    })),
  } as unknown as BenchApi;
  return { bench, mocks, push: (event: BenchEvent) => listener?.(event) };
}

describe('app stores', () => {
  it('fills the live run columns from sample batches and bumps version per batch', () => {
    const { bench, push } = fakeBench();
    const stores = createAppStores(bench);
    connectStores(bench, stores);
    push({ type: 'samples', runId: 'r1', rows: [{ control_v: 1 }] }); // before run-started: ignored
    expect(stores.liveRun.getState().rows).toBe(0);
    push({ type: 'run-started', meta: meta('r1', '2026-03-01T00:00:00Z') });
    const v0 = stores.liveRun.getState().version;
    const columnsRef = stores.liveRun.getState().columns;
    push({
      type: 'samples',
      runId: 'r1',
      rows: [
        { time_s: 0, control_v: 0.5, frequency_hz: 1e6, status: 'ok' },
        { time_s: 1, control_v: 0.6, frequency_hz: 1.1e6, status: 'ok' },
      ],
    });
    push({ type: 'samples', runId: 'other', rows: [{ control_v: 9 }] });
    push({ type: 'samples', runId: 'r1', rows: [{ time_s: 2, control_v: 0.7, frequency_hz: 1.2e6, status: 'ok' }] });
    const state = stores.liveRun.getState();
    expect(state.rows).toBe(3);
    expect(state.version).toBe(v0 + 2);
    expect(state.columns).toBe(columnsRef); // held by reference, not replaced
    expect(Array.from(state.columns.control_v.view())).toEqual([0.5, 0.6, 0.7]);
    push({
      type: 'progress',
      progress: { runId: 'r1', kind: 'sweep', phase: 'paused', pointsDone: 3, pointsTotal: 10, etaS: 7, latest: null },
    });
    expect(stores.liveRun.getState().paused).toBe(true);
    // A later non-paused phase does not unpause by itself; the resume call does.
    push({
      type: 'progress',
      progress: {
        runId: 'r1',
        kind: 'sweep',
        phase: 'settling',
        pointsDone: 3,
        pointsTotal: 10,
        etaS: 7,
        latest: null,
      },
    });
    expect(stores.liveRun.getState().paused).toBe(true);
    stores.liveRun.getState().setPaused(false);
    expect(stores.liveRun.getState().paused).toBe(false);
    push({ type: 'run-ended', meta: meta('r1', '2026-03-01T00:00:00Z', { status: 'aborted' }) });
    expect(stores.liveRun.getState().active).toBe(false);
    expect(stores.runs.getState().runs[0]?.status).toBe('aborted');
  });

  it('routes connection, live readouts and error notices', () => {
    const { bench, push } = fakeBench();
    const stores = createAppStores(bench);
    connectStores(bench, stores);
    push({ type: 'connection', state: { connected: true, simulated: true, roles: [], error: null } });
    push({
      type: 'live',
      readout: { controlSetV: 1.5, controlMeasV: 1.499, frequencyHz: 4e8, temperatureC: 24.5, timeS: 3 },
    });
    push({ type: 'error', message: 'counter timed out' });
    expect(stores.connection.getState().connection.simulated).toBe(true);
    expect(stores.connection.getState().readout?.frequencyHz).toBe(4e8);
    expect(stores.notice.getState().message).toBe('counter timed out');
    push({ type: 'connection', state: { connected: false, simulated: false, roles: [], error: null } });
    expect(stores.connection.getState().readout).toBeNull();
  });

  it('keeps a failed connect as an error message', async () => {
    const { bench } = fakeBench();
    const stores = createAppStores(bench);
    expect(await stores.connection.getState().connect('sim')).toBe(false);
    expect(stores.connection.getState().error).toBe('supply.address: cannot open /dev/ttyUSB9');
    expect(stores.connection.getState().busy).toBe(false);
  });

  it('reconnect opens the last bench again, and says so when this page never opened one', async () => {
    const { bench, mocks } = fakeBench();
    const stores = createAppStores(bench);
    expect(await stores.connection.getState().reconnect()).toBe(false);
    expect(mocks.connect).not.toHaveBeenCalled();
    expect(stores.connection.getState().error).toMatch(/choose the instruments again on the Bench screen/);
    await stores.connection.getState().connect('sim');
    await stores.connection.getState().reconnect();
    expect(mocks.connect.mock.calls).toEqual([['sim'], ['sim']]);
  });

  it('lists runs newest first, deletes with undo, and forgets deleted runs from picks', async () => {
    const { bench, mocks } = fakeBench();
    const stores = createAppStores(bench);
    const runs = stores.runs.getState();
    await runs.refresh();
    expect(stores.runs.getState().runs.map((r) => r.id)).toEqual(['b', 'a']);
    stores.runs.getState().togglePick('a');
    stores.runs.getState().togglePick('b');
    stores.runs.getState().togglePick('b');
    expect(stores.runs.getState().picked).toEqual(['a']);
    await stores.runs.getState().remove('a');
    expect(stores.runs.getState().runs.map((r) => r.id)).toEqual(['b']);
    expect(stores.runs.getState().picked).toEqual([]);
    expect(stores.runs.getState().lastDeleted?.id).toBe('a');
    await stores.runs.getState().undoRemove();
    expect(mocks.restoreRun).toHaveBeenCalledWith('a');
    expect(stores.runs.getState().runs.map((r) => r.id)).toEqual(['b', 'a']);
    expect(stores.runs.getState().lastDeleted).toBeNull();
  });

  it('opens a run into columns once and renames in place', async () => {
    const { bench, mocks } = fakeBench();
    const stores = createAppStores(bench);
    await stores.runs.getState().refresh();
    const opened = await stores.runs.getState().open('a');
    expect(opened?.rows).toBe(3);
    expect(opened?.columns.frequency_hz.at(2)).toBe(3);
    await stores.runs.getState().open('a');
    expect(mocks.openRun).toHaveBeenCalledTimes(1);
    await stores.runs.getState().rename('a', 'varactor-400M-07');
    expect(stores.runs.getState().runs.find((r) => r.id === 'a')?.dut.id).toBe('varactor-400M-07');
  });

  it('remembers the theme choice and cycles system → dark → light', () => {
    const { bench } = fakeBench();
    const memory = new Map<string, string>();
    const storage = {
      getItem: (k: string) => memory.get(k) ?? null,
      setItem: (k: string, v: string) => void memory.set(k, v),
    };
    const stores = createAppStores(bench, storage);
    expect(stores.settings.getState().theme).toBe('system');
    stores.settings.getState().cycleTheme();
    expect(stores.settings.getState().theme).toBe('dark');
    stores.settings.getState().cycleTheme();
    expect(memory.get('tunebench.theme')).toBe('light');
    expect(createAppStores(bench, storage).settings.getState().theme).toBe('light');
  });
});
