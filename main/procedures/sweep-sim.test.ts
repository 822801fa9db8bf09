/**
 * Every way out of a sweep, on the simulated bench through the real SCPI
 * role drivers: afterwards the simulated supply's control channel is at the
 * safe voltage with its output off (the simulator's own state, not what the
 * driver believes).
 */
import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import { assembleBench, type AssembledBench } from '../bench/assemble.ts';
import type { FaultSpec } from '../sim/faults.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { stopOnSignals } from './exit-guard.ts';
import { RunControl } from './run-control.ts';
import { runSweep, type SweepOptions } from './sweep.ts';
import { MemorySink } from './testing/fake-bench.ts';
import { SHORT_SWEEP_PLAN } from './testing/short-sweep-plan.ts';

const plan = SHORT_SWEEP_PLAN;

async function simSweep(
  faults: FaultSpec[] = [],
  tweak?: (bench: AssembledBench) => void,
  extra: Partial<SweepOptions> = {},
) {
  const clock = new VirtualClock({ autoAdvance: true });
  const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', faults } });
  tweak?.(bench);
  const sink = new MemorySink();
  const outcome = await runSweep({ bench, plan, clock, sink, ...extra });
  const control = bench.sim?.supply.state(1);
  await bench.close();
  return { outcome, sink, control };
}

function expectSafe(control: { outputOn: boolean; setpointV: number } | undefined): void {
  expect(control?.outputOn).toBe(false);
  expect(control?.setpointV).toBeCloseTo(0.5, 9);
}

describe('sweep ways out on the simulated bench', () => {
  it('completion', async () => {
    const { outcome, sink, control } = await simSweep();
    expect(outcome.status).toBe('complete');
    expect(sink.rows).toHaveLength(30);
    expect(sink.rows.filter((r) => r.status === 'ok').length).toBeGreaterThan(20);
    expectSafe(control);
  });

  it('operator stop', async () => {
    const control = new RunControl();
    const { outcome, control: state } = await simSweep([], undefined, {
      control,
      onProgress: (p) => p.pointsDone === 4 && control.stop(),
    });
    expect(outcome.status).toBe('aborted');
    expect(outcome.reason).toBe('stop');
    expectSafe(state);
  });

  it('pause timeout', async () => {
    const control = new RunControl({ pauseTimeoutS: 30 });
    const { outcome, control: state } = await simSweep([], undefined, {
      control,
      onProgress: (p) => p.pointsDone === 2 && control.pause(),
    });
    expect(outcome.reason).toBe('pause-timeout');
    expectSafe(state);
  });

  it('instrument error (an entry in the supply error queue)', async () => {
    const { outcome, control } = await simSweep([
      { type: 'error', device: 'supply', atS: 1, code: -222, message: 'Data out of range' },
    ]);
    expect(outcome.status).toBe('aborted');
    expect(outcome.failure?.kind).toBe('instrument-error');
    expect(outcome.failure?.message).toMatch(/-222/);
    expectSafe(control);
  });

  it('dropped counter link that cannot be reopened', async () => {
    const { outcome, control } = await simSweep([{ type: 'drop', device: 'counter', atReading: 7 }], (bench) => {
      bench.reconnect = undefined;
    });
    expect(outcome.failure?.kind).toBe('disconnected');
    expectSafe(control);
  });

  it('dropped supply link (reopened by the session, then safe at the end)', async () => {
    const { outcome, sink, control } = await simSweep([{ type: 'drop', device: 'supply', atS: 1.2 }]);
    expect(sink.events.some((e) => e.type === 'link' && e.role === 'supply')).toBe(true);
    expect(['complete', 'aborted']).toContain(outcome.status);
    expectSafe(control);
  });

  it('SIGINT', async () => {
    const control = new RunControl();
    const fakeProcess = new EventEmitter();
    const dispose = stopOnSignals(control, fakeProcess);
    const { outcome, control: state } = await simSweep([], undefined, {
      control,
      onProgress: (p) => p.pointsDone === 3 && fakeProcess.emit('SIGINT'),
    });
    dispose();
    expect(outcome.reason).toBe('signal');
    expectSafe(state);
  });

  it('uncaught error (a bug inside a driver call)', async () => {
    let calls = 0;
    const { outcome, control } = await simSweep([], (bench) => {
      const read = bench.counter.readFrequency.bind(bench.counter);
      bench.counter.readFrequency = () =>
        ++calls === 5 ? Promise.reject(new TypeError('x is not a function')) : read();
    });
    expect(outcome.failure?.kind).toBe('internal');
    expectSafe(control);
  });
});
