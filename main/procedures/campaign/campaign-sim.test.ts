/**
 * A whole campaign on the simulated bench in virtual time, checked against
 * the DUT model it ran on: the frequency tempco at a fixed control voltage
 * (within 3 %) and Kvco at each temperature (within 2 % of the model's own
 * derivative), plus what the campaign leaves behind.
 */
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { line } from '../../../app/analysis/campaign-analysis.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG, type AssembledBench } from '../../bench/assemble.ts';
import { loadCampaignAnalysis } from '../../cli/campaign-source.ts';
import { dutFrequencyHz } from '../../sim/dut-model.ts';
import { VirtualClock } from '../../time/virtual-clock.ts';
import { RunControl } from '../run-control.ts';
import { readCampaignFile } from './campaign-file.ts';
import { startCampaign, type CampaignOutcome } from './run-campaign.ts';
import { campaignDut, campaignPlanInput } from './demo-campaign.ts';

const dut = campaignDut();
/** The model's noise-free frequency at control voltage v, DUT temperature t, nominal supply, long after power-on. */
const modelHz = (v: number, t: number): number =>
  dutFrequencyHz(dut, { tuneNodeV: v, supplyV: dut.supply.nominalV, temperatureC: t, poweredForS: 1e6, wanderPpm: 0 });

/** Every file under `dir` (relative path → bytes), sorted by path; the writer's lock is gone by then. */
async function filesUnder(dir: string): Promise<Map<string, Buffer>> {
  const entries = await readdir(dir, { recursive: true, withFileTypes: true });
  const paths = entries
    .filter((e) => e.isFile())
    .map((e) => relative(dir, join(e.parentPath, e.name)))
    .sort();
  const files = new Map<string, Buffer>();
  for (const path of paths) files.set(path, await readFile(join(dir, path)));
  return files;
}

let runsDir: string;
let bench: AssembledBench;
let outcome: CampaignOutcome;

beforeAll(async () => {
  runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaign-'));
  const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-03-01T20:00:00.000Z' });
  bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut, seed: 11 } });
  outcome = await startCampaign({ bench, clock, control: new RunControl(), plan: campaignPlanInput(), runsDir });
}, 120_000);

afterAll(async () => {
  await bench.close();
  await rm(runsDir, { recursive: true, force: true });
});

describe('campaign on the simulated bench', () => {
  it('finishes every condition, one run each, in chamber order', async () => {
    const file = await readCampaignFile(outcome.dir);
    expect(file.status).toBe('complete');
    expect(file.conditions.map((c) => [c.temperatureC, c.supplyV])).toEqual([
      [-10, 4.75],
      [-10, 5],
      [-10, 5.25],
      [25, 4.75],
      [25, 5],
      [25, 5.25],
      [60, 4.75],
      [60, 5],
      [60, 5.25],
    ]);
    expect(file.conditions.every((c) => c.state === 'done' && c.runId !== null && c.earlierRunIds.length === 0)).toBe(
      true,
    );
    expect(new Set(file.conditions.map((c) => c.runId)).size).toBe(9);
    // Each run records its condition and the DUT temperature it was swept at.
    const first = file.conditions[0];
    const events = await readFile(join(outcome.dir, first?.runId ?? '', 'events.jsonl'), 'utf8');
    const condition = events
      .split('\n')
      .filter(Boolean)
      .map((l) => JSON.parse(l) as Record<string, unknown>)
      .find((e) => e.type === 'campaign-condition');
    expect(condition).toMatchObject({ setpoint_c: -10, supply_v: 4.75, unit: 'unit-a' });
    expect(Math.abs((first?.dutTemperatureC?.start ?? 99) - -10)).toBeLessThan(0.25);
  });

  it('measures the frequency tempco at 3 V within 3 % of the model (same temperatures, least-squares line)', async () => {
    const { analysis } = await loadCampaignAnalysis(outcome.dir);
    const nominal = analysis.conditions.filter((c) => c.supplyV === 5);
    const temps = nominal.map((c) => c.dutTemperatureC as number);
    const model = line(
      temps,
      temps.map((t) => modelHz(3, t)),
      25,
    );
    expect(model).not.toBeNull();
    const modelPpm = ((model?.slope ?? 0) / (model?.at ?? 1)) * 1e6;
    // Sanity of the reference: with the tuning tempco the model's figure is far from tempcoPpmPerC alone.
    expect(Math.abs(modelPpm - dut.tempcoPpmPerC)).toBeGreaterThan(100);
    const measured = analysis.frequencyTempcoPpmPerC as number;
    expect(Math.abs(measured - modelPpm) / Math.abs(modelPpm)).toBeLessThan(0.03);
  });

  it('measures Kvco at 3 V at each temperature within 2 % of the model derivative', async () => {
    const { analysis } = await loadCampaignAnalysis(outcome.dir);
    for (const c of analysis.conditions.filter((r) => r.supplyV === 5)) {
      const t = c.dutTemperatureC as number;
      const h = 1e-3;
      const modelKvco = (modelHz(3 + h, t) - modelHz(3 - h, t)) / (2 * h);
      expect(
        Math.abs((c.kvcoAtNominalHzPerV as number) - modelKvco) / modelKvco,
        `at ${c.temperatureC} °C`,
      ).toBeLessThan(0.02);
    }
    // Kvco's tempco against the model's own: the least-squares slope of the model's Kvco at 3 V over the
    // measured DUT temperatures, over its Kvco at 25 °C (+164.9 ppm/°C). Three temperatures span a Kvco
    // change of only ~1.2 %, so the 2 % per-condition error above could move the slope a lot; with seed 11
    // the campaign is repeatable byte for byte (see below) and gives 165.0 ± 16.6 ppm/°C. Checked two ways:
    // within twice its own stated uncertainty (the ± is honest) and within 5 % (fails a wrong sign, a °F/°C
    // mix-up (×1.8) or a missing ×1e6).
    const rows = analysis.conditions.filter((r) => r.supplyV === 5);
    const temps = rows.map((r) => r.dutTemperatureC as number);
    const modelKvcos = temps.map((t) => (modelHz(3 + 1e-3, t) - modelHz(3 - 1e-3, t)) / 2e-3);
    const meanT = temps.reduce((a, b) => a + b, 0) / temps.length;
    const meanK = modelKvcos.reduce((a, b) => a + b, 0) / modelKvcos.length;
    const slope =
      temps.reduce((a, t, i) => a + (t - meanT) * ((modelKvcos[i] as number) - meanK), 0) /
      temps.reduce((a, t) => a + (t - meanT) ** 2, 0);
    const modelTempcoPpm = (slope / ((modelHz(3 + 1e-3, 25) - modelHz(3 - 1e-3, 25)) / 2e-3)) * 1e6;
    expect(modelTempcoPpm).toBeGreaterThan(100);
    const measuredTempco = analysis.kvcoTempcoPpmPerC as number;
    expect(Math.abs(measuredTempco - modelTempcoPpm) / modelTempcoPpm).toBeLessThan(0.05);
    const stated = analysis.kvcoTempcoByUnit['unit-a']?.uncertaintyPpmPerC ?? Number.NaN;
    expect(stated).toBeGreaterThan(0);
    expect(Math.abs(measuredTempco - modelTempcoPpm)).toBeLessThanOrEqual(2 * stated);
  });

  it('measures pushing from the supply corners near the model (120 Hz/V)', async () => {
    const { analysis } = await loadCampaignAnalysis(outcome.dir);
    // Within 5 % of the model's 120 Hz/V (seed 11 gives 118.8 ± 2.5 Hz/V, the same every run).
    expect(Math.abs((analysis.pushingHzPerV?.typ ?? Number.NaN) - dut.pushingHzPerV) / dut.pushingHzPerV).toBeLessThan(
      0.05,
    );
    expect(analysis.headroom).toHaveLength(3);
    expect(analysis.headroom.every((r) => r.inWindow)).toBe(true);
  });

  it('logs every soak reading, converging on each setpoint', async () => {
    const rows = (await readFile(join(outcome.dir, 'soak-log.csv'), 'utf8')).trim().split('\n');
    expect(rows[0]).toBe('index,time_s,setpoint_c,air_c,dut_c,frequency_hz');
    const byIndex = new Map<number, number[][]>();
    for (const line of rows.slice(1)) {
      const cells = line.split(',').map(Number);
      byIndex.set(cells[0] as number, [...(byIndex.get(cells[0] as number) ?? []), cells]);
    }
    // One soak per temperature (at the first supply corner of each).
    expect([...byIndex.keys()]).toEqual([0, 3, 6]);
    for (const readings of byIndex.values()) {
      const last = readings[readings.length - 1] as number[];
      expect(Math.abs((last[4] as number) - (last[2] as number))).toBeLessThanOrEqual(0.2);
    }
  });

  it('gives byte-identical files when run again with the same seed', { timeout: 120_000 }, async () => {
    // Run to run the campaign once moved: the virtual clock jumped while a slow fsync of campaign.json was in
    // flight (main/time/event-loop-idle.ts), and concurrent appends put event lines in either order.
    const againDir = await mkdtemp(join(tmpdir(), 'tunebench-campaign-again-'));
    const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-03-01T20:00:00.000Z' });
    const again = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut, seed: 11 } });
    try {
      const second = await startCampaign({
        bench: again,
        clock,
        control: new RunControl(),
        plan: campaignPlanInput(),
        runsDir: againDir,
      });
      const first = await filesUnder(outcome.dir);
      const repeat = await filesUnder(second.dir);
      expect([...repeat.keys()]).toEqual([...first.keys()]);
      // One run folder per condition plus campaign.json, its events and the soak log.
      expect(first.size).toBeGreaterThan(9 * 3);
      for (const [path, bytes] of first) expect(repeat.get(path)?.equals(bytes), path).toBe(true);
    } finally {
      await again.close();
      await rm(againDir, { recursive: true, force: true });
    }
  });

  it('leaves the supply off and the chamber heading to safeC', () => {
    const snap = bench.sim?.snapshot();
    expect(snap?.supply[0].outputOn).toBe(false);
    expect(snap?.supply[1].outputOn).toBe(false);
    expect(snap?.chamber.setpointC).toBe(25);
    expect(outcome.safeStateOk).toBe(true);
  });
});
