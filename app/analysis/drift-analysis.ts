/**
 * analyzeDrift: a fixed-control-voltage log of frequency (and temperature)
 * against time → tempco, warm-up, drift rate, f–T loop and Allan deviations.
 */
import { AnalysisError } from './analysis-error.ts';
import { stability, type StabilityPoint } from './allan.ts';
import { fitPolynomial } from './poly-fit.ts';
import { isNoOscillation } from './sweep-points.ts';
import { frequencyTemperatureLoop, type FtLoop } from './drift-loop.ts';

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
}

export interface DriftAnalysis {
  kind: 'drift';
  meanHz: number;
  tempcoPpmPerC: number | null;
  tempcoHzPerC: number | null;
  driftPpmPerHour: number | null;
  /** Overlapping ADEV of fractional frequency at octave taus (CONTRACTS.md). */
  adev: { tauS: number; adev: number; terms: number }[];
  tempcoUncertaintyHzPerC: number | null;
  tempcoUncertaintyPpmPerC: number | null;
  temperatureSpanC: number | null;
  meanTemperatureC: number | null;
  driftUncertaintyPpmPerHour: number | null;
  warmUp: { settled: boolean; warmUpS: number | null; limitPpmPerHour: number; windowS: number };
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
  const n = input.timeS.length;
  const t = new Float64Array(n);
  const f = new Float64Array(n);
  const temp = new Float64Array(n);
  const hasTemp = input.temperatureC !== undefined;
  let m = 0;
  let mt = 0; // samples with a temperature
  for (let i = 0; i < n; i++) {
    const fi = input.frequencyHz[i] as number;
    const ti = input.timeS[i] as number;
    if (isNoOscillation(fi) || !Number.isFinite(ti)) continue;
    t[m] = ti;
    f[m] = fi;
    const c = hasTemp ? (input.temperatureC?.[i] as number) : NaN;
    temp[m] = c;
    if (Number.isFinite(c)) mt++;
    m++;
  }
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
    const tt = new Float64Array(mt);
    const ff = new Float64Array(mt);
    let k = 0;
    for (let i = 0; i < m; i++) {
      if (!Number.isFinite(temp[i] as number)) continue;
      tt[k] = temp[i] as number;
      ff[k++] = f[i] as number;
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

  // Allan deviations of y = (f − mean)/mean, assuming the nominal interval.
  const dts = new Float64Array(m - 1);
  for (let i = 1; i < m; i++) dts[i - 1] = (t[i] as number) - (t[i - 1] as number);
  const tau0S = dts.slice().sort()[(m - 1) >> 1] as number;
  let irregular = 0;
  for (let i = 0; i < m - 1; i++) if (Math.abs((dts[i] as number) - tau0S) > 0.1 * tau0S) irregular++;
  if (irregular > 0) warnings.push(`${irregular} sample intervals differ from ${tau0S} s by > 10 %; Allan deviations assume even spacing`);
  const y = new Float64Array(m);
  for (let i = 0; i < m; i++) y[i] = ((f[i] as number) - meanHz) / meanHz;
  const factors = options.averagingFactors;
  if (factors?.some((f) => !Number.isInteger(f) || f < 1)) throw new AnalysisError('averaging factors must be whole numbers ≥ 1');
  const oadev = stability('oadev', y, 0, m, tau0S, factors).filter((p) => p.terms > 0);
  const loop = hasTemp ? frequencyTemperatureLoop(temp, f, m, meanHz) : null;

  return {
    kind: 'drift',
    meanHz,
    tempcoPpmPerC: tempco ? (tempco.hz / meanHz) * 1e6 : null,
    tempcoHzPerC: tempco ? tempco.hz : null,
    driftPpmPerHour: drift ? drift.ppmH : null,
    adev: oadev.map((p) => ({ tauS: p.tauS, adev: p.deviation, terms: p.terms })),
    tempcoUncertaintyHzPerC: tempco ? tempco.sd : null,
    tempcoUncertaintyPpmPerC: tempco ? (tempco.sd / meanHz) * 1e6 : null,
    temperatureSpanC: tSpan,
    meanTemperatureC: tMean,
    driftUncertaintyPpmPerHour: drift ? drift.sd : null,
    warmUp: {
      settled: warmUp.settled,
      warmUpS: warmUp.settled ? (t[from] as number) - (t[0] as number) : null,
      limitPpmPerHour: warmUp.limit,
      windowS: warmUp.windowS,
    },
    loop,
    allan: {
      tau0S,
      samples: m,
      adev: stability('adev', y, 0, m, tau0S, factors).filter((p) => p.terms > 0),
      oadev,
      mdev: stability('mdev', y, 0, m, tau0S, factors).filter((p) => p.terms > 0),
    },
    samples: n,
    noOscillationSamples: n - m,
    durationS,
    warnings,
  };
}

/**
 * Warm-up: the record is cut into 20 windows (≥ 10 samples each); the drift
 * rate of each is its least-squares slope. Warm-up ends at the start of the
 * first window after which every window stays within the limit (allowing
 * two standard deviations of the window's slope for noise).
 */
function findWarmUp(
  t: Float64Array,
  f: Float64Array,
  m: number,
  meanHz: number,
  limit: number,
): { settled: boolean; startIndex: number; limit: number; windowS: number } {
  const windows = Math.max(1, Math.min(20, Math.floor(m / 10)));
  const size = Math.floor(m / windows);
  const toPpmH = (3600 * 1e6) / meanHz;
  let start = -1;
  for (let w = windows - 1; w >= 0; w--) {
    const a = w * size;
    const b = w === windows - 1 ? m : a + size;
    if (b - a < 3 || (t[b - 1] as number) <= (t[a] as number)) break;
    const line = fitPolynomial(t, f, a, b, 1);
    const rate = (line.coefficients[1] as number) * toPpmH;
    const rateSd = Number.isFinite(line.coefficientStdDev[1]) ? (line.coefficientStdDev[1] as number) * toPpmH : 0;
    // Settled while the rate is consistent (2σ) with lying inside the limit: noise alone does not extend warm-up.
    if (Math.abs(rate) - 2 * Math.abs(rateSd) > limit) break;
    start = a;
  }
  const windowS = ((t[m - 1] as number) - (t[0] as number)) / windows;
  if (start < 0) return { settled: false, startIndex: Math.floor((3 * m) / 4), limit, windowS };
  return { settled: true, startIndex: start, limit, windowS };
}
