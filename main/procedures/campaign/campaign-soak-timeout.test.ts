/**
 * A soak that cannot finish in its timeout is an event and a message, and the
 * campaign skips that temperature, sweeps anyway, or stops, as the plan says.
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { CampaignPlanInput } from '../../../app/contract/campaign-plan.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../../bench/assemble.ts';
import { VirtualClock } from '../../time/virtual-clock.ts';
import { RunControl } from '../run-control.ts';
import { campaignDut, campaignPlanInput } from './demo-campaign.ts';
import { startCampaign } from './run-campaign.ts';

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

/**
 * The chamber starts at 25 °C (nearer the lab), which soaks in about 22 min; −30 °C is 55 °C further at
 * 3 °C/min — 18 min of ramp, then the air and DUT lags — longer than the 30 min timeout.
 */
async function run(onTimeout: 'skip' | 'stop' | 'sweep-anyway') {
  const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-soaktimeout-'));
  dirs.push(runsDir);
  const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-06-01T18:00:00.000Z' });
  const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 9 } });
  const plan: CampaignPlanInput = campaignPlanInput({ temperaturesC: [-30, 25], supplyV: [5] });
  plan.soak = { ...plan.soak, timeoutS: 1800, onTimeout };
  const messages: string[] = [];
  try {
    const outcome = await startCampaign({
      bench,
      clock,
      control: new RunControl(),
      plan,
      runsDir,
      onState: (e) => {
        if (e.message) messages.push(e.message);
      },
    });
    const events = (await readFile(join(outcome.dir, 'campaign-events.jsonl'), 'utf8'))
      .split('\n')
      .filter(Boolean)
      .map((l) => JSON.parse(l) as { type: string; waited_s?: number });
    return { outcome, events, messages, snap: bench.sim?.snapshot() };
  } finally {
    await bench.close();
  }
}

describe('soak timeout', () => {
  it('skip: an event, a message naming the temperature, and the campaign goes on', async () => {
    const r = await run('skip');
    const timeout = r.events.find((e) => e.type === 'soak-timeout');
    expect(timeout?.waited_s).toBeGreaterThanOrEqual(1800);
    expect(r.outcome.file.conditions.map((c) => [c.temperatureC, c.state])).toEqual([
      [25, 'done'],
      [-30, 'skipped'],
    ]);
    expect(r.messages[0]).toMatch(/soak at -30 °C timed out after \d+ s .*plan: skip/);
    expect(r.outcome.file.status).toBe('complete');
  });

  it('stop: the campaign ends failed at that condition, bench safe', async () => {
    const r = await run('stop');
    expect(r.outcome.file.status).toBe('failed');
    expect(r.outcome.file.reason).toBe('soak-timeout');
    expect(r.outcome.file.conditions.map((c) => c.state)).toEqual(['done', 'failed']);
    expect(r.snap?.supply.map((s) => s.outputOn)).toEqual([false, false]);
    expect(r.snap?.chamber.setpointC).toBe(25);
  });

  it('sweep-anyway: the sweep runs and the condition carries the message', async () => {
    const r = await run('sweep-anyway');
    expect(r.outcome.file.conditions[1]).toMatchObject({ temperatureC: -30, state: 'done' });
    expect(r.outcome.file.conditions[1]?.message).toMatch(/timed out/);
  });
});

describe('soak with a frequency drift limit', () => {
  it('holds the control voltage at nominal, reads the counter, and ends the soak under the ppm/min limit', async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-soakdrift-'));
    dirs.push(runsDir);
    const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-06-02T18:00:00.000Z' });
    const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 10 } });
    const plan: CampaignPlanInput = campaignPlanInput({ temperaturesC: [40], supplyV: [5] });
    plan.soak = { ...plan.soak, maxDriftPpmPerMin: 2 };
    const frequencies: number[] = [];
    try {
      const outcome = await startCampaign({
        bench,
        clock,
        control: new RunControl(),
        plan,
        runsDir,
        onSoakSample: (_e, s) => {
          if (s.frequencyHz !== null) frequencies.push(s.frequencyHz);
        },
      });
      expect(outcome.file.status).toBe('complete');
      const events = (await readFile(join(outcome.dir, 'campaign-events.jsonl'), 'utf8'))
        .split('\n')
        .filter(Boolean)
        .map((l) => JSON.parse(l) as { type: string; drift_ppm_per_min?: number });
      const done = events.find((e) => e.type === 'soak-done');
      expect(Math.abs(done?.drift_ppm_per_min ?? 99)).toBeLessThanOrEqual(2);
      // The counter read the DUT at 3 V through the soak: about 18.4 kHz at 25 °C for this DUT, rising with temperature.
      expect(frequencies.length).toBeGreaterThan(30);
      const sorted = [...frequencies].sort((a, b) => a - b);
      expect(sorted[Math.floor(sorted.length / 2)]).toBeGreaterThan(18_300);
      expect(sorted[Math.floor(sorted.length / 2)]).toBeLessThan(18_900);
    } finally {
      await bench.close();
    }
  });
});
