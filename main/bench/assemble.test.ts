import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { serveSimBench } from '../sim/tcp-server.ts';
import { RealClock } from '../time/real-clock.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { SIM_BENCH_CONFIG, assembleBench } from './assemble.ts';
import { ConfigFileError, loadBenchFile, loadSweepPlan } from '../cli/config-files.ts';

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

describe('assembleBench', () => {
  it('builds the in-process simulated bench with identities for run.json', async () => {
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock });
    expect(bench.simulated).toBe(true);
    expect(bench.instruments.map((i) => i.role)).toEqual(['supply', 'counter', 'thermometer']);
    expect(bench.instruments[1]?.idn).toMatch(/SIM-COUNTER/);
    expect(bench.controlChannel).toBe(SIM_BENCH_CONFIG.supply.controlChannel);
    const reading = await bench.counter.readFrequency();
    expect(reading.status).toBe('no-signal'); // control channel off at power-on: the DUT is stalled
    await bench.close();
  });

  it('talks to a simulated bench served on loopback TCP, by tcp:// and by VISA resource address', async () => {
    const served = await serveSimBench({ basePort: 0, host: '127.0.0.1' });
    try {
      const counterPort = served.addresses.counter.split(':').pop();
      const clock = new RealClock();
      const bench = await assembleBench(
        {
          supply: { address: served.addresses.supply, controlChannel: 1, dutSupplyChannel: 2 },
          counter: { address: `TCPIP0::127.0.0.1::${counterPort}::SOCKET` },
        },
        { clock },
      );
      expect(bench.simulated).toBe(false);
      expect(bench.sim).toBeNull();
      expect(bench.instruments.map((i) => i.idn)).toEqual([
        expect.stringMatching(/SIM-SUPPLY/),
        expect.stringMatching(/SIM-COUNTER/),
      ]);
      await bench.supply.setVoltage(1, 3);
      await bench.supply.setOutput(1, true);
      await bench.counter.setGate(0.01);
      await clock.sleep(0.1);
      const reading = await bench.counter.readFrequency();
      expect(reading.status).toBe('ok');
      // Reopening the link keeps the same driver working.
      await bench.reconnect?.('counter');
      expect((await bench.counter.readFrequency()).status).toBe('ok');
      expect(await bench.drainErrors?.('supply')).toEqual([]);
      await bench.supply.setOutput(1, false);
      await bench.close();
      expect(served.bench.supply.state(1).outputOn).toBe(false);
    } finally {
      await served.close();
    }
  });
});

describe('bench and plan files', () => {
  it('names the field and the expected form', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'tunebench-files-'));
    dirs.push(dir);
    const bench = join(dir, 'bench.json');
    await writeFile(bench, JSON.stringify({ supply: { address: 'sim', controlChannel: 0 } }));
    await expect(loadBenchFile(bench)).rejects.toThrow(ConfigFileError);
    await expect(loadBenchFile(bench)).rejects.toThrow(/supply\.controlChannel: .*\n.*counter/s);
    const plan = join(dir, 'plan.json');
    await writeFile(plan, JSON.stringify({ start: 1, stop: 2, limits: { maxControlV: '5x', currentLimitA: 0.02 } }));
    await expect(loadSweepPlan(plan)).rejects.toThrow(/limits\.maxControlV: expected a voltage/);
    await writeFile(plan, JSON.stringify({ start: 1, stop: 2, limits: { maxControlV: 5, currentLimitA: 0.02 } }));
    await expect(loadSweepPlan(plan)).rejects.toThrow(/step: required unless "points" is given/);
    await writeFile(plan, '{ "start": 1, ');
    await expect(loadSweepPlan(plan)).rejects.toThrow(/not valid JSON/);
  });
});
