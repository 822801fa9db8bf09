/**
 * The campaign's safe state, on every way out (completion, stop, Ctrl+C,
 * instrument error, lost link, a crash of the process): the control channel
 * to its safe level and off (goSafe), the DUT supply off, and the chamber to
 * the plan's safeC — or stopped, when its profile says so. Each step is tried
 * even if one before failed, a dropped link is reopened once, each step is
 * read back where the instrument can say, and every step is recorded.
 * Never throws.
 */
import type { CampaignPlan } from '../../../app/contract/campaign-plan.ts';
import type { Chamber } from '../../instruments/roles.ts';
import { goSafe, tryStep } from '../safe-state.ts';
import type { BenchRoles, EventBody } from '../types.ts';

export interface CampaignSafeResult {
  ok: boolean;
  failures: string[];
}

export async function campaignSafeState(
  bench: BenchRoles & { chamber?: Chamber | undefined },
  plan: Pick<CampaignPlan, 'sweep' | 'safeC' | 'chamber'>,
  record: (event: EventBody) => void,
): Promise<CampaignSafeResult> {
  const control = await goSafe(bench, bench.controlChannel, plan.sweep.safe, record);
  const failures = [...control.failures];
  const dutCh = bench.dutSupplyChannel;
  await tryStep(
    bench,
    `dut-supply-off channel ${dutCh}`,
    async () => {
      await bench.supply.setOutput(dutCh, false);
      if (await bench.supply.getOutput(dutCh)) throw new Error(`channel ${dutCh} still reads ON after OFF was sent`);
    },
    record,
    failures,
  );
  const chamber = bench.chamber;
  if (chamber) {
    // The limits are the plan's, already checked; set here too in case the campaign failed before it set them.
    chamber.setLimits(plan.chamber);
    if (chamber.endAction === 'stop') {
      await tryStep(
        bench,
        'chamber-stop',
        async () => {
          await chamber.setRunning(false);
          if (await chamber.getRunning()) throw new Error('chamber still reads running after stop was sent');
        },
        record,
        failures,
        'chamber',
      );
    } else {
      await tryStep(
        bench,
        `chamber-setpoint ${plan.safeC} °C`,
        () => chamber.setSetpoint(plan.safeC),
        record,
        failures,
        'chamber',
      );
    }
  }
  return { ok: failures.length === 0, failures };
}
