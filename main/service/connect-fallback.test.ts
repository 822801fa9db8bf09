import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { BenchConfig } from '../../app/contract/plans.ts';
import { fakeBench } from '../procedures/testing/fake-bench.ts';
import { createBenchService, type BenchService } from './bench-service.ts';
import { storePort } from './default-ports.ts';
import { ScaledClock } from '../time/scaled-clock.ts';

describe('a refused connection', () => {
  let service: BenchService | null = null;
  let runsDir = '';
  afterEach(async () => {
    await service?.close();
    if (runsDir) await rm(runsDir, { recursive: true, force: true });
  });

  it('says it could not connect and keeps the simulated bench that worked', async () => {
    runsDir = await mkdtemp(join(tmpdir(), 'tunebench-refused-'));
    const clock = new ScaledClock(200);
    const opened: string[] = [];
    service = createBenchService({
      runsDir,
      openBench: async (config) => {
        if (config !== 'sim') throw new Error('tcp://127.0.0.1:1: connection refused');
        opened.push('sim');
        return {
          roles: fakeBench(clock),
          connection: { connected: true, simulated: true, roles: [], error: null },
          clock,
          close: async () => undefined,
        };
      },
      listSerialPorts: async () => [],
      listProfiles: async () => [],
      store: storePort(runsDir),
      procedures: {},
      livePeriodMs: 50,
    });
    await service.connect('sim');
    const real = { supply: { address: 'tcp://127.0.0.1:1' } } as unknown as BenchConfig;
    await expect(service.connect(real)).rejects.toThrow(
      'could not connect to these instruments: tcp://127.0.0.1:1: connection refused. The previous bench is connected again.',
    );
    expect(opened).toEqual(['sim', 'sim']);
    await expect(service.getConnection()).resolves.toMatchObject({ connected: true, simulated: true });
  });
});
