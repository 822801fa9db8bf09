/**
 * The end of every procedure's run, shared so each way out ends the same:
 * pause listener dropped, progress closed, the safe state, the outcome's
 * counters filled in, the `end` event, and a last flush that cannot undo
 * the safe state.
 */
import type { SafeState } from '../../app/contract/plans.ts';
import { classifyEnd, type ProcedureContext } from './context.ts';
import type { ProgressReporter } from './progress.ts';
import type { RunControl } from './run-control.ts';
import { goSafe } from './safe-state.ts';
import type { ProcedureOutcome } from './types.ts';

/**
 * Records why a run's body threw: the outcome's status, reason and failure,
 * and an `abort` event. With `stopIsClean` an operator's stop (or a signal)
 * ends the run as `complete` with a `stopped` event instead.
 */
export function recordRunEnd(
  outcome: ProcedureOutcome,
  ctx: ProcedureContext,
  error: unknown,
  stopIsClean = false,
): void {
  const { reason, failure } = classifyEnd(error);
  const clean = stopIsClean && failure === null && (reason === 'stop' || reason === 'signal');
  outcome.status = clean ? 'complete' : 'aborted';
  outcome.reason = reason;
  outcome.failure = failure;
  ctx.event(
    failure === null
      ? { type: clean ? 'stopped' : 'abort', reason }
      : { type: 'abort', reason, error: failure.message, failure: failure.kind },
  );
}

export interface FinishRunParts {
  ctx: ProcedureContext;
  control: RunControl;
  progress: ProgressReporter;
  /** The control channel driven to `safe`. */
  channel: number;
  safe: SafeState;
  /** Work that must happen before the safe state (drift: drain error queues, close a gap). */
  beforeSafe?: () => Promise<void>;
  /** Further safe-state steps after the control channel's; resolves with the unconfirmed ones (empty when all held). */
  afterSafe?: () => Promise<string[]>;
}

/** Ends a run in its `finally`; never throws for a failing flush (recorded as the outcome's failure). */
export async function finishRun(outcome: ProcedureOutcome, parts: FinishRunParts): Promise<void> {
  const { ctx } = parts;
  parts.control.onPauseChange(null);
  const counterFault = outcome.failure === null ? ctx.counterFault() : null;
  if (counterFault !== null) {
    outcome.status = 'aborted';
    outcome.reason = counterFault.kind;
    outcome.failure = counterFault;
    ctx.event({ type: 'abort', reason: counterFault.kind, error: counterFault.message, failure: counterFault.kind });
  }
  parts.progress.finish(outcome.status === 'complete');
  await parts.beforeSafe?.();
  const safe = await goSafe(ctx.bench, parts.channel, parts.safe, (event) => ctx.event(event));
  const failures = [...safe.failures, ...(parts.afterSafe ? await parts.afterSafe() : [])];
  outcome.safeStateOk = failures.length === 0;
  if (failures.length > 0) outcome.safeStateFailures = failures;
  outcome.rowsWritten = ctx.rowsWritten;
  ctx.event({ type: 'end', status: outcome.status, reason: outcome.reason });
  ctx.dispose();
  try {
    await ctx.sink.flush();
  } catch (error) {
    // The data already flushed stays; a failing disk must not skip the safe state (done above).
    outcome.failure ??= {
      kind: 'internal',
      message: `flush failed: ${error instanceof Error ? error.message : String(error)}`,
    };
  }
}
