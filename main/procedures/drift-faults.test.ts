/**
 * A 12-hour drift log at 1 s intervals on virtual time, on the simulated
 * bench, with 110 injected faults of each kind on the counter (drop, reply
 * delayed past the timeout, garbage, error-queue entry, silence) and a few on
 * the thermometer. Checks that nothing the counter delivered is lost, that
 * every fault left a trace in events.jsonl, and that the supply ends safe.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { driftPlanSchema } from '../../app/contract/plans.ts';
import { assembleBench } from '../bench/assemble.ts';
import type { FrequencyReading } from '../instruments/roles.ts';
import type { FaultSpec } from '../sim/faults.ts';
import { createRng } from '../sim/prng.ts';
import { parseSamplesCsv, readRunFolder } from '../store/index.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { recordDrift } from './recorded-run.ts';

const KINDS = ['drop', 'delay', 'garbage', 'error', 'silence'] as const;
const PER_KIND = 110;
const DURATION_S = 12 * 3600;

/** One fault every ~78 s, kinds interleaved, so each fault's trace can be found in its own window. */
function faultScript(): FaultSpec[] {
  const rng = createRng(2026);
  const faults: FaultSpec[] = [];
  const total = KINDS.length * PER_KIND;
  const spacingS = (DURATION_S - 600) / total;
  for (let i = 0; i < total; i++) {
    const kind = KINDS[i % KINDS.length] as (typeof KINDS)[number];
    const atS = 300 + i * spacingS + rng.uniform() * 10;
    switch (kind) {
      case 'drop':
        faults.push({ type: 'drop', device: 'counter', atS });
        break;
      case 'delay':
        faults.push({ type: 'delay', device: 'counter', atS, delayS: 3, count: 1 });
        break;
      case 'garbage':
        faults.push({ type: 'garbage', device: 'counter', atS, count: 1 });
        break;
      case 'error':
        faults.push({ type: 'error', device: 'counter', atS, code: -300, message: `Device-specific error ${i}` });
        break;
      case 'silence':
        faults.push({ type: 'silence', device: 'counter', atS, durationS: 8 });
        break;
    }
  }
  for (let i = 0; i < 12; i++) {
    const atS = 1000 + i * 3500;
    faults.push(
      i % 2 === 0
        ? { type: 'drop', device: 'thermometer', atS }
        : { type: 'garbage', device: 'thermometer', atS, count: 1 },
    );
  }
  return faults;
}

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

describe('12-hour drift log with injected faults (virtual time)', () => {
  it('keeps every delivered reading, records every fault and gap, and ends safe', { timeout: 600_000 }, async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-drift12h-'));
    dirs.push(runsDir);
    const clock = new VirtualClock({ autoAdvance: true });
    const faults = faultScript();
    const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', faults, seed: 7 } });
    const sim = bench.sim;
    if (sim === null) throw new Error('expected the simulated bench');

    // Everything the counter driver hands to the procedure once logging starts, in order
    // (readings while the tuning port settles, before the `settled` event, are not samples).
    const delivered: number[] = [];
    let logging = false;
    const read = bench.counter.readFrequency.bind(bench.counter);
    bench.counter.readFrequency = async (): Promise<FrequencyReading> => {
      const reading = await read();
      if (reading.status === 'ok' && logging) delivered.push(reading.frequencyHz);
      return reading;
    };

    const plan = driftPlanSchema.parse({
      controlV: 3,
      intervalS: 1,
      durationS: DURATION_S,
      gateS: 0.1,
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    });
    let runStartS = 0;
    const recorded = await recordDrift({
      bench,
      plan,
      clock,
      runsDir,
      dutId: 'sensor-osc-12h',
      onRunStarted: () => (runStartS = clock.now()),
      onEvent: (event) => {
        if (event.type === 'settled') logging = true;
      },
    });
    await bench.close();

    expect(recorded.meta.status).toBe('complete');
    expect(recorded.outcome.failure).toBeNull();

    // Every fault went off, at least PER_KIND of each kind.
    const fired = sim.faults.counter.fired;
    const firedByKind = Object.fromEntries(KINDS.map((k) => [k, fired.filter((f) => f.type === k).length]));
    console.log(
      'faults fired on the counter by kind:',
      firedByKind,
      'thermometer:',
      sim.faults.thermometer.fired.length,
    );
    for (const kind of KINDS) expect(firedByKind[kind]).toBeGreaterThanOrEqual(100);

    const run = await readRunFolder(recorded.dir);
    const samples = parseSamplesCsv(run.samplesCsv);
    expect(samples.dropped).toEqual([]);
    const status = samples.text.status as string[];
    const frequency = samples.numeric.frequency_hz as number[];
    const okFrequencies = frequency.filter((_, i) => status[i] === 'ok');
    // Nothing the counter delivered is missing, reordered or altered on disk.
    expect(okFrequencies.length).toBe(delivered.length);
    expect(okFrequencies).toEqual(delivered);
    // A 12 h log at 1 s: about 43 200 rows, minus the slots lost inside gaps.
    expect(samples.rowCount).toBeGreaterThan(42_000);

    // Every fault left a trace on the counter within 15 s of going off.
    const events = run.events;
    const counterEvents = events.filter((e) => e.role === 'counter');
    const traceOf = (type: string, atS: number): boolean => {
      const t0 = atS - runStartS;
      return counterEvents.some((e) => e.time_s >= t0 - 0.01 && e.time_s <= t0 + 15 && matches(type, e));
    };
    const untraced = fired.filter((f) => !traceOf(f.type, f.atS));
    expect(untraced).toEqual([]);
    // Each error-queue fault appears with its own message.
    for (const f of faults.filter((x) => x.type === 'error' && x.device === 'counter')) {
      if (f.type !== 'error') continue;
      expect(events.some((e) => e.type === 'fault' && e.error === f.message)).toBe(true);
    }
    // Every gap that opened was closed, with its length.
    const gapStarts = events.filter((e) => e.type === 'gap-start').length;
    const gapEnds = events.filter((e) => e.type === 'gap-end');
    expect(gapStarts).toBeGreaterThanOrEqual(100);
    expect(gapEnds.length).toBe(gapStarts);
    expect(gapEnds.every((e) => typeof e.duration_s === 'number' && e.duration_s >= 0)).toBe(true);
    console.log(
      'events by type:',
      countBy(events.map((e) => e.type)),
      'rows:',
      samples.rowCount,
      'ok:',
      okFrequencies.length,
    );

    // The supply ended in its safe state (noise-free truth from the simulator).
    const control = sim.supply.state(1);
    expect(control.outputOn).toBe(false);
    expect(control.setpointV).toBe(0);
  });
});

function matches(type: string, e: { type: string; [key: string]: unknown }): boolean {
  const text = JSON.stringify([e.errorName ?? '', e.error ?? '', e.event ?? '']);
  switch (type) {
    case 'drop':
      return e.type === 'link-lost' || (e.type === 'link' && (e.event === 'disconnected' || e.event === 'reconnected'));
    case 'delay':
      return (
        (e.type === 'fault' && /timeout|TimeoutError/.test(text)) ||
        (e.type === 'link' && (e.event === 'resync' || e.event === 'stale-line'))
      );
    case 'garbage':
      return e.type === 'fault' && /ReplyFormatError|expected/.test(text);
    case 'error':
      return e.type === 'fault' && e.code === -300;
    // A counter silent even to the resync is out of step (AlignmentError), not just late.
    case 'silence':
      return e.type === 'gap-start' || (e.type === 'fault' && /timeout|TimeoutError|AlignmentError/.test(text));
    default:
      return false;
  }
}

function countBy(values: string[]): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const v of values) counts[v] = (counts[v] ?? 0) + 1;
  return counts;
}
