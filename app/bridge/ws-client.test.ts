import { describe, expect, it } from 'vitest';
import { runMetaFixture } from './testing/run-meta-fixture.ts';
import type { BenchEvent } from '../contract/bench-api.ts';
import { BenchCallError } from './bench-call-error.ts';
import { socketUrlFor } from './pick-bridge.ts';
import { encodeBinaryReply } from '../contract/wire-binary.ts';
import { frameParts } from '../contract/wire-parts.ts';
import { createWsBench } from './ws-client.ts';
import { FakeSocket, FakeTimers } from './testing/fake-socket.ts';

function setup() {
  const sockets: FakeSocket[] = [];
  const timers = new FakeTimers();
  const bench = createWsBench({
    url: 'ws://127.0.0.1:7788/api?token=abc',
    createSocket: (url) => {
      const socket = new FakeSocket(url);
      sockets.push(socket);
      return socket;
    },
    timers,
    reconnectDelaysMs: [100, 200, 400],
  });
  const last = () => {
    const socket = sockets[sockets.length - 1];
    if (!socket) throw new Error('no socket');
    return socket;
  };
  return { bench, sockets, timers, last };
}

const connectionState = { connected: true, simulated: true, roles: [], error: null };

describe('WebSocket BenchApi client', () => {
  it('builds the socket URL from the page location and its token', () => {
    expect(socketUrlFor({ protocol: 'http:', host: '127.0.0.1:7788', search: '?token=a%2Bb' })).toBe(
      'ws://127.0.0.1:7788/api?token=a%2Bb',
    );
    expect(socketUrlFor({ protocol: 'https:', host: 'lab.local', search: '' })).toBe('wss://lab.local/api?token=');
  });

  it('queues calls until the socket opens, then matches replies by id, out of order', async () => {
    const { bench, last } = setup();
    const first = bench.api.getConnection();
    const second = bench.api.listProfiles();
    expect(last().sent).toHaveLength(0);
    last().accept();
    expect(bench.link.getState()).toBe('open');
    const calls = last().calls();
    expect(calls.map((c) => c.method)).toEqual(['getConnection', 'listProfiles']);
    expect(calls[0]?.id).not.toBe(calls[1]?.id);
    last().reply({ id: calls[1]?.id, ok: true, result: [{ name: 'counter-scpi', role: 'counter' }] });
    last().reply({ id: calls[0]?.id, ok: true, result: connectionState });
    await expect(second).resolves.toEqual([{ name: 'counter-scpi', role: 'counter' }]);
    await expect(first).resolves.toEqual(connectionState);
  });

  it('passes parameters through unchanged', () => {
    const { bench, last } = setup();
    last().accept();
    void bench.api.renameRun('run-7', 'clock-mult-03');
    expect(last().calls()[0]).toMatchObject({ method: 'renameRun', params: ['run-7', 'clock-mult-03'] });
  });

  it('rejects with the field named by main', async () => {
    const { bench, last } = setup();
    last().accept();
    const pending = bench.api.startDrift({} as never, 'dut');
    const id = last().calls()[0]?.id;
    last().reply({ id, ok: false, error: { message: 'expected a number', field: 'plan.controlV' } });
    const error = await pending.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(BenchCallError);
    expect((error as BenchCallError).field).toBe('plan.controlV');
    expect((error as BenchCallError).message).toBe('plan.controlV: expected a number');
    expect((error as BenchCallError).linkLost).toBe(false);
  });

  it('rejects a reply that does not match the method result shape, naming the field', async () => {
    const { bench, last } = setup();
    last().accept();
    const pending = bench.api.getConnection();
    last().reply({ id: last().calls()[0]?.id, ok: true, result: { connected: 'yes' } });
    const error = (await pending.catch((e: unknown) => e)) as BenchCallError;
    expect(error.field).toBe('result.connected');
  });

  it('fails calls in flight when the link drops, reconnects with growing delays, and sends queued calls after', async () => {
    const { bench, sockets, timers, last } = setup();
    const states: string[] = [];
    bench.link.subscribe((s) => states.push(s));
    last().accept();
    const inFlight = bench.api.listRuns();
    last().drop();
    const error = (await inFlight.catch((e: unknown) => e)) as BenchCallError;
    expect(error.linkLost).toBe(true);
    expect(bench.link.getState()).toBe('lost');

    const queued = bench.api.listRuns();
    expect(timers.runNext()).toBe(100);
    expect(sockets).toHaveLength(2);
    last().drop(); // the server is still away
    expect(timers.runNext()).toBe(200);
    last().drop();
    expect(timers.runNext()).toBe(400);
    last().drop();
    expect(timers.runNext()).toBe(400); // the last delay repeats
    last().accept();
    expect(states).toEqual(['open', 'lost', 'open']);
    const call = last().calls()[0];
    expect(call?.method).toBe('listRuns');
    last().reply({ id: call?.id, ok: true, result: [] });
    await expect(queued).resolves.toEqual([]);
    // After a good connection the delays start again from the first.
    last().drop();
    expect(timers.runNext()).toBe(100);
  });

  it('delivers validated events and reports malformed ones as error events', () => {
    const { bench, last } = setup();
    const events: BenchEvent[] = [];
    bench.api.subscribe((e) => events.push(e));
    last().accept();
    last().reply({
      event: { type: 'samples', runId: 'r1', rows: [{ control_v: 1, frequency_hz: null, status: 'no-signal' }] },
    });
    last().reply({ event: { type: 'live', readout: { controlSetV: 'x' } } });
    last().onmessage?.({ data: 'not json' });
    expect(events[0]?.type).toBe('samples');
    const samples = events[0] as Extract<BenchEvent, { type: 'samples' }>;
    expect(Number.isNaN(samples.rows[0]?.frequency_hz)).toBe(true);
    expect(events[1]).toMatchObject({ type: 'error' });
    expect((events[1] as { message: string }).message).toContain('readout.controlSetV');
    expect(events[2]).toMatchObject({ type: 'error', message: 'main sent a message that is not JSON' });
  });

  it('ignores replies for unknown ids and stops reconnecting after close()', () => {
    const { bench, sockets, timers, last } = setup();
    last().accept();
    last().reply({ id: 999, ok: true, result: null });
    bench.link.close();
    expect(bench.link.getState()).toBe('lost');
    expect(timers.queue).toHaveLength(0);
    expect(sockets).toHaveLength(1);
  });

  it('reads a stored run from one binary frame as Float64Array views, checked against rowCount', async () => {
    const { bench, last } = setup();
    last().accept();
    expect(last().binaryType).toBe('arraybuffer');
    const pending = bench.api.openRun('r1');
    const id = last().calls()[0]?.id;
    const frequencyHz = new Float64Array([400e6, Number.NaN, 400.0000001e6, -0]);
    const samples = {
      names: ['time_s', 'frequency_hz', 'status'],
      numeric: { time_s: new Float64Array([0, 1, 2, 3]), frequency_hz: frequencyHz },
      text: { status: { levels: ['ok', 'no-signal'], codes: new Uint8Array([0, 1, 0, 0]) } },
      rowCount: 4,
    };
    const frame = encodeBinaryReply({
      id,
      ok: true,
      result: { meta: runMeta, samples, events: [{ time_s: 0, type: 'start' }] },
    });
    if (!frame) throw new Error('expected a binary frame');
    // As the server sends it: consecutive parts (small here so there are several).
    for (const part of frameParts(frame, 64)) last().replyBinary(part);
    const detail = await pending;
    const got = detail.samples.numeric.frequency_hz;
    expect(got).toBeInstanceOf(Float64Array);
    expect(Array.from(got ?? []).map((v) => (Object.is(v, -0) ? '-0' : String(v)))).toEqual([
      '400000000',
      'NaN',
      '400000000.1',
      '-0',
    ]);
    expect(detail.samples.text.status).toEqual({ levels: ['ok', 'no-signal'], codes: new Uint8Array([0, 1, 0, 0]) });
    expect(detail.events).toEqual([{ time_s: 0, type: 'start' }]);
  });

  it('rejects a binary reply whose column does not hold rowCount values, naming the column', async () => {
    const { bench, last } = setup();
    last().accept();
    const pending = bench.api.openRun('r1');
    const id = last().calls()[0]?.id;
    const samples = { names: ['time_s'], numeric: { time_s: new Float64Array([0, 1, 3]) }, text: {}, rowCount: 4 };
    last().replyBinary(
      encodeBinaryReply({ id, ok: true, result: { meta: runMeta, samples, events: [] } }) as Uint8Array,
    );
    const error = (await pending.catch((e: unknown) => e)) as BenchCallError;
    expect(error).toBeInstanceOf(BenchCallError);
    expect(error.field).toBe('result.samples.numeric.time_s');
    expect(error.message).toMatch(/expected 4 rows/);
  });

  it('fails the call (not the link) when a binary frame points outside itself', async () => {
    const { bench, last } = setup();
    last().accept();
    const pending = bench.api.openRun('r1');
    const id = last().calls()[0]?.id;
    const frame = encodeBinaryReply({ id, ok: true, result: { numeric: new Float64Array([1, 5, 6]) } }) as Uint8Array;
    const cut = frame.slice(0, frame.length - 8); // the last value cut off, the frame length made to match
    new DataView(cut.buffer).setUint32(4, cut.byteLength, true);
    last().replyBinary(cut);
    const error = (await pending.catch((e: unknown) => e)) as BenchCallError;
    expect(error.field).toBe('result.numeric');
    expect(error.message).toMatch(/past the end of the frame/);
    expect(bench.link.getState()).toBe('open');
  });
});

const runMeta = runMetaFixture('radio-lo-400m-b');
