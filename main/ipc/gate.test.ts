import { describe, expect, it } from 'vitest';
import type { BenchApi, BenchEvent } from '../../app/contract/bench-api.ts';
import { EventHub } from '../service/event-hub.ts';
import { callChannel, EVENT_CHANNEL, type IpcOutcome } from './channels.ts';
import { createIpcGate, setupBenchIpc, type IpcCallEvent, type IpcMainLike } from './gate.ts';

type Handler = (event: IpcCallEvent, ...args: unknown[]) => Promise<IpcOutcome>;

function fakeIpcMain() {
  const handlers = new Map<string, Handler>();
  const ipcMain: IpcMainLike = {
    handle: (channel, listener) => void handlers.set(channel, listener),
    removeHandler: (channel) => void handlers.delete(channel),
  };
  return { ipcMain, handlers };
}

const APP = 'tunebench://app/index.html';
const fromWindow = (id: number, url = APP, parent: unknown = null): IpcCallEvent => ({
  sender: { id },
  senderFrame: { url, parent },
});

function setup() {
  const { ipcMain, handlers } = fakeIpcMain();
  const gate = createIpcGate(ipcMain, (url) => url.startsWith('tunebench://app/'));
  const received: { channel: string; payload: unknown }[] = [];
  gate.trust({ webContentsId: 7, send: (channel, payload) => received.push({ channel, payload }) });
  const hub = new EventHub();
  const renamed: unknown[][] = [];
  const api = {
    renameRun: async (...args: unknown[]) => {
      renamed.push(args);
      return { id: args[0] };
    },
    subscribe: (listener: (event: BenchEvent) => void) => hub.subscribe(listener),
  } as unknown as BenchApi;
  setupBenchIpc(gate, api, ['renameRun']);
  const call = (event: IpcCallEvent, ...args: unknown[]) =>
    (handlers.get(callChannel('renameRun')) as Handler)(event, ...args);
  return { gate, handlers, call, renamed, received, hub };
}

describe('IPC gate', () => {
  it('answers a valid call from the app window', async () => {
    const { call, renamed } = setup();
    await expect(call(fromWindow(7), '20261202-010000-osc', 'osc-b')).resolves.toEqual({
      ok: true,
      result: { id: '20261202-010000-osc' },
    });
    expect(renamed).toEqual([['20261202-010000-osc', 'osc-b']]);
  });

  it('drops calls from other web contents, subframes, foreign pages and destroyed frames', async () => {
    const { call, renamed } = setup();
    for (const event of [
      fromWindow(8),
      fromWindow(7, APP, {}),
      fromWindow(7, 'https://example.com/'),
      { sender: { id: 7 }, senderFrame: null },
    ]) {
      const outcome = await call(event, '20261202-010000-osc', 'osc-b');
      expect(outcome).toMatchObject({ ok: false, error: { message: expect.stringMatching(/not a tunebench window/) } });
    }
    expect(renamed).toHaveLength(0);
  });

  it('validates every argument and names the field', async () => {
    const { call, renamed } = setup();
    await expect(call(fromWindow(7), '../../etc', 'osc-b')).resolves.toMatchObject({
      ok: false,
      error: { field: 'id' },
    });
    await expect(call(fromWindow(7), 'a/b', 'osc-b')).resolves.toMatchObject({ ok: false, error: { field: 'id' } });
    await expect(call(fromWindow(7), '20261202-010000-osc', 42)).resolves.toMatchObject({
      ok: false,
      error: { field: 'dutId' },
    });
    await expect(call(fromWindow(7), '20261202-010000-osc')).resolves.toMatchObject({
      ok: false,
      error: { field: 'params' },
    });
    expect(renamed).toHaveLength(0);
  });

  it('broadcasts pushed events to trusted windows only, and unregisters on dispose', () => {
    const { gate, handlers, received, hub } = setup();
    hub.emit({ type: 'error', message: 'x' });
    expect(received).toEqual([{ channel: EVENT_CHANNEL, payload: { type: 'error', message: 'x' } }]);
    gate.dispose();
    expect(handlers.size).toBe(0);
  });
});

describe('IPC gate against hostile payloads (issue 14.1)', () => {
  it('answers a 6000-deep nested argument and a 100 000-character one with a bounded refusal, never a throw', async () => {
    const { call, renamed } = setup();
    let nested: unknown = 'x';
    for (let i = 0; i < 6000; i += 1) nested = [nested];
    const deep = await call(fromWindow(7), nested, 'osc-b');
    expect(deep).toMatchObject({
      ok: false,
      error: { message: expect.stringMatching(/nested too deeply \(at most 16 levels\)/) },
    });
    const long = await call(fromWindow(7), `run${'\u202e'.repeat(100_000)}`, 'osc-b');
    expect(long.ok).toBe(false);
    expect(JSON.stringify(long).length).toBeLessThan(1200);
    expect(JSON.stringify(long)).not.toContain('\u202e');
    expect(renamed).toEqual([]);
  });
});
