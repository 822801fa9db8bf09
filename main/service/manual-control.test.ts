import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { parseCallParams } from '../../app/contract/bench-api-schemas.ts';
import type { ManualControlRequest } from '../../app/contract/bench-api.ts';
import { fakeBench, type FakeSupply } from '../procedures/testing/fake-bench.ts';
import { createBenchService, type BenchService } from './bench-service.ts';
import { storePort } from './default-ports.ts';
import { ScaledClock } from '../time/scaled-clock.ts';

function request(raw: unknown): ManualControlRequest {
  const parsed = parseCallParams('manualControl', [raw]);
  if (!parsed.ok) throw new Error(parsed.message);
  return parsed.args[0] as ManualControlRequest;
}

describe('manual bring-up control', () => {
  let runsDir: string;
  let service: BenchService;
  let supply: FakeSupply;

  beforeEach(async () => {
    runsDir = await mkdtemp(join(tmpdir(), 'tunebench-manual-'));
    const clock = new ScaledClock(200);
    service = createBenchService({
      runsDir,
      openBench: async () => {
        const roles = fakeBench(clock);
        supply = roles.supply;
        return {
          roles,
          connection: {
            connected: true,
            simulated: true,
            roles: [{ role: 'supply', address: 'sim', idn: 'T,F,0,1', simulated: true }],
            error: null,
          },
          clock,
          close: async () => undefined,
        };
      },
      listSerialPorts: async () => [],
      listProfiles: async () => [],
      store: storePort(runsDir),
      procedures: {},
      livePeriodMs: 30,
    });
    await service.connect('sim');
  });

  afterEach(async () => {
    await service.close();
    await rm(runsDir, { recursive: true, force: true });
  });

  it('applies the limits before the output turns on, reads the setting back, and reports it', async () => {
    const status = await service.manualControl(
      request({ controlV: '1.5', output: true, limits: { maxControlV: 3, currentLimitA: '20m' } }),
    );
    expect(status).toMatchObject({ output: true, controlSetV: 1.5 });
    const order = supply.log.filter((line) => line.startsWith('set'));
    expect(order.indexOf('setCurrentLimit 1 0.02')).toBeLessThan(order.indexOf('setOutput 1 true'));
    expect(order.findIndex((line) => line.startsWith('setOverVoltageProtection 1'))).toBeLessThan(
      order.indexOf('setOutput 1 true'),
    );
    expect(supply.channels.get(1)).toMatchObject({ voltageV: 1.5, output: true, currentLimitA: 0.02 });
  });

  it('refuses a voltage above the limit before writing anything, naming the field', async () => {
    await expect(
      service.manualControl(request({ controlV: 3.2, output: true, limits: { maxControlV: 3, currentLimitA: 0.02 } })),
    ).rejects.toThrow(/request\.controlV: 3\.2 V exceeds limits\.maxControlV \(3 V\)/);
    expect(supply.log.filter((line) => line.startsWith('set'))).toEqual([]);
  });

  it('leaves the supply safe on disconnect when bring-up left the output on', async () => {
    await service.manualControl(
      request({ controlV: 2, output: true, limits: { maxControlV: 3, currentLimitA: 0.02 } }),
    );
    const bySupply = supply;
    await service.disconnect();
    expect(bySupply.channels.get(1)).toMatchObject({ voltageV: 0, output: false });
    // The strip still says how the supply was left, after the links closed.
    expect((await service.getBenchStatus()).safeState).toMatchObject({
      runId: 'manual',
      reached: true,
      outputOff: true,
    });
  });
});
