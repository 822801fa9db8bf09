/**
 * Every file shipped in resources/examples/ loads through the same loader
 * the CLI uses (strict keys, the one quantity grammar) and runs a short
 * sweep — or its own procedure — on the simulated bench, so a user who
 * copies one starts from a working file. The plans keep their gate, settle
 * and limits; only their length is cut. Before the quantity grammar, every
 * shipped plan sent `SENS:FREQ:APER 6000` ("100m" read as 100 minutes).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { sweepPlanSchema } from '../app/contract/plans.ts';
import { assembleBench } from '../main/bench/assemble.ts';
import {
  loadBenchFile,
  loadCampaignPlan,
  loadDriftPlan,
  loadPushingPlan,
  loadSweepPlan,
} from '../main/cli/config-files.ts';
import { parseAddress } from '../main/instruments/address.ts';
import { recordDrift, recordPushing, recordSweep } from '../main/procedures/recorded-run.ts';
import { serveDeviceOnSerial } from '../main/sim/stream-adapter.ts';
import { serveSimBench } from '../main/sim/tcp-server.ts';
import { readRunFolder } from '../main/store/index.ts';
import { RealClock } from '../main/time/real-clock.ts';
import { VirtualClock } from '../main/time/virtual-clock.ts';

const dir = join(import.meta.dirname, '..', 'resources', 'examples');
const path = (name: string): string => join(dir, name);
const temps: string[] = [];
let socat: ChildProcess | null = null;
afterAll(async () => {
  if (socat?.pid !== undefined) socat.kill('SIGTERM');
  for (const t of temps) await rm(t, { recursive: true, force: true });
});
async function tempDir(): Promise<string> {
  const t = await mkdtemp(join(tmpdir(), 'tunebench-examples-'));
  temps.push(t);
  return t;
}

/** A short sweep every bench example must carry: three points, 10 ms gate. */
const SHORT_SWEEP = sweepPlanSchema.parse({
  points: [2, 2.5, 3],
  readingsPerPoint: 1,
  gateS: '10ms',
  settle: { mode: 'fixed', seconds: '10ms' },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: '20mA' },
});

describe('shipped example files', () => {
  it('every JSON file in the folder is covered here and names its JSON Schema', () => {
    const files = readdirSync(dir)
      .filter((f) => f.endsWith('.json'))
      .sort();
    expect(files).toEqual([
      'bench-serial-and-socket.json',
      'bench-sim-over-tcp.json',
      'campaign-sensor-if.json',
      'drift-overnight.json',
      'pushing-3v3-rail.json',
      'sweep-clock-multiplier.json',
    ]);
    for (const file of files) {
      const ref = (JSON.parse(readFileSync(path(file), 'utf8')) as { $schema?: string }).$schema ?? '';
      expect(ref, file).toMatch(/^\.\.\/schemas\/[\w-]+\.schema\.json$/);
      expect(existsSync(join(dir, ref)), `${file} → ${ref}`).toBe(true);
    }
  });

  it('the sweep plan loads with its gate in milliseconds and runs shortened on the simulated varactor DUT', async () => {
    const plan = await loadSweepPlan(path('sweep-clock-multiplier.json'));
    expect(plan.gateS).toBeCloseTo(0.1, 15);
    expect(plan.start).toBe(0.5);
    expect(plan.step).toBeCloseTo(0.05, 15);
    expect(plan.limits.currentLimitA).toBeCloseTo(0.02, 15);
    const short = { ...plan, start: 2, stop: 2.1 };
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock, sim: { dut: 'varactor' } });
    try {
      const recorded = await clock.runUntil(
        recordSweep({ bench, clock, plan: short, runsDir: await tempDir(), dutId: 'example' }),
      );
      expect(recorded.meta.status).toBe('complete');
      expect(bench.sim?.counter.state().gateS).toBeCloseTo(0.1, 12); // what the counter was told, not the plan
      expect((recorded.meta.plan as { gateS: number }).gateS).toBeCloseTo(0.1, 15);
      expect(recorded.outcome.rowsWritten).toBe(3 * 2 * 5); // 3 levels, up and down, 5 readings each
    } finally {
      await bench.close();
    }
  });

  it('the drift plan loads (12 h, 100 ms gate) and runs 5 s of it', async () => {
    const plan = await loadDriftPlan(path('drift-overnight.json'));
    expect(plan.durationS).toBe(12 * 3600);
    expect(plan.gateS).toBeCloseTo(0.1, 15);
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock, sim: { dut: 'varactor' } });
    try {
      const recorded = await clock.runUntil(
        recordDrift({ bench, clock, plan: { ...plan, durationS: 5 }, runsDir: await tempDir(), dutId: 'example' }),
      );
      expect(recorded.meta.status).toBe('complete');
      expect(recorded.outcome.readings).toBeGreaterThanOrEqual(4);
      expect(bench.sim?.counter.state().gateS).toBeCloseTo(0.1, 12);
    } finally {
      await bench.close();
    }
  });

  it('the pushing plan loads and runs whole on the simulated 3.3 V varactor DUT', async () => {
    const plan = await loadPushingPlan(path('pushing-3v3-rail.json'));
    expect(plan.supplyStepV).toBeCloseTo(0.05, 15);
    expect(plan.settleS).toBeCloseTo(0.2, 15);
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock, sim: { dut: 'varactor' } });
    try {
      const recorded = await clock.runUntil(
        recordPushing({ bench, clock, plan, runsDir: await tempDir(), dutId: 'example' }),
      );
      expect(recorded.meta.status).toBe('complete');
      expect(recorded.outcome.steps).toBe(13);
      expect(bench.sim?.counter.state().gateS).toBeCloseTo(0.1, 12);
    } finally {
      await bench.close();
    }
  });

  it('bench-sim-over-tcp loads and runs a short sweep against `tunebench sim` on ephemeral ports', async () => {
    const bench = await loadBenchFile(path('bench-sim-over-tcp.json'));
    const served = await serveSimBench({ basePort: 0, dut: 'varactor' });
    try {
      const port = (address: string): string => `tcp://127.0.0.1:${(parseAddress(address) as { port: number }).port}`;
      const wired = {
        ...bench,
        supply: { ...bench.supply, address: port(served.addresses.supply) },
        counter: { ...bench.counter, address: port(served.addresses.counter) },
        thermometer: bench.thermometer && { ...bench.thermometer, address: port(served.addresses.thermometer) },
        chamber: bench.chamber && { ...bench.chamber, address: port(served.addresses.chamber) },
      };
      const clock = new RealClock();
      const assembled = await assembleBench(wired, { clock });
      try {
        const recorded = await recordSweep({
          bench: assembled,
          clock,
          plan: SHORT_SWEEP,
          runsDir: await tempDir(),
          dutId: 'example',
        });
        expect(recorded.meta.status).toBe('complete');
        expect(served.bench.supply.state(1).outputOn).toBe(false);
      } finally {
        await assembled.close();
      }
    } finally {
      await served.close();
    }
  });

  it('bench-serial-and-socket loads (VISA socket form, serial options) and runs a short sweep with its counter on a pty', async () => {
    const bench = await loadBenchFile(path('bench-serial-and-socket.json'));
    expect(parseAddress(bench.supply.address).kind).toBe('tcp');
    const counterAddress = parseAddress(bench.counter.address);
    expect(counterAddress).toMatchObject({
      kind: 'serial',
      baudRate: 115200,
      parity: 'none',
      stopBits: 1,
      flow: 'none',
    });
    const t = await tempDir();
    socat = spawn(
      '/usr/bin/socat',
      [`pty,raw,echo=0,link=${join(t, 'device')}`, `pty,raw,echo=0,link=${join(t, 'host')}`],
      { stdio: 'ignore' },
    );
    for (let i = 0; i < 100 && !(existsSync(join(t, 'device')) && existsSync(join(t, 'host'))); i++)
      await new Promise((r) => setTimeout(r, 20));
    const served = await serveSimBench({ basePort: 0, dut: 'varactor' });
    const serial = await serveDeviceOnSerial(served.bench.devices.counter, {
      path: join(t, 'device'),
      baudRate: 115200,
    });
    try {
      const supplyPort = (parseAddress(served.addresses.supply) as { port: number }).port;
      // Only the host, port and pty path change: the file's address forms and serial options are kept.
      const wired = {
        ...bench,
        supply: { ...bench.supply, address: bench.supply.address.replace('::5025::', `::${supplyPort}::`) },
        counter: { ...bench.counter, address: bench.counter.address.replace('/dev/ttyUSB0', join(t, 'host')) },
      };
      const clock = new RealClock();
      const assembled = await assembleBench(wired, { clock });
      try {
        const recorded = await recordSweep({
          bench: assembled,
          clock,
          plan: SHORT_SWEEP,
          runsDir: t,
          dutId: 'example',
        });
        expect(recorded.meta.status).toBe('complete');
        const run = await readRunFolder(recorded.dir);
        expect(run.samplesCsv.split('\n').filter((l) => /,ok,/.test(l))).toHaveLength(3);
      } finally {
        await assembled.close();
      }
    } finally {
      await serial.close();
      await served.close();
    }
  });

  it('the campaign plan loads through the CLI loader, its voltages and times in the one quantity grammar', async () => {
    const { plan: campaign } = await loadCampaignPlan(path('campaign-sensor-if.json'));
    expect(campaign.supplyV).toEqual([4.75, 5, 5.25]);
    expect(campaign.soak.timeoutS).toBe(7200);
    expect(campaign.temperaturesC).toEqual([-10, 25, 60]);
    expect(campaign.soak.dwellS).toBe(300);
    expect(campaign.sweep.limits.maxControlV).toBe(5);
    expect(campaign.sweep.gateS).toBeCloseTo(0.1, 15);
  });

  it('a copy with a misspelt key is refused with a did-you-mean', async () => {
    const t = await tempDir();
    const text = readFileSync(path('bench-sim-over-tcp.json'), 'utf8').replace('"controlChannel"', '"controlChanel"');
    await writeFile(join(t, 'bench.json'), text);
    await expect(loadBenchFile(join(t, 'bench.json'))).rejects.toThrow(
      /supply: unknown key "controlChanel" \(did you mean "controlChannel"\?\)/,
    );
  });
});
