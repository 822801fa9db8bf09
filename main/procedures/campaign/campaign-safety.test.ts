/**
 * The campaign leaves the bench safe on every way out — stop (abort), an
 * instrument error, a lost link — checked against the simulator's own state:
 * both supply outputs off, the chamber's setpoint at safeC. (Completion is in
 * campaign-sim.test.ts; Ctrl+C through the CLI in cmd-campaign.test.ts.)
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG, type AssembledBench } from '../../bench/assemble.ts';
import type { SimBenchOptions } from '../../sim/sim-bench.ts';
import { VirtualClock } from '../../time/virtual-clock.ts';
import { RunControl } from '../run-control.ts';
import { campaignDut, campaignPlanInput } from './demo-campaign.ts';
import { resumeCampaign, startCampaign, type CampaignHooks } from './run-campaign.ts';
import { readRunFolder } from '../../store/index.ts';

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

async function campaignWith(
  sim: Omit<SimBenchOptions, 'clock' | 'dut'>,
  hooks: (control: RunControl, bench: AssembledBench) => CampaignHooks = () => ({}),
  reconnect?: { attempts: number; delayS: number },
) {
  const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaignsafe-'));
  dirs.push(runsDir);
  const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-05-01T18:00:00.000Z' });
  const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, {
    clock,
    sim: { ...sim, dut: campaignDut() },
    reconnect,
  });
  const control = new RunControl();
  try {
    // Start warm, so the chamber's safe setpoint (25 °C) differs from where it stands when the run ends.
    const outcome = await startCampaign({
      bench,
      clock,
      control,
      plan: campaignPlanInput({ temperaturesC: [60, -10] }),
      runsDir,
      ...hooks(control, bench),
    });
    const snap = bench.sim?.snapshot();
    const events = (await readFile(join(outcome.dir, 'campaign-events.jsonl'), 'utf8'))
      .split('\n')
      .filter(Boolean)
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    return { outcome, snap, events };
  } finally {
    await bench.close();
  }
}

function expectSafe(result: Awaited<ReturnType<typeof campaignWith>>): void {
  expect(result.snap?.supply[0].outputOn, 'control channel').toBe(false);
  expect(result.snap?.supply[0].setpointV).toBe(0);
  expect(result.snap?.supply[1].outputOn, 'DUT supply').toBe(false);
  expect(result.snap?.chamber.setpointC, 'chamber setpoint').toBe(25);
  const steps = result.events.filter((e) => e.type === 'safe-state');
  expect(steps.map((e) => e.step)).toEqual(
    expect.arrayContaining(['output-off', 'dut-supply-off channel 2', 'chamber-setpoint 25 °C']),
  );
}

describe('campaign safe state', () => {
  it('on a stop (abort) during a soak', async () => {
    let readings = 0;
    const result = await campaignWith({ seed: 2 }, (control) => ({
      onSoakSample: (entry) => {
        if (entry.index === 3 && ++readings === 3) control.stop('stop');
      },
    }));
    expect(result.outcome.file.status).toBe('aborted');
    expect(result.outcome.file.conditions.slice(0, 3).every((c) => c.state === 'done')).toBe(true);
    expect(result.outcome.file.conditions[3]?.state).toBe('waiting');
    expect(result.snap?.chamber.setpointC).toBe(25);
    expectSafe(result);
    expect(result.outcome.safeStateOk).toBe(true);
  });

  it('on an instrument error (the chamber reports a SCPI error during the first soak)', async () => {
    // Counted by readings (air temperature queries), not time: the 30th falls inside the first soak;
    // the chamber's next write (the second temperature's setpoint) reports it.
    const result = await campaignWith({
      seed: 3,
      faults: [{ type: 'error', device: 'chamber', atReading: 30, code: -222, message: 'Data out of range' }],
    });
    expect(result.outcome.file.status).toBe('failed');
    expect(result.outcome.failure).toMatch(/-222, "Data out of range" after TEMP:SETP/);
    expect(result.outcome.file.conditions.map((c) => c.state)).toEqual([
      'done',
      'done',
      'done',
      'failed',
      'waiting',
      'waiting',
    ]);
    expectSafe(result);
  });

  it('on a lost link (the chamber drops during a soak and is not reopened by the session)', async () => {
    const result = await campaignWith({ seed: 4, faults: [{ type: 'drop', device: 'chamber', atS: 600 }] }, undefined, {
      attempts: 0,
      delayS: 0.1,
    });
    expect(result.outcome.file.status).toBe('failed');
    expect(result.outcome.failure ?? '').toMatch(/disconnect|closed|link|drop/i);
    expect(result.outcome.file.conditions[0]?.state).toBe('failed');
    expectSafe(result);
    // The safe state reopened the chamber's link once to reach it.
    expect(
      result.events.some((e) => e.type === 'safe-state' && e.step === 'chamber-setpoint 25 °C' && e.ok === true),
    ).toBe(true);
  });
});

describe('a campaign folder in use', () => {
  it('refuses a resume while the campaign is still running, and allows it once it has stopped', async () => {
    let dir = '';
    let refusal: unknown = null;
    const result = await campaignWith({ seed: 8 }, (control, bench) => ({
      onState: (entry, file) => {
        if (entry.index === 0 && entry.state === 'soaking') dir = file.id;
      },
      onSoakSample: () => {
        if (refusal !== null || dir === '') return;
        refusal = 'pending';
        void resumeCampaign({
          bench,
          clock: new VirtualClock(),
          control: new RunControl(),
          dir: join(dirs[dirs.length - 1] as string, dir),
        }).then(
          () => {
            refusal = 'resumed';
          },
          (error: unknown) => {
            refusal = error;
            control.stop('stop');
          },
        );
      },
    }));
    expect(refusal).toBeInstanceOf(Error);
    expect((refusal as Error).message).toMatch(/the campaign is still running \(pid \d+/);
    expect(result.outcome.file.status).toBe('aborted');
    // Stopped: the lock is gone and another resume may claim the folder.
    await expect(readFile(join(result.outcome.dir, 'writer.lock'), 'utf8')).rejects.toThrow(/ENOENT/);
  });
});

describe('a stop during a sweep, then resume', () => {
  it('keeps the stopped run as an earlier run of its condition and sweeps that condition again', async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaignstop-'));
    dirs.push(runsDir);
    const plan = campaignPlanInput({ temperaturesC: [25], supplyV: [4.75, 5.25] });
    const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-05-02T18:00:00.000Z' });
    const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 6 } });
    try {
      const control = new RunControl();
      let samplesAtSecond = 0;
      let sweepingSecond = false;
      const stopped = await startCampaign({
        bench,
        clock,
        control,
        plan,
        runsDir,
        sweep: {
          onSample: () => {
            if (sweepingSecond && ++samplesAtSecond === 20) control.stop('stop');
          },
        },
        onState: (entry) => {
          if (entry.index === 1 && entry.state === 'sweeping') sweepingSecond = true;
        },
      });
      expect(stopped.file.status).toBe('aborted');
      const second = stopped.file.conditions[1];
      expect(second?.state).toBe('waiting');
      expect(second?.earlierRunIds).toHaveLength(1);
      const firstRun = stopped.file.conditions[0]?.runId;
      const resumed = await resumeCampaign({ bench, clock, control: new RunControl(), dir: stopped.dir });
      expect(resumed.file.status).toBe('complete');
      expect(resumed.file.conditions[0]?.runId).toBe(firstRun);
      expect(resumed.file.conditions[1]?.runId).not.toBe(second?.earlierRunIds[0]);
      expect((await readRunFolder(join(stopped.dir, second?.earlierRunIds[0] as string))).meta.status).toBe('aborted');
      expect((await readRunFolder(join(stopped.dir, resumed.file.conditions[1]?.runId as string))).meta.status).toBe(
        'complete',
      );
    } finally {
      await bench.close();
    }
  });
});
