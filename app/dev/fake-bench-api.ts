/**
 * DEV ONLY — not shipped, not a feature. An in-memory BenchApi used by
 * harness.html to look at the screens without the main process: a made-up
 * clock-multiplier VCO that stalls below 0.8 V and is unsteady up to 1.0 V,
 * and a drift log with a slow temperature swing. Timings are sped up.
 */
import type {
  BenchApi,
  BenchEvent,
  ConnectionState,
  RunDetail,
  RunKind,
  RunMeta,
  SampleColumns,
} from '../contract/bench-api.ts';
import type { DriftPlan, SweepPlan } from '../contract/plans.ts';

type Row = Record<string, number | string>;

function makeRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state * 1664525 + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

function vcoHz(controlV: number, random: () => number): number | null {
  if (controlV < 0.8) return null;
  const base = 2.0e6 + 1.8e6 * (controlV - 1) - 0.12e6 * (controlV - 1) ** 2;
  if (controlV < 1.0) return random() < 0.3 ? null : base * (1 + (random() - 0.5) * 0.08);
  return base + (random() - 0.5) * 40;
}

function toColumns(rows: Row[]): SampleColumns {
  const names = rows[0] ? Object.keys(rows[0]) : [];
  const numeric: Record<string, number[]> = {};
  const text: Record<string, string[]> = {};
  for (const name of names) {
    if (!rows.some((r) => typeof r[name] === 'number')) text[name] = rows.map((r) => String(r[name] ?? ''));
    else numeric[name] = rows.map((r) => (typeof r[name] === 'number' ? r[name] : Number.NaN));
  }
  return { names, numeric, text };
}

export function createFakeBench(options: { bigDriftRows?: number } = {}): BenchApi {
  const listeners = new Set<(event: BenchEvent) => void>();
  const random = makeRandom(7);
  const runs = new Map<string, { meta: RunMeta; rows: Row[]; deleted: boolean }>();
  let connection: ConnectionState = { connected: false, simulated: false, roles: [], error: null };
  let timer: ReturnType<typeof setInterval> | null = null;
  let paused = false;
  let stopRequested = false;
  let counter = 0;
  const emit = (event: BenchEvent) => listeners.forEach((l) => l(event));

  function newMeta(kind: RunKind, dutId: string, plan: unknown, startedAt = new Date().toISOString()): RunMeta {
    counter += 1;
    return {
      schema: 'tunebench.run/1',
      id: `${startedAt.slice(0, 19).replace(/[:T-]/g, '')}-${kind}-${counter}`,
      kind,
      status: 'running',
      startedAt,
      endedAt: null,
      dut: { id: dutId, notes: '' },
      instruments: connection.roles.map((r) => ({ role: r.role, idn: r.idn, address: r.address })),
      plan,
      software: { version: 'dev-harness' },
    };
  }

  function finish(id: string, status: RunMeta['status']): void {
    if (timer) clearInterval(timer);
    timer = null;
    const run = runs.get(id);
    if (!run) return;
    run.meta = { ...run.meta, status, endedAt: new Date().toISOString() };
    emit({ type: 'run-ended', meta: run.meta });
  }

  function runLoop(
    meta: RunMeta,
    total: number,
    rowAt: (k: number) => Row[],
    periodMs: number,
    cleanStop: RunMeta['status'],
  ): void {
    const run = { meta, rows: [] as Row[], deleted: false };
    runs.set(meta.id, run);
    paused = false;
    stopRequested = false;
    emit({ type: 'run-started', meta });
    let k = 0;
    timer = setInterval(() => {
      if (stopRequested) return finish(meta.id, cleanStop);
      if (paused) return;
      const rows = rowAt(k);
      run.rows.push(...rows);
      k += 1;
      emit({ type: 'samples', runId: meta.id, rows });
      const last = rows[rows.length - 1];
      emit({
        type: 'progress',
        progress: {
          runId: meta.id,
          kind: meta.kind,
          phase: 'reading',
          pointsDone: k,
          pointsTotal: total,
          etaS: ((total - k) * periodMs) / 1000,
          latest: null,
        },
      });
      if (typeof last?.control_v === 'number')
        emit({
          type: 'live',
          readout: {
            controlSetV: last.control_v,
            controlMeasV: last.control_v - 0.0004,
            frequencyHz: typeof last.frequency_hz === 'number' ? last.frequency_hz : null,
            temperatureC: typeof last.temperature_c === 'number' ? last.temperature_c : 24.8,
            timeS: k,
          },
        });
      if (k >= total) finish(meta.id, 'complete');
    }, periodMs);
  }

  if (options.bigDriftRows) {
    const meta = {
      ...newMeta('drift', 'sensor-osc-overnight', { controlV: 1.2, intervalS: 0.05 }, '2026-11-30T18:00:00.000Z'),
      status: 'complete' as const,
    };
    const rows: Row[] = [];
    for (let i = 0; i < options.bigDriftRows; i += 1) {
      const t = i * 0.05;
      const temperatureC = 24 + 3 * Math.sin(t / 7000);
      rows.push({
        time_s: t,
        control_v: 1.2,
        frequency_hz: 1.2e6 - 36 * (temperatureC - 24) + (random() - 0.5) * 2,
        temperature_c: temperatureC,
        status: 'ok',
      });
    }
    runs.set(meta.id, { meta, rows, deleted: false });
  }

  const api: BenchApi = {
    listSerialPorts: async () => [
      { path: '/dev/ttyUSB0', manufacturer: 'FTDI' },
      { path: '/dev/ttyACM0', manufacturer: null },
    ],
    listProfiles: async () => [
      { name: 'supply-scpi', role: 'supply' },
      { name: 'counter-scpi', role: 'counter' },
      { name: 'thermometer-scpi', role: 'thermometer' },
    ],
    async connect(config) {
      const sim = config === 'sim';
      connection = {
        connected: true,
        simulated: sim,
        roles: (['supply', 'counter', 'thermometer'] as const).map((role) => ({
          role,
          address: sim ? 'sim' : 'tcp://127.0.0.1:5025',
          idn: `tunebench,sim-${role},0,dev`,
          simulated: sim,
        })),
        error: null,
      };
      emit({ type: 'connection', state: connection });
      return connection;
    },
    async disconnect() {
      connection = { connected: false, simulated: false, roles: [], error: null };
      emit({ type: 'connection', state: connection });
      return connection;
    },
    getConnection: async () => connection,
    manualControl: async (request) => ({
      source: 'idle',
      output: request.output,
      controlSetV: request.controlV,
      controlMeasV: request.controlV,
      frequencyHz: null,
      temperatureC: null,
      updatedAt: new Date().toISOString(),
      links: connection.roles.map((r) => ({ role: r.role, state: 'up' as const, detail: null })),
      paused: null,
      safeState: null,
    }),
    getBenchStatus: async () => ({
      source: connection.connected ? 'idle' : 'none',
      output: connection.connected ? false : null,
      controlSetV: null,
      controlMeasV: null,
      frequencyHz: null,
      temperatureC: null,
      updatedAt: null,
      links: connection.roles.map((r) => ({ role: r.role, state: 'up' as const, detail: null })),
      paused: null,
      safeState: null,
    }),
    async startSweep(plan: SweepPlan, dutId) {
      const meta = newMeta('sweep', dutId, plan);
      const start = plan.start ?? 0;
      const step = plan.step ?? 0.1;
      const total = Math.floor(((plan.stop ?? 1) - start) / step + 1e-9) + 1;
      runLoop(
        meta,
        total,
        (k) => {
          const controlV = start + k * step;
          return Array.from({ length: plan.readingsPerPoint }, (_, r) => {
            const f = vcoHz(controlV, random);
            return {
              time_s: k + r * 0.1,
              control_v: controlV,
              frequency_hz: f ?? '',
              direction: 'up',
              status: f === null ? 'no-signal' : 'ok',
            };
          });
        },
        60,
        'aborted',
      );
      return meta;
    },
    async startDrift(plan: DriftPlan, dutId) {
      const meta = newMeta('drift', dutId, plan);
      const total = Math.floor(plan.durationS / plan.intervalS);
      runLoop(
        meta,
        total,
        (k) => {
          const t = k * plan.intervalS;
          const temperatureC = 24 + 2.5 * Math.sin(t / 200);
          return [
            {
              time_s: t,
              control_v: plan.controlV,
              frequency_hz: 2.9e6 - 60 * (temperatureC - 24) + (random() - 0.5) * 3 + (0.5 * t) / 60,
              temperature_c: temperatureC,
              status: 'ok',
            },
          ];
        },
        20,
        'complete',
      );
      return meta;
    },
    async startPushing() {
      throw new Error('not in the dev harness');
    },
    pauseRun: async () => void (paused = true),
    resumeRun: async () => void (paused = false),
    stopRun: async () => void (stopRequested = true),
    listRuns: async () => [...runs.values()].filter((r) => !r.deleted).map((r) => r.meta),
    async openRun(id): Promise<RunDetail> {
      const run = runs.get(id);
      if (!run || run.deleted) throw new Error(`id: no run ${id}`);
      return { meta: run.meta, samples: toColumns(run.rows), events: [] };
    },
    async renameRun(id, dutId) {
      const run = runs.get(id);
      if (!run) throw new Error(`id: no run ${id}`);
      run.meta = { ...run.meta, dut: { ...run.meta.dut, id: dutId } };
      return run.meta;
    },
    async addNote(id, text) {
      const run = runs.get(id);
      if (run)
        run.meta = {
          ...run.meta,
          dut: { ...run.meta.dut, notes: run.meta.dut.notes ? `${run.meta.dut.notes}\n${text}` : text },
        };
    },
    async deleteRun(id) {
      const run = runs.get(id);
      if (run) run.deleted = true;
    },
    async restoreRun(id) {
      const run = runs.get(id);
      if (!run) throw new Error(`id: no run ${id}`);
      run.deleted = false;
      return run.meta;
    },
    async importCsv(fileName, csvText, dutId) {
      const [header = '', ...lines] = csvText.trim().split(/\r?\n/);
      const names = header.split(',').map((h) => h.trim());
      const rows = lines.map(
        (line) => Object.fromEntries(line.split(',').map((cell, i) => [names[i] ?? `c${i}`, Number(cell)])) as Row,
      );
      const meta = {
        ...newMeta(names.includes('control_v') ? 'sweep' : 'drift', dutId, { importedFrom: fileName }),
        status: 'complete' as const,
      };
      runs.set(meta.id, { meta, rows, deleted: false });
      return meta;
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
  return api;
}
