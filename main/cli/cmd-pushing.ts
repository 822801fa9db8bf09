/**
 * `tunebench pushing [--bench …] [--plan …] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor]`
 */
import { asUsageError, exitCodeFor, openCliRun, parseRunFlags, runsDirFrom, validatedCliPlan } from './recording-command.ts';
import { loadPushingPlan } from './config-files.ts';
import { defaultPushingPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordPushing, validatePushingPlan } from '../procedures/recorded-run.ts';
import type { CliCommand } from './types.ts';

const usage = `usage: tunebench pushing [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor]

Holds the control voltage, steps the DUT's own supply (supply channel
dutSupplyChannel) over a range no higher than the plan's maxSupplyV, and
reports the frequency pushing in Hz/V and ppm/V. The DUT supply is put back
where it was found at the end.

options:
  --plan FILE   pushing plan { controlV, supplyStartV, supplyStopV, supplyStepV, maxSupplyV, limits, safe, … };
                default: ±10 % around the simulated DUT's nominal supply
  --runs, --dut-id, --dut, --bench as for \`tunebench sweep\`
`;

export const pushingCommand: CliCommand = {
  name: 'pushing',
  summary: 'supply pushing (Hz/V) at a fixed control voltage',
  usage,
  async run(argv, io) {
    const { flags, dut } = parseRunFlags(argv);
    const planPath = flags.values.get('plan');
    const plan = validatedCliPlan(planPath === undefined ? defaultPushingPlan(dut) : await loadPushingPlan(planPath).catch(asUsageError), validatePushingPlan);
    const { progress, dutId, recording, close } = await openCliRun(io, flags, dut, plan.safe);
    try {
      const recorded = await recordPushing({
        ...recording,
        plan,
        runsDir: runsDirFrom(flags.values.get('runs'), io),
        dutId,
        onRunStarted: (_meta, dir) => io.stderr.write(`run folder: ${dir}\n`),
      });
      progress.done();
      const o = recorded.outcome;
      io.stdout.write(`${recorded.dir}\n`);
      io.stdout.write(`status: ${recorded.meta.status}, ${o.steps} supply steps\n`);
      if (o.hzPerV !== null && o.ppmPerV !== null) io.stdout.write(`pushing: ${o.hzPerV.toPrecision(4)} Hz/V (${o.ppmPerV.toPrecision(4)} ppm/V)\n`);
      io.stdout.write((await summarizeRun(recorded.dir, undefined, o)).text);
      return exitCodeFor(o, io);
    } finally {
      await close();
    }
  },
};
