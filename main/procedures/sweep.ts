/**
 * The gain sweep: limits checked and applied, output on, each setpoint
 * settled and read, the stall edge refined, and the safe state on every way
 * out (completion, stop, pause timeout, instrument error, dropped link,
 * signal, bug). The engine never leaves a powered DUT behind a throw.
 */
import type { SweepPlan } from '../../app/contract/plans.ts';
import type { Clock } from '../time/clock.ts';
import { ProcedureContext } from './context.ts';
import { applyLimits, checkLimits, ovpLevelV } from './limits.ts';
import { leaveFoundOutput } from './safe-state.ts';
import { finishRun, recordRunEnd } from './finish-run.ts';
import { ProgressReporter, type ProgressListener } from './progress.ts';
import { bisectEdge, bisectionSteps, findEdge, type EdgeBracket } from './refine-edge.ts';
import { RunControl } from './run-control.ts';
import { emptyConditions, recordConditions } from './run-conditions.ts';
import { measurePoint, newPointState, type PointResult } from './sweep-point.ts';
import { probeTarget, probeTimeConstant } from './settle-probe.ts';
import { NO_SIGNAL_LEFT_FRACTION, PortHistory, stepLeftFraction } from './port-lag.ts';
import { takenMeanErrorHz } from './settle-predict.ts';
import { sweepSchedule } from './sweep-points.ts';
import type { BenchRoles, ProcedureOutcome, RunSink, SampleRow } from './types.ts';

export { SWEEP_COLUMNS } from './sweep-point.ts';

/**
 * τ is taken this much longer where the sweep judges from it after the fact (a trial point's
 * readings, when the port is inside the edge's bracket): its estimate scatters, and a gate's start
 * is a reply's time less a gate.
 */
const TRIAL_TAU_MARGIN = 1.25;

export interface SweepOptions {
  bench: BenchRoles;
  plan: SweepPlan;
  clock: Clock;
  sink: RunSink;
  /** Pause/resume/stop; a fresh one (never stopped) when omitted. */
  control?: RunControl;
  onProgress?: ProgressListener;
  runId?: string;
}

export interface SweepOutcome extends ProcedureOutcome {
  kind: 'sweep';
  pointsDone: number;
  pointsTotal: number;
  refinedPoints: number;
  /** Final stall-edge bracket, when the sweep found one. */
  edge: EdgeBracket | null;
}

/**
 * Runs a sweep. Throws LimitsError (before touching any instrument) when the
 * plan exceeds its limits; otherwise always resolves, with the supply left
 * in the safe state.
 */
export async function runSweep(options: SweepOptions): Promise<SweepOutcome> {
  const { bench, plan, clock, sink } = options;
  checkLimits(plan.limits, plan.safe);
  const schedule = sweepSchedule(plan);
  const control = options.control ?? new RunControl();
  const ctx = new ProcedureContext(clock, bench, sink);
  const levels = schedule.levels;
  const stalled = [new Uint8Array(levels.length), new Uint8Array(levels.length)];
  const oscillating = [new Uint8Array(levels.length), new Uint8Array(levels.length)];
  const progress = new ProgressReporter(
    clock,
    'sweep',
    options.runId ?? '',
    schedule.controlV.length,
    options.onProgress,
  );
  const outcome: SweepOutcome = {
    kind: 'sweep',
    status: 'complete',
    reason: null,
    failure: null,
    rowsWritten: 0,
    safeStateOk: true,
    pointsDone: 0,
    pointsTotal: schedule.controlV.length,
    refinedPoints: 0,
    edge: null,
  };
  control.onPauseChange((paused) => ctx.event({ type: paused ? 'pause' : 'resume' }));
  const channel = bench.controlChannel;
  ctx.event({ type: 'start', points: schedule.controlV.length, channel });
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
    await bench.supply.setVoltage(channel, schedule.controlV[0] as number);
    await bench.supply.setOutput(channel, true);
    // The port starts from 0 V here (taken once the output is surely on: a later start only leaves more to go).
    const outputOnAtS = clock.now();
    ctx.event({ type: 'output-on', channel, controlV: schedule.controlV[0] });
    // The conditions the figures were taken under; read again after the safe state.
    outcome.conditions = emptyConditions();
    await recordConditions(ctx, 'start', outcome.conditions);

    const state = newPointState(plan);
    let probed = false;
    /**
     * Points whose "no signal" was believed before τ was known, while the port was maybe still on
     * its way from switch-on: their rows are held back until τ is learned. A point stands if, by the
     * lag of every step written since switch-on (port-lag.ts, τ taken 25 % longer), its port had come
     * within 5 % of its own step when its last reading's gate opened (the watching's 3τ rule); its
     * rows are then written. Else it is measured again, and only the new rows are written.
     */
    let provisional: { i: number; atS: number; rows: SampleRow[] }[] = [];
    const history = new PortHistory();
    history.write(outputOnAtS, schedule.controlV[0] as number);
    let tauNoted = false;
    let index = schedule.controlV.length; // rows of refinement points are numbered on from the coarse ones
    const resolveProvisional = async (): Promise<void> => {
      const tauS = state.tau.tauS;
      const pending = provisional;
      provisional = [];
      for (const p of pending) {
        const gateOpenS = p.atS - plan.gateS;
        const leftFraction =
          tauS === null ? Number.POSITIVE_INFINITY : stepLeftFraction(history, gateOpenS, TRIAL_TAU_MARGIN * tauS);
        if (leftFraction <= NO_SIGNAL_LEFT_FRACTION) {
          for (const row of p.rows) ctx.row(row);
          continue;
        }
        await control.checkpoint(clock);
        const controlV = schedule.controlV[p.i] as number;
        const pass = schedule.pass[p.i] as number;
        ctx.event({
          type: 'remeasure',
          point_index: p.i,
          control_v: controlV,
          reason:
            tauS === null
              ? 'no time constant learned'
              : `no signal read ${(gateOpenS - outputOnAtS).toFixed(3)} s after switch-on, with ${(100 * leftFraction).toFixed(0)} % of its step still to go (by the lag, τ 25 % longer)`,
        });
        // The step is from wherever the sweep is now: its size is no guide (lastMeanHz, where the port is, still is).
        state.lastStepHz = 0;
        state.fromElsewhere = true;
        const result = await measurePoint(
          ctx,
          plan,
          state,
          {
            controlV,
            direction: pass === 0 ? 'up' : 'down',
            refined: false,
            index: p.i,
            afterOutputOn: tauS === null,
            previouslyProvisional: true,
          },
          control.signal,
        );
        const level = pass === 0 ? p.i : schedule.controlV.length - 1 - p.i;
        (stalled[pass] as Uint8Array)[level] = result.stalled ? 1 : 0;
        (oscillating[pass] as Uint8Array)[level] = result.oscillating ? 1 : 0;
        state.fromElsewhere = true;
      }
      await ctx.sink.flush();
    };
    /** The previous point oscillated (τ can only be learned from a step between two oscillating levels). */
    let lastOscillated = false;
    /**
     * The trial point's step was too small to show τ (a few counts): probe τ with one larger step
     * and measure the point again, since it may have been read before it settled — unless its
     * readings, judged with the τ just learned, were settled already. Only the new rows are written.
     * Null when the rows read stand (nowhere to probe, or judged settled; the caller writes them).
     */
    const probeAndRemeasure = async (
      i: number,
      controlV: number,
      upward: boolean,
      direction: 'up' | 'down',
      scatterBeforeHz: number,
      taken: { rows: readonly SampleRow[]; stepAtS: number; beforeHz: number },
    ): Promise<PointResult | null> => {
      const target = probeTarget(levels, controlV, upward);
      if (target === null) return null;
      // The probe is no point of the plan: its time stays out of the ETA's time per point.
      const probe = await progress.excluding(() => probeTimeConstant(ctx, plan, state, target, control.signal));
      tauNoted = state.tau.tauS !== null;
      const pathStepHz = state.lastStepHz;
      // With τ known, the trial's own readings may already be settled: their mean's error, judged by
      // the lag with τ taken 25 % longer, within the tolerance in counts. Then they stand (the caller
      // writes them) and the sweep goes on from the probe voltage instead of stepping back.
      const trialErrorHz = trialMeanErrorHz(taken);
      if (plan.settle.mode === 'auto' && trialErrorHz <= plan.settle.toleranceCounts / plan.gateS) {
        ctx.event({ type: 'trial-stands', point_index: i, control_v: controlV, meanErrorHz: trialErrorHz });
        state.lastMeanHz = probe.endHz;
        state.lastStepHz = 0;
        state.fromElsewhere = true;
        return null;
      }
      // The point is measured again from the probe voltage, settled there: that is its "before" value
      // (NaN if the probe saw no oscillation); its step is not like the last one.
      state.lastMeanHz = probe.endHz;
      state.lastStepHz = 0;
      state.fromElsewhere = true;
      // The trial's readings scatter because they were read on the way: they must not loosen the tolerance.
      state.scatterHz = scatterBeforeHz;
      await control.checkpoint(clock);
      ctx.event({
        type: 'remeasure',
        point_index: i,
        control_v: controlV,
        reason: 'read before τ was known; its step was too small to show it',
      });
      const result = await progress.excludingPoint(() =>
        measurePoint(
          ctx,
          plan,
          state,
          { controlV, direction, refined: false, index: i, previouslyProvisional: true },
          control.signal,
        ),
      );
      // The step along the sweep's path (from the previous point to this one) predicts the next.
      state.lastStepHz = pathStepHz;
      return result;
    };
    /** Settling error of the mean of a trial point's ok readings, once τ is known (Infinity if it cannot tell). */
    const trialMeanErrorHz = (taken: { rows: readonly SampleRow[]; stepAtS: number; beforeHz: number }): number => {
      const tauS = state.tau.tauS;
      if (tauS === null || !Number.isFinite(taken.beforeHz)) return Number.POSITIVE_INFINITY;
      const starts: number[] = [];
      const values: number[] = [];
      for (const row of taken.rows) {
        if (row.status !== 'ok') return Number.POSITIVE_INFINITY;
        starts.push((row.time_s as number) + ctx.startS - plan.gateS - taken.stepAtS);
        values.push(row.frequency_hz as number);
      }
      return takenMeanErrorHz(TRIAL_TAU_MARGIN * tauS, plan.gateS, starts, values, taken.beforeHz);
    };
    for (let i = 0; i < schedule.controlV.length; i++) {
      await control.checkpoint(clock);
      const controlV = schedule.controlV[i] as number;
      const pass = schedule.pass[i] as number;
      const direction = pass === 0 ? 'up' : 'down';
      const mayHold = plan.settle.mode === 'auto' && state.tau.tauS === null && (i === 0 || state.provisionalChain);
      // The point after the first oscillating one is a trial: measured with τ unknown, its step teaches
      // τ when it is large enough to show the lag — read back to back and fitted as it goes, until the
      // readings cover 3τ; then the rules with τ decide, and its readings are the point's (no probe,
      // no second measurement). Its rows wait for that.
      const trial: boolean = plan.settle.mode === 'auto' && !probed && state.tau.tauS === null && lastOscillated;
      const held: SampleRow[] | undefined = mayHold || trial ? [] : undefined;
      const measure = () =>
        measurePoint(
          ctx,
          plan,
          state,
          { controlV, direction, refined: false, index: i, afterOutputOn: i === 0, learnTau: trial },
          control.signal,
          held,
        );
      // The step back from the probe voltage is the probe's cost, not a point's: it stays out of the ETA too;
      // so does the trial, watched as no later point is.
      const scatterBefore = state.scatterHz;
      const beforeHz = state.lastMeanHz;
      let result: PointResult = await (state.fromElsewhere || trial ? progress.excludingPoint(measure) : measure());
      if (trial && state.tau.tauS === null) {
        probed = true;
        const retried = await probeAndRemeasure(i, controlV, pass === 0, direction, scatterBefore, {
          rows: held ?? [],
          stepAtS: result.stepAtS,
          beforeHz,
        });
        if (retried !== null) result = retried;
        else for (const row of held ?? []) ctx.row(row);
      } else if (held && result.provisionalAtS !== null)
        provisional.push({ i, atS: result.provisionalAtS, rows: held });
      else if (held) for (const row of held) ctx.row(row);
      lastOscillated = result.oscillating;
      // Kept while a "no signal" may still have to be judged by where the port was.
      if (state.tau.tauS === null || provisional.length > 0) history.write(result.stepAtS, controlV);
      if (!tauNoted && state.tau.tauS !== null) {
        tauNoted = true;
        ctx.event({ type: 'settle-tau', tauS: state.tau.tauS, point_index: i });
      }
      if (provisional.length > 0 && state.tau.tauS !== null) await resolveProvisional();
      const level = pass === 0 ? i : schedule.controlV.length - 1 - i;
      (stalled[pass] as Uint8Array)[level] = result.stalled ? 1 : 0;
      (oscillating[pass] as Uint8Array)[level] = result.oscillating ? 1 : 0;
      outcome.pointsDone = i + 1;
      progress.report('reading', i + 1, { controlV, frequencyHz: result.lastFrequencyHz, status: result.lastStatus });
    }

    // Points still provisional (τ never learned): measured again, waiting maxS for a "no signal".
    await resolveProvisional();

    const bracket =
      plan.direction === 'down'
        ? findEdge(levels, stalled[1] as Uint8Array, oscillating[1] as Uint8Array, 'down')
        : findEdge(levels, stalled[0] as Uint8Array, oscillating[0] as Uint8Array, 'up');
    outcome.edge = bracket;
    if (bracket !== null && plan.refineEdgeV > 0) {
      const steps = bisectionSteps(bracket.oscillatingV - bracket.stalledV, plan.refineEdgeV);
      // Refinement points join the total only once they are known; the total is cut back below if the bisection stops early.
      progress.total += steps;
      ctx.event({ type: 'refine-start', stalledV: bracket.stalledV, oscillatingV: bracket.oscillatingV, steps });
      outcome.edge = await bisectEdge(bracket, plan.refineEdgeV, async (controlV) => {
        await control.checkpoint(clock);
        const result = await measurePoint(
          ctx,
          plan,
          state,
          {
            controlV,
            direction: bracket.direction,
            refined: true,
            index,
            finalNoSignalAfterS: finalNoSignalAfterS(bracket, state.controlV, controlV, state.tau.tauS),
          },
          control.signal,
        );
        index++;
        outcome.refinedPoints++;
        progress.report('refining', index, {
          controlV,
          frequencyHz: result.lastFrequencyHz,
          status: result.lastStatus,
        });
        if (result.oscillating) return true;
        return result.stalled ? false : null;
      });
      progress.total = index;
      ctx.event({
        type: 'refine-end',
        stalledV: outcome.edge.stalledV,
        oscillatingV: outcome.edge.oscillatingV,
        points: outcome.refinedPoints,
      });
    }
  } catch (error) {
    recordRunEnd(outcome, ctx, error);
  } finally {
    // End conditions after the safe state, so a slow or failing read cannot hold it up.
    const conditions = outcome.conditions;
    const afterSafe = conditions
      ? async () => {
          await recordConditions(ctx, 'end', conditions);
          return [];
        }
      : undefined;
    await finishRun(outcome, { ctx, control, progress, channel, safe: plan.safe, afterSafe });
  }
  return outcome;
}

/**
 * A bisection point approached from above (the oscillating side): the port
 * falls from `fromV` toward `toV`, and once it is inside the bracket (below
 * its oscillating level, by the lag with τ taken 25 % longer) a "no signal"
 * means it is below the one edge the bisection assumes, where it stays:
 * final. From below, or with τ unknown: undefined (the usual rules).
 */
export function finalNoSignalAfterS(
  bracket: EdgeBracket,
  fromV: number,
  toV: number,
  tauS: number | null,
): number | undefined {
  if (tauS === null || !(fromV > toV) || !(bracket.oscillatingV > toV)) return undefined;
  const insideS = TRIAL_TAU_MARGIN * tauS * Math.log(Math.max(1, (fromV - toV) / (bracket.oscillatingV - toV)));
  return insideS;
}
