/**
 * The shared end of a run (DEVELOPERS.md, "Safety contract"): the safe state
 * comes before the `end` event and the last flush, a failing flush cannot
 * skip it, and extra safe-state steps count towards safeStateOk.
 */
import { describe, expect, it } from 'vitest';
import type { ProgressInfo } from '../../app/contract/bench-api.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import { ProcedureContext, ProcedureFailure } from './context.ts';
import { finishRun, recordRunEnd } from './finish-run.ts';
import { ProgressReporter } from './progress.ts';
import { RunControl, RunStoppedError } from './run-control.ts';
import { MemorySink, fakeBench } from './testing/fake-bench.ts';
import type { ProcedureOutcome } from './types.ts';

function setup(sink = new MemorySink()) {
  const clock = new VirtualClock();
  const bench = fakeBench(clock);
  const ctx = new ProcedureContext(clock, bench, sink);
  const seen: ProgressInfo[] = [];
  const progress = new ProgressReporter(clock, 'sweep', 'run-1', 10, (info) => seen.push(info));
  const outcome: ProcedureOutcome = {
    kind: 'sweep',
    status: 'complete',
    reason: null,
    failure: null,
    rowsWritten: 0,
    safeStateOk: false,
  };
  const parts = { ctx, control: new RunControl(), progress, channel: 1, safe: { controlV: 0.25, outputOff: true } };
  return { clock, bench, ctx, sink, seen, outcome, parts };
}

describe('finishRun', () => {
  it('drives the control channel safe, then records end and flushes', async () => {
    const { bench, ctx, sink, seen, outcome, parts } = setup();
    ctx.row({ time_s: 0, control_v: 1, frequency_hz: 1e5, status: 'ok' });
    ctx.row({ time_s: 1, control_v: 2, frequency_hz: 3e5, status: 'ok' });
    const order: string[] = [];
    await finishRun(outcome, {
      ...parts,
      beforeSafe: () => Promise.resolve(void order.push(`before ${bench.supply.log.length}`)),
    });
    expect(order).toEqual(['before 0']);
    expect(bench.supply.log).toEqual(['setVoltage 1 0.25', 'setOutput 1 false']);
    expect(sink.events.map((e) => e.type)).toEqual(['safe-state', 'safe-state', 'end']);
    expect(sink.events[2]).toMatchObject({ type: 'end', status: 'complete', reason: null });
    expect(sink.flushes).toBe(1);
    expect(outcome).toMatchObject({ safeStateOk: true, rowsWritten: 2, failure: null });
    // A completed run's total is cut back to the points done (here none were reported).
    expect(seen.at(-1)).toMatchObject({ phase: 'finishing', pointsTotal: 0 });
  });

  it('counts a failed extra step against safeStateOk', async () => {
    const { sink, outcome, parts } = setup();
    await finishRun(outcome, {
      ...parts,
      afterSafe: () => Promise.resolve(['channel 2 dut-supply-restore not confirmed']),
    });
    expect(outcome.safeStateOk).toBe(false);
    expect(sink.eventsOfType('end')).toHaveLength(1);
  });

  it('keeps the safe state when the last flush fails, and records the flush as the failure', async () => {
    const failing = new MemorySink();
    failing.flush = () => Promise.reject(new Error('disk full'));
    const { bench, outcome, parts } = setup(failing);
    await finishRun(outcome, parts);
    expect(bench.supply.channel(1)).toMatchObject({ voltageV: 0.25, output: false });
    expect(outcome.failure).toEqual({ kind: 'internal', message: 'flush failed: disk full' });
  });

  it('leaves an earlier failure in place when the flush also fails', async () => {
    const failing = new MemorySink();
    failing.flush = () => Promise.reject(new Error('disk full'));
    const { outcome, parts } = setup(failing);
    outcome.status = 'aborted';
    outcome.failure = { kind: 'disconnected', message: 'counter link lost' };
    await finishRun(outcome, parts);
    expect(outcome.failure).toEqual({ kind: 'disconnected', message: 'counter link lost' });
  });
});

describe('recordRunEnd', () => {
  it('records an operator stop as an abort by default', () => {
    const { ctx, sink, outcome } = setup();
    recordRunEnd(outcome, ctx, new RunStoppedError('stop'));
    expect(outcome).toMatchObject({ status: 'aborted', reason: 'stop', failure: null });
    expect(sink.events).toEqual([{ time_s: 0, type: 'abort', reason: 'stop' }]);
  });

  it('records a stop or a signal as a clean end when stopIsClean', () => {
    for (const reason of ['stop', 'signal']) {
      const { ctx, sink, outcome } = setup();
      recordRunEnd(outcome, ctx, new RunStoppedError(reason), true);
      expect(outcome).toMatchObject({ status: 'complete', reason, failure: null });
      expect(sink.events).toEqual([{ time_s: 0, type: 'stopped', reason }]);
    }
  });

  it('keeps a pause timeout and a failure as aborts even when stopIsClean', () => {
    const timedOut = setup();
    recordRunEnd(timedOut.outcome, timedOut.ctx, new RunStoppedError('pause-timeout'), true);
    expect(timedOut.outcome.status).toBe('aborted');
    const failed = setup();
    recordRunEnd(failed.outcome, failed.ctx, new ProcedureFailure('stall', 'no oscillation at 3 V'), true);
    expect(failed.outcome).toMatchObject({
      status: 'aborted',
      reason: 'stall',
      failure: { kind: 'stall', message: 'no oscillation at 3 V' },
    });
    expect(failed.sink.events).toEqual([
      { time_s: 0, type: 'abort', reason: 'stall', error: 'no oscillation at 3 V', failure: 'stall' },
    ]);
  });
});
