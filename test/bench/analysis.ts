/**
 * Analysis benchmarks (issue 3 §6, issue 9): polynomial and spline fits of 10,000 points,
 * full sweep analysis of 10,000 and 100,000 readings, overlapping ADEV of
 * 1,000,000 samples at all octave taus next to the direct O(N·m) sum, and the
 * whole drift analysis of a 1,000,000-sample log.
 *
 * Run: npx tsx test/bench/analysis.ts   (or through test/bench/index.ts)
 * Each figure: one warm-up run, then the median of several timed runs.
 */
import { cpus, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { oadevDirect, octaveFactors, stability } from '../../app/analysis/allan.ts';
import { fitPolynomialAuto } from '../../app/analysis/poly-fit-auto.ts';
import { fitPolynomial } from '../../app/analysis/poly-fit.ts';
import { analyzeSweep } from '../../app/analysis/sweep-analysis.ts';
import { fitSpline } from '../../app/analysis/spline-fit.ts';
import { analyzeDrift } from '../../app/analysis/drift-analysis.ts';
import { warmingReference } from '../fixtures/drift-scenarios.ts';

export interface BenchFigure {
  name: string;
  /** Median wall-clock time. */
  medianMs: number;
  /** Median CPU time of this process (user + system): honest when the machine is shared. */
  medianCpuMs: number;
  runs: number;
  targetMs?: number;
  note?: string;
}

/** Park–Miller generator in (0, 1): deterministic data for every run. */
function lcg(seed: number): () => number {
  let n = seed;
  return () => {
    n = (16807 * n) % 2147483647;
    return n / 2147483647;
  };
}

function timeMedian(fn: () => unknown, runs: number): { medianMs: number; medianCpuMs: number; runs: number } {
  fn(); // warm-up: JIT and caches
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  const median = (v: number[]): number => v.sort((a, b) => a - b)[Math.floor(v.length / 2)] as number;
  return { medianMs: median(wall), medianCpuMs: median(cpu), runs };
}

/** Readings of a sweep: `points` control voltages × `perPoint` readings × up and down. */
function sweepReadings(
  points: number,
  perPoint: number,
  rnd: () => number,
): { controlV: Float64Array; frequencyHz: Float64Array; direction: Int8Array; gateS: number } {
  const total = points * perPoint * 2;
  const controlV = new Float64Array(total);
  const frequencyHz = new Float64Array(total);
  const direction = new Int8Array(total);
  let k = 0;
  for (const dir of [1, -1] as const) {
    for (let p = 0; p < points; p++) {
      const v = 0.5 + (4 * p) / (points - 1);
      const f = 1e6 + 2e5 * v - 8e3 * v * v;
      for (let r = 0; r < perPoint; r++) {
        controlV[k] = v;
        direction[k] = dir;
        const jitter = v < 0.9 ? 0.03 * f * (rnd() - 0.5) : 0;
        frequencyHz[k] = v < 0.8 ? NaN : Math.round((f + jitter + 30 * (rnd() - 0.5)) / 10) * 10;
        k++;
      }
    }
  }
  return { controlV, frequencyHz, direction, gateS: 0.1 };
}

export function runAnalysisBench(log: (line: string) => void = console.log): BenchFigure[] {
  const figures: BenchFigure[] = [];
  const rnd = lcg(42);

  // 1. Polynomial fit of 10,000 points.
  const n = 10_000;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = 0.5 + (4 * i) / (n - 1);
    xs[i] = v;
    ys[i] = 1e6 + 2e5 * v - 8e3 * v * v + 300 * v * v * v + 20 * (rnd() - 0.5);
  }
  figures.push({
    name: 'poly fit, 10,000 points, degree 3',
    ...timeMedian(() => fitPolynomial(xs, ys, 0, n, 3), 21),
    targetMs: 10,
  });
  figures.push({
    name: 'poly fit, 10,000 points, auto (AICc over degrees 1–6)',
    ...timeMedian(() => fitPolynomialAuto(xs, ys, 0, n, 6), 11),
    targetMs: 10,
  });
  // The default tuning-curve model: P-spline with GCV, weights 1/u², monotone, knots warped (two fits).
  const us = new Float64Array(n).fill(20 / Math.sqrt(12));
  figures.push({
    name: 'spline fit, 10,000 points (GCV, weighted, monotone, warped knots)',
    ...timeMedian(() => fitSpline(xs, ys, us, 0, n, { monotone: 'rising' }), 21),
    targetMs: 10,
  });

  // 2. Sweep analysis of 10,000 readings: 500 points × 10 readings × up and down,
  //    stalled below 0.8 V, jittery just above, counter quantisation at 0.1 s gate;
  //    then 100,000 readings (2,000 points × 25 × up/down).
  const sweep = sweepReadings(500, 10, rnd);
  figures.push({
    name: 'sweep analysis, 10,000 readings (500 points × 10 × up/down)',
    ...timeMedian(() => analyzeSweep(sweep), 11),
    targetMs: 50,
  });
  const bigSweep = sweepReadings(2000, 25, rnd);
  figures.push({
    name: 'sweep analysis, 100,000 readings (2,000 points × 25 × up/down)',
    ...timeMedian(() => analyzeSweep(bigSweep), 5),
    targetMs: 250,
  });

  // 3. Overlapping ADEV of 1,000,000 samples at all octave taus, vs the direct sum.
  const m = 1_000_000;
  const y = new Float64Array(m);
  for (let i = 0; i < m; i++) y[i] = 1e-9 * (rnd() - 0.5);
  const all = octaveFactors(m, 'oadev');
  const scratch = new Float64Array(m + 1);
  const fastAll = timeMedian(() => stability('oadev', y, 0, m, 1, all), 7);
  figures.push({
    name: `overlapping ADEV, 1,000,000 samples, all ${all.length} octave taus (m = 1 … ${all[all.length - 1]}), fresh phase array`,
    ...fastAll,
    targetMs: 250,
  });
  const fastAllScratch = timeMedian(() => stability('oadev', y, 0, m, 1, all, scratch), 7);
  figures.push({ name: `overlapping ADEV, same, phase in a reused scratch buffer`, ...fastAllScratch, targetMs: 250 });
  const subset = all.filter((f) => f <= 64);
  const fastSubset = timeMedian(() => stability('oadev', y, 0, m, 1, subset, scratch), 7);
  const directSubset = timeMedian(() => subset.map((f) => oadevDirect(y, f)), 3);
  figures.push({
    name: `overlapping ADEV via phase (scratch buffer), same data, m = ${subset.join(', ')}`,
    ...fastSubset,
  });
  figures.push({
    name: `overlapping ADEV direct O(N·m), same data, m = ${subset.join(', ')}`,
    ...directSubset,
    note: `ratio direct / phase-based = ${(directSubset.medianCpuMs / fastSubset.medianCpuMs).toFixed(1)}× CPU on this subset (direct not run on all taus: O(N·Σm) ≈ ${(m * all.reduce((a, b) => a + b, 0) * 2).toExponential(1)} additions)`,
  });

  // 4. Whole drift analysis of a 1,000,000-sample log (1 s steps: warm-up, aging, one slow
  //    temperature excursion, counter noise): tempco, warm-up, drift, f–T loop, ADEV/OADEV/MDEV.
  //    The renderer's worker analyses a log once, so the first call (JIT still cold) is noted too.
  const drift = warmingReference(1_000_000);
  const firstCall = performance.now();
  analyzeDrift(drift);
  const firstMs = performance.now() - firstCall;
  figures.push({
    name: 'drift analysis of 1,000,000 samples (all figures)',
    ...timeMedian(() => analyzeDrift(drift), 5),
    targetMs: 1000,
    note: `first call in this process: ${firstMs.toFixed(0)} ms wall`,
  });

  log(
    `analysis benchmarks (median of timed runs after one warm-up; load average ${loadavg()[0]?.toFixed(1)} on ${cpus().length} CPUs)`,
  );
  log('     wall ms     CPU ms');
  for (const f of figures) {
    const target =
      f.targetMs !== undefined
        ? `  target ≤ ${f.targetMs} ms (CPU ${f.medianCpuMs <= f.targetMs ? 'met' : 'MISSED'})`
        : '';
    log(`  ${f.medianMs.toFixed(2).padStart(9)}  ${f.medianCpuMs.toFixed(2).padStart(9)}  ${f.name}${target}`);
    if (f.note) log(`               ${f.note}`);
  }
  return figures;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) runAnalysisBench();
