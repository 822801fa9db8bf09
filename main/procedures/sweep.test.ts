import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import { sweepPlanSchema, type SweepPlanInput } from '../../app/contract/plans.ts';
import { DisconnectedError, InstrumentError } from '../instruments/errors.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { stopOnSignals } from './exit-guard.ts';
import { LimitsError } from './limits.ts';
import { RunControl } from './run-control.ts';
import { runSweep, type SweepOptions } from './sweep.ts';
import { MemorySink, fakeBench } from './testing/fake-bench.ts';

const BASE: SweepPlanInput = {
  start: 0.5,
  stop: 2,
  step: 0.1,
  readingsPerPoint: 2,
  gateS: 0.01,
  settle: { mode: 'fixed', seconds: 0.05 },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: 0.05 },
  safe: { controlV: 0.25, outputOff: true },
};

function setup(overrides: Partial<SweepPlanInput> = {}) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock);
  const sink = new MemorySink();
  const plan = sweepPlanSchema.parse({ ...BASE, ...overrides });
  const run = (extra: Partial<SweepOptions> = {}) =>
    clock.runUntil(runSweep({ bench, plan, clock, sink, ...extra }), { limitS: 1e5 });
  return { clock, bench, sink, plan, run };
}

/** The safe state of the plan above: control 0.25 V, output off. */
function expectSafe(bench: ReturnType<typeof fakeBench>): void {
  const ch = bench.supply.channel(1);
  expect(ch.voltageV).toBe(0.25);
  expect(ch.output).toBe(false);
}

describe('runSweep', () => {
  it('completes an up-down sweep, recording every reading with its direction', async () => {
    const { bench, sink, run } = setup({ direction: 'up-down' });
    const outcome = await run();
    expect(outcome.status).toBe('complete');
    expect(outcome.pointsTotal).toBe(32); // 16 levels 0.5..2.0, both ways
    expect(sink.rows).toHaveLength(64);
    expect(sink.rows.filter((r) => r.direction === 'up')).toHaveLength(32);
    expect(sink.rows[32]?.control_v).toBeCloseTo(2, 12);
    // f = 100 kHz + 200 kHz/V·(V − 1): at 1.5 V, 200 kHz (toy DUT, quantised to 100 Hz).
    const at15 = sink.rows.find((r) => Math.abs((r.control_v as number) - 1.5) < 1e-9);
    expect(at15?.frequency_hz).toBe(200e3);
    expect(sink.rows.filter((r) => r.status === 'no-signal')).toHaveLength(2 * 2 * 5); // 0.5..0.9 stalled
    expect(outcome.safeStateOk).toBe(true);
    expectSafe(bench);
  });

  it('sets current limit and over-voltage protection before the output goes on', async () => {
    const { bench, run } = setup();
    await run();
    const log = bench.supply.log;
    const outputOn = log.indexOf('setOutput 1 true');
    expect(log.indexOf('setCurrentLimit 1 0.05')).toBeLessThan(outputOn);
    expect(log.indexOf('setOverVoltageProtection 1 5.5')).toBeLessThan(outputOn);
    expect(log.indexOf('setVoltage 1 0.5')).toBeLessThan(outputOn);
    expect(log.slice(0, 3).every((op) => !op.startsWith('setOutput'))).toBe(true);
  });

  it('refuses a plan beyond its limits before writing anything', async () => {
    const clock = new VirtualClock();
    const bench = fakeBench(clock);
    const plan = sweepPlanSchema.parse({ ...BASE, stop: 6 });
    await expect(runSweep({ bench, plan, clock, sink: new MemorySink() })).rejects.toThrow(LimitsError);
    await expect(runSweep({ bench, plan, clock, sink: new MemorySink() })).rejects.toThrow(
      /stop: 6 V exceeds limits.maxControlV \(5 V\)/,
    );
    const listed = sweepPlanSchema.parse({ ...BASE, points: [1, 2, 5.01] });
    await expect(runSweep({ bench, plan: listed, clock, sink: new MemorySink() })).rejects.toThrow(/points\[2\]/);
    const badSafe = sweepPlanSchema.parse({ ...BASE, safe: { controlV: 7 } });
    await expect(runSweep({ bench, plan: badSafe, clock, sink: new MemorySink() })).rejects.toThrow(/safe.controlV/);
    expect(bench.supply.log).toEqual([]);
  });

  it('bisects the stall edge to 1 mV and marks the refined points', async () => {
    const { sink, run } = setup({ refineEdgeV: 0.001 });
    const outcome = await run();
    // Coarse bracket 0.9..1.0 V (toy DUT stalls below 1 V): ceil(log2(100)) = 7 bisections.
    expect(outcome.refinedPoints).toBe(7);
    const refined = sink.rows.filter((r) => r.refined === 1);
    expect(refined).toHaveLength(14);
    expect(outcome.edge).not.toBeNull();
    const edge = outcome.edge as { stalledV: number; oscillatingV: number };
    expect(edge.oscillatingV - edge.stalledV).toBeLessThanOrEqual(0.001);
    expect(edge.stalledV).toBeLessThan(1);
    expect(edge.oscillatingV).toBeGreaterThanOrEqual(1);
  });

  it('way out: stop mid-sweep → aborted, safe', async () => {
    const { bench, sink, run } = setup();
    const control = new RunControl();
    const outcome = await run({ control, onProgress: (p) => p.pointsDone === 4 && control.stop() });
    expect(outcome.status).toBe('aborted');
    expect(outcome.reason).toBe('stop');
    expect(outcome.pointsDone).toBe(4);
    expect(sink.rows).toHaveLength(8);
    expectSafe(bench);
    expect(sink.eventsOfType('safe-state').every((e) => e.ok === true)).toBe(true);
  });

  it('way out: pause timeout → aborted, safe', async () => {
    const { bench, clock, sink, run } = setup();
    const control = new RunControl({ pauseTimeoutS: 60 });
    const outcome = await run({ control, onProgress: (p) => p.pointsDone === 3 && control.pause() });
    expect(outcome.status).toBe('aborted');
    expect(outcome.reason).toBe('pause-timeout');
    expect(sink.eventsOfType('pause')).toHaveLength(1);
    expect(clock.now()).toBeGreaterThanOrEqual(60);
    expectSafe(bench);
  });

  it('pause then resume goes on to completion', async () => {
    const { clock, sink, run } = setup();
    const control = new RunControl({ pauseTimeoutS: 60 });
    const outcome = await run({
      control,
      onProgress: (p) => {
        if (p.pointsDone === 3 && !control.paused) {
          control.pause();
          clock.setTimer(10, () => control.resume());
        }
      },
    });
    expect(outcome.status).toBe('complete');
    expect(sink.eventsOfType('resume')).toHaveLength(1);
    expect(sink.rows).toHaveLength(32);
  });

  it('way out: instrument error on the supply → aborted with failure, safe', async () => {
    const { bench, run } = setup();
    bench.supply.failWith = (op, _ch, value) =>
      op === 'setVoltage' && Math.abs((value as number) - 1.2) < 1e-9
        ? new InstrumentError([{ code: -222, message: 'Data out of range' }], 'VOLT 1.2')
        : null;
    const outcome = await run();
    expect(outcome.status).toBe('aborted');
    expect(outcome.failure?.kind).toBe('instrument-error');
    expectSafe(bench);
  });

  it('way out: counter link dropped with no reconnect → aborted, safe', async () => {
    const { bench, sink, run } = setup();
    bench.counter.override = (i) => (i === 7 ? new DisconnectedError('tcp://127.0.0.1:5026', 'remote closed') : null);
    const outcome = await run();
    expect(outcome.failure?.kind).toBe('disconnected');
    expect(sink.eventsOfType('link-lost')).toHaveLength(1);
    expectSafe(bench);
  });

  it('way out: supply link dropped → safe state after one reconnect', async () => {
    const { bench, sink, run } = setup();
    let down = false;
    bench.supply.failWith = (op, _ch, value) => {
      if (op === 'setVoltage' && Math.abs((value as number) - 1.5) < 1e-9) down = true;
      return down ? new DisconnectedError('tcp://127.0.0.1:5025') : null;
    };
    const reconnects: string[] = [];
    bench.reconnect = async (role) => {
      reconnects.push(role);
      down = false;
    };
    const outcome = await run();
    expect(outcome.failure?.kind).toBe('disconnected');
    expect(reconnects).toEqual(['supply']);
    expect(sink.eventsOfType('safe-state')[0]?.afterReconnect).toBe(true);
    expectSafe(bench);
  });

  it('way out: SIGINT → aborted, safe', async () => {
    const { bench, run } = setup();
    const control = new RunControl();
    const fakeProcess = new EventEmitter();
    const dispose = stopOnSignals(control, fakeProcess);
    const outcome = await run({ control, onProgress: (p) => p.pointsDone === 5 && fakeProcess.emit('SIGINT') });
    dispose();
    expect(outcome.reason).toBe('signal');
    expect(outcome.status).toBe('aborted');
    expectSafe(bench);
  });

  it('way out: a bug (uncaught TypeError) in a driver → aborted as internal, safe', async () => {
    const { bench, run } = setup();
    bench.counter.override = (i) =>
      i === 3 ? new TypeError("Cannot read properties of undefined (reading 'x')") : null;
    const outcome = await run();
    expect(outcome.failure?.kind).toBe('internal');
    expect(outcome.failure?.message).toMatch(/TypeError/);
    expectSafe(bench);
  });

  it('a failing safe-state step does not stop the next one', async () => {
    const { bench, sink, run } = setup();
    const control = new RunControl();
    bench.supply.failWith = (op, _ch, value) =>
      control.signal.aborted && op === 'setVoltage' && value === 0.25
        ? new InstrumentError([{ code: -300, message: 'Device-specific error' }])
        : null;
    const outcome = await run({ control, onProgress: (p) => p.pointsDone === 2 && control.stop() });
    expect(outcome.safeStateOk).toBe(false);
    expect(bench.supply.channel(1).output).toBe(false);
    expect(sink.eventsOfType('safe-state').map((e) => e.ok)).toEqual([false, true]);
  });
});
