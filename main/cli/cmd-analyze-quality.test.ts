/**
 * Issue 9 items 2, 3 and 6 through the CLI on a recorded run folder: data
 * quality from events.jsonl, unsettled points out of the fit, the fit range
 * and the tuning window. Reproduction (item 6): a varactor up-down sweep whose
 * points hit the settle timeout used to give `"warnings": []`.
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SweepAnalysis } from '../../app/analysis/sweep-types.ts';
import type { RunQuality } from '../../app/analysis/run-quality.ts';
import { sweepPlanSchema } from '../../app/contract/plans.ts';
import { runCliCaptured as cli } from '../../test/testing/run-cli-captured.ts';
import { assembleBench } from '../bench/assemble.ts';
import { summarizeRun } from '../cli/run-summary.ts';
import { recordSweep } from '../procedures/recorded-run.ts';
import { VirtualClock } from '../time/virtual-clock.ts';

let dir = '';
let runDir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tunebench-quality-'));
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: 'varactor', seed: 4 } });
  // A settle limit shorter than the tuning port needs after the larger steps: some points time out.
  const plan = sweepPlanSchema.parse({
    start: 0.5,
    stop: 4.5,
    step: 0.1,
    direction: 'up-down',
    readingsPerPoint: 3,
    gateS: 0.1,
    settle: { mode: 'auto', maxS: 0.12 },
    limits: { maxControlV: 5, currentLimitA: 0.02 },
    window: { fromV: 1, toV: 3.5 },
  });
  try {
    runDir = (await recordSweep({ bench, clock, runsDir: dir, dutId: 'lo-7', plan })).dir;
  } finally {
    await bench.close();
  }
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

type Result = SweepAnalysis & { quality: RunQuality };

describe('analyze on a run folder: quality, fit range, window', () => {
  it('run.json says the run came from the simulated bench', async () => {
    const meta = JSON.parse(await readFile(join(runDir, 'run.json'), 'utf8')) as { simulated?: boolean };
    expect(meta.simulated).toBe(true);
  });

  it('counts settle timeouts from events.jsonl, names the voltages and leaves those points out of the fit', async () => {
    const { code, out } = await cli('analyze', runDir, '--json', '--fit-range', 'all');
    expect(code).toBe(0);
    const r = JSON.parse(out) as Result;
    // Settling by prediction needs one reading where watching needed two, so fewer points time out than before.
    expect(r.quality.settleTimeouts.count).toBeGreaterThan(0);
    expect(r.warnings.some((w) => /hit the settle timeout \(at 0\.5, /.test(w))).toBe(true);
    expect(r.fit.unsettledLeftOutV.length).toBeGreaterThan(0);
    expect(r.quality.unsettledPointsLeftOut).toBe(r.fit.unsettledLeftOutV.length);
    expect(r.points.filter((p) => p.unsettled).length).toBeGreaterThan(0);
    const kept = JSON.parse(
      (await cli('analyze', runDir, '--json', '--fit-range', 'all', '--keep-unsettled')).out,
    ) as Result;
    expect(kept.fit.unsettledLeftOutV).toEqual([]);
    expect(kept.fit.points).toBeGreaterThan(r.fit.points);
  });

  it("the sweep command's end-of-run summary counts the same faults and names the voltages", async () => {
    const summary = await summarizeRun(runDir);
    expect(summary.text).toMatch(/data quality +\d+ settle timeout\(s\), 0 failed reading\(s\)/);
    expect(summary.text).toMatch(/note: \d+ point\(s\) hit the settle timeout \(at 0\.5, /);
  });

  it('takes the window from the plan, from --window over it, and refuses one outside the oscillating range', async () => {
    const fromPlan = JSON.parse((await cli('analyze', runDir, '--json')).out) as Result;
    expect(fromPlan.window).toEqual({ fromV: 1, toV: 3.5, source: 'plan' });
    expect(fromPlan.kvco.vAtMin).toBeGreaterThanOrEqual(1);
    expect(fromPlan.kvco.vAtMax).toBeLessThanOrEqual(3.5);
    expect(fromPlan.kvco.linear.fromV).toBeGreaterThanOrEqual(1);
    const flag = JSON.parse((await cli('analyze', runDir, '--json', '--window', '2:3')).out) as Result;
    expect(flag.window).toEqual({ fromV: 2, toV: 3, source: 'flag' });
    // Varactor Kvco falls with V: over 2–3 V the min is at the top, the max at the bottom.
    expect(flag.kvco.vAtMin).toBeCloseTo(3, 9);
    expect(flag.kvco.vAtMax).toBeCloseTo(2, 9);
    const refused = await cli('analyze', runDir, '--window', '0.2:3');
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/window 0\.2–3 V \(flag\) reaches outside the measured oscillating range 0\.5–4\.5 V/);
    expect((await cli('analyze', runDir, '--window', '3:2')).code).toBe(2);
  });

  it('--fit-range all|usable|A:B says in fit.fromV/toV what was used', async () => {
    const all = JSON.parse(
      (await cli('analyze', runDir, '--json', '--fit-range', 'all', '--keep-unsettled')).out,
    ) as Result;
    expect([all.fit.fromV, all.fit.toV]).toEqual([0.5, 4.5]);
    const ab = JSON.parse(
      (await cli('analyze', runDir, '--json', '--fit-range', '1.2:3.8', '--keep-unsettled')).out,
    ) as Result;
    expect(ab.fit.fromV).toBeCloseTo(1.2, 9);
    expect(ab.fit.toV).toBeCloseTo(3.8, 9);
    expect((await cli('analyze', runDir, '--fit-range', 'most')).code).toBe(2);
  });
});
