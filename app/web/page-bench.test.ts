/**
 * The web edition's in-page bench in Node: the desktop's service over the
 * page's stand-ins (the same four app/web/page-modules.ts substitutes the build
 * makes), a memory runs folder in place of OPFS and the simulated bench on a
 * virtual clock. Checks that a page run is a desktop run folder (the desktop
 * store opens it to the same rows), that rows reach the folder within a
 * second, that a torn last line is dropped when read, that a page closed
 * mid-run leaves its run `interrupted`, and that page close drives the safe
 * state.
 */
import { mkdtemp, rm, writeFile, mkdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { BenchEvent, RunMeta } from '../contract/bench-api.ts';
import { defaultDriftPlan, defaultSweepPlan } from '../../main/cli/default-plans.ts';
import { openRun } from '../../main/store/run-store.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';
import { RealClock } from '../../main/time/real-clock.ts';
import { sweepPlanSchema } from '../contract/plans.ts';
import { FakeSerialPort, FakeWebSerial, farEndOf } from '../../main/instruments/testing/fake-web-serial.ts';
import { serveSimBench } from '../../main/sim/tcp-server.ts';
import { SHORT_SWEEP } from '../../test/hostile/hostile-bench.ts';
import { createPageBench, type PageBench } from './page-bench.ts';
import { guardPageClose } from './page-close.ts';
import { PAGE_MODULES } from './page-modules.ts';
import { memoryDir, readText, writeText, type PageDir } from './store/page-dir.ts';
import { createPageRun, PAGE_FLUSH_MS } from './store/page-run-writer.ts';
import { createPageRunStore } from './store/page-run-store.ts';

// The same substitutes as the web build (app/web/vite.config.ts); a test below checks the lists agree.
vi.mock('../../main/instruments/create-transport.ts', async () => import('./page/create-transport.ts'));
vi.mock('../../main/instruments/profile-loader.ts', async () => import('./page/profile-loader.ts'));
vi.mock('../../main/service/address-policy.ts', async () => import('./page/address-policy.ts'));
vi.mock('../../main/store/index.ts', async () => import('./page/store-index.ts'));
const MOCKED = [
  'main/instruments/create-transport.ts',
  'main/instruments/profile-loader.ts',
  'main/service/address-policy.ts',
  'main/store/index.ts',
];

const benches: PageBench[] = [];
afterEach(async () => {
  vi.useRealTimers();
  for (const bench of benches.splice(0)) await bench.service.close();
});

function pageBench(root: PageDir): PageBench {
  const bench = createPageBench({ root, simClock: () => new VirtualClock({ autoAdvance: true }) });
  benches.push(bench);
  return bench;
}

function ended(bench: PageBench): Promise<RunMeta> {
  return new Promise((resolve) => {
    const off = bench.api.subscribe((event: BenchEvent) => {
      if (event.type === 'run-ended') {
        off();
        resolve(event.meta);
      }
    });
  });
}

/** Copies a page run folder onto the disk, as a zip export and unpack would. */
async function toDisk(root: PageDir, id: string, runsDir: string): Promise<void> {
  const dir = (await root.dir(id, false)) as PageDir;
  await mkdir(join(runsDir, id), { recursive: true });
  for (const entry of await dir.entries())
    await writeFile(join(runsDir, id, entry.name), (await dir.readBytes(entry.name)) as Uint8Array);
}

describe('the in-page bench (web edition)', () => {
  it('these tests substitute exactly the modules the web build does', () => {
    expect(Object.keys(PAGE_MODULES).sort()).toEqual(MOCKED);
  });

  it('a sweep on the in-page simulated bench is a desktop run folder: the desktop store reads the same rows', async () => {
    const root = memoryDir();
    const bench = pageBench(root);
    await bench.api.connect('sim');
    const plan = { ...defaultSweepPlan('relaxation'), stepV: 0.1 };
    const done = ended(bench);
    const started = await bench.api.startSweep(plan, 'page-osc-3');
    const meta = await done;
    expect(meta.status).toBe('complete');
    expect(meta.simulated).toBe(true);
    await expect((await root.dir(started.id, false))?.entries()).resolves.toEqual([
      { name: 'events.jsonl', kind: 'file' },
      { name: 'run.json', kind: 'file' },
      { name: 'samples.csv', kind: 'file' },
    ]);
    const inPage = await bench.api.openRun(started.id);
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-page-'));
    try {
      await toDisk(root, started.id, runsDir);
      const onDisk = await openRun(runsDir, started.id);
      expect(onDisk.meta).toEqual(inPage.meta);
      expect(onDisk.samples.rowCount).toBe(inPage.samples.rowCount);
      expect(onDisk.samples.rowCount).toBeGreaterThan(20);
      expect(Array.from(onDisk.samples.numeric.frequency_hz ?? [])).toEqual(
        Array.from(inPage.samples.numeric.frequency_hz ?? []),
      );
      expect(onDisk.events).toEqual(inPage.events);
    } finally {
      await rm(runsDir, { recursive: true, force: true });
    }
  }, 120_000);

  it('rows reach the folder within a second of real time; a torn last line is dropped when read', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    const root = memoryDir();
    const clock = new VirtualClock();
    const writer = await createPageRun(root, {
      runsDir: 'opfs:/runs',
      kind: 'drift',
      dut: { id: 'page-osc-4' },
      instruments: [{ role: 'counter', idn: 'X', address: 'sim:counter' }],
      plan: {},
      columns: ['index', 'time_s', 'frequency_hz', 'status'],
      clock,
    });
    const dir = (await root.dir(writer.id, false)) as PageDir;
    writer.appendSample([0, 0, 1234.5, 'ok']);
    writer.appendSample({ index: 1, time_s: 1, frequency_hz: 1234.75, status: 'ok' });
    expect(await readText(dir, 'samples.csv')).toBe('index,time_s,frequency_hz,status\n');
    await vi.advanceTimersByTimeAsync(PAGE_FLUSH_MS);
    expect(await readText(dir, 'samples.csv')).toBe(
      'index,time_s,frequency_hz,status\n0,0,1234.5,ok\n1,1,1234.75,ok\n',
    );
    expect(writer.rowsWritten()).toBe(2);
    // A tab killed mid-append on some other store could leave half a line: the reader drops it.
    await writeText(dir, 'samples.csv', `${await readText(dir, 'samples.csv')}2,2,123`);
    const store = createPageRunStore(root);
    const opened = await store.open(writer.id);
    expect(opened.samples.rowCount).toBe(2);
    // This page is not writing it (store.writing is empty): a run left `running` reads as interrupted.
    expect(opened.meta.status).toBe('interrupted');
    await writer.finish('complete');
  });

  it('pagehide during a drift log stops it and drives the safe state, recorded in the run', async () => {
    const root = memoryDir();
    const bench = pageBench(root);
    await bench.api.connect('sim');
    const page = new EventTarget();
    const guard = guardPageClose(page, bench.service);
    const done = ended(bench);
    const started = await bench.api.startDrift({ ...defaultDriftPlan('relaxation'), durationS: 3600 }, 'page-osc-5');
    await new Promise((resolve) => setTimeout(resolve, 50));
    page.dispatchEvent(new Event('pagehide'));
    page.dispatchEvent(new Event('beforeunload'));
    await expect(guard.fired()).resolves.toEqual({ ok: true });
    const meta = await done;
    expect(meta.status).toBe('complete');
    const { events } = await bench.api.openRun(started.id);
    expect(events.filter((e) => e.type === 'last-resort')).toEqual([
      expect.objectContaining({ cause: 'signal', signal: 'pagehide' }),
    ]);
    const steps = events.filter((e) => e.type === 'safe-state');
    expect(steps.length).toBeGreaterThan(0);
    expect(steps.every((e) => e.ok === true)).toBe(true);
    expect(steps.map((e) => e.step)).toContain('output-off');
    const status = await bench.api.getBenchStatus();
    expect(status.output).toBe(false);
  }, 120_000);

  it('a sweep over Web Serial: the port chosen in the browser, the simulated bench at its far end, then the safe state', async () => {
    const served = await serveSimBench({
      host: '127.0.0.1',
      basePort: 0,
      seed: 7,
      dut: 'relaxation',
      clock: new RealClock(),
    });
    try {
      const supplyPort = new FakeSerialPort({
        far: farEndOf(served.addresses.supply),
        info: { usbVendorId: 0x0403, usbProductId: 0x6001 },
        chunkBytes: 5,
      });
      const counterPort = new FakeSerialPort({
        far: farEndOf(served.addresses.counter),
        info: { usbVendorId: 0x1a86, usbProductId: 0x7523 },
      });
      const serial = Object.assign(new FakeWebSerial(), {
        // The user picks the supply's adapter in the chooser; the counter's was granted on an earlier visit.
        requestPort: async () => supplyPort,
      });
      serial.ports.push(counterPort);
      const bench = createPageBench({ root: memoryDir(), serial });
      benches.push(bench);
      await expect(bench.api.chooseBrowserSerialPort?.()).resolves.toEqual({
        path: 'usb-0403-6001',
        manufacturer: 'USB 0403:6001',
      });
      expect((await bench.api.listSerialPorts()).map((p) => p.path)).toEqual(['usb-0403-6001', 'usb-1a86-7523']);
      const connection = await bench.api.connect({
        supply: { address: 'serial:usb-0403-6001?baud=115200', controlChannel: 1, dutSupplyChannel: 2 },
        counter: { address: 'serial:usb-1a86-7523?baud=115200' },
      });
      expect(connection.roles.map((r) => r.idn)).toEqual(['tunebench,SIM-SUPPLY,0,0.1', 'tunebench,SIM-COUNTER,0,0.1']);
      const done = ended(bench);
      await bench.api.startSweep(sweepPlanSchema.parse({ ...SHORT_SWEEP, readingsPerPoint: 2 }), 'page-serial-1');
      expect((await done).status).toBe('complete');
      expect(supplyPort.opens[0]?.baudRate).toBe(115200);
      // The safe state, read from the simulator itself: control channel at 0 V, output off.
      expect(served.bench.supply.state(1)).toMatchObject({ setpointV: 0, outputOn: false });
    } finally {
      await served.close();
    }
  }, 120_000);

  it('refuses a network address and says what the page can reach', async () => {
    const bench = pageBench(memoryDir());
    await expect(
      bench.api.connect({
        supply: { address: 'tcp://192.168.1.20:5025', controlChannel: 1, dutSupplyChannel: 2 },
        counter: { address: 'sim' },
      }),
    ).rejects.toThrow(/config\.supply\.address: the web edition reaches "sim" or a port granted in this browser/);
    await expect(bench.api.chooseBrowserSerialPort?.()).rejects.toThrow(/this browser has no Web Serial/);
  });
});
