/**
 * `tunebench pushing [--bench …] [--plan …] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor|FILE.json]`
 */
import { loadPushingPlan } from './config-files.ts';
import { defaultPushingPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordPushing, validatePushingPlan } from '../procedures/recorded-run.ts';
import { recordingCommand } from './record-command.ts';

const usage = `usage: tunebench pushing [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor|FILE.json]

Holds the control voltage, steps the DUT's own supply (supply channel
dutSupplyChannel) over a range no higher than the plan's maxSupplyV, and
reports the frequency pushing in Hz/V and ppm/V. The DUT supply is put back
where it was found at the end.

options:
  --plan FILE   pushing plan { controlV, supplyStartV, supplyStopV, supplyStepV, maxSupplyV, limits, safe, … };
                default: ±10 % around the simulated DUT's nominal supply
  --runs, --dut-id, --dut, --bench as for \`tunebench sweep\`

Every key of the plan file: resources/docs/reference.md (or \`tunebench schema pushing-plan\`).
Ctrl+C stops cleanly: control voltage to the safe level, output off, DUT supply restored.
`;

export const pushingCommand = recordingCommand({
  name: 'pushing',
  usage,
  defaultPlan: defaultPushingPlan,
  loadPlan: loadPushingPlan,
  validate: validatePushingPlan,
  record: (options) => recordPushing(options),
  async report(recorded) {
    const o = recorded.outcome;
    const lines = [`status: ${recorded.meta.status}, ${o.steps} supply steps\n`];
    if (o.hzPerV !== null && o.ppmPerV !== null)
      lines.push(`pushing: ${o.hzPerV.toPrecision(4)} Hz/V (${o.ppmPerV.toPrecision(4)} ppm/V)\n`);
    lines.push((await summarizeRun(recorded.dir, undefined, o)).text);
    return lines.join('');
  },
});
