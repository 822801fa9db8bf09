/**
 * A procedure with its run folder: validates the plan (so a refused plan
 * leaves no folder behind), creates the run, runs the procedure into it,
 * and records the final status. A drift log stopped by a crash can be
 * resumed into its own folder. This is what the CLI and the BenchApi
 * service call.
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { driftPlanSchema, type DriftPlan, type PushingPlan, type SweepPlan } from '../../app/contract/plans.ts';
import { createRun, reopenRun, type RunWriter } from '../store/index.ts';
import type { Clock } from '../time/clock.ts';
import { DRIFT_COLUMNS, runDrift, type DriftOutcome } from './drift.ts';
import { checkControlV, checkLimits } from './limits.ts';
import type { ProgressListener } from './progress.ts';
import { PUSHING_COLUMNS, checkPushingLimits, runPushing, type PushingOutcome } from './pushing.ts';
import type { RunControl } from './run-control.ts';
import { SWEEP_COLUMNS, runSweep, type SweepOutcome } from './sweep.ts';
import { sweepSchedule } from './sweep-points.ts';
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
  /** Called once the run folder exists (before any instrument is touched). */
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

async function record<O extends ProcedureOutcome>(
  writer: RunWriter,
  options: RecordOptions,
  run: (sink: RunSink) => Promise<O>,
): Promise<RecordedRun<O>> {
  options.onRunStarted?.(writer.meta(), writer.dir);
  for (const event of options.startEvents ?? []) writer.appendEvent({ ...event });
  let outcome: O;
  try {
    outcome = await run(teeSink(writer, options));
  } catch (error) {
    // Procedures resolve on every way out after touching instruments; a throw here
    // is a bug before the first write. Close the run as aborted, then report it.
    writer.appendEvent({ type: 'abort', reason: 'internal-error', error: error instanceof Error ? error.message : String(error) });
    await writer.finish('aborted');
    throw error;
  }
  const meta = await writer.finish(outcome.status, outcome.conditions ? { conditions: outcome.conditions } : undefined);
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
}

export function validatePushingPlan(plan: PushingPlan): void {
  checkPushingLimits(plan);
}

/** The run folder of a new run of `kind`, described from the options and the plan. */
function createRunFor(options: RecordOptions, kind: RunMeta['kind'], plan: SweepPlan | DriftPlan | PushingPlan, columns: readonly string[]): Promise<RunWriter> {
  return createRun({
    runsDir: options.runsDir,
    clock: options.clock,
    kind,
    dut: { id: options.dutId, notes: options.dutNotes },
    instruments: options.bench.instruments,
    plan,
    columns,
  });
}

/** What every procedure takes from the options besides its plan and sink. */
function procedureContext(options: RecordOptions, writer: RunWriter) {
  return { bench: options.bench, clock: options.clock, control: options.control, onProgress: options.onProgress, runId: writer.id };
}

export async function recordSweep(options: RecordOptions & { plan: SweepPlan }): Promise<RecordedRun<SweepOutcome>> {
  validateSweepPlan(options.plan);
  const writer = await createRunFor(options, 'sweep', options.plan, SWEEP_COLUMNS);
  return record(writer, options, (sink) => runSweep({ ...procedureContext(options, writer), plan: options.plan, sink }));
}

export async function recordDrift(options: RecordOptions & { plan: DriftPlan }): Promise<RecordedRun<DriftOutcome>> {
  validateDriftPlan(options.plan);
  const writer = await createRunFor(options, 'drift', options.plan, DRIFT_COLUMNS);
  return record(writer, options, (sink) => runDrift({ ...procedureContext(options, writer), plan: options.plan, sink }));
}

export async function recordPushing(options: RecordOptions & { plan: PushingPlan }): Promise<RecordedRun<PushingOutcome>> {
  validatePushingPlan(options.plan);
  const writer = await createRunFor(options, 'pushing', options.plan, PUSHING_COLUMNS);
  return record(writer, options, (sink) => runPushing({ ...procedureContext(options, writer), plan: options.plan, sink }));
}

/**
 * Resumes an interrupted drift log into its own folder: the store records
 * the gap, time_s carries on from the run's start, and the log runs until
 * its planned duration (counted from the original start) or a stop.
 */
export async function resumeDrift(options: Omit<RecordOptions, 'dutId' | 'dutNotes'> & { id: string }): Promise<RecordedRun<DriftOutcome>> {
  const writer = await reopenRun({ runsDir: options.runsDir, id: options.id, clock: options.clock });
  const meta = writer.meta();
  const parsed = driftPlanSchema.safeParse(meta.plan);
  if (meta.kind !== 'drift' || !parsed.success) {
    await writer.finish('interrupted');
    throw new RangeError(`run ${meta.id}: only a drift log with a valid plan can be resumed (kind ${meta.kind})`);
  }
  const plan = parsed.data;
  const resumed = { ...options, dutId: meta.dut.id };
  return record(writer, resumed, (sink) => runDrift({ ...procedureContext(resumed, writer), plan, sink, timeOffsetS: writer.elapsedS() }));
}
