/**
 * Automatic settling after a control-voltage step: read until the settling
 * error still left is within a tolerance, up to a maximum wait — so a fast
 * DUT is not held back and a slow one is not read early.
 *
 * Model: the tuning port settles like a first-order lag (common practice for
 * an RC-filtered tuning line), so the distance to the final frequency decays
 * as e^(−t/τ). Two rules, depending on what is known:
 *
 * 1. τ known (learned, see settle-tau.ts / settle-probe.ts) and the settled
 *    frequency before the step known: the part of the step already made,
 *    f − f_before = A·(1 − e^(−t/τ)), gives the step A and so what is left,
 *    A·e^(−t/τ); A is never taken smaller than the previous step's size (on
 *    a smooth curve steps are alike, and a few counts of step can hide in the
 *    quantisation of an early reading). The first reading after the step
 *    places the next where the rest should be half the tolerance — one jump,
 *    t = τ·ln(2A/tol), instead of creeping up — and that reading decides.
 *    Only a reading taken once half the step is done (by τ) may decide: an
 *    earlier one can hide the whole step in its ±1 count. The deciding
 *    reading is returned (`last`): it is as settled as any after it, so the
 *    sweep records it as the point's first reading instead of reading again.
 * 2. Otherwise: two readings Δ apart differ by d = rem·(e^(Δ/τ) − 1), so
 *    rem = d / (e^(Δ/τ) − 1), which grows with τ; with τ taken as the time
 *    since the step (T), the test covers any τ up to T, and readings are
 *    spaced by T/2 so waiting longer covers slower DUTs. A port slower than
 *    T that moves less than a count per reading cannot be told from a settled
 *    one by any test that short — hence rule 1, the probe, and `maxS`.
 *
 * τ is used with a 25 % margin. Each difference carries the counter's ±1-count
 * quantisation (resolution 1/gate Hz, common practice) and the DUT's scatter;
 * rule 2 takes that much off (else a settled, noisy DUT would wait for maxS),
 * rule 1 does not (it may only err towards waiting). No-signal readings say
 * nothing about settling: they are believed after 3τ when τ is known, after
 * maxS right after switch-on, else at once. Tolerance: `toleranceCounts`
 * counts, or three times the previous point's scatter, whichever is larger.
 */
import type { Clock } from '../time/clock.ts';
import type { CounterReading } from './read-counter.ts';
import { meanErrorHz, predictedStartS } from './settle-predict.ts';
import { TimeConstantEstimate, fitStepCurve } from './settle-tau.ts';

export { TimeConstantEstimate } from './settle-tau.ts';

export interface AutoSettleOptions {
  gateS: number;
  maxS: number;
  toleranceCounts: number;
  /** Standard deviation of the readings at the previous point, Hz (0 if unknown). */
  scatterHz: number;
  /** The output has just been switched on: the tuning port starts from 0 V, a step as large as it gets. */
  afterOutputOn?: boolean;
  /** Filled with the ok settling readings (time since the step, Hz), for learning τ afterwards. */
  trace?: SettleTrace;
  /**
   * Size of the previous step in frequency, Hz (0 if unknown). On a smooth
   * curve the next step is alike; a few counts of step can hide in the
   * quantisation of the first readings, this cannot.
   */
  expectedStepHz?: number;
  /**
   * With τ unknown and the port possibly still on its way from switch-on,
   * believe no signal once this long after the step (instead of maxS or at
   * once) and mark the outcome provisional: the sweep checks it against τ
   * once learned.
   */
  provisionalAfterS?: number;
  /**
   * The reading that ends settling is the first of this many recorded back
   * to back, and the tolerance is on their mean (settle-predict.ts). Used by
   * settling by prediction; default 1 (the reading alone).
   */
  recordedReadings?: number;
  /**
   * "No signal" is final in a reading whose command went out at least this
   * long after the step (s): the port moves one way, into a region known to
   * stall from there on (a bisection point of the stall edge approached from
   * the oscillating side, once the port is surely inside the bracket). Until
   * then the watching readings are not spaced past that moment.
   */
  finalNoSignalAfterS?: number;
  /**
   * With τ unknown, learn it from this step (a trial point): readings back
   * to back, and once they have moved by at least this much (Hz) they are
   * fitted after each new one (end value free, settle-tau.ts); an estimate
   * is taken once the readings cover 3 of its τ (the end value then shows).
   * The rules with τ known then decide, so the step's own readings are the
   * point's, with no probe and no second measurement. A step that moves less
   * settles by the rules without τ (the sweep then probes).
   */
  learnTauFromStepHz?: number;
}

/** Preallocated record of one point's settling readings. */
export interface SettleTrace {
  timesS: Float64Array;
  valuesHz: Float64Array;
  n: number;
}

export interface SettleOutcome {
  settled: boolean;
  /** Seconds from the step to the end of the last settling reading. */
  elapsedS: number;
  readings: number;
  toleranceHz: number;
  /**
   * The reading that showed the port settled and when it ended (clock s);
   * null when not settled. It is a settled reading like any after it, so a
   * caller may record it as the point's first.
   */
  last: { reading: CounterReading; atS: number } | null;
  /**
   * No-signal readings just before `last` (oldest first), when `last` is a
   * believed no-signal: the port moves one way, so a later "no signal"
   * vouches for the earlier ones, and they count as the point's readings too.
   */
  held: { reading: CounterReading; atS: number }[];
  /** No signal believed before τ was known (right after switch-on): the sweep re-checks it. */
  provisional: boolean;
}

/** Learned τ is taken this much larger when bounding the remaining error (estimates scatter). */
const TAU_MARGIN = 1.25;

/** Rule 1 decides only from a reading taken once this fraction of the step is done (by τ). */
const MIN_DONE_FRACTION = 0.5;

/** Rule 1 places the next reading where the rest should be this fraction of the tolerance. */
const TARGET_FRACTION = 0.5;

/** A step watched to learn τ is fitted once its readings cover this many of the fitted τ. */
const LEARN_COVER_TAUS = 3;

/** Largest minus smallest value of a trace, Hz. */
function traceSpanHz(t: SettleTrace): number {
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < t.n; i++) {
    lo = Math.min(lo, t.valuesHz[i] as number);
    hi = Math.max(hi, t.valuesHz[i] as number);
  }
  return t.n > 0 ? hi - lo : 0;
}

/**
 * The latest readings of a trace still move one way: the last two steps
 * between them have the same sign and together exceed the noise allowance
 * (with two readings, their one difference exceeds it).
 */
function onItsWay(t: SettleTrace, noiseHz: number): boolean {
  const n = t.n;
  if (n < 2) return false;
  const last = t.valuesHz[n - 1] as number;
  const before = t.valuesHz[n - 2] as number;
  if (n === 2) return Math.abs(last - before) > noiseHz;
  const earlier = t.valuesHz[n - 3] as number;
  return (last - before) * (before - earlier) > 0 && Math.abs(last - earlier) > noiseHz;
}

/** Scatter counts at most ten tolerances, so one wild point cannot loosen the next. */
export function settleToleranceHz(options: AutoSettleOptions): number {
  const countsHz = options.toleranceCounts / options.gateS;
  return Math.max(countsHz, Math.min(3 * options.scatterHz, 10 * countsHz));
}

/** Difference allowed between two readings for noise alone, Hz. */
export function settleNoiseHz(options: AutoSettleOptions): number {
  const countHz = 1 / options.gateS;
  return countHz + 2 * Math.min(options.scatterHz, 10 * countHz);
}

/** Upper bound of the settling error left at the later of two readings Δ apart. */
export function remainingBoundHz(differenceHz: number, noiseHz: number, spacingS: number, tauS: number): number {
  const signal = Math.max(0, Math.abs(differenceHz) - noiseHz);
  return signal / Math.expm1(spacingS / tauS);
}

/**
 * Waits for the DUT to settle. `stepAtS` is clock time of the voltage write;
 * `read` takes one counter reading (it may throw on a dropped link).
 */
export async function settleAuto(
  clock: Clock,
  stepAtS: number,
  read: () => Promise<CounterReading>,
  options: AutoSettleOptions,
  learned: TimeConstantEstimate,
  signal?: AbortSignal,
  /** Mean frequency settled at the previous setpoint (NaN if none): the value at the step. */
  beforeStepHz = Number.NaN,
): Promise<SettleOutcome> {
  const tolHz = settleToleranceHz(options);
  const noiseHz = settleNoiseHz(options);
  const { gateS, maxS } = options;
  const deadlineS = stepAtS + maxS;
  // A reading averages its gate: its time is the gate's centre.
  const half = gateS / 2;
  const trace = options.trace;
  if (trace) trace.n = 0;
  const note = (atS: number, reading: CounterReading): void => {
    if (!trace || reading.status !== 'ok' || trace.n >= trace.timesS.length) return;
    trace.timesS[trace.n] = atS - half - stepAtS;
    trace.valuesHz[trace.n] = reading.frequencyHz;
    trace.n++;
  };
  /** The run of no-signal readings up to the latest (cleared by an oscillating one). */
  let noSignalRun: { reading: CounterReading; atS: number }[] = [];
  let provisional = false;
  const done = (settled: boolean, reading: CounterReading, atS: number, readings: number): SettleOutcome => {
    const believedNoSignal = settled && reading.status === 'no-signal';
    return {
      settled,
      elapsedS: atS - stepAtS,
      readings,
      toleranceHz: tolHz,
      last: settled ? { reading, atS } : null,
      held: believedNoSignal ? noSignalRun.slice(0, -1) : [],
      provisional: believedNoSignal && provisional,
    };
  };
  const remember = (reading: CounterReading, atS: number): void => {
    if (reading.status === 'no-signal') noSignalRun.push({ reading, atS });
    else noSignalRun = [];
  };
  /**
   * Rule 1 on one ok reading: null when settled, else when to read next (s
   * after this reading). Needs τ and the value before the step.
   */
  const ruleOne = (reading: CounterReading, atS: number): number | null | undefined => {
    const tauS = learned.tauS;
    if (tauS === null || !Number.isFinite(beforeStepHz) || reading.status !== 'ok') return undefined;
    // The part of the step already done, f − f_before = A·(1 − e^(−t/τ)), gives what is left, A·e^(−t/τ).
    const tauEffS = TAU_MARGIN * tauS;
    const centreS = atS - half - stepAtS;
    const doneFraction = -Math.expm1(-centreS / tauEffS);
    // No noise taken off here: the estimate may only err towards waiting longer.
    const stepHz = Math.max(Math.abs(reading.frequencyHz - beforeStepHz) / doneFraction, options.expectedStepHz ?? 0);
    const remHz = stepHz * Math.exp(-centreS / tauEffS);
    // Early in the step the done part is too small to tell a step from none (a few counts hide
    // in the quantisation); from half done on, the estimate is off by at most one count.
    if (remHz <= tolHz && doneFraction >= MIN_DONE_FRACTION) return null;
    // Read next where the rest should be within tolerance by a margin: one jump instead of creeping up.
    // Only the time of that reading rests on this estimate, not the decision, so early in the step
    // (a small done fraction magnifies the ±1-count quantisation) the noise is taken off here.
    const plannedStepHz = Math.max(
      Math.max(0, Math.abs(reading.frequencyHz - beforeStepHz) - noiseHz) / doneFraction,
      options.expectedStepHz ?? 0,
    );
    const targetCentreS = tauEffS * Math.log(Math.max(1, Math.min(stepHz, plannedStepHz) / (tolHz * TARGET_FRACTION)));
    return Math.max(gateS, targetCentreS + half + stepAtS - atS);
  };
  // Settling by prediction (settle-predict.ts): one wait, then the reading that confirms it. The
  // tolerance is on the mean of the readings recorded from it on, in counts: the previous point's
  // scatter does not widen it (that allowance is for the watching rules' differences of noisy
  // readings; here the model decides, and a scatter that settling itself caused must not loosen it).
  const knownTauS = learned.tauS;
  const expectedStepHz = options.expectedStepHz ?? 0;
  const recorded = Math.max(1, Math.floor(options.recordedReadings ?? 1));
  const meanTolHz = options.toleranceCounts / gateS;
  const finalAfterS = options.finalNoSignalAfterS;
  const learnTauFrom = options.learnTauFromStepHz;
  /** Fits the step watched so far; takes τ once the readings cover 3τ. */
  /** Fits the step watched so far: τ taken once the readings cover 3τ ('learned'), 'covering' until then. */
  const tryLearnTau = (t: SettleTrace, minStepHz: number): 'learned' | 'covering' | 'no' => {
    if (traceSpanHz(t) < minStepHz) return 'no';
    const fit = fitStepCurve(t.timesS, t.valuesHz, t.n, minStepHz);
    if (fit === null) return 'no';
    if ((t.timesS[t.n - 1] as number) < LEARN_COVER_TAUS * fit.tauS) return 'covering';
    learned.accept(fit.tauS);
    return 'learned';
  };
  const finalNoSignal = (reading: CounterReading, sentS: number): boolean =>
    finalAfterS !== undefined && reading.status === 'no-signal' && sentS - stepAtS >= finalAfterS;
  if (knownTauS !== null && Number.isFinite(beforeStepHz) && expectedStepHz > 0 && options.afterOutputOn !== true) {
    const startS = predictedStartS(knownTauS, gateS, expectedStepHz, meanTolHz, recorded);
    const waitS = stepAtS + Math.min(maxS, startS) - clock.now();
    if (waitS > 0) await clock.sleep(waitS, signal);
  }
  const sentAtS = clock.now();
  let previous = await read();
  let previousAtS = clock.now();
  note(previousAtS, previous);
  remember(previous, previousAtS);
  let readings = 1;
  if (finalNoSignal(previous, sentAtS)) return done(true, previous, previousAtS, readings);
  let previousSentS = sentAtS;
  if (knownTauS !== null && Number.isFinite(beforeStepHz) && expectedStepHz > 0 && previous.status === 'ok') {
    // The gate opened between the command's sending and a gate before its reply: the earlier end is
    // the one that leaves the most error (over a link the reply comes a return trip after the gate).
    const startS = Math.min(sentAtS, previousAtS - gateS) - stepAtS;
    const errorHz = meanErrorHz(knownTauS, gateS, recorded, startS, previous.frequencyHz, beforeStepHz);
    if (errorHz <= meanTolHz) return done(true, previous, previousAtS, readings);
  }
  let nextSpacingS = gateS;
  // With τ and the value before the step known, one reading right after the step says how long to wait.
  const first = ruleOne(previous, previousAtS);
  if (first === null) return done(true, previous, previousAtS, readings);
  if (first !== undefined) nextSpacingS = first;
  for (;;) {
    if (previousAtS >= deadlineS) return done(false, previous, previousAtS, readings);
    // The next reading ends one gate after it starts; start it so its end lies nextSpacingS after the previous end
    // (no later than where a "no signal" would be final).
    // (A reading sent before that moment could not tell; the next goes out no later than it.)
    if (finalAfterS !== undefined && previousSentS - stepAtS < finalAfterS)
      nextSpacingS = Math.min(nextSpacingS, Math.max(gateS, stepAtS + finalAfterS + gateS - previousAtS));
    const waitS = Math.min(nextSpacingS - gateS, deadlineS - previousAtS);
    if (waitS > 0) await clock.sleep(waitS, signal);
    const currentSentS = clock.now();
    const current = await read();
    const currentAtS = clock.now();
    note(currentAtS, current);
    remember(current, currentAtS);
    readings++;
    if (finalNoSignal(current, currentSentS)) return done(true, current, currentAtS, readings);
    previousSentS = currentSentS;
    if (previous.status === 'no-signal' && current.status === 'no-signal') {
      // No signal says nothing about how far the port still has to go: a DUT
      // whose port is still on its way up through the stalled region reads the
      // same. Believe it after 3 learned time constants (5 % left), or after
      // maxS right after switch-on (a step from 0 V), else at once.
      const sinceStepS = currentAtS - stepAtS;
      const learnedTau = learned.tauS;
      let trustAfterS = options.afterOutputOn === true ? maxS : learnedTau === null ? 0 : 3 * learnedTau;
      if (learnedTau === null && options.provisionalAfterS !== undefined) {
        trustAfterS = Math.min(maxS, options.provisionalAfterS);
        provisional = true;
      }
      if (sinceStepS >= trustAfterS) return done(true, current, currentAtS, readings);
      // Watching for the oscillation to start after switch-on: read back to back, so it shows at once.
      nextSpacingS =
        provisional && options.afterOutputOn === true
          ? gateS
          : Math.max(gateS, Math.min(0.5 * sinceStepS, trustAfterS - sinceStepS));
      previous = current;
      previousAtS = currentAtS;
      continue;
    }
    // (While the trace has room: a full one would answer the same forever.)
    if (
      learnTauFrom !== undefined &&
      learned.tauS === null &&
      trace &&
      trace.n < trace.timesS.length &&
      current.status === 'ok'
    ) {
      // A step to learn τ from, read back to back and fitted after each reading. Until τ is fixed it is
      // read on while a fit needs only more time, or while the step is visibly on its way (the rule
      // without τ below takes τ no longer than the time since the step, and over the first gates of
      // a slow port two readings a gate apart differ by less than its noise allowance); otherwise the
      // usual rules decide (a step too small or too quick to show τ: the sweep probes).
      const learning = tryLearnTau(trace, learnTauFrom);
      if (learning === 'covering' || (learning === 'no' && onItsWay(trace, noiseHz))) {
        previous = current;
        previousAtS = currentAtS;
        nextSpacingS = gateS;
        continue;
      }
      // Just learned: judged as a predicted point's first reading is, on the mean of the readings
      // recorded from it on (settle-predict.ts), the step read from the value before it.
      const tauS = learned.tauS;
      if (learning === 'learned' && tauS !== null && Number.isFinite(beforeStepHz)) {
        const startS = Math.min(currentSentS, currentAtS - gateS) - stepAtS;
        const errorHz = meanErrorHz(tauS, gateS, recorded, startS, current.frequencyHz, beforeStepHz);
        if (errorHz <= meanTolHz) return done(true, current, currentAtS, readings);
      }
    }
    const byRuleOne = ruleOne(current, currentAtS);
    if (byRuleOne === null) return done(true, current, currentAtS, readings);
    if (byRuleOne !== undefined) {
      nextSpacingS = byRuleOne;
    } else if (previous.status === 'ok' && current.status === 'ok') {
      const spacingS = currentAtS - previousAtS;
      const learnedTau = learned.tauS;
      // Without τ: bound the remainder by the last difference, taking τ ≤ time since the step.
      const tauEffS = learnedTau === null ? currentAtS - stepAtS : TAU_MARGIN * learnedTau;
      const remHz = remainingBoundHz(current.frequencyHz - previous.frequencyHz, noiseHz, spacingS, tauEffS);
      if (remHz <= tolHz) return done(true, current, currentAtS, readings);
      nextSpacingS =
        learnedTau === null
          ? Math.max(gateS, 0.5 * (currentAtS - stepAtS))
          : Math.max(gateS, learnedTau * Math.log(Math.max(1, remHz / (tolHz / 3))));
    } else {
      nextSpacingS = Math.max(gateS, 0.5 * (currentAtS - stepAtS));
    }
    previous = current;
    previousAtS = currentAtS;
  }
}
