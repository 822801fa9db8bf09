/**
 * The one flow of the three recording commands (sweep, drift, pushing):
 * shared flags, the plan (file or default for the simulated DUT), flag
 * overrides, validation before any instrument is touched, the bench, the
 * recorded run, its report, and one mapping of errors to exit codes
 * (a refused plan, file or address → 2; the work failed → 1).
 */
import type { SafeState } from '../../app/contract/plans.ts';
import { asUsageError, exitCodeFor, openCliRun, runsDirFrom, validatedCliPlan, type RunVerdict } from './run-setup.ts';
import type { RecordedRun, RecordOptions } from '../procedures/recorded-run.ts';
import type { ProcedureOutcome } from '../procedures/types.ts';
import type { BuiltinDutName } from '../sim/builtin-duts.ts';
import { parseFlags, withFlags, type FlagSpec, type ParsedFlags } from './flags.ts';
import { defaultsFor, resolveSimDut } from './sim-dut.ts';
import { UsageError, type CliCommand, type CliIo } from './types.ts';

/** Flags every recording command takes. */
export const RECORDING_FLAGS: FlagSpec = { values: ['bench', 'plan', 'runs', 'dut-id', 'dut'] };

export interface RecordingCommandSpec<P extends { safe: SafeState }, O extends ProcedureOutcome> {
  name: string;
  usage: string;
  /** Flags beyond RECORDING_FLAGS. */
  flags?: FlagSpec;
  defaultPlan(dut: BuiltinDutName): P;
  loadPlan(path: string): Promise<P>;
  /** Flags that override plan fields (drift's --duration, --interval). */
  applyFlags?(plan: P, flags: ParsedFlags): P;
  /** Throws LimitsError naming the field; runs before the bench opens. */
  validate(plan: P): void;
  /** A line for stderr before the bench opens (e.g. how long the run will take). */
  notice?(plan: P, flags: ParsedFlags): string | null;
  /** Said after the run folder's path on stderr. */
  folderNote?: string;
  record(options: RecordOptions & { plan: P }, flags: ParsedFlags): Promise<RecordedRun<O>>;
  /** Status lines for stdout after the run folder's path. */
  report(recorded: RecordedRun<O>): Promise<string>;
}

async function runRecording<P extends { safe: SafeState }, O extends ProcedureOutcome>(
  spec: RecordingCommandSpec<P, O>,
  argv: string[],
  io: CliIo,
): Promise<number> {
  const flags = parseFlags(argv, withFlags(RECORDING_FLAGS, spec.flags ?? {}));
  if (flags.positionals.length > 0) throw new UsageError(`unexpected argument "${flags.positionals[0]}"`);
  const dut = await resolveSimDut(flags.values.get('dut'));
  const planPath = flags.values.get('plan');
  let plan =
    planPath === undefined ? spec.defaultPlan(defaultsFor(dut)) : await spec.loadPlan(planPath).catch(asUsageError);
  if (spec.applyFlags) plan = spec.applyFlags(plan, flags);
  validatedCliPlan(plan, (p) => spec.validate(p));
  const notice = spec.notice?.(plan, flags);
  if (notice) io.stderr.write(`${notice}\n`);
  const { progress, dutId, recording, close } = await openCliRun(io, flags, dut, plan.safe);
  let verdict: RunVerdict | undefined;
  try {
    const recorded = await spec
      .record(
        {
          ...recording,
          plan,
          runsDir: runsDirFrom(flags.values.get('runs'), io),
          dutId,
          onRunStarted: (_meta, dir) =>
            io.stderr.write(`run folder: ${dir}${spec.folderNote ? ` ${spec.folderNote}` : ''}\n`),
        },
        flags,
      )
      .catch(asUsageError);
    progress.done();
    io.stdout.write(`${recorded.dir}\n`);
    io.stdout.write(await spec.report(recorded));
    const exitCode = exitCodeFor(recorded.outcome, io);
    verdict = { safeStateOk: recorded.outcome.safeStateOk, exitCode };
    return exitCode;
  } catch (error) {
    progress.done();
    throw error;
  } finally {
    await close(verdict);
  }
}

/** A CliCommand that records one procedure into a new run folder. */
export function recordingCommand<P extends { safe: SafeState }, O extends ProcedureOutcome>(
  spec: RecordingCommandSpec<P, O>,
): CliCommand {
  return { name: spec.name, usage: spec.usage, run: (argv, io) => runRecording(spec, argv, io) };
}
