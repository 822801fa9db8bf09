/**
 * Procedure benchmarks (issue 4), printed honestly:
 * 1. Engine overhead per sweep point: real time per point minus the time
 *    spent inside role-driver calls, (a) on the in-process simulated bench
 *    (virtual clock, so instrument "delay" costs no real time), (b) with
 *    zero-delay in-memory role fakes (engine alone), (c) over the TCP
 *    simulated bench on loopback (real clock, 1 ms gate). Target ≤ 0.5 ms.
 * 2. Settling: a simulated DUT whose tuning port settles with τ = 50 ms,
 *    counter gate 10 ms: automatic settling against a fixed 0.5 s settle, as
 *    a time ratio (target ≤ 1/3) and the largest difference between the two
 *    curves (target ≤ max(2 counts, 10 ppm)).
 *
 *   npx tsx test/bench/procedures.ts
 */
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { sweepPlanSchema, type SweepPlanInput } from '../../app/contract/plans.ts';
import { assembleBench, type AssembledBench } from '../../main/bench/assemble.ts';
import type { Counter, FrequencyReading } from '../../main/instruments/roles.ts';
import { runSweep } from '../../main/procedures/sweep.ts';
import { FakeSupply, MemorySink } from '../../main/procedures/testing/fake-bench.ts';
import type { BenchRoles } from '../../main/procedures/types.ts';
import { builtinDut } from '../../main/sim/builtin-duts.ts';
import { serveSimBench } from '../../main/sim/tcp-server.ts';
import type { Clock } from '../../main/time/clock.ts';
import { RealClock } from '../../main/time/real-clock.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';
import { floorSeconds, pointsOf } from './sweep-floor-model.ts';

export interface OverheadFigure {
  label: string;
  points: number;
  totalMsPerPoint: number;
  driverMsPerPoint: number;
  engineMsPerPoint: number;
}

export interface SettlingFigure {
  stepV: number;
  autoS: number;
  fixedS: number;
  ratio: number;
  /** The physics floor of the automatic run's own points (sweep-floor-model.ts): the least any settling could take. */
  floorS: number;
  /** The same points' floor with each point's recorded mean (not its first gate) within 1 count. */
  meanFloorS: number;
  maxDiffHz: number;
  allowedHz: number;
  points: number;
  /** τ the automatic run settled its points with (its last settle-tau or settle-probe event), s; the simulator's is 0.05 s. */
  learnedTauS: number | null;
}

export interface ProceduresBenchResult {
  overhead: OverheadFigure[];
  settling: SettlingFigure[];
}

/** Wraps every method of a role driver to add up the real time spent inside it. */
function timed<T extends object>(target: T, sink: { ms: number }): T {
  return new Proxy(target, {
    get(obj, key, receiver) {
      const value: unknown = Reflect.get(obj, key, receiver);
      if (typeof value !== 'function') return value;
      return async (...args: unknown[]) => {
        const t0 = performance.now();
        try {
          return await (value as (...a: unknown[]) => Promise<unknown>).apply(obj, args);
        } finally {
          sink.ms += performance.now() - t0;
        }
      };
    },
  });
}

const OVERHEAD_PLAN: SweepPlanInput = {
  start: 1.6,
  stop: 4.2,
  readingsPerPoint: 1,
  gateS: 0.001,
  settle: { mode: 'fixed', seconds: 0 },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: 0.02 },
};

async function measureOverhead(
  label: string,
  bench: BenchRoles,
  clock: Clock,
  points: number,
): Promise<OverheadFigure> {
  const driver = { ms: 0 };
  const roles: BenchRoles = { ...bench, supply: timed(bench.supply, driver), counter: timed(bench.counter, driver) };
  const plan = sweepPlanSchema.parse({ ...OVERHEAD_PLAN, step: (4.2 - 1.6) / (points - 1) });
  const run = (): Promise<unknown> => runSweep({ bench: roles, plan, clock, sink: new MemorySink() });
  await run(); // warm-up (JIT, first connections)
  driver.ms = 0;
  const t0 = performance.now();
  const outcome = (await run()) as { pointsDone: number };
  const totalMs = performance.now() - t0;
  const n = outcome.pointsDone;
  return {
    label,
    points: n,
    totalMsPerPoint: totalMs / n,
    driverMsPerPoint: driver.ms / n,
    engineMsPerPoint: (totalMs - driver.ms) / n,
  };
}

/** Role fakes that answer at once: what is left is the engine. */
function zeroDelayBench(clock: Clock): BenchRoles {
  const supply = new FakeSupply(clock);
  const counter: Counter = {
    role: 'counter',
    gateS: 0.001,
    identify: () => Promise.resolve({ idn: 'ZERO', manufacturer: '', model: '', serial: '', firmware: '' }),
    setGate: () => Promise.resolve(),
    readFrequency: (): Promise<FrequencyReading> =>
      Promise.resolve({ status: 'ok', frequencyHz: 10e3 + 1e3 * supply.channel(1).voltageV }),
    close: () => Promise.resolve(),
  };
  return { supply, counter, controlChannel: 1, dutSupplyChannel: 2 };
}

export async function settlingFigure(stepV: number): Promise<SettlingFigure> {
  const dut = builtinDut('relaxation');
  const slowDut = { ...dut, id: `${dut.id}-tau50ms`, tuning: { ...dut.tuning, settleTauS: 0.05 } };
  const curves: Map<number, number>[] = [];
  const durations: number[] = [];
  let floorS = Number.NaN;
  let meanFloorS = Number.NaN;
  let learnedTauS: number | null = null;
  for (const settle of [
    { mode: 'auto', maxS: 2 },
    { mode: 'fixed', seconds: 0.5 },
  ] as const) {
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock, sim: { dut: slowDut, seed: 11 } });
    const sink = new MemorySink();
    const plan = sweepPlanSchema.parse({
      start: 1.6,
      stop: 4.2,
      step: stepV,
      readingsPerPoint: 3,
      gateS: 0.01,
      settle,
      refineEdgeV: 0,
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    });
    const t0 = clock.now();
    await runSweep({ bench, plan, clock, sink });
    durations.push(clock.now() - t0);
    await bench.close();
    if (settle.mode === 'auto') {
      floorS = floorSeconds(pointsOf(sink.rows), 0.05, 0.01, 3);
      meanFloorS = floorSeconds(pointsOf(sink.rows), 0.05, 0.01, 3, 'recorded-mean');
      const taught = sink.events.filter((e) => e.type === 'settle-tau' || e.type === 'settle-probe').at(-1);
      learnedTauS = typeof taught?.tauS === 'number' ? taught.tauS : null;
    }
    const sums = new Map<number, { sum: number; n: number }>();
    for (const row of sink.rows) {
      if (row.status !== 'ok') continue;
      const v = Math.round((row.control_v as number) * 1e6) / 1e6;
      const s = sums.get(v) ?? { sum: 0, n: 0 };
      s.sum += row.frequency_hz as number;
      s.n++;
      sums.set(v, s);
    }
    curves.push(new Map([...sums].map(([v, s]) => [v, s.sum / s.n])));
  }
  const [auto, fixed] = curves as [Map<number, number>, Map<number, number>];
  let maxDiffHz = 0;
  let allowedHz = Number.POSITIVE_INFINITY;
  let points = 0;
  for (const [v, fAuto] of auto) {
    const fFixed = fixed.get(v);
    if (fFixed === undefined) continue;
    points++;
    const allowed = Math.max(2 / 0.01, 10e-6 * fFixed);
    const diff = Math.abs(fAuto - fFixed);
    if (diff > maxDiffHz) {
      maxDiffHz = diff;
      allowedHz = allowed;
    }
    allowedHz = Math.min(allowedHz, allowed);
  }
  const [autoS, fixedS] = durations as [number, number];
  return {
    stepV,
    autoS,
    fixedS,
    ratio: autoS / fixedS,
    floorS,
    meanFloorS,
    maxDiffHz,
    allowedHz,
    points,
    learnedTauS,
  };
}

export async function runProceduresBench(options: { print?: boolean } = {}): Promise<ProceduresBenchResult> {
  const print = options.print ?? true;
  const overhead: OverheadFigure[] = [];

  const fakeClock = new VirtualClock({ autoAdvance: true });
  overhead.push(
    await measureOverhead(
      'engine alone (zero-delay role fakes, virtual clock)',
      zeroDelayBench(fakeClock),
      fakeClock,
      1000,
    ),
  );

  const simClock = new VirtualClock({ autoAdvance: true });
  const simBench: AssembledBench = await assembleBench('sim', { clock: simClock });
  overhead.push(await measureOverhead('in-process simulated bench (virtual clock)', simBench, simClock, 500));
  await simBench.close();

  const served = await serveSimBench({ basePort: 0, host: '127.0.0.1', dut: 'relaxation' });
  const realClock = new RealClock();
  const tcpBench = await assembleBench(
    {
      supply: { address: served.addresses.supply, controlChannel: 1, dutSupplyChannel: 2 },
      counter: { address: served.addresses.counter },
    },
    { clock: realClock },
  );
  overhead.push(
    await measureOverhead('TCP simulated bench on 127.0.0.1 (real clock, 1 ms gate)', tcpBench, realClock, 100),
  );
  await tcpBench.close();
  await served.close();

  const settling = [await settlingFigure(0.05), await settlingFigure(0.2)];

  if (print) {
    console.log('sweep engine overhead per point (target ≤ 0.5 ms; engine = total − time inside role-driver calls)');
    for (const f of overhead) {
      console.log(
        `  ${f.label.padEnd(60)} ${f.points} points: total ${f.totalMsPerPoint.toFixed(3)} ms, in drivers ${f.driverMsPerPoint.toFixed(3)} ms, engine ${f.engineMsPerPoint.toFixed(3)} ms`,
      );
    }
    console.log(
      'automatic vs fixed 0.5 s settling, τ = 50 ms tuning port, gate 10 ms, 3 readings/point, 1.6–4.2 V (relaxation DUT, ~8 kHz/V)',
    );
    console.log('  (targets: time ratio ≤ 0.333; largest curve difference ≤ max(2 counts = 200 Hz, 10 ppm))');
    for (const s of settling) {
      console.log(
        `  step ${s.stepV} V: auto ${s.autoS.toFixed(2)} s, fixed ${s.fixedS.toFixed(2)} s, ratio ${s.ratio.toFixed(3)} ${s.ratio <= 1 / 3 ? '(meets)' : '(MISSES)'}; ` +
          `largest difference ${s.maxDiffHz.toFixed(1)} Hz vs allowed ${s.allowedHz.toFixed(1)} Hz ${s.maxDiffHz <= s.allowedHz ? '(meets)' : '(MISSES)'} over ${s.points} points`,
      );
    }
  }
  return { overhead, settling };
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await runProceduresBench();
}
