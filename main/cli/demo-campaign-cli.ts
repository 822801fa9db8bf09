/**
 * `tunebench demo campaign`: the demo campaign (main/procedures/campaign/
 * demo-campaign.ts) on the in-process simulated bench in virtual time, then
 * its datasheet. No instrument is touched.
 */
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderCampaignMarkdown } from '../../app/analysis/campaign-datasheet.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../bench/assemble.ts';
import { CAUTIONS } from './run-setup.ts';
import { campaignDut, campaignPlanInput } from '../procedures/campaign/demo-campaign.ts';
import { startCampaign } from '../procedures/campaign/run-campaign.ts';
import { RunControl } from '../procedures/run-control.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { loadCampaignAnalysis } from './campaign-source.ts';
import { CHAMBER_CAUTIONS } from './cmd-campaign.ts';
import type { CliIo } from './types.ts';

export async function runCampaignDemo(runsFlag: string | undefined, io: CliIo): Promise<number> {
  const runsDir = runsFlag ?? (await mkdtemp(join(tmpdir(), 'tunebench-demo-')));
  const clock = new VirtualClock({ autoAdvance: true, startWallIso: new Date().toISOString() });
  const dut = campaignDut();
  const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut, seed: 7 } });
  io.stderr.write(`${CAUTIONS}\n${CHAMBER_CAUTIONS}\n`);
  io.stderr.write(
    `demo campaign: SIMULATED chamber, bench and DUT (${dut.id}, tempco ${dut.tempcoPpmPerC} ppm/°C, tuning tempco ${dut.tuningTempcoPpmPerC} ppm/°C); virtual time\n`,
  );
  const startedMs = Date.now();
  try {
    const outcome = await startCampaign({
      bench,
      clock,
      control: new RunControl({ signal: io.signal }),
      plan: campaignPlanInput(),
      runsDir,
    });
    io.stdout.write(`campaign folder: ${outcome.dir}\n`);
    io.stdout.write(
      `${outcome.file.conditions.length} conditions, status ${outcome.file.status}: ${(clock.now() / 3600).toFixed(2)} h of chamber time in ${((Date.now() - startedMs) / 1000).toFixed(1)} s\n\n`,
    );
    const { analysis } = await loadCampaignAnalysis(outcome.dir);
    io.stdout.write(renderCampaignMarkdown(analysis, `Campaign datasheet — ${dut.id} (simulated)`));
    return outcome.file.status === 'complete' && outcome.safeStateOk ? 0 : 1;
  } finally {
    await bench.close();
  }
}
