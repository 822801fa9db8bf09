import { describe, expect, it, vi } from 'vitest';
import type { BenchApi, BenchEvent, BenchStatus, RunMeta } from '../contract/bench-api.ts';
import { connectStores, createAppStores, restoreRunContext } from './app-stores.ts';

vi.mock('react', () => ({}));

const RUNNING: RunMeta = {
  schema: 'tunebench.run/1',
  id: '20260304-050607-osc-7',
  kind: 'drift',
  status: 'running',
  startedAt: '2026-03-04T05:06:07Z',
  endedAt: null,
  dut: { id: 'osc-7', notes: '' },
  instruments: [],
  plan: { controlV: 2.5, intervalS: 1, gateS: 0.1 },
  software: { version: '0.1.0' },
};

function status(source: BenchStatus['source']): BenchStatus {
  return {
    source,
    output: source === 'run',
    controlSetV: 2.5,
    controlMeasV: null,
    frequencyHz: 13_780,
    temperatureC: 23.5,
    updatedAt: null,
    links: [],
    paused: null,
    safeState: null,
  };
}

function bench(source: BenchStatus['source']) {
  let listener: ((event: BenchEvent) => void) | null = null;
  const api = {
    subscribe: (l: (event: BenchEvent) => void) => {
      listener = l;
      return () => (listener = null);
    },
    getBenchStatus: vi.fn(async () => status(source)),
    listRuns: vi.fn(async () => [RUNNING]),
    openRun: vi.fn(async () => ({
      meta: RUNNING,
      samples: {
        names: ['time_s', 'control_v', 'frequency_hz', 'status'],
        numeric: { time_s: [0, 1, 2], control_v: [2.5, 2.5, 2.5], frequency_hz: [13_770, 13_780, 13_780] },
        text: { status: ['ok', 'ok', 'ok'] },
      },
      events: [{ time_s: 1.5, type: 'pause' }],
    })),
  } as unknown as BenchApi;
  return { api, push: (event: BenchEvent) => listener?.(event) };
}

describe('context after a reload', () => {
  it('a drift log main is still recording becomes the live run again, with its readings so far and its pause, then takes new batches', async () => {
    const { api, push } = bench('run');
    const stores = createAppStores(api);
    connectStores(api, stores);
    await restoreRunContext(api, stores);
    const live = stores.liveRun.getState();
    expect(live).toMatchObject({ active: true, paused: true, rows: 3 });
    expect(live.meta?.id).toBe(RUNNING.id);
    push({
      type: 'samples',
      runId: RUNNING.id,
      rows: [{ time_s: 3, control_v: 2.5, frequency_hz: 13_770, status: 'ok' }],
    });
    expect(stores.liveRun.getState().rows).toBe(4);
    expect(Array.from(stores.liveRun.getState().columns.frequency_hz.view())).toEqual([13_770, 13_780, 13_780, 13_770]);
  });

  it('leaves the window alone when main holds no run (a stale "running" folder is not revived)', async () => {
    const { api } = bench('idle');
    const stores = createAppStores(api);
    await restoreRunContext(api, stores);
    expect(stores.liveRun.getState().meta).toBeNull();
  });
});
