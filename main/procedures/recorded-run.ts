/**
 * A procedure with its run folder: validates the plan (so a refused plan
 * leaves no folder behind), creates the run, runs the procedure into it,
 * and records the final status. A drift log stopped by a crash can be
 * resumed into its own folder. This is what the CLI and the BenchApi
 * service call.
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import {
  driftPlanSchema,
  driftTimingProblems,
  type DriftPlan,
  type PushingPlan,
  type SweepPlan,
} from '../../app/contract/plans.ts';
import { cacheFinishedRun, createRun, nodeStoreFs, reopenRun, type RunWriter } from '../store/index.ts';
import { isRunFileFault } from '../store/store-error.ts';
import type { Clock } from '../time/clock.ts';
import { DRIFT_COLUMNS, runDrift, type DriftOutcome } from './drift.ts';
import { checkControlV, checkLimits, LimitsError } from './limits.ts';
import type { ProgressListener } from './progress.ts';
import { PUSHING_COLUMNS, checkPushingLimits, runPushing, type PushingOutcome } from './pushing.ts';
import { RunControl } from './run-control.ts';
import { SWEEP_COLUMNS, runSweep, type SweepOutcome } from './sweep.ts';
import { sweepSchedule } from './sweep-points.ts';
import { DEFAULT_GATE_RANGE_S } from '../instruments/roles.ts';
import type { BenchRoles, EventBody, ProcedureEvent, ProcedureOutcome, RunSink, SampleRow } from './types.ts';

/** What a bench tells run.json about itself. */
export interface RecordableBench extends BenchRoles {
  instruments: RunMeta['instruments'];
}

export interface RecordOptions {
  bench: RecordableBench;
  clock: Clock;
  runsDir: string;
  dutId: string;
  dutNotes?: string;
  control?: RunControl;
  onProgress?: ProgressListener;
  /** Called once the run folder will stay: at the first output-on or reading, else at the end (never for a refused plan). */
  onRunStarted?: (meta: RunMeta, dir: string) => void;
  /** Each row as it is recorded (for live views). */
  onSample?: (row: SampleRow) => void;
  onEvent?: (event: ProcedureEvent) => void;
  /** Events recorded first in the run (e.g. a campaign's `campaign-condition`). */
  startEvents?: readonly EventBody[];
}

export interface RecordedRun<O extends ProcedureOutcome> {
  meta: RunMeta;
  dir: string;
  outcome: O;
}

/** A RunSink over the store's writer that also tells live listeners. */
function teeSink(writer: RunWriter, options: RecordOptions): RunSink {
  return {
    appendSample(row) {
      writer.appendSample(row);
      options.onSample?.(row);
    },
    appendEvent(event) {
      writer.appendEvent(event);
      options.onEvent?.(event);
    },
    flush: () => writer.flush(),
  };
}

/**
 * A procedure that refuses its plan on what it finds at the bench (a limits
 * failure before any output turned on and before any reading) leaves no run
 * folder: the folder is removed and the refusal thrown as a LimitsError.
 */
async function refusedBeforeOutput(
  writer: RunWriter,
  outcome: ProcedureOutcome,
  outputTouched: boolean,
): Promise<void> {
  if (outcome.failure?.kind !== 'limits' || outputTouched || outcome.rowsWritten > 0) return;
  await writer.finish('aborted');
  await nodeStoreFs.rm(writer.dir, { recursive: true, force: true });
  const field = /^([\w.[\]]+): /.exec(outcome.failure.message)?.[1] ?? 'plan';
  throw new LimitsError(field, outcome.failure.message.slice(field.length + 2) || outcome.failure.message);
}

async function record<O extends ProcedureOutcome>(
  writer: RunWriter,
  options: RecordOptions,
  run: (sink: RunSink) => Promise<O>,
  fresh = true,
): Promise<RecordedRun<O>> {
  let outputTouched = !fresh;
  let announced = false;
  // The folder is announced once it will stay: when an output turns on or a reading arrives,
  // else at the end unless the plan was refused (then it is removed).
  const announce = (): void => {
    if (announced) return;
    announced = true;
    options.onRunStarted?.(writer.meta(), writer.dir);
  };
  const tee = teeSink(writer, options);
  const sink: RunSink = {
    ...tee,
    appendSample(row) {
      announce();
      tee.appendSample(row);
    },
    appendEvent(event) {
      if (event.type === 'output-on') {
        outputTouched = true;
        announce();
      }
      tee.appendEvent(event);
    },
  };
  for (const event of options.startEvents ?? []) writer.appendEvent({ ...event });
  let outcome: O;
  try {
    outcome = await run(sink);
  } catch (error) {
    announce();
    // Procedures resolve on every way out after touching instruments; a throw here
    // is a bug before the first write. Close the run as aborted, then report it.
    writer.appendEvent({
      type: 'abort',
      reason: 'internal-error',
      error: error instanceof Error ? error.message : String(error),
    });
    await writer.finish('aborted');
    throw error;
  }
  await refusedBeforeOutput(writer, outcome, outputTouched);
  announce();
  const meta = await writer.finish(outcome.status, outcome.conditions ? { conditions: outcome.conditions } : undefined);
  // The bench is already safe here: a big run's column cache is built now, so its first opening draws at once.
  await cacheFinishedRun(writer.dir, writer.rowsWritten()).catch(() => false);
  return { meta, dir: writer.dir, outcome };
}

/** Throws LimitsError (naming the field) when a plan exceeds its limits; call before opening a bench. */
export function validateSweepPlan(plan: SweepPlan): void {
  checkLimits(plan.limits, plan.safe);
  sweepSchedule(plan);
}

export function validateDriftPlan(plan: DriftPlan): void {
  checkLimits(plan.limits, plan.safe);
  checkControlV('controlV', plan.controlV, plan.limits);
  const [problem] = driftTimingProblems(plan);
  if (problem !== undefined) throw new LimitsError(problem.field, problem.message);
}

/**
 * Checks a plan against the instruments it will run on, before a run
 * folder exists: the gate must lie in the counter's range (its profile's
 * minGateS/maxGateS; 1 µs–10 s when the counter declares none).
 */
export function checkPlanAgainstBench(plan: { gateS: number }, bench: BenchRoles): void {
  const range = bench.counter.gateRangeS ?? DEFAULT_GATE_RANGE_S;
  if (plan.gateS < range.minS || plan.gateS > range.maxS) {
    throw new LimitsError(
      'gateS',
      `${plan.gateS} s is outside the counter's gate range ${range.minS}–${range.maxS} s (a profile may declare minGateS/maxGateS)`,
    );
  }
}

export function validatePushingPlan(plan: PushingPlan): void {
  checkPushingLimits(plan);
}

/** The run folder of a new run of `kind`, described from the options and the plan. */
function createRunFor(
  options: RecordOptions,
  kind: RunMeta['kind'],
  plan: SweepPlan | DriftPlan | PushingPlan,
  columns: readonly string[],
): Promise<RunWriter> {
  return createRun({
    runsDir: options.runsDir,
    clock: options.clock,
    kind,
    dut: { id: options.dutId, notes: options.dutNotes },
    instruments: options.bench.instruments,
    plan,
    columns,
    onError: stopOnRunFileFault(options.control),
  });
}

/**
 * The writer's own timed flush (a drift log's only one) reports its errors here: a run folder that has gone
 * or a disk that refuses the run's files stops the run at once, through its safe state — the procedure's
 * final flush then raises the fault by name. Without this a drift log ran to its planned end writing nothing.
 */
function stopOnRunFileFault(control: RunControl | undefined): (error: Error) => void {
  return (error) => {
    if (isRunFileFault(error)) control?.stop('disk-fault');
  };
}

/** The options with a RunControl of their own, so a fault of the run's files can stop the run. */
function withControl<T extends { control?: RunControl }>(options: T): T & { control: RunControl } {
  return { ...options, control: options.control ?? new RunControl() };
}

/** What every procedure takes from the options besides its plan and sink. */
function procedureContext(options: RecordOptions, writer: RunWriter) {
  return {
    bench: options.bench,
    clock: options.clock,
    control: options.control,
    onProgress: options.onProgress,
    runId: writer.id,
  };
}

export async function recordSweep(given: RecordOptions & { plan: SweepPlan }): Promise<RecordedRun<SweepOutcome>> {
  const options = withControl(given);
  validateSweepPlan(options.plan);
  checkPlanAgainstBench(options.plan, options.bench);
  const writer = await createRunFor(options, 'sweep', options.plan, SWEEP_COLUMNS);
  return record(writer, options, (sink) =>
    runSweep({ ...procedureContext(options, writer), plan: options.plan, sink }),
  );
}

export async function recordDrift(given: RecordOptions & { plan: DriftPlan }): Promise<RecordedRun<DriftOutcome>> {
  const options = withControl(given);
  validateDriftPlan(options.plan);
  checkPlanAgainstBench(options.plan, options.bench);
  const writer = await createRunFor(options, 'drift', options.plan, DRIFT_COLUMNS);
  return record(writer, options, (sink) =>
    runDrift({ ...procedureContext(options, writer), plan: options.plan, sink }),
  );
}

export async function recordPushing(
  given: RecordOptions & { plan: PushingPlan },
): Promise<RecordedRun<PushingOutcome>> {
  const options = withControl(given);
  validatePushingPlan(options.plan);
  checkPlanAgainstBench(options.plan, options.bench);
  const writer = await createRunFor(options, 'pushing', options.plan, PUSHING_COLUMNS);
  return record(writer, options, (sink) =>
    runPushing({ ...procedureContext(options, writer), plan: options.plan, sink }),
  );
}

/**
 * Resumes an interrupted drift log into its own folder: the store records
 * the gap, time_s carries on from the run's start, and the log runs until
 * its planned duration (counted from the original start) or a stop.
 */
export async function resumeDrift(
  given: Omit<RecordOptions, 'dutId' | 'dutNotes'> & { id: string },
): Promise<RecordedRun<DriftOutcome>> {
  const options = withControl(given);
  const writer = await reopenRun({
    runsDir: options.runsDir,
    id: options.id,
    clock: options.clock,
    onError: stopOnRunFileFault(options.control),
  });
  const meta = writer.meta();
  const parsed = driftPlanSchema.safeParse(meta.plan);
  if (meta.kind !== 'drift' || !parsed.success) {
    await writer.finish('interrupted');
    throw new RangeError(`run ${meta.id}: only a drift log with a valid plan can be resumed (kind ${meta.kind})`);
  }
  const plan = parsed.data;
  const resumed = { ...options, dutId: meta.dut.id };
  return record(
    writer,
    resumed,
    (sink) => runDrift({ ...procedureContext(resumed, writer), plan, sink, timeOffsetS: writer.elapsedS() }),
    false,
  );
}
