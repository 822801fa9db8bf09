/**
 * analyzeDrift: a fixed-control-voltage log of frequency (and temperature)
 * against time → tempco, warm-up, drift rate, f–T loop and Allan deviations.
 */
import { AnalysisError } from './analysis-error.ts';
import { deviationAt, octaveFactors, phaseFromFrequency, type StabilityKind, type StabilityPoint } from './allan.ts';
import { fitPolynomial } from './poly-fit.ts';
import { isNoOscillation } from './sweep-points.ts';
import { frequencyTemperatureLoop, type FtLoop } from './drift-loop.ts';
import { findWarmUp } from './drift-warmup.ts';
import { kthSmallestInPlace } from './select-kth.ts';

export interface DriftInput {
  timeS: Float64Array;
  frequencyHz: Float64Array;
  temperatureC?: Float64Array;
}

export interface DriftOptions {
  /** Warm-up ends when the drift rate stays within this (ppm/hour). Default 5. */
  warmupLimitPpmPerHour?: number;
  /** Temperature span below which no tempco is reported (°C). Default 0.2. */
  minTemperatureSpanC?: number;
  /** Averaging factors m (tau = m·tau0) for the Allan deviations; default octaves 1, 2, 4, … */
  averagingFactors?: readonly number[];
  /** Counter gate (s): sets the ±1-count floor 1/(gate·f) that ADEV points are checked against. */
  gateS?: number;
}

export interface DriftAnalysis {
  kind: 'drift';
  meanHz: number;
  tempcoPpmPerC: number | null;
  tempcoHzPerC: number | null;
  driftPpmPerHour: number | null;
  /** Overlapping ADEV of fractional frequency at octave taus (CONTRACTS.md); at or below the ±1-count floor = resolution-limited. */
  adev: { tauS: number; adev: number; terms: number; resolutionLimited: boolean }[];
  /** The counter's ±1-count floor 1/(gate·f) as a fractional frequency; null without a gate. */
  resolutionFloor: number | null;
  /** |drift| ≥ 2σ (false when there is no drift figure). */
  driftSignificant: boolean;
  /** |tempco| ≥ 2σ (false when there is no tempco). */
  tempcoSignificant: boolean;
  tempcoUncertaintyHzPerC: number | null;
  tempcoUncertaintyPpmPerC: number | null;
  temperatureSpanC: number | null;
  meanTemperatureC: number | null;
  driftUncertaintyPpmPerHour: number | null;
  /** `determined` false: the log cannot tell whether warm-up has ended (the drift rate's 2σ exceeds the limit). */
  warmUp: { settled: boolean; determined: boolean; warmUpS: number | null; limitPpmPerHour: number; windowS: number };
  loop: FtLoop | null;
  allan: {
    tau0S: number;
    samples: number;
    adev: StabilityPoint[];
    oadev: StabilityPoint[];
    mdev: StabilityPoint[];
  };
  samples: number;
  noOscillationSamples: number;
  durationS: number;
  warnings: string[];
}

export function analyzeDrift(input: DriftInput, options: DriftOptions = {}): DriftAnalysis {
  const { t, f, temp, m, mt } = validSamples(input);
  const n = input.timeS.length;
  const hasTemp = input.temperatureC !== undefined;
  if (m < 3) throw new AnalysisError(`a drift analysis needs at least 3 valid readings (got ${m})`);
  const warnings: string[] = [];
  let meanHz = 0;
  for (let i = 0; i < m; i++) meanHz += f[i] as number;
  meanHz /= m;
  const durationS = (t[m - 1] as number) - (t[0] as number);

  // Tempco: least-squares line f(T) over samples that have a temperature.
  let tempco: { hz: number; sd: number } | null = null;
  let tSpan: number | null = null;
  let tMean: number | null = null;
  if (mt >= 3) {
    // Every valid sample has a temperature (the usual case): fit the columns as they are.
    const tt = mt === m ? temp : new Float64Array(mt);
    const ff = mt === m ? f : new Float64Array(mt);
    if (mt < m) {
      let k = 0;
      for (let i = 0; i < m; i++) {
        if (!Number.isFinite(temp[i])) continue;
        tt[k] = temp[i] as number;
        ff[k++] = f[i] as number;
      }
    }
    let lo = Infinity;
    let hi = -Infinity;
    let sum = 0;
    for (let i = 0; i < mt; i++) {
      lo = Math.min(lo, tt[i] as number);
      hi = Math.max(hi, tt[i] as number);
      sum += tt[i] as number;
    }
    tSpan = hi - lo;
    tMean = sum / mt;
    if (tSpan >= (options.minTemperatureSpanC ?? 0.2)) {
      const line = fitPolynomial(tt, ff, 0, mt, 1);
      tempco = { hz: line.coefficients[1] as number, sd: line.coefficientStdDev[1] as number };
    } else {
      warnings.push(`temperature moved only ${tSpan.toPrecision(3)} °C: no tempco`);
    }
  }

  const warmUp = findWarmUp(t, f, m, meanHz, options.warmupLimitPpmPerHour ?? 5);
  let drift: { ppmH: number; sd: number } | null = null;
  const from = warmUp.startIndex;
  if (m - from >= 3 && (t[m - 1] as number) > (t[from] as number)) {
    const line = fitPolynomial(t, f, from, m, 1);
    const toPpmH = (3600 * 1e6) / meanHz;
    drift = { ppmH: (line.coefficients[1] as number) * toPpmH, sd: (line.coefficientStdDev[1] as number) * toPpmH };
  }
  if (!warmUp.settled) warnings.push('drift never settled within the limit; drift rate is over the last quarter');
  // Warm-up and drift must not contradict: a settled warm-up means the drift after it is within the limit.
  let settled = warmUp.settled;
  let determined = true;
  if (drift && settled) {
    if (2 * drift.sd > warmUp.limit) {
      settled = false;
      determined = false;
      warnings.push(
        `the log is too short to tell whether warm-up has ended: the drift rate's 2σ (${(2 * drift.sd).toPrecision(2)} ppm/h) exceeds the ${warmUp.limit} ppm/h limit`,
      );
    } else if (Math.abs(drift.ppmH) - 2 * drift.sd > warmUp.limit) {
      settled = false;
      warnings.push(
        `the drift rate exceeds the ${warmUp.limit} ppm/h warm-up limit beyond its uncertainty: still warming up`,
      );
    }
  }
  if (m - 1 < 10)
    warnings.push(`only ${m - 1} interval(s) in the log: drift rate and Allan deviation need at least 10`);

  // Allan deviations of y = (f − mean)/mean, assuming the nominal interval.
  // One buffer holds the intervals, then (once their median is known) the phase: a fresh
  // million-sample array costs page faults comparable to the arithmetic.
  const buffer = new Float64Array(m + 1);
  const dts = buffer.subarray(0, m - 1);
  for (let i = 1; i < m; i++) dts[i - 1] = (t[i] as number) - (t[i - 1] as number);
  const tau0S = kthSmallestInPlace(dts, (m - 1) >> 1); // the median interval; reorders dts
  let irregular = 0;
  for (let i = 1; i < m; i++) if (Math.abs((t[i] as number) - (t[i - 1] as number) - tau0S) > 0.1 * tau0S) irregular++;
  if (irregular > 0)
    warnings.push(
      `${irregular} sample intervals differ from ${tau0S} s by > 10 %; Allan deviations assume even spacing`,
    );
  const y = new Float64Array(m);
  for (let i = 0; i < m; i++) y[i] = ((f[i] as number) - meanHz) / meanHz;
  const factors = options.averagingFactors;
  if (factors?.some((f) => !Number.isInteger(f) || f < 1))
    throw new AnalysisError('averaging factors must be whole numbers ≥ 1');
  // One phase record serves all three statistics.
  const x = phaseFromFrequency(y, 0, m, tau0S, buffer);
  const allan = (kind: StabilityKind): StabilityPoint[] =>
    (factors ?? octaveFactors(m, kind)).map((factor) => deviationAt(kind, x, tau0S, factor)).filter((p) => p.terms > 0);
  const oadev = allan('oadev');
  const resolutionFloor = options.gateS && options.gateS > 0 ? 1 / (options.gateS * meanHz) : null;
  const limited = oadev.filter((p) => resolutionFloor !== null && p.deviation <= resolutionFloor * (1 + 1e-9));
  if (limited.length > 0) {
    warnings.push(
      `ADEV at τ = ${limited.map((p) => `${p.tauS} s`).join(', ')} is at or below the counter's ±1-count floor ${resolutionFloor?.toPrecision(2)} (1/(gate·f)): resolution-limited, not the oscillator`,
    );
  }
  const loop = hasTemp ? frequencyTemperatureLoop(temp, f, m, meanHz) : null;

  return {
    kind: 'drift',
    meanHz,
    tempcoPpmPerC: tempco ? (tempco.hz / meanHz) * 1e6 : null,
    tempcoHzPerC: tempco ? tempco.hz : null,
    driftPpmPerHour: drift ? drift.ppmH : null,
    adev: oadev.map((p) => ({
      tauS: p.tauS,
      adev: p.deviation,
      terms: p.terms,
      resolutionLimited: resolutionFloor !== null && p.deviation <= resolutionFloor * (1 + 1e-9),
    })),
    resolutionFloor,
    driftSignificant: drift !== null && Number.isFinite(drift.sd) && Math.abs(drift.ppmH) >= 2 * drift.sd,
    tempcoSignificant: tempco !== null && Number.isFinite(tempco.sd) && Math.abs(tempco.hz) >= 2 * tempco.sd,
    tempcoUncertaintyHzPerC: tempco ? tempco.sd : null,
    tempcoUncertaintyPpmPerC: tempco ? (tempco.sd / meanHz) * 1e6 : null,
    temperatureSpanC: tSpan,
    meanTemperatureC: tMean,
    driftUncertaintyPpmPerHour: drift ? drift.sd : null,
    warmUp: {
      settled,
      determined,
      warmUpS: settled ? (t[from] as number) - (t[0] as number) : null,
      limitPpmPerHour: warmUp.limit,
      windowS: warmUp.windowS,
    },
    loop,
    allan: {
      tau0S,
      samples: m,
      adev: allan('adev'),
      oadev,
      mdev: allan('mdev'),
    },
    samples: n,
    noOscillationSamples: n - m,
    durationS,
    warnings,
  };
}

/**
 * The readings that oscillated, at finite times, as columns of length m (mt
 * of them with a finite temperature). When every reading is valid the input
 * columns are used as they are (they are only read): no copy of a million samples.
 */
function validSamples(input: DriftInput): {
  t: Float64Array;
  f: Float64Array;
  temp: Float64Array;
  m: number;
  mt: number;
} {
  const n = input.timeS.length;
  const inTemp = input.temperatureC;
  let m = 0;
  let mt = 0;
  for (let i = 0; i < n; i++) {
    if (isNoOscillation(input.frequencyHz[i] as number) || !Number.isFinite(input.timeS[i])) continue;
    m++;
    if (inTemp !== undefined && Number.isFinite(inTemp[i])) mt++;
  }
  if (m === n && input.frequencyHz.length >= n && (inTemp === undefined || inTemp.length >= n)) {
    // Without a temperature column nothing reads `temp` (mt = 0, no loop).
    return { t: input.timeS, f: input.frequencyHz, temp: inTemp ?? new Float64Array(0), m, mt };
  }
  const t = new Float64Array(m);
  const f = new Float64Array(m);
  const temp = new Float64Array(m);
  let k = 0;
  for (let i = 0; i < n; i++) {
    const fi = input.frequencyHz[i] as number;
    const ti = input.timeS[i] as number;
    if (isNoOscillation(fi) || !Number.isFinite(ti)) continue;
    t[k] = ti;
    f[k] = fi;
    temp[k] = inTemp !== undefined ? (inTemp[i] as number) : NaN;
    k++;
  }
  return { t, f, temp, m, mt };
}
