/**
 * Settling at one setpoint before logging starts (the drift log): the same
 * rules as a sweep point — `fixed` sleeps, `auto` reads until what is left
 * of the step is within tolerance (settle.ts) or `maxS` has passed. The
 * output has just come on, so the step is from 0 V, as large as it gets and
 * possibly through the stall edge; no time constant is known yet.
 */
import type { DriftPlan } from '../../app/contract/plans.ts';
import type { ProcedureContext } from './context.ts';
import { TimeConstantEstimate, settleAuto } from './settle.ts';

export type SettlePlan = NonNullable<DriftPlan['settle']>;

/** The drift log's settling when the plan gives none: automatic, up to 10 s (a log runs for hours). */
export const DEFAULT_DRIFT_SETTLE: SettlePlan = { mode: 'auto', maxS: 10, toleranceCounts: 2 };

export interface SettleAtResult {
  settled: boolean;
  /** Seconds from the step to the end of settling. */
  waitedS: number;
  readings: number;
}

/**
 * Waits out the step written at clock time `stepAtS`; records a `settled`
 * event (and `settle-timeout` when maxS ran out first).
 */
export async function settleAtSetpoint(
  ctx: ProcedureContext,
  settle: SettlePlan,
  gateS: number,
  stepAtS: number,
  controlV: number,
  signal: AbortSignal,
): Promise<SettleAtResult> {
  let result: SettleAtResult;
  if (settle.mode === 'fixed') {
    const leftS = settle.seconds - (ctx.clock.now() - stepAtS);
    if (leftS > 0) await ctx.clock.sleep(leftS, signal);
    result = { settled: true, waitedS: ctx.clock.now() - stepAtS, readings: 0 };
  } else {
    const outcome = await settleAuto(
      ctx.clock,
      stepAtS,
      () => ctx.readFrequency(),
      { gateS, maxS: settle.maxS, toleranceCounts: settle.toleranceCounts, scatterHz: 0, afterOutputOn: true },
      new TimeConstantEstimate(),
      signal,
    );
    result = { settled: outcome.settled, waitedS: outcome.elapsedS, readings: outcome.readings };
    if (!outcome.settled) ctx.event({ type: 'settle-timeout', control_v: controlV, waited_s: outcome.elapsedS });
  }
  ctx.event({
    type: 'settled',
    mode: settle.mode,
    control_v: controlV,
    waited_s: result.waitedS,
    settled: result.settled,
    readings: result.readings,
  });
  return result;
}
