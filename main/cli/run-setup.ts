/**
 * What the sweep, drift and pushing commands share: the runs folder, the
 * bench (file or built-in simulation), the safety cautions, a RunControl
 * wired to SIGINT/SIGTERM, progress on stderr, and the mapping of outcomes
 * and errors to exit codes (0 done, 1 work failed, 2 bad input).
 */
import { AddressError, ProfileError } from '../instruments/errors.ts';
import { stopOnSignals } from '../procedures/exit-guard.ts';
import { goSafe } from '../procedures/safe-state.ts';
import { installLastResortGuard } from '../service/last-resort-guard.ts';
import { LimitsError } from '../procedures/limits.ts';
import { RunControl } from '../procedures/run-control.ts';
import type { RecordOptions } from '../procedures/recorded-run.ts';
import type { ProcedureOutcome } from '../procedures/types.ts';
import type { Clock } from '../time/clock.ts';
import { RealClock } from '../time/real-clock.ts';
import type { SafeState } from '../../app/contract/plans.ts';
import type { ParsedFlags } from './flags.ts';
import { UsageError, WorkFailedError, type CliIo } from './types.ts';
import { assembleBench, type AssembledBench } from '../bench/assemble.ts';
import { BenchCheckError } from '../bench/bench-checks.ts';
import { ConfigFileError, loadBenchFile } from './config-files.ts';
import type { DutParams } from '../sim/dut-params.ts';
import type { DefaultDut } from './default-plans.ts';
import { createProgressDisplay } from './progress-display.ts';

export const CAUTIONS = [
  'Cautions: supply limits protect the DUT only if they are right for it — check them before a run.',
  'Unattended and overnight runs: keep the bench where a fault cannot start a fire or hurt anyone; mains-powered',
  'instruments need their covers and earth. Local codes and licensed practice come first.',
].join('\n');

export function parseDutName(text: string | undefined): DefaultDut {
  if (text === undefined || text === 'relaxation' || text === 'varactor') return text ?? 'relaxation';
  throw new UsageError(`--dut: expected relaxation or varactor, got "${text}"`);
}

export { runsDirFrom } from './runs-dir-flag.ts';

/** Turns a bad file, plan or address into a UsageError (exit 2) that names the field. */
export function asUsageError(error: unknown): never {
  if (
    error instanceof ConfigFileError ||
    error instanceof LimitsError ||
    error instanceof AddressError ||
    error instanceof ProfileError ||
    error instanceof BenchCheckError
  ) {
    throw new UsageError(error instanceof LimitsError ? `plan refused — ${error.message}` : error.message);
  }
  throw error;
}

export async function openCliBench(
  benchPath: string | undefined,
  dut: DefaultDut | DutParams,
  clock: Clock,
): Promise<AssembledBench> {
  const config = benchPath === undefined ? 'sim' : await loadBenchFile(benchPath).catch(asUsageError);
  try {
    return await assembleBench(config, { clock, sim: { dut } });
  } catch (error) {
    if (error instanceof AddressError || error instanceof ProfileError || error instanceof BenchCheckError)
      asUsageError(error);
    throw new WorkFailedError(`cannot open the bench: ${error instanceof Error ? error.message : String(error)}`);
  }
}

/** How a recorded run ended, for the last-resort guard when a signal arrives while it finishes. */
export interface RunVerdict {
  safeStateOk: boolean;
  exitCode: number;
}

/**
 * A RunControl stopped by io.signal, or by SIGINT/SIGTERM/SIGHUP when the
 * caller gave none. When the command owns the process (its streams are the
 * process's), it installs the one last-resort guard
 * (main/service/last-resort-guard.ts): a signal stops the run cleanly (the
 * procedure drives and records the safe state); a crash or a heap near its
 * limit stops it too, and if the procedure has not ended within 8 s the
 * guard drives the safe state itself; then the process exits with code 1.
 */
export function cliControl(
  io: CliIo,
  bench: AssembledBench,
  safe: SafeState,
  /** The guard's own safe state when the work has not ended within 8 s (default: the control channel's). */
  driveSafe: (record: (event: { type: string; [key: string]: unknown }) => void) => Promise<{ ok: boolean }> = (
    record,
  ) => goSafe(bench, bench.controlChannel, safe, record),
): { control: RunControl; dispose: (verdict?: RunVerdict) => void } {
  const control = new RunControl({ signal: io.signal });
  const disposers: (() => void)[] = [];
  let ended: (verdict: RunVerdict) => void = () => undefined;
  const runEnded = new Promise<RunVerdict>((resolve) => (ended = resolve));
  if (io.stdout === process.stdout && io.signal === undefined) {
    const record = (event: { type: string; [key: string]: unknown }): void => {
      io.stderr.write(`${event.type}: ${JSON.stringify(event)}\n`);
    };
    const holder = {
      async leaveSafe(cause: { kind: string }): Promise<{ ok: boolean; exitCode?: number }> {
        control.stop(cause.kind === 'signal' ? 'signal' : cause.kind);
        const wait = new Promise<null>((resolve) => setTimeout(() => resolve(null), 8000).unref());
        // The run ended by itself: its own safe-state verdict and exit code stand (a run that ended is not
        // a bench proven safe — a second Ctrl-C once exited 0 over an unconfirmed safe state).
        const verdict = await Promise.race([runEnded, wait]);
        if (verdict !== null) return { ok: verdict.safeStateOk, exitCode: verdict.exitCode };
        return { ok: (await driveSafe(record)).ok };
      },
    };
    disposers.push(
      installLastResortGuard({
        source: process,
        holder,
        log: (line) => io.stderr.write(`${line}\n`),
        exit: (code) => process.exit(code),
        onSignal: () => control.stop('signal'),
      }),
    );
  } else if (io.signal === undefined) disposers.push(stopOnSignals(control, process, ['SIGINT', 'SIGTERM', 'SIGHUP']));
  return {
    control,
    dispose: (verdict) => {
      // Without a verdict (the command threw) nothing proves the safe state.
      ended(verdict ?? { safeStateOk: false, exitCode: 1 });
      disposers.forEach((dispose) => dispose());
    },
  };
}

/** One line per instrument: role, identity, address (printed at the start of every run on a real bench). */
export function identityLines(bench: Pick<AssembledBench, 'instruments'>): string[] {
  return bench.instruments.map(({ role, idn, address }) => `${role}: ${idn} at ${address}`);
}

export function cliProgress(io: CliIo): ReturnType<typeof createProgressDisplay> {
  return createProgressDisplay(io.stderr);
}

/** Exit code for an outcome; failures and aborts are explained on stderr. */
export function exitCodeFor(outcome: ProcedureOutcome, io: CliIo): number {
  if (!outcome.safeStateOk) {
    io.stderr.write(
      'WARNING: the safe state could not be confirmed by readback — check the supply now (see events.jsonl):\n',
    );
    for (const line of outcome.safeStateFailures ?? []) io.stderr.write(`  ${line}\n`);
  }
  if (outcome.failure !== null) {
    io.stderr.write(`${outcome.kind} failed (${outcome.failure.kind}): ${outcome.failure.message}\n`);
    return 1;
  }
  if (outcome.status === 'aborted') {
    io.stderr.write(
      `${outcome.kind} stopped early (${outcome.reason ?? 'stop'}); ${outcome.safeStateOk ? 'the supply was put in its safe state' : 'the safe state was NOT confirmed'}.\n`,
    );
    return 1;
  }
  // An unconfirmed safe state is a failure even when the work itself completed.
  return outcome.safeStateOk ? 0 : 1;
}

/** Returns the plan once `validate` passes it; a refusal is a UsageError naming the field. */
export function validatedCliPlan<P>(plan: P, validate: (plan: P) => void): P {
  try {
    validate(plan);
  } catch (error) {
    asUsageError(error);
  }
  return plan;
}

/** A bench opened for one recorded run, with its control, progress display and recorded DUT id. */
export interface CliRun {
  clock: Clock;
  bench: AssembledBench;
  control: RunControl;
  progress: ReturnType<typeof createProgressDisplay>;
  /** `--dut-id`, else the simulated DUT's name, else "dut". */
  dutId: string;
  /** What every record call takes from this session: bench, clock, control, progress. */
  recording: Pick<RecordOptions, 'bench' | 'clock' | 'control' | 'onProgress'>;
  /** Releases the signal handlers and closes the bench; `verdict`: how the run ended, when it did. */
  close: (verdict?: RunVerdict) => Promise<void>;
}

/**
 * Shows the cautions, opens the bench (file or simulation), and wires the
 * run's control and progress. Call after the plan has been validated, so a
 * refused plan never touches an instrument.
 */
export async function openCliRun(
  io: CliIo,
  flags: ParsedFlags,
  dut: DefaultDut | DutParams,
  safe: SafeState,
): Promise<CliRun> {
  const clock = new RealClock();
  io.stderr.write(`${CAUTIONS}\n`);
  const bench = await openCliBench(flags.values.get('bench'), dut, clock);
  if (bench.simulated)
    io.stderr.write(`bench: simulated (${bench.sim?.dutParams.id ?? 'sim'}) — no instrument is touched\n`);
  else for (const line of identityLines(bench)) io.stderr.write(`${line}\n`);
  const found = bench.controlFound;
  if (found.outputOn) {
    io.stderr.write(
      `NOTE: control channel ${found.channel} was found ON at ${found.setpointV} V (left by an earlier run or by hand); it goes to the safe state before the limits are applied.\n`,
    );
  }
  const { control, dispose } = cliControl(io, bench, safe);
  const dutId = flags.values.get('dut-id') ?? (bench.sim !== null ? `sim-${bench.sim.dutParams.id}` : 'dut');
  const close = async (verdict?: RunVerdict): Promise<void> => {
    dispose(verdict);
    await bench.close();
  };
  const progress = cliProgress(io);
  return {
    clock,
    bench,
    control,
    progress,
    dutId,
    recording: { bench, clock, control, onProgress: progress.update },
    close,
  };
}
