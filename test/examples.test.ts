/**
 * The example files shipped in resources/examples/ must stay valid against
 * the contract schemas, so a user who copies one starts from a working file.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { benchConfigSchema, driftPlanSchema, pushingPlanSchema, sweepPlanSchema } from '../app/contract/plans.ts';
import { parseAddress } from '../main/instruments/address.ts';
import { campaignPlanSchema } from '../app/contract/campaign-plan.ts';

const dir = join(import.meta.dirname, '..', 'resources', 'examples');
const read = (name: string): unknown => JSON.parse(readFileSync(join(dir, name), 'utf8'));

describe('shipped example files', () => {
  it('has a schema check for every JSON file in the folder', () => {
    const files = readdirSync(dir).filter((f) => f.endsWith('.json')).sort();
    expect(files).toEqual([
      'bench-serial-and-socket.json',
      'bench-sim-over-tcp.json',
      'campaign-sensor-if.json',
      'drift-overnight.json',
      'pushing-3v3-rail.json',
      'sweep-clock-multiplier.json',
    ]);
  });

  it('bench files parse and every address has a known form', () => {
    for (const name of ['bench-sim-over-tcp.json', 'bench-serial-and-socket.json']) {
      const bench = benchConfigSchema.parse(read(name));
      expect(parseAddress(bench.supply.address).kind).toBe('tcp');
      expect(['tcp', 'serial']).toContain(parseAddress(bench.counter.address).kind);
    }
  });

  it('plans parse with SI prefixes turned into SI numbers', () => {
    const sweep = sweepPlanSchema.parse(read('sweep-clock-multiplier.json'));
    expect(sweep.start).toBe(0.5);
    expect(sweep.step).toBeCloseTo(0.05, 15);
    expect(sweep.limits.currentLimitA).toBeCloseTo(0.02, 15);
    expect(sweep.direction).toBe('up-down');
    const drift = driftPlanSchema.parse(read('drift-overnight.json'));
    expect(drift.durationS).toBe(12 * 3600);
    const pushing = pushingPlanSchema.parse(read('pushing-3v3-rail.json'));
    expect(pushing.supplyStepV).toBeCloseTo(0.05, 15);
    expect(pushing.maxSupplyV).toBe(3.6);
    const campaign = campaignPlanSchema.parse(read('campaign-sensor-if.json'));
    expect(campaign.temperaturesC).toEqual([-10, 25, 60]);
    expect(campaign.soak.dwellS).toBe(300);
    expect(campaign.sweep.limits.maxControlV).toBe(5);
  });
});
