/**
 * Issue 14.4 and 14.8 at the server: slow pages, calls in flight, symbolic
 * links out of the served folder, and the Host check on every interface.
 * Everything on 127.0.0.1 with an ephemeral port.
 */
import { mkdir, mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import type { BenchApi } from '../../app/contract/bench-api.ts';
import { EventHub } from '../service/event-hub.ts';
import { allowedHostHeaders, startBrowserServer, type BrowserServer } from './http-server.ts';
import { MAX_IN_FLIGHT } from './ws-api.ts';
import { wsText } from '../../test/testing/serve-process.ts';

const BIG = Float64Array.from({ length: 500_000 }, (_, i) => Math.sin(i) * 1e6); // 4 MB per reply
const releases: (() => void)[] = [];
const hub = new EventHub();
const stops: number[] = [];
const api = {
  subscribe: (listener: never) => hub.subscribe(listener),
  openRun: async () => ({
    samples: { names: ['frequency_hz'], numeric: { frequency_hz: BIG }, text: {}, rowCount: BIG.length },
  }),
  listProfiles: () => new Promise((resolve) => releases.push(() => resolve([]))), // answers when released: holds its slot
  stopRun: async () => void stops.push(Date.now()),
} as unknown as BenchApi;

let root: string;
let server: BrowserServer;

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tunebench-limits-'));
  const dir = join(root, 'renderer');
  await mkdir(join(dir, 'assets'), { recursive: true });
  await writeFile(join(dir, 'index.html'), '<!doctype html><title>t</title>');
  await writeFile(join(dir, 'assets', 'real.js'), 'ok');
  await writeFile(join(root, 'outside-secret.txt'), 'secret');
  await symlink(join(root, 'outside-secret.txt'), join(dir, 'assets', 'leak.js'));
  await symlink(join(dir, 'assets', 'real.js'), join(dir, 'assets', 'alias.js'));
  server = await startBrowserServer({ host: '127.0.0.1', port: 0, rendererDir: dir, api, drainWaitMs: 300 });
});

afterAll(async () => {
  await server.close();
  await rm(root, { recursive: true, force: true });
});

function status(path: string): Promise<number> {
  return new Promise((resolve, reject) => {
    request({ host: '127.0.0.1', port: server.port, path }, (res) => (res.resume(), resolve(res.statusCode ?? 0)))
      .on('error', reject)
      .end();
  });
}

function open(): Promise<WebSocket> {
  return new Promise((resolve, reject) => {
    const socket = new WebSocket(`ws://127.0.0.1:${server.port}/api?token=${server.token}`, { origin: server.origin });
    socket.once('open', () => resolve(socket));
    socket.once('error', reject);
  });
}

describe('server limits', () => {
  it('14.8: follows a symbolic link only to a file inside the served folder', async () => {
    expect(await status(`/assets/alias.js?token=${server.token}`)).toBe(200);
    expect(await status(`/assets/leak.js?token=${server.token}`)).toBe(404);
  });

  it('14.8: on every interface the Host must still name this machine, never another domain', () => {
    const allowed = allowedHostHeaders('0.0.0.0', 7788, ['192.168.4.20', 'labpc', 'fe80::1']);
    for (const host of ['127.0.0.1:7788', 'localhost:7788', '192.168.4.20:7788', 'labpc:7788', '[fe80::1]:7788'])
      expect(allowed.has(host), host).toBe(true);
    for (const host of ['attacker.example:7788', 'labpc.attacker.example:7788', '192.168.4.20:80'])
      expect(allowed.has(host), host).toBe(false);
    expect([...allowedHostHeaders('127.0.0.1', 7788, ['192.168.4.20'])].sort()).toEqual([
      '127.0.0.1:7788',
      '[::1]:7788',
      'localhost:7788',
    ]);
  });

  it('14.4: caps calls in flight per page, but Stop is always served', async () => {
    const socket = await open();
    const replies: { id: number; ok: boolean; error?: { message: string } }[] = [];
    socket.on('message', (data, binary) => {
      const message = binary ? null : (JSON.parse(wsText(data)) as { id?: number });
      if (message && typeof message.id === 'number') replies.push(message as never);
    });
    for (let id = 1; id <= MAX_IN_FLIGHT; id += 1)
      socket.send(JSON.stringify({ id, method: 'listProfiles', params: [] }));
    socket.send(JSON.stringify({ id: 99, method: 'listProfiles', params: [] }));
    await expect
      .poll(() => replies.find((r) => r.id === 99))
      .toMatchObject({
        ok: false,
        error: { message: expect.stringMatching(/8 calls from this page are still running/) },
      });
    socket.send(JSON.stringify({ id: 100, method: 'stopRun', params: [] }));
    await expect.poll(() => replies.find((r) => r.id === 100)).toMatchObject({ ok: true });
    expect(stops).toHaveLength(1);
    for (const release of releases.splice(0)) release();
    await expect.poll(() => replies.filter((r) => r.id <= MAX_IN_FLIGHT && r.ok).length).toBe(MAX_IN_FLIGHT);
    socket.terminate();
  });

  it('14.4: a page that stops reading its replies is dropped; another page goes on', async () => {
    const slow = await open();
    const closed = new Promise<void>((resolve) => slow.once('close', () => resolve()));
    let binaryBytes = 0;
    slow.on('message', (data: Buffer, binary) => binary && (binaryBytes += data.byteLength));
    const tcp = (slow as unknown as { _socket: { pause(): void; resume(): void } })._socket;
    tcp.pause(); // reads nothing for a while
    for (let id = 1; id <= MAX_IN_FLIGHT; id += 1) slow.send(JSON.stringify({ id, method: 'openRun', params: ['r1'] }));
    await new Promise((resolve) => setTimeout(resolve, 3000)); // well past the 300 ms the server waits
    tcp.resume();
    await closed; // the server dropped it…
    expect(binaryBytes).toBeLessThan(MAX_IN_FLIGHT * BIG.byteLength); // …before sending every reply
    const other = await open();
    const answered = new Promise<Record<string, unknown>>((resolve) =>
      other.on('message', (data, binary) => !binary && resolve(JSON.parse(wsText(data)) as Record<string, unknown>)),
    );
    other.send(JSON.stringify({ id: 1, method: 'stopRun', params: [] }));
    expect(await answered).toMatchObject({ id: 1, ok: true });
    other.terminate();
  }, 30_000);
});
