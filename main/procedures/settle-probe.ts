/**
 * Learning the tuning port's time constant before the small steps of an
 * automatic-settling sweep. A step of a few counter counts cannot reveal a
 * lag of tens of milliseconds (the ±1-count quantisation swamps it), so
 * without a learned τ such steps would be read early. One larger step
 * inside the plan's own range — from the first oscillating point a quarter
 * of the range onward — settles visibly; its readings, fitted once their end
 * value is known, give τ. The probe's readings are not samples (they belong
 * to no scheduled point); the result is recorded as an event.
 */
import type { SweepPlan } from '../../app/contract/plans.ts';
import type { ProcedureContext } from './context.ts';
import { settleAuto } from './settle.ts';
import { minFitStepHz, type PointState } from './sweep-point.ts';

/** The level a probe from `fromV` steps to: a quarter of the range along the sweep, inside it. */
export function probeTarget(levels: Float64Array, fromV: number, upward: boolean): number | null {
  const n = levels.length;
  if (n < 4) return null;
  const lo = levels[0] as number;
  const hi = levels[n - 1] as number;
  const span = (hi - lo) / 4;
  const target = upward ? Math.min(hi, fromV + span) : Math.max(lo, fromV - span);
  return Math.abs(target - fromV) > 0 ? target : null;
}

/**
 * Steps to `toV`, waits it out, fits τ; returns the estimate (or null) and
 * the settled frequency at `toV` (NaN if none), leaving the port at `toV`.
 */
export async function probeTimeConstant(
  ctx: ProcedureContext,
  plan: SweepPlan,
  state: PointState,
  toV: number,
  signal: AbortSignal,
): Promise<{ tauS: number | null; endHz: number }> {
  if (plan.settle.mode !== 'auto') return { tauS: null, endHz: Number.NaN };
  const stepAtS = ctx.clock.now();
  await ctx.bench.supply.setVoltage(ctx.bench.controlChannel, toV);
  const options = {
    gateS: plan.gateS,
    maxS: plan.settle.maxS,
    toleranceCounts: plan.settle.toleranceCounts,
    scatterHz: state.scatterHz,
    trace: state.trace,
  };
  const settled = await settleAuto(ctx.clock, stepAtS, () => ctx.readFrequency(), options, state.tau, signal);
  const trace = state.trace;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < 3; i++) {
    const reading = await ctx.readFrequency();
    if (reading.status !== 'ok') continue;
    sum += reading.frequencyHz;
    count++;
    // The settled readings are the tail of the step: the fit finds the end value from them.
    if (trace.n < trace.timesS.length) {
      trace.timesS[trace.n] = ctx.clock.now() - plan.gateS / 2 - stepAtS;
      trace.valuesHz[trace.n] = reading.frequencyHz;
      trace.n++;
    }
  }
  if (count === 0) {
    ctx.event({ type: 'settle-probe', toV, tauS: null, note: 'no oscillation at the probe voltage' });
    return { tauS: null, endHz: Number.NaN };
  }
  const endHz = sum / count;
  state.tau.fitStep(trace.timesS, trace.valuesHz, trace.n, minFitStepHz(plan.gateS));
  const tauS = state.tau.tauS;
  ctx.event({ type: 'settle-probe', toV, tauS, settled: settled.settled, waitedS: settled.elapsedS });
  return { tauS, endHz };
}
