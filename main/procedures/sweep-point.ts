/**
 * One point of a sweep: write the control voltage, settle, read back the
 * control voltage when the supply can (with automatic settling, while the
 * counter gates the point's first new reading), then take the readings, each
 * recorded as it arrives, and flush at the end of the point.
 */
import type { SweepPlan } from '../../app/contract/plans.ts';
import { InstrumentError, ReplyFormatError, TimeoutError } from '../instruments/errors.ts';
import type { ProcedureContext } from './context.ts';
import { scatterHz } from './context.ts';
import type { CounterReading } from './read-counter.ts';
import { enoughReadings, readingsRule } from './point-readings.ts';
import { TimeConstantEstimate, settleAuto, type SettleTrace } from './settle.ts';
import type { Direction } from './sweep-points.ts';
import type { SampleRow, SampleStatus } from './types.ts';

/** samples.csv columns of a sweep (CONTRACTS.md names first, then ours). */
export const SWEEP_COLUMNS = [
  'time_s',
  'control_v',
  'control_meas_v',
  'frequency_hz',
  'direction',
  'status',
  'refined',
  'point_index',
  'settle_s',
] as const;

export interface PointResult {
  /** At least one reading oscillated. */
  oscillating: boolean;
  /** Every reading was no-signal (failed readings say nothing either way). */
  stalled: boolean;
  settled: boolean;
  settleS: number;
  lastFrequencyHz: number;
  lastStatus: SampleStatus;
  /** Readings recorded at the point (fixed, or as many as the adaptive rule needed). */
  readingsTaken: number;
  /** Clock time of the point's control-voltage write. */
  stepAtS: number;
  /** "No signal" believed before τ was known, the port maybe still on its way from switch-on: clock time of the last such reading, else null. */
  provisionalAtS: number | null;
}

export interface PointState {
  /** Scatter of the previous point's readings, Hz (feeds the settle tolerance). */
  scatterHz: number;
  /** Reused per point, so the hot loop allocates no arrays. */
  readingsHz: Float64Array;
  /** The DUT's tuning-port time constant, learned as the sweep goes. */
  tau: TimeConstantEstimate;
  /** Mean of the previous point's ok readings, Hz (NaN if none). */
  lastMeanHz: number;
  /** |change of mean frequency| over the previous step, Hz (0 if unknown). */
  lastStepHz: number;
  trace: SettleTrace;
  /** The next point steps from somewhere off the sweep's path (the probe voltage): its step is no guide. */
  fromElsewhere: boolean;
  /** Mean of the previous point on the sweep's path (not the probe, a bisection or a point measured again), Hz. */
  pathMeanHz: number;
  /** Every point since switch-on read "no signal" before τ was known: the port may still be on its way. */
  provisionalChain: boolean;
  /** The control voltage last written by a point (NaN before the first). */
  controlV: number;
}

export function newPointState(plan: SweepPlan): PointState {
  return {
    scatterHz: 0,
    readingsHz: new Float64Array(readingsRule(plan).max),
    tau: new TimeConstantEstimate(),
    lastMeanHz: Number.NaN,
    lastStepHz: 0,
    trace: { timesS: new Float64Array(64), valuesHz: new Float64Array(64), n: 0 },
    fromElsewhere: false,
    provisionalChain: false,
    pathMeanHz: Number.NaN,
    controlV: Number.NaN,
  };
}

export async function measurePoint(
  ctx: ProcedureContext,
  plan: SweepPlan,
  state: PointState,
  point: {
    controlV: number;
    direction: Direction;
    refined: boolean;
    index: number;
    afterOutputOn?: boolean;
    previouslyProvisional?: boolean;
    /** See AutoSettleOptions.finalNoSignalAfterS. */
    finalNoSignalAfterS?: number;
    /** A trial point: learn τ from its own step when it shows it (AutoSettleOptions.learnTauFromStepHz). */
    learnTau?: boolean;
  },
  signal: AbortSignal,
  /** Where the point's rows go instead of the run, when the caller may hold them back (a provisional "no signal"). */
  held?: SampleRow[],
): Promise<PointResult> {
  const { supply } = ctx.bench;
  const channel = ctx.bench.controlChannel;
  const stepAtS = ctx.clock.now();
  await supply.setVoltage(channel, point.controlV);
  state.controlV = point.controlV;

  let settled = true;
  /** The readings that showed the port settled: settled readings, recorded as the point's first. */
  let settledReadings: { reading: CounterReading; atS: number }[] = [];
  let provisionalAtS: number | null = null;
  if (plan.settle.mode === 'fixed') {
    if (plan.settle.seconds > 0) await ctx.clock.sleep(plan.settle.seconds, signal);
  } else {
    const outcome = await settleAuto(
      ctx.clock,
      stepAtS,
      () => ctx.readFrequency(),
      {
        gateS: plan.gateS,
        maxS: plan.settle.maxS,
        toleranceCounts: plan.settle.toleranceCounts,
        scatterHz: state.scatterHz,
        afterOutputOn: point.afterOutputOn,
        trace: state.trace,
        expectedStepHz: state.lastStepHz,
        // The settling's last reading is the first of the point's readings, the rest follow at once.
        recordedReadings: readingsRule(plan).min,
        finalNoSignalAfterS: point.finalNoSignalAfterS,
        learnTauFromStepHz: point.learnTau === true ? minFitStepHz(plan.gateS) : undefined,
        // From switch-on until something oscillates, with τ unknown: the point's own readings decide
        // (the last of them ends by then), checked against τ once learned (sweep.ts) — at the first
        // point after switch-on, once the watch for the oscillation to start is over (switchOnWatchS).
        provisionalAfterS:
          point.previouslyProvisional !== true && (point.afterOutputOn === true || state.provisionalChain)
            ? point.afterOutputOn === true
              ? switchOnWatchS(plan.gateS, readingsRule(plan).min, plan.settle.maxS)
              : (readingsRule(plan).min - 0.5) * plan.gateS
            : undefined,
      },
      state.tau,
      signal,
      state.lastMeanHz,
    );
    settled = outcome.settled;
    if (
      outcome.last !== null &&
      (outcome.last.reading.status === 'ok' || outcome.last.reading.status === 'no-signal')
    ) {
      settledReadings = [...outcome.held, outcome.last].slice(-readingsRule(plan).max);
    }
    if (outcome.provisional && outcome.last !== null) provisionalAtS = outcome.last.atS;
    if (!settled) {
      ctx.event({
        type: 'settle-timeout',
        point_index: point.index,
        control_v: point.controlV,
        waited_s: outcome.elapsedS,
      });
    }
  }
  const settleS = ctx.clock.now() - stepAtS;

  const rule = readingsRule(plan);
  // The supply is read back while the counter gates the point's first fresh reading (when the rule
  // needs one beyond the settling's): the link's round trip hides behind the gate. Both come after
  // settling, as before; the read-back is no earlier than the reading.
  let prefetched: Promise<{ reading: CounterReading; atS: number }> | null =
    plan.settle.mode === 'auto' && settledReadings.length < rule.min
      ? ctx.readFrequency().then((reading) => ({ reading, atS: ctx.clock.now() }))
      : null;
  // Handled here too, so a read-back that throws first leaves no unhandled rejection behind.
  prefetched?.catch(() => undefined);
  const measuredV = await measureControlV(ctx, channel);
  let oscillating = false;
  let noSignal = 0;
  let lastFrequencyHz = Number.NaN;
  let lastStatus: SampleStatus = 'error';
  const readings = state.readingsHz;
  const trace = state.trace;
  const halfGateS = plan.gateS / 2;
  let taken = 0;
  for (let r = 0; !enoughReadings(rule, readings, r, 1 / plan.gateS); r++) {
    const settling = settledReadings[r] ?? null;
    // Not one of the settling's readings: it is new to the trace (the prefetched one included).
    const fresh = settling === null;
    let early: { reading: CounterReading; atS: number } | null = settling;
    if (fresh && prefetched !== null) {
      early = await prefetched;
      prefetched = null;
    }
    const reading = early?.reading ?? (await ctx.readFrequency());
    const endS = early?.atS ?? ctx.clock.now();
    // The readings also feed the τ fit (as the tail of the settling); the reused one is in the trace already.
    if (fresh && reading.status === 'ok' && trace.n < trace.timesS.length) {
      trace.timesS[trace.n] = endS - halfGateS - stepAtS;
      trace.valuesHz[trace.n] = reading.frequencyHz;
      trace.n++;
    }
    readings[r] = reading.frequencyHz;
    if (reading.status === 'ok') oscillating = true;
    if (reading.status === 'no-signal') noSignal++;
    lastFrequencyHz = reading.frequencyHz;
    lastStatus = reading.status;
    const row: SampleRow = {
      time_s: endS - ctx.startS,
      control_v: point.controlV,
      control_meas_v: measuredV,
      frequency_hz: reading.frequencyHz,
      direction: point.direction,
      status: reading.status,
      refined: point.refined ? 1 : 0,
      point_index: point.index,
      settle_s: settleS,
    };
    if (held) held.push(row);
    else ctx.row(row);
    taken = r + 1;
  }
  await ctx.sink.flush();
  state.scatterHz = scatterHz(readings, taken);
  const meanHz = meanOf(readings, taken);
  // The step between neighbours on the sweep's path predicts the next one — also right after a
  // detour (the probe voltage); a bisection or a point measured again says nothing about it.
  if (!point.refined && point.previouslyProvisional !== true) {
    state.lastStepHz =
      Number.isFinite(meanHz) && Number.isFinite(state.pathMeanHz) ? Math.abs(meanHz - state.pathMeanHz) : 0;
    state.pathMeanHz = meanHz;
  } else if (point.refined) {
    state.lastStepHz = 0;
  }
  state.fromElsewhere = false;
  const beforeHz = state.lastMeanHz;
  state.lastMeanHz = meanHz;
  // Learn the port's time constant from this point's settling, now that its end value is known —
  // only from a step between two oscillating levels (not from switch-on or out of the stalled
  // region: such a step crosses the stall edge, where f(V) is far from a straight line).
  if (
    plan.settle.mode === 'auto' &&
    point.afterOutputOn !== true &&
    Number.isFinite(beforeHz) &&
    Number.isFinite(meanHz)
  ) {
    state.tau.fitStep(trace.timesS, trace.valuesHz, trace.n, minFitStepHz(plan.gateS));
  }
  state.provisionalChain = provisionalAtS !== null && !oscillating;
  return {
    oscillating,
    stalled: noSignal === taken,
    readingsTaken: taken,
    settled,
    settleS,
    lastFrequencyHz,
    lastStatus,
    provisionalAtS,
    stepAtS,
  };
}

/**
 * How long the first point after switch-on watches for the oscillation to
 * start before a "no signal" is believed (provisionally, sweep.ts): the
 * port comes up from 0 V with a τ not yet known, and a point read "no
 * signal" too early is measured again later, from wherever the sweep is
 * then — a step back and up again. A tenth of the plan's `maxS` (the
 * longest it lets any step settle; 0.2 s at the default 2 s), and never
 * less than the point's own readings take: a DUT that is truly stalled
 * there costs that much once per run, and is recorded "no signal".
 */
export function switchOnWatchS(gateS: number, readings: number, maxS: number): number {
  return Math.max((readings - 0.5) * gateS, maxS / 10);
}

/**
 * Smallest step whose settling is fitted for τ: 10 counter counts. Below
 * that the ±1-count quantisation shapes the fit more than the lag does
 * (the settle probe is there for sweeps of such small steps).
 */
export function minFitStepHz(gateS: number): number {
  return 10 / gateS;
}

/** Measured control voltage, or NaN when the supply cannot (or fails to) read it. */
async function measureControlV(ctx: ProcedureContext, channel: number): Promise<number> {
  if (!ctx.bench.supply.capabilities.measureVoltage) return Number.NaN;
  try {
    return await ctx.bench.supply.measureVoltage(channel);
  } catch (error) {
    // A failed read-back loses one column of one point, not the run.
    if (error instanceof TimeoutError || error instanceof InstrumentError || error instanceof ReplyFormatError) {
      ctx.event({
        type: 'fault',
        role: 'supply',
        operation: 'measure-voltage',
        error: error.message,
        errorName: error.name,
      });
      return Number.NaN;
    }
    throw error;
  }
}

/** Mean of the non-NaN values (NaN when none). */
function meanOf(values: Float64Array, n: number): number {
  let sum = 0;
  let count = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i] as number;
    if (Number.isNaN(v)) continue;
    sum += v;
    count++;
  }
  return count > 0 ? sum / count : Number.NaN;
}
