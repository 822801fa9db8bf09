/**
 * Child process for the campaign crash test: the demo campaign on the
 * in-process simulated bench in virtual time. Prints `done <index> <runId>`
 * as conditions finish, and `soaking <index>` after the fifth soak reading
 * of condition HOLD_INDEX — where the thread then blocks inside the soak
 * loop (virtual time would otherwise finish the soak in milliseconds) until
 * the parent's SIGKILL.
 * Usage: node --import tsx campaign-child.ts RUNS_DIR HOLD_INDEX
 */
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../../../bench/assemble.ts';
import { VirtualClock } from '../../../time/virtual-clock.ts';
import { RunControl } from '../../run-control.ts';
import { campaignDut, campaignPlanInput } from '../demo-campaign.ts';
import { startCampaign } from '../run-campaign.ts';

const [runsDir, holdText] = process.argv.slice(2);
if (!runsDir || holdText === undefined) throw new Error('usage: campaign-child.ts RUNS_DIR HOLD_INDEX');
const hold = Number(holdText);
const clock = new VirtualClock({ autoAdvance: true, startWallIso: '2026-04-01T22:00:00.000Z' });
const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 21 } });
let soakReadings = 0;
await startCampaign({
  bench,
  clock,
  control: new RunControl(),
  plan: campaignPlanInput(),
  runsDir,
  onState: (entry) => {
    if (entry.state === 'done') process.stdout.write(`done ${entry.index} ${entry.runId ?? ''}\n`);
  },
  onSoakSample: (entry) => {
    if (entry.index !== hold || ++soakReadings < 5) return;
    process.stdout.write(`soaking ${entry.index}\n`);
    Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 60_000);
  },
});
