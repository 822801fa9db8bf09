/**
 * Where a sweep's time goes (issue 12 item 3): the role drivers and the
 * clock are wrapped so every instrument call and every wait is a timed span;
 * the run is cut into one stretch per control-voltage write (a point, the τ
 * probe, a point measured again) and each stretch's time is split into
 *   settle wait   — what the procedure asked the clock to wait,
 *   timer late    — how much later than asked the wait ended,
 *   gates         — readings × gate (what the counter must spend counting),
 *   read link     — the rest of each counter call (round trip, the far end's
 *                   own timer, parsing),
 *   supply        — supply calls while no counter reading or wait runs,
 *   engine        — everything else (this process between calls).
 * The floor's share of each stretch (sweep-floor-model.ts) sits beside it, so
 * what is over the floor shows by kind.
 */
import type { Clock } from '../../main/time/clock.ts';
import type { BenchRoles } from '../../main/procedures/types.ts';

export interface Span {
  kind: 'read' | 'supply' | 'sleep';
  what: string;
  startS: number;
  endS: number;
  /** For sleeps: what was asked. */
  askedS: number;
  /** For control writes: the voltage. */
  volts: number;
}

export class SweepTimer {
  readonly spans: Span[] = [];
  readonly clock: Clock;

  constructor(inner: Clock) {
    const spans = this.spans;
    this.clock = {
      now: () => inner.now(),
      wallTimeIso: () => inner.wallTimeIso(),
      setTimer: (s, cb) => inner.setTimer(s, cb),
      sleep: async (seconds, signal) => {
        const startS = inner.now();
        try {
          await inner.sleep(seconds, signal);
        } finally {
          spans.push({ kind: 'sleep', what: 'sleep', startS, endS: inner.now(), askedS: seconds, volts: Number.NaN });
        }
      },
    };
  }

  /** The bench with its supply and counter calls timed on this timer's clock. */
  wrap<B extends BenchRoles>(bench: B): B {
    return { ...bench, supply: this.#timed(bench.supply, 'supply'), counter: this.#timed(bench.counter, 'read') };
  }

  #timed<T extends object>(target: T, kind: 'read' | 'supply'): T {
    const spans = this.spans;
    const clock = this.clock;
    return new Proxy(target, {
      get(obj, key, receiver) {
        const value: unknown = Reflect.get(obj, key, receiver);
        if (typeof value !== 'function') return value;
        const what = String(key);
        return (...args: unknown[]) => {
          const result: unknown = (value as (...a: unknown[]) => unknown).apply(obj, args);
          if (!(result instanceof Promise)) return result;
          const startS = clock.now();
          const volts = what === 'setVoltage' ? (args[1] as number) : Number.NaN;
          const record = (): void => {
            spans.push({
              kind: what === 'readFrequency' ? 'read' : kind,
              what,
              startS,
              endS: clock.now(),
              askedS: 0,
              volts,
            });
          };
          return (result as Promise<unknown>).then(
            (v: unknown) => {
              record();
              return v;
            },
            (e: unknown) => {
              record();
              throw e;
            },
          );
        };
      },
    });
  }
}

export interface StretchTimes {
  volts: number;
  totalS: number;
  settleWaitS: number;
  timerLateS: number;
  gatesS: number;
  readLinkS: number;
  supplyS: number;
  engineS: number;
  reads: number;
}

/** Length of the parts of [a, b] not covered by any of `cover` (sorted or not). */
function uncoveredS(a: number, b: number, cover: readonly Span[]): number {
  const cuts = cover
    .map((s) => [Math.max(a, s.startS), Math.min(b, s.endS)] as const)
    .filter(([x, y]) => y > x)
    .sort((p, q) => p[0] - q[0]);
  let free = 0;
  let at = a;
  for (const [x, y] of cuts) {
    if (x > at) free += x - at;
    at = Math.max(at, y);
  }
  return free + Math.max(0, b - at);
}

/** One stretch per control write from the first one on (writes to other channels are not cuts). */
export function stretches(spans: readonly Span[], gateS: number, endS: number): StretchTimes[] {
  const sorted = [...spans].sort((p, q) => p.startS - q.startS);
  const cuts = sorted.filter((s) => s.what === 'setVoltage' && Number.isFinite(s.volts));
  const out: StretchTimes[] = [];
  for (let i = 0; i < cuts.length; i++) {
    const a = (cuts[i] as Span).startS;
    const b = i + 1 < cuts.length ? (cuts[i + 1] as Span).startS : endS;
    const inside = sorted.filter((s) => s.startS >= a && s.startS < b);
    const reads = inside.filter((s) => s.kind === 'read');
    const sleeps = inside.filter((s) => s.kind === 'sleep');
    const supply = inside.filter((s) => s.kind === 'supply');
    let settleWaitS = 0;
    let timerLateS = 0;
    for (const s of sleeps) {
      settleWaitS += s.askedS;
      timerLateS += s.endS - s.startS - s.askedS;
    }
    let readS = 0;
    for (const r of reads) readS += r.endS - r.startS;
    const gatesS = reads.length * gateS;
    const supplyS = supply.reduce((sum, s) => sum + uncoveredS(s.startS, s.endS, [...reads, ...sleeps]), 0);
    const totalS = b - a;
    out.push({
      volts: (cuts[i] as Span).volts,
      totalS,
      settleWaitS,
      timerLateS,
      gatesS,
      readLinkS: readS - gatesS,
      supplyS,
      engineS: totalS - settleWaitS - timerLateS - readS - supplyS,
      reads: reads.length,
    });
  }
  return out;
}

/** Sum of each kind over the stretches. */
export function totals(list: readonly StretchTimes[]): StretchTimes {
  const t: StretchTimes = {
    volts: Number.NaN,
    totalS: 0,
    settleWaitS: 0,
    timerLateS: 0,
    gatesS: 0,
    readLinkS: 0,
    supplyS: 0,
    engineS: 0,
    reads: 0,
  };
  for (const s of list) {
    t.totalS += s.totalS;
    t.settleWaitS += s.settleWaitS;
    t.timerLateS += s.timerLateS;
    t.gatesS += s.gatesS;
    t.readLinkS += s.readLinkS;
    t.supplyS += s.supplyS;
    t.engineS += s.engineS;
    t.reads += s.reads;
  }
  return t;
}

/** One line: each kind in seconds and per stretch in ms. */
export function describeTotals(t: StretchTimes, count: number): string {
  const part = (label: string, s: number): string =>
    `${label} ${s.toFixed(2)} s (${((s / count) * 1000).toFixed(1)} ms)`;
  return [
    `${count} stretches ${t.totalS.toFixed(2)} s:`,
    part('settle wait', t.settleWaitS),
    part('timer late', t.timerLateS),
    part(`gates (${t.reads} readings)`, t.gatesS),
    part('read link', t.readLinkS),
    part('supply', t.supplyS),
    part('engine', t.engineS),
  ].join(', ');
}
