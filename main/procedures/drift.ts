/**
 * The drift log: control voltage held, frequency (and temperature, when a
 * thermometer is on the bench) read every interval until the duration ends
 * or the operator stops it — a stop is a clean end (`complete`), not a loss.
 *
 * Built to run unattended for hours: a failed reading is recorded and the
 * log goes on; a dropped or silent link opens a gap, the link is reopened at
 * each following slot, and the gap is recorded when data flows again.
 * Readings are scheduled on slots start + k·interval, so a slow reading
 * never makes the log creep; missed slots are counted in the gap event.
 */
import type { DriftPlan } from '../../app/contract/plans.ts';
import type { Clock } from '../time/clock.ts';
import { ProcedureContext } from './context.ts';
import { DriftLink } from './drift-link.ts';
import { applyLimits, checkControlV, checkLimits, ovpLevelV } from './limits.ts';
import { leaveFoundOutput } from './safe-state.ts';
import { finishRun, recordRunEnd } from './finish-run.ts';
import { ProgressReporter, type ProgressListener } from './progress.ts';
import { RunControl } from './run-control.ts';
import { DEFAULT_DRIFT_SETTLE, settleAtSetpoint } from './settle-at.ts';
import type { BenchRoles, ProcedureOutcome, RunSink } from './types.ts';

export const DRIFT_COLUMNS = ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status'] as const;

export interface DriftOptions {
  bench: BenchRoles;
  plan: DriftPlan;
  clock: Clock;
  sink: RunSink;
  control?: RunControl;
  onProgress?: ProgressListener;
  runId?: string;
  /** When resuming a run: seconds already elapsed on its time axis (time_s continues from here). */
  timeOffsetS?: number;
}

export interface DriftOutcome extends ProcedureOutcome {
  kind: 'drift';
  readings: number;
  gaps: number;
}

export async function runDrift(options: DriftOptions): Promise<DriftOutcome> {
  const { bench, plan, clock, sink } = options;
  checkLimits(plan.limits, plan.safe);
  checkControlV('controlV', plan.controlV, plan.limits);
  if (!(plan.intervalS > 0)) throw new RangeError(`intervalS: must be greater than 0, got ${plan.intervalS}`);
  const control = options.control ?? new RunControl();
  const ctx = new ProcedureContext(clock, bench, sink, options.timeOffsetS ?? 0);
  const link = new DriftLink(ctx, plan.gateS);
  const slotsTotal = Math.max(1, Math.floor(plan.durationS / plan.intervalS));
  const progress = new ProgressReporter(clock, 'drift', options.runId ?? '', slotsTotal, options.onProgress);
  const outcome: DriftOutcome = {
    kind: 'drift',
    status: 'complete',
    reason: null,
    failure: null,
    rowsWritten: 0,
    safeStateOk: true,
    readings: 0,
    gaps: 0,
  };
  const channel = bench.controlChannel;
  control.onPauseChange((paused) => ctx.event({ type: paused ? 'pause' : 'resume' }));
  ctx.event(
    options.timeOffsetS
      ? { type: 'resumed', at_s: options.timeOffsetS }
      : { type: 'start', channel, controlV: plan.controlV },
  );
  try {
    await control.checkpoint(clock);
    await leaveFoundOutput(bench, channel, plan.safe, (event) => ctx.event(event));
    const { ovpApplied } = await applyLimits(bench.supply, channel, plan.limits);
    ctx.event({
      type: 'limits',
      currentLimitA: plan.limits.currentLimitA,
      ovpV: ovpApplied ? ovpLevelV(plan.limits) : null,
      maxControlV: plan.limits.maxControlV,
    });
    await bench.counter.setGate(plan.gateS);
    await bench.supply.setVoltage(channel, plan.controlV);
    const stepAtS = clock.now();
    await bench.supply.setOutput(channel, true);
    ctx.event({ type: 'output-on', channel, controlV: plan.controlV });
    // The tuning port starts from 0 V: a reading before it has settled would sit off the rest of the log.
    progress.report('settling', 0, null);
    await progress.excluding(() =>
      settleAtSetpoint(ctx, plan.settle ?? DEFAULT_DRIFT_SETTLE, plan.gateS, stepAtS, plan.controlV, control.signal),
    );

    const firstSlotS = ctx.timeS();
    for (let slot = 0; ; slot++) {
      const slotS = firstSlotS + slot * plan.intervalS;
      if (slotS >= plan.durationS) break;
      const waitS = slotS - ctx.timeS();
      if (waitS > 0) await clock.sleep(waitS, control.signal);
      else if (waitS < -plan.intervalS) continue; // this slot passed while a reading or reconnect ran long
      await control.checkpoint(clock);
      const reading = await link.readCounter(slotS);
      if (reading === null) continue; // link down: the gap is open, nothing to record this slot
      const temperatureC = await link.readTemperature();
      ctx.row({
        time_s: ctx.timeS(),
        control_v: plan.controlV,
        frequency_hz: reading.frequencyHz,
        temperature_c: temperatureC,
        status: reading.status,
      });
      outcome.readings++;
      await link.checkErrorQueues();
      progress.report('logging', Math.min(slotsTotal, slot + 1), {
        controlV: plan.controlV,
        frequencyHz: reading.frequencyHz,
        status: reading.status,
      });
    }
  } catch (error) {
    // An operator's stop (or SIGINT) ends a drift log cleanly; anything else is an abort.
    recordRunEnd(outcome, ctx, error, true);
  } finally {
    await finishRun(outcome, {
      ctx,
      control,
      progress,
      channel,
      safe: plan.safe,
      beforeSafe: async () => {
        await link.checkErrorQueues(true);
        link.closeGap();
        outcome.gaps = link.gaps;
      },
    });
  }
  return outcome;
}
