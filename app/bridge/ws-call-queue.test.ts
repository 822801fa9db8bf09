import { describe, expect, it } from 'vitest';
import type { WireCall } from '../contract/wire.ts';
import { BenchCallError } from './bench-call-error.ts';
import { CallQueue, type PendingCall } from './ws-call-queue.ts';

function pending(method: PendingCall['method'], log: string[]): PendingCall {
  return {
    method,
    resolve: (value) => log.push(`${method} resolved ${JSON.stringify(value)}`),
    reject: (error) => log.push(`${method} rejected linkLost=${error.linkLost} ${error.message}`),
  };
}

describe('CallQueue', () => {
  it('numbers calls in call order and sends the waiting ones oldest first while the socket can send', () => {
    const queue = new CallQueue();
    const log: string[] = [];
    const a = queue.add(pending('listRuns', log), []);
    const b = queue.add(pending('renameRun', log), ['run-7', 'osc-b']);
    const c = queue.add(pending('getConnection', log), []);
    expect([a.id, b.id, c.id]).toEqual([1, 2, 3]);
    expect(b).toEqual({ id: 2, method: 'renameRun', params: ['run-7', 'osc-b'] });

    const sent: WireCall[] = [];
    let room = 2; // the socket closes after two sends
    queue.sendWaiting(
      () => room > 0,
      (call) => {
        room -= 1;
        sent.push(call);
      },
    );
    expect(sent.map((call) => call.id)).toEqual([1, 2]);
    expect(queue.waiting).toBe(1);
    expect(queue.inFlightCount).toBe(2);
    queue.sendWaiting(
      () => true,
      (call) => sent.push(call),
    );
    expect(sent.map((call) => call.id)).toEqual([1, 2, 3]);
    expect(queue.waiting).toBe(0);
  });

  it('hands each in-flight call to one reply only, and nothing for an id it does not hold', () => {
    const queue = new CallQueue();
    const log: string[] = [];
    const call = queue.add(pending('listRuns', log), []);
    expect(queue.take(call.id)).toBeUndefined(); // not sent yet: a reply cannot answer it
    queue.sendWaiting(
      () => true,
      () => undefined,
    );
    expect(queue.take(999)).toBeUndefined();
    expect(queue.take(call.id)?.method).toBe('listRuns');
    expect(queue.take(call.id)).toBeUndefined();
    expect(queue.inFlightCount).toBe(0);
  });

  it('fails the calls in flight with linkLost when the link drops, and keeps the unsent ones waiting', () => {
    const queue = new CallQueue();
    const log: string[] = [];
    const rejected: BenchCallError[] = [];
    queue.add({ ...pending('listRuns', log), reject: (error) => rejected.push(error) }, []);
    queue.sendWaiting(
      () => true,
      () => undefined,
    );
    queue.add(pending('getConnection', log), []);
    queue.failInFlight();
    expect(rejected).toHaveLength(1);
    expect(rejected[0]).toBeInstanceOf(BenchCallError);
    expect(rejected[0]?.linkLost).toBe(true);
    expect(rejected[0]?.message).toBe('link to the bench lost before the reply came');
    expect(queue.inFlightCount).toBe(0);
    expect(queue.waiting).toBe(1);
    expect(log).toEqual([]);
  });
});
