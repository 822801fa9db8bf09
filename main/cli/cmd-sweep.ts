/**
 * `tunebench sweep [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor]`
 */
import { basename } from 'node:path';
import { CAUTIONS, asUsageError, cliControl, cliProgress, exitCodeFor, openCliBench, parseDutName, runsDirFrom } from '../bench/cli-session.ts';
import { loadSweepPlan } from '../bench/config-files.ts';
import { defaultSweepPlan } from '../bench/default-plans.ts';
import { summarizeRun } from '../bench/run-summary.ts';
import { recordSweep, validateSweepPlan } from '../procedures/recorded-run.ts';
import { RealClock } from '../time/real-clock.ts';
import { parseFlags } from './flags.ts';
import { UsageError, type CliCommand } from './types.ts';

const usage = `usage: tunebench sweep [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor]

Runs a gain sweep: steps the control voltage, settles, reads the counter,
refines the stall edge, and records every reading in a new run folder.
Without --bench it runs against the built-in simulated bench (in real time).

options:
  --bench FILE    bench file (addresses and profiles of supply, counter, thermometer)
  --plan FILE     sweep plan (start/stop/step or points, settle, limits, safe state);
                  default: 1–4.5 V in 50 mV steps, automatic settling, 5 V / 20 mA limits
  --runs DIR      runs folder (default: TUNEBENCH_RUNS, else the user data folder)
  --dut-id ID     DUT id recorded with the run
  --dut NAME      simulated DUT when there is no --bench: relaxation (default) or varactor

Ctrl-C stops the sweep cleanly: control voltage to the safe level, output off.
`;

export const sweepCommand: CliCommand = {
  name: 'sweep',
  summary: 'gain sweep of the DUT into a new run folder',
  usage,
  async run(argv, io) {
    const flags = parseFlags(argv, { values: ['bench', 'plan', 'runs', 'dut-id', 'dut'] });
    if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
    const dut = parseDutName(flags.values.get('dut'));
    const planPath = flags.values.get('plan');
    const plan = planPath === undefined ? defaultSweepPlan(dut) : await loadSweepPlan(planPath).catch(asUsageError);
    try {
      validateSweepPlan(plan);
    } catch (error) {
      asUsageError(error);
    }
    const benchPath = flags.values.get('bench');
    const clock = new RealClock();
    io.stderr.write(`${CAUTIONS}\n`);
    const bench = await openCliBench(benchPath, dut, clock);
    const dutId = flags.values.get('dut-id') ?? (bench.sim !== null ? `sim-${bench.sim.dutParams.id}` : 'dut');
    if (bench.simulated) io.stderr.write(`bench: simulated (${bench.sim?.dutParams.id ?? 'sim'}) — no instrument is touched\n`);
    const { control, dispose } = cliControl(io, bench, plan.safe);
    const progress = cliProgress(io);
    try {
      const recorded = await recordSweep({
        bench,
        plan,
        clock,
        runsDir: runsDirFrom(flags.values.get('runs'), io),
        dutId,
        control,
        onProgress: progress.update,
        onRunStarted: (_meta, dir) => io.stderr.write(`run folder: ${dir}\n`),
      }).catch(asUsageError);
      progress.done();
      io.stdout.write(`${recorded.dir}\n`);
      const summary = await summarizeRun(recorded.dir, `Gain table — ${basename(recorded.dir)}`);
      io.stdout.write(`status: ${recorded.meta.status}, ${recorded.outcome.rowsWritten} readings, ${recorded.outcome.refinedPoints} refined points\n`);
      io.stdout.write(summary.text);
      if (summary.tableMarkdown !== null) io.stdout.write(`\n${summary.tableMarkdown}`);
      return exitCodeFor(recorded.outcome, io);
    } finally {
      dispose();
      await bench.close();
    }
  },
};
