/**
 * `tunebench drift [--bench …] [--plan …] [--runs DIR] [--duration 8h] [--interval 1s] [--resume RUN_ID]`
 */
import { parseDurationS } from '../../app/contract/si.ts';
import type { DriftPlan } from '../../app/contract/plans.ts';
import { asUsageError, exitCodeFor, openCliRun, parseRunFlags, runsDirFrom, validatedCliPlan } from './recording-command.ts';
import { loadDriftPlan } from './config-files.ts';
import { defaultDriftPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordDrift, resumeDrift, validateDriftPlan } from '../procedures/recorded-run.ts';
import { StoreError } from '../store/store-error.ts';
import { positiveFlag } from './flags.ts';
import { UsageError, type CliCommand } from './types.ts';

const usage = `usage: tunebench drift [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--duration 8h] [--interval 1s]
                       [--dut-id ID] [--dut relaxation|varactor] [--resume RUN_ID]

Holds the control voltage and logs frequency (and temperature, with a
thermometer on the bench) every interval until the duration ends or Ctrl-C —
a clean stop that keeps everything recorded. The first reading waits until the
tuning port has settled at the control voltage (plan "settle"; default
automatic, at most 10 s). Dropped links are reopened and the gaps recorded.
Without --bench it runs on the built-in simulated bench.

options:
  --plan FILE       drift plan { controlV, intervalS, durationS, gateS, settle, limits, safe }
  --duration TIME   overrides the plan: 90s, 15m, 8h (default 8h)
  --interval TIME   overrides the plan: time between readings (default 1s)
  --resume RUN_ID   carry on an interrupted drift log in its own folder (gap recorded)
  --runs, --dut-id, --dut, --bench as for \`tunebench sweep\`
`;

function durationFlag(name: string, text: string | undefined): number | undefined {
  return positiveFlag(name, text, parseDurationS, (got) => `expected a duration such as 90s, 15m or 8h, got "${got}"`);
}

export const driftCommand: CliCommand = {
  name: 'drift',
  summary: 'drift log at a fixed control voltage (frequency + temperature)',
  usage,
  async run(argv, io) {
    const { flags, dut } = parseRunFlags(argv, ['duration', 'interval', 'resume']);
    const planPath = flags.values.get('plan');
    let plan: DriftPlan = planPath === undefined ? defaultDriftPlan(dut) : await loadDriftPlan(planPath).catch(asUsageError);
    const durationS = durationFlag('duration', flags.values.get('duration'));
    const intervalS = durationFlag('interval', flags.values.get('interval'));
    plan = { ...plan, ...(durationS === undefined ? {} : { durationS }), ...(intervalS === undefined ? {} : { intervalS }) };
    validatedCliPlan(plan, validateDriftPlan);
    const runsDir = runsDirFrom(flags.values.get('runs'), io);
    const { progress, dutId, recording, close } = await openCliRun(io, flags, dut, plan.safe);
    const common = {
      ...recording,
      runsDir,
      onRunStarted: (_meta: unknown, dir: string) => io.stderr.write(`run folder: ${dir} (Ctrl-C ends the log cleanly)\n`),
    };
    try {
      const resumeId = flags.values.get('resume');
      const recorded =
        resumeId === undefined
          ? await recordDrift({ ...common, plan, dutId })
          : await resumeDrift({ ...common, id: resumeId }).catch((error: unknown) => {
              if (error instanceof StoreError || error instanceof RangeError) throw new UsageError(`--resume ${resumeId}: ${error.message}`);
              throw error;
            });
      progress.done();
      io.stdout.write(`${recorded.dir}\n`);
      io.stdout.write(`status: ${recorded.meta.status}, ${recorded.outcome.readings} readings, ${recorded.outcome.gaps} gap(s)\n`);
      io.stdout.write((await summarizeRun(recorded.dir, undefined, recorded.outcome)).text);
      return exitCodeFor(recorded.outcome, io);
    } finally {
      await close();
    }
  },
};
