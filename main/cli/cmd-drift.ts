/**
 * `tunebench drift [--bench …] [--plan …] [--runs DIR] [--duration 8h] [--interval 1s] [--resume RUN_ID]`
 */
import { parseDurationS } from '../../app/contract/si.ts';
import type { DriftPlan } from '../../app/contract/plans.ts';
import { CAUTIONS, asUsageError, cliControl, cliProgress, exitCodeFor, openCliBench, parseDutName, runsDirFrom } from '../bench/cli-session.ts';
import { loadDriftPlan } from '../bench/config-files.ts';
import { defaultDriftPlan } from '../bench/default-plans.ts';
import { summarizeRun } from '../bench/run-summary.ts';
import { recordDrift, resumeDrift, validateDriftPlan } from '../procedures/recorded-run.ts';
import { StoreError } from '../store/store-error.ts';
import { RealClock } from '../time/real-clock.ts';
import { parseFlags } from './flags.ts';
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
  if (text === undefined) return undefined;
  const seconds = parseDurationS(text);
  if (seconds === null || !(seconds > 0)) throw new UsageError(`--${name}: expected a duration such as 90s, 15m or 8h, got "${text}"`);
  return seconds;
}

export const driftCommand: CliCommand = {
  name: 'drift',
  summary: 'drift log at a fixed control voltage (frequency + temperature)',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['bench', 'plan', 'runs', 'dut-id', 'dut', 'duration', 'interval', 'resume'] });
    if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
    const dut = parseDutName(flags.values.get('dut'));
    const planPath = flags.values.get('plan');
    let plan: DriftPlan = planPath === undefined ? defaultDriftPlan(dut) : await loadDriftPlan(planPath).catch(asUsageError);
    const durationS = durationFlag('duration', flags.values.get('duration'));
    const intervalS = durationFlag('interval', flags.values.get('interval'));
    plan = { ...plan, ...(durationS === undefined ? {} : { durationS }), ...(intervalS === undefined ? {} : { intervalS }) };
    try {
      validateDriftPlan(plan);
    } catch (error) {
      asUsageError(error);
    }
    const clock = new RealClock();
    const runsDir = runsDirFrom(flags.values.get('runs'), io);
    io.stderr.write(`${CAUTIONS}\n`);
    const bench = await openCliBench(flags.values.get('bench'), dut, clock);
    if (bench.simulated) io.stderr.write(`bench: simulated (${bench.sim?.dutParams.id ?? 'sim'}) — no instrument is touched\n`);
    const { control, dispose } = cliControl(io, bench, plan.safe);
    const progress = cliProgress(io);
    const common = {
      bench,
      clock,
      runsDir,
      control,
      onProgress: progress.update,
      onRunStarted: (_meta: unknown, dir: string) => io.stderr.write(`run folder: ${dir} (Ctrl-C ends the log cleanly)\n`),
    };
    try {
      const resumeId = flags.values.get('resume');
      const recorded =
        resumeId === undefined
          ? await recordDrift({ ...common, plan, dutId: flags.values.get('dut-id') ?? (bench.sim !== null ? `sim-${bench.sim.dutParams.id}` : 'dut') })
          : await resumeDrift({ ...common, id: resumeId }).catch((error: unknown) => {
              if (error instanceof StoreError || error instanceof RangeError) throw new UsageError(`--resume ${resumeId}: ${error.message}`);
              throw error;
            });
      progress.done();
      io.stdout.write(`${recorded.dir}\n`);
      io.stdout.write(`status: ${recorded.meta.status}, ${recorded.outcome.readings} readings, ${recorded.outcome.gaps} gap(s)\n`);
      io.stdout.write((await summarizeRun(recorded.dir)).text);
      return exitCodeFor(recorded.outcome, io);
    } finally {
      dispose();
      await bench.close();
    }
  },
};
