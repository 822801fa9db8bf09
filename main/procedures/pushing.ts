/**
 * Supply pushing: control voltage held, the DUT's own supply stepped over a
 * range, frequency read at each step; the result is the slope in Hz/V and
 * ppm/V (least-squares line through the mean frequency at each step). The
 * DUT supply is put back to where it was found on every way out.
 */
import { MAX_PLAN_POINTS, type PushingPlan } from '../../app/contract/plans.ts';
import type { Clock } from '../time/clock.ts';
import { ProcedureContext, ProcedureFailure } from './context.ts';
import { UnsupportedOperationError } from '../instruments/errors.ts';
import type { Supply } from '../instruments/roles.ts';
import { LimitsError, applyLimits, checkControlV, checkLimits, ovpLevelV } from './limits.ts';
import { finishRun, recordRunEnd } from './finish-run.ts';
import { ProgressReporter, type ProgressListener } from './progress.ts';
import { RunControl } from './run-control.ts';
import { linearSlope, supplyLevels } from './pushing-math.ts';
import { driveVerified, leaveFoundOutput, outputOffStep, voltageStep } from './safe-state.ts';
import type { BenchRoles, ProcedureOutcome, RunSink, SampleStatus } from './types.ts';

export const PUSHING_COLUMNS = ['time_s', 'control_v', 'supply_v', 'frequency_hz', 'status'] as const;

export interface PushingOptions {
  bench: BenchRoles;
  plan: PushingPlan;
  clock: Clock;
  sink: RunSink;
  control?: RunControl;
  onProgress?: ProgressListener;
  runId?: string;
}

export interface PushingOutcome extends ProcedureOutcome {
  kind: 'pushing';
  /** Slope of frequency against DUT supply voltage, Hz/V (null with < 2 oscillating steps). */
  hzPerV: number | null;
  ppmPerV: number | null;
  meanHz: number | null;
  steps: number;
}

export function checkPushingLimits(plan: PushingPlan): Float64Array {
  checkLimits(plan.limits, plan.safe);
  checkControlV('controlV', plan.controlV, plan.limits);
  if (!(plan.maxSupplyV > 0)) throw new LimitsError('maxSupplyV', `must be greater than 0 V, got ${plan.maxSupplyV}`);
  for (const key of ['supplyStartV', 'supplyStopV'] as const) {
    const volts = plan[key];
    if (!(volts >= 0)) throw new LimitsError(key, `${volts} V is negative`);
    if (volts > plan.maxSupplyV)
      throw new LimitsError(key, `${volts} V exceeds maxSupplyV (${plan.maxSupplyV} V); the plan is refused`);
  }
  if (!(plan.supplyStepV > 0))
    throw new LimitsError('supplyStepV', `must be greater than 0 V, got ${plan.supplyStepV}`);
  const steps = Math.abs(plan.supplyStopV - plan.supplyStartV) / plan.supplyStepV;
  if (!(steps + 2 <= MAX_PLAN_POINTS)) {
    throw new LimitsError(
      'supplyStepV',
      `${plan.supplyStepV} V over ${plan.supplyStartV}..${plan.supplyStopV} V gives more than ${MAX_PLAN_POINTS} steps; use a larger step`,
    );
  }
  return supplyLevels(plan.supplyStartV, plan.supplyStopV, plan.supplyStepV);
}

export async function runPushing(options: PushingOptions): Promise<PushingOutcome> {
  const { bench, plan, clock, sink } = options;
  const levels = checkPushingLimits(plan);
  const control = options.control ?? new RunControl();
  const ctx = new ProcedureContext(clock, bench, sink);
  const progress = new ProgressReporter(clock, 'pushing', options.runId ?? '', levels.length, options.onProgress);
  const outcome: PushingOutcome = {
    kind: 'pushing',
    status: 'complete',
    reason: null,
    failure: null,
    rowsWritten: 0,
    safeStateOk: true,
    hzPerV: null,
    ppmPerV: null,
    meanHz: null,
    steps: 0,
  };
  const channel = bench.controlChannel;
  const dutChannel = bench.dutSupplyChannel;
  const meanHz = new Float64Array(levels.length).fill(Number.NaN);
  let restoreDut: { volts: number; on: boolean } | null = null;
  control.onPauseChange((paused) => ctx.event({ type: paused ? 'pause' : 'resume' }));
  ctx.event({ type: 'start', channel, dutChannel, steps: levels.length });
  try {
    await control.checkpoint(clock);
    restoreDut = {
      volts: await bench.supply.getVoltageSetpoint(dutChannel),
      on: await bench.supply.getOutput(dutChannel),
    };
    ctx.event({ type: 'dut-supply-found', volts: restoreDut.volts, on: restoreDut.on });
    const dutOvpV = dutSupplyOvpLevelV(plan.maxSupplyV);
    if (restoreDut.volts > dutOvpV) {
      // Protection set below the voltage found would trip (or refuse) the way back: change nothing.
      throw new ProcedureFailure(
        'limits',
        `maxSupplyV: the DUT supply (channel ${dutChannel}) is at ${restoreDut.volts} V, above maxSupplyV (${plan.maxSupplyV} V) plus its protection margin; the plan is refused`,
      );
    }
    await leaveFoundOutput(bench, channel, plan.safe, (event) => ctx.event(event));
    const { ovpApplied } = await applyLimits(bench.supply, channel, plan.limits);
    // The driver refuses any DUT supply write above its OVP level from here on.
    bench.supply.limitChannel(dutChannel, 'dut-supply', dutOvpV);
    const dutOvpApplied = await applyDutSupplyOvp(bench.supply, dutChannel, dutOvpV);
    ctx.event({
      type: 'limits',
      currentLimitA: plan.limits.currentLimitA,
      ovpV: ovpApplied ? ovpLevelV(plan.limits) : null,
      maxControlV: plan.limits.maxControlV,
      maxSupplyV: plan.maxSupplyV,
      dutSupplyOvpV: dutOvpApplied ? dutOvpV : null,
    });
    await bench.counter.setGate(plan.gateS);
    await bench.supply.setVoltage(channel, plan.controlV);
    await bench.supply.setOutput(channel, true);
    await bench.supply.setVoltage(dutChannel, levels[0] as number);
    if (!restoreDut.on) await bench.supply.setOutput(dutChannel, true);
    ctx.event({ type: 'output-on', channel, controlV: plan.controlV, dutChannel });

    for (let i = 0; i < levels.length; i++) {
      await control.checkpoint(clock);
      const supplyV = levels[i] as number;
      await bench.supply.setVoltage(dutChannel, supplyV);
      if (plan.settleS > 0) await clock.sleep(plan.settleS, control.signal);
      let sum = 0;
      let ok = 0;
      let last: { frequencyHz: number; status: SampleStatus } = { frequencyHz: Number.NaN, status: 'error' };
      for (let r = 0; r < plan.readingsPerPoint; r++) {
        const reading = await ctx.readFrequency();
        ctx.row({
          time_s: ctx.timeS(),
          control_v: plan.controlV,
          supply_v: supplyV,
          frequency_hz: reading.frequencyHz,
          status: reading.status,
        });
        if (reading.status === 'ok') {
          sum += reading.frequencyHz;
          ok++;
        }
        last = reading;
      }
      await sink.flush();
      if (ok > 0) meanHz[i] = sum / ok;
      outcome.steps = i + 1;
      progress.report('reading', i + 1, {
        controlV: plan.controlV,
        supplyV,
        frequencyHz: last.frequencyHz,
        status: last.status,
      });
    }
    const fit = linearSlope(levels, meanHz);
    if (fit !== null) {
      outcome.hzPerV = fit.slope;
      outcome.meanHz = fit.meanY;
      outcome.ppmPerV = (fit.slope / fit.meanY) * 1e6;
      ctx.event({ type: 'pushing-result', hzPerV: outcome.hzPerV, ppmPerV: outcome.ppmPerV, meanHz: outcome.meanHz });
    }
  } catch (error) {
    recordRunEnd(outcome, ctx, error);
  } finally {
    const found = restoreDut;
    // The DUT supply goes back where it was found, after the control channel is safe, proven by readback.
    const restoreDutSupply = async (): Promise<string[]> => {
      if (found === null) return [];
      const steps = [voltageStep(bench, dutChannel, found.volts, 'dut-supply-restore')];
      if (!found.on) steps.push(outputOffStep(bench, dutChannel, 'dut-supply-off'));
      return (await driveVerified(bench, steps, (event) => ctx.event(event))).failures;
    };
    await finishRun(outcome, { ctx, control, progress, channel, safe: plan.safe, afterSafe: restoreDutSupply });
  }
  return outcome;
}

/**
 * Over-voltage protection level of the DUT supply channel: maxSupplyV plus
 * 5 % (at least 50 mV), so a setpoint at maxSupplyV never trips it and a
 * runaway write stops not far above it.
 */
export function dutSupplyOvpLevelV(maxSupplyV: number): number {
  return maxSupplyV + Math.max(0.05, 0.05 * maxSupplyV);
}

/** Sets OVP on the DUT supply channel when the supply has it; false when it has not. */
async function applyDutSupplyOvp(supply: Supply, channel: number, volts: number): Promise<boolean> {
  if (!supply.capabilities.overVoltageProtection) return false;
  try {
    await supply.setOverVoltageProtection(channel, volts);
    return true;
  } catch (error) {
    if (error instanceof UnsupportedOperationError) return false;
    throw error;
  }
}
