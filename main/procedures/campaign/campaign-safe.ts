/**
 * The campaign's safe state, on every way out (completion, stop, Ctrl+C,
 * instrument error, lost link, a crash of the process): the control channel
 * to its safe level and off and the DUT supply off (each written first, then
 * read back: safe-state.ts), and the chamber to
 * the plan's safeC — or stopped, when its profile says so. Each step is tried
 * even if one before failed, a dropped link is reopened once, each step is
 * read back where the instrument can say, and every step is recorded.
 * Never throws.
 */
import type { CampaignPlan } from '../../../app/contract/campaign-plan.ts';
import type { Chamber } from '../../instruments/roles.ts';
import { driveVerified, outputOffStep, tryStep, voltageStep } from '../safe-state.ts';
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
  // The supply's steps are one verified safe state: every command is written urgently before any readback,
  // so a supply whose replies have wedged still gets the DUT supply's OUTP OFF (not held behind a resync in
  // the session's queue, which a wedged link never answers), and one reconnect serves them all.
  const control = plan.sweep.safe;
  const steps = [voltageStep(bench, bench.controlChannel, control.controlV, `control-voltage ${control.controlV} V`)];
  if (control.outputOff) steps.push(outputOffStep(bench, bench.controlChannel));
  const dutCh = bench.dutSupplyChannel;
  steps.push(outputOffStep(bench, dutCh, `dut-supply-off channel ${dutCh}`));
  const supply = await driveVerified(bench, steps, record);
  const failures = [...supply.failures];
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
