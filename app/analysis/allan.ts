/**
 * Frequency-stability statistics of fractional-frequency data y (sample
 * interval tau0), as defined in NIST SP 1065 (W. J. Riley, "Handbook of
 * Frequency Stability Analysis", 2008), §5.2. All work on the phase
 * x[i] = tau0·Σ_{k<i} (y[k] − ȳ) (N+1 points), so an average of m
 * frequencies is one phase difference: O(N) per averaging time, not O(N·m).
 * Subtracting ȳ first keeps the phase small (rounding) and changes none of
 * these statistics (each is blind to a frequency offset).
 */

export interface StabilityPoint {
  /** Averaging factor m; tau = m·tau0. */
  m: number;
  tauS: number;
  deviation: number;
  /** Number of squared terms summed. */
  terms: number;
}

export type StabilityKind = 'adev' | 'oadev' | 'mdev' | 'hdev' | 'ohdev' | 'tdev' | 'totdev';

/**
 * Phase (s) from fractional frequency, offset removed; length n+1. Pass
 * `scratch` (length ≥ n+1) to reuse memory across calls: a fresh large array
 * costs page faults that can exceed the arithmetic.
 */
export function phaseFromFrequency(
  y: Float64Array,
  i0: number,
  i1: number,
  tau0S: number,
  scratch?: Float64Array,
): Float64Array {
  const n = i1 - i0;
  let mean = 0;
  for (let i = i0; i < i1; i++) mean += y[i] as number;
  mean /= n;
  const x = scratch && scratch.length >= n + 1 ? scratch.subarray(0, n + 1) : new Float64Array(n + 1);
  x[0] = 0;
  let acc = 0;
  for (let i = 0; i < n; i++) {
    acc += ((y[i0 + i] as number) - mean) * tau0S;
    x[i + 1] = acc;
  }
  return x;
}

/** Octave averaging factors 1, 2, 4, … while the statistic has ≥ 1 term. */
export function octaveFactors(n: number, kind: StabilityKind): number[] {
  const out: number[] = [];
  for (let m = 1; termsFor(kind, n, m) >= 1; m *= 2) out.push(m);
  return out;
}

function termsFor(kind: StabilityKind, n: number, m: number): number {
  const nx = n + 1; // phase points
  switch (kind) {
    case 'adev':
      return Math.floor(n / m) - 1;
    case 'oadev':
      return nx - 2 * m;
    case 'mdev':
    case 'tdev':
      return nx - 3 * m + 1;
    case 'hdev':
      return Math.floor(n / m) - 2;
    case 'ohdev':
      return nx - 3 * m;
    case 'totdev':
      return m <= (nx - 1) / 2 ? nx - 2 : 0;
  }
}

/** Σ (x[i+2m] − 2x[i+m] + x[i])² for i = 0, step, 2·step, … while i + 2m < length. */
function sumSecondDifferences(x: Float64Array, m: number, step: number): number {
  let sum = 0;
  const last = x.length - 2 * m;
  for (let i = 0; i < last; i += step) {
    const d = x[i + 2 * m]! - 2 * x[i + m]! + x[i]!;
    sum += d * d;
  }
  return sum;
}

/** Σ (x[i+3m] − 3x[i+2m] + 3x[i+m] − x[i])², as above. */
function sumThirdDifferences(x: Float64Array, m: number, step: number): number {
  let sum = 0;
  const last = x.length - 3 * m;
  for (let i = 0; i < last; i += step) {
    const d = x[i + 3 * m]! - 3 * x[i + 2 * m]! + 3 * x[i + m]! - x[i]!;
    sum += d * d;
  }
  return sum;
}

/**
 * Σ_j (Σ_{i=j}^{j+m−1} second difference)² for j = 0 … terms−1, the modified
 * Allan sum: a sliding window adds the entering difference and drops the
 * leaving one, O(N) per m.
 */
function sumModified(x: Float64Array, m: number, terms: number): number {
  let w = 0;
  for (let i = 0; i < m; i++) w += x[i + 2 * m]! - 2 * x[i + m]! + x[i]!;
  let sum = w * w;
  for (let j = 1; j < terms; j++) {
    const a = j + m - 1;
    const b = j - 1;
    w += x[a + 2 * m]! - 2 * x[a + m]! + x[a]! - (x[b + 2 * m]! - 2 * x[b + m]! + x[b]!);
    sum += w * w;
  }
  return sum;
}

/**
 * Total variance sum, SP 1065 §5.2.11: phase extended by reflection about both
 * ends, x*(1−j) = 2x(1) − x(1+j), x*(N+j) = 2x(N) − x(N−j); i = 2 … N−1.
 */
function sumTotal(x: Float64Array, m: number): number {
  const last = x.length - 1;
  const x0 = x[0]!;
  const xl = x[last]!;
  let sum = 0;
  for (let i = 1; i < last; i++) {
    const lo = i - m;
    const hi = i + m;
    const a = lo < 0 ? 2 * x0 - x[-lo]! : x[lo]!;
    const b = hi > last ? 2 * xl - x[2 * last - hi]! : x[hi]!;
    const d = a - 2 * x[i]! + b;
    sum += d * d;
  }
  return sum;
}

/** One statistic at one averaging factor m from phase x (length N+1). */
export function deviationAt(kind: StabilityKind, x: Float64Array, tau0S: number, m: number): StabilityPoint {
  const tau = m * tau0S;
  const terms = termsFor(kind, x.length - 1, m);
  if (terms < 1 || m < 1) return { m, tauS: tau, deviation: NaN, terms: Math.max(0, terms) };
  const t2 = tau * tau;
  let deviation: number;
  switch (kind) {
    case 'adev':
      deviation = Math.sqrt(sumSecondDifferences(x, m, m) / (2 * t2 * terms));
      break;
    case 'oadev':
      deviation = Math.sqrt(sumSecondDifferences(x, m, 1) / (2 * t2 * terms));
      break;
    case 'hdev':
      deviation = Math.sqrt(sumThirdDifferences(x, m, m) / (6 * t2 * terms));
      break;
    case 'ohdev':
      deviation = Math.sqrt(sumThirdDifferences(x, m, 1) / (6 * t2 * terms));
      break;
    case 'mdev':
    case 'tdev': {
      const mdev = Math.sqrt(sumModified(x, m, terms) / (2 * m * m * t2 * terms));
      deviation = kind === 'mdev' ? mdev : (tau / Math.sqrt(3)) * mdev;
      break;
    }
    case 'totdev':
      deviation = Math.sqrt(sumTotal(x, m) / (2 * t2 * terms));
      break;
  }
  return { m, tauS: tau, deviation, terms };
}

/**
 * A statistic of fractional frequency y over an index window at the given
 * averaging factors (default: octaves). `scratch`: see phaseFromFrequency.
 */
export function stability(
  kind: StabilityKind,
  y: Float64Array,
  i0: number,
  i1: number,
  tau0S: number,
  factors?: readonly number[],
  scratch?: Float64Array,
): StabilityPoint[] {
  const x = phaseFromFrequency(y, i0, i1, tau0S, scratch);
  const ms = factors ?? octaveFactors(i1 - i0, kind);
  const out: StabilityPoint[] = [];
  for (const m of ms) out.push(deviationAt(kind, x, tau0S, m));
  return out;
}

/**
 * Overlapping ADEV computed the direct way — each m-sample frequency average
 * summed afresh, O(N·m) — kept only as the benchmark baseline and a test oracle.
 */
export function oadevDirect(y: Float64Array, m: number): number {
  const n = y.length;
  let sum = 0;
  let terms = 0;
  for (let i = 0; i + 2 * m <= n; i++) {
    let a = 0;
    let b = 0;
    for (let k = 0; k < m; k++) {
      a += y[i + k] as number;
      b += y[i + m + k] as number;
    }
    const d = (b - a) / m;
    sum += d * d;
    terms++;
  }
  return Math.sqrt(sum / (2 * terms));
}
