import { describe, expect, it } from 'vitest';
import { BENCH_METHODS, DESKTOP_METHODS } from '../app/contract/wire.ts';
import type { BenchEvent } from '../app/contract/bench-api.ts';
import { callChannel, EVENT_CHANNEL } from './ipc/channels.ts';
import { buildPreloadApi, type IpcPort } from './preload-api.ts';

function fakePort(reply: (channel: string, args: unknown[]) => unknown) {
  const invoked: { channel: string; args: unknown[] }[] = [];
  const listeners = new Map<string, Set<(payload: unknown) => void>>();
  const port: IpcPort = {
    invoke: async (channel, ...args) => {
      invoked.push({ channel, args });
      return reply(channel, args);
    },
    on: (channel, listener) => {
      const set = listeners.get(channel) ?? new Set();
      set.add(listener);
      listeners.set(channel, set);
      return () => set.delete(listener);
    },
  };
  const push = (channel: string, payload: unknown): void => listeners.get(channel)?.forEach((l) => l(payload));
  return { port, invoked, push, listeners };
}

describe('preload surface', () => {
  it('exposes exactly the BenchApi methods, the desktop extras and subscribe — no IPC primitives', () => {
    const api = buildPreloadApi(fakePort(() => ({ ok: true, result: null })).port);
    const keys = Object.keys(api).sort();
    expect(keys).toEqual([...BENCH_METHODS, ...DESKTOP_METHODS, 'subscribe'].sort());
    for (const key of keys) expect(typeof (api as unknown as Record<string, unknown>)[key]).toBe('function');
    expect(keys).not.toContain('invoke');
    expect(keys).not.toContain('send');
    expect(Object.isFrozen(api)).toBe(true);
  });

  it('sends each call on its own fixed channel with the arguments as given', async () => {
    const fake = fakePort(() => ({ ok: true, result: [{ id: 'r1' }] }));
    const api = buildPreloadApi(fake.port);
    await expect(api.listRuns()).resolves.toEqual([{ id: 'r1' }]);
    await api.renameRun('20261202-010000-osc', 'osc-b');
    expect(fake.invoked).toEqual([
      { channel: callChannel('listRuns'), args: [] },
      { channel: callChannel('renameRun'), args: ['20261202-010000-osc', 'osc-b'] },
    ]);
  });

  it('turns a refusal from main into an error carrying the message and field', async () => {
    const api = buildPreloadApi(
      fakePort(() => ({ ok: false, error: { message: 'openRun: id: must not contain ".."', field: 'id' } })).port,
    );
    await expect(api.openRun('..')).rejects.toMatchObject({
      message: 'openRun: id: must not contain ".."',
      field: 'id',
    });
  });

  it('rejects a reply that is not an outcome', async () => {
    const api = buildPreloadApi(fakePort(() => 'garbage').port);
    await expect(api.getConnection()).rejects.toThrow(/unreadable reply/);
  });

  it('delivers pushed events to subscribers until they unsubscribe', () => {
    const fake = fakePort(() => null);
    const api = buildPreloadApi(fake.port);
    const seen: BenchEvent[] = [];
    const off = api.subscribe((event) => seen.push(event));
    fake.push(EVENT_CHANNEL, { type: 'error', message: 'one' });
    off();
    fake.push(EVENT_CHANNEL, { type: 'error', message: 'two' });
    expect(seen).toEqual([{ type: 'error', message: 'one' }]);
    expect(fake.listeners.get(EVENT_CHANNEL)?.size).toBe(0);
  });
});
