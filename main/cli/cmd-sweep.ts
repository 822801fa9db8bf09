/**
 * `tunebench sweep [--bench BENCH.json] [--plan PLAN.json] [--runs DIR] [--dut-id ID] [--dut relaxation|varactor]`
 */
import { basename } from 'node:path';
import { asUsageError, exitCodeFor, openCliRun, parseRunFlags, runsDirFrom, validatedCliPlan } from './recording-command.ts';
import { loadSweepPlan } from './config-files.ts';
import { defaultSweepPlan } from './default-plans.ts';
import { summarizeRun } from './run-summary.ts';
import { recordSweep, validateSweepPlan } from '../procedures/recorded-run.ts';
import type { CliCommand } from './types.ts';

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
    const { flags, dut } = parseRunFlags(argv);
    const planPath = flags.values.get('plan');
    const plan = validatedCliPlan(planPath === undefined ? defaultSweepPlan(dut) : await loadSweepPlan(planPath).catch(asUsageError), validateSweepPlan);
    const { progress, dutId, recording, close } = await openCliRun(io, flags, dut, plan.safe);
    try {
      const recorded = await recordSweep({
        ...recording,
        plan,
        runsDir: runsDirFrom(flags.values.get('runs'), io),
        dutId,
        onRunStarted: (_meta, dir) => io.stderr.write(`run folder: ${dir}\n`),
      }).catch(asUsageError);
      progress.done();
      io.stdout.write(`${recorded.dir}\n`);
      const summary = await summarizeRun(recorded.dir, `Gain table — ${basename(recorded.dir)}`, recorded.outcome);
      io.stdout.write(`status: ${recorded.meta.status}, ${recorded.outcome.rowsWritten} readings, ${recorded.outcome.refinedPoints} refined points\n`);
      io.stdout.write(summary.text);
      if (summary.tableMarkdown !== null) io.stdout.write(`\n${summary.tableMarkdown}`);
      return exitCodeFor(recorded.outcome, io);
    } finally {
      await close();
    }
  },
};
