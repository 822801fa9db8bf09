/**
 * The campaign through the BenchApi service, as the app drives it: refused
 * without a chamber, stopped from the app mid-campaign (control and DUT
 * supply outputs read off from the simulated supply, chamber setpoint at
 * safeC), resumed from the list of campaign folders with nothing measured
 * twice, the unit change answered, then the datasheet. Simulated bench on a
 * clock 600× real time.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BenchEvent } from '../../app/contract/bench-api.ts';
import type { CampaignView } from '../../app/contract/campaign-schemas.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG, type AssembledBench } from '../bench/assemble.ts';
import { ScaledClock } from '../time/scaled-clock.ts';
import { createBenchService, type BenchService } from './bench-service.ts';
import { defaultPorts } from './default-ports.ts';

const PLAN = {
  temperaturesC: [25, 35],
  supplyV: [5],
  maxSupplyV: 5.5,
  units: ['u1', 'u2'],
  soak: { toleranceC: 1, maxSlopeCPerMin: 0.5, dwellS: 60, timeoutS: 7200, readIntervalS: 10 },
  chamber: { minC: -20, maxC: 70, maxRateCPerMin: 3 },
  sweep: {
    start: 2,
    stop: 4,
    step: 0.25,
    readingsPerPoint: 2,
    gateS: 0.1,
    settle: { mode: 'fixed', seconds: 0.05 },
    refineEdgeV: 0,
    limits: { maxControlV: 5, currentLimitA: 0.02 },
  },
  safeC: 20,
  nominalControlV: 3,
};

let runsDir: string;
let service: BenchService;
let bench: AssembledBench | null = null;
const views: CampaignView[] = [];

function until(test: (v: CampaignView) => boolean, timeoutMs = 30_000): Promise<CampaignView> {
  return new Promise((resolve, reject) => {
    const found = views.find(test);
    if (found) return resolve(found);
    const timer = setTimeout(() => reject(new Error('timed out waiting for the campaign')), timeoutMs);
    const off = service.subscribe((event: BenchEvent) => {
      if (event.type === 'campaign' && test(event.campaign)) {
        clearTimeout(timer);
        off();
        resolve(event.campaign);
      }
    });
  });
}

beforeAll(async () => {
  runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaign-service-'));
  const ports = defaultPorts({ runsDir });
  service = createBenchService({
    ...ports,
    livePeriodMs: 50,
    openBench: async (config) => {
      const clock = new ScaledClock(600);
      bench = await assembleBench(config === 'sim' ? SIM_CAMPAIGN_BENCH_CONFIG : config, {
        clock,
        sim: { dut: 'relaxation', seed: 3 },
      });
      const opened = bench;
      return {
        roles: opened,
        chamber: opened.chamber,
        clock,
        connection: {
          connected: true,
          simulated: true,
          roles: opened.instruments
            .filter((i) => i.role !== 'chamber')
            .map((i) => ({ role: i.role as 'supply', address: i.address, idn: i.idn, simulated: true })),
          error: null,
        },
        close: () => opened.close(),
      };
    },
  });
  service.subscribe((event) => {
    if (event.type === 'campaign') views.push(event.campaign);
  });
});

afterAll(async () => {
  await service.close();
  await rm(runsDir, { recursive: true, force: true });
});

describe('campaign service', () => {
  it('refuses before a bench is connected', async () => {
    await expect(service.startCampaign?.(PLAN)).rejects.toThrow(/no bench connected/);
  });

  it('stopped from the app: supply outputs off and chamber at safeC, read from the simulated bench', async () => {
    await service.connect('sim');
    const started = await service.startCampaign?.(PLAN);
    expect(started?.active).toBe(true);
    await until((v) => v.conditions[0]?.state === 'done');
    await until((v) => v.unitChange !== null);
    // A second start while it holds the bench is refused.
    await expect(service.startSweep(PLAN.sweep as never, 'x')).rejects.toThrow(/campaign holds the bench/);
    await service.stopCampaign?.();
    const ended = await until((v) => !v.active);
    expect(ended.status).toBe('aborted');
    expect(ended.safeStateOk).toBe(true);
    const snap = bench?.sim?.snapshot();
    expect(snap?.supply[0].outputOn, 'control channel').toBe(false);
    expect(snap?.supply[1].outputOn, 'DUT supply').toBe(false);
    expect(snap?.chamber.setpointC, 'chamber setpoint').toBe(20);
  }, 60_000);

  it('resumes from the list: done conditions are kept, the unit change is answered, the datasheet reads it', async () => {
    const list = (await service.listCampaigns?.()) ?? [];
    expect(list).toHaveLength(1);
    const first = list[0];
    expect(first?.status).toBe('aborted');
    const before = views.filter((v) => v.id === first?.id && !v.active).at(-1);
    const doneBefore = before?.conditions.filter((c) => c.state === 'done') ?? [];
    expect(doneBefore.length).toBe(2);
    views.length = 0;
    await service.resumeCampaign?.(first?.id ?? '');
    await until((v) => v.unitChange !== null);
    await service.confirmUnitChange?.();
    const ended = await until((v) => !v.active);
    expect(ended.status).toBe('complete');
    expect(ended.conditions.every((c) => c.state === 'done')).toBe(true);
    // The runs that were done before the stop are the same runs: nothing measured twice.
    for (const c of doneBefore) expect(ended.conditions[c.index]?.runId).toBe(c.runId);
    const sheet = await service.campaignDatasheet?.(first?.id ?? '');
    expect(sheet?.simulated).toBe(true);
    expect(sheet?.rows.map((r) => r.parameter)).toEqual(expect.arrayContaining(['Kvco at 25.0 °C', 'Kvco at 35.0 °C']));
    expect(sheet?.headroom).toHaveLength(4);
    // Every sweep analysed: each headroom control voltage carries its ±.
    for (const h of sheet?.headroom ?? []) expect(h.controlV).toMatch(/ ± /);
    await expect(service.resumeCampaign?.(first?.id ?? '')).rejects.toThrow(/complete: nothing to resume/);
  }, 60_000);
});
