import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import type { BenchApi, BenchEvent } from '../../app/contract/bench-api.ts';
import { decodeBinaryReply } from '../../app/contract/wire-binary.ts';
import { FrameAssembler, PART_BYTES } from '../../app/contract/wire-parts.ts';
import { EventHub } from '../service/event-hub.ts';
import { startBrowserServer, type BrowserServer } from './http-server.ts';

/** A BenchApi whose getConnection answers and which records startSweep calls. */
function fakeApi(hub: EventHub, calls: unknown[][]): BenchApi {
  const answer = async (...args: unknown[]): Promise<unknown> => {
    calls.push(args);
    return { connected: false, simulated: false, roles: [], error: null };
  };
  const api: Record<string, unknown> = {
    subscribe: (listener: (event: BenchEvent) => void) => hub.subscribe(listener),
  };
  for (const name of ['getConnection', 'startSweep', 'listRuns']) api[name] = answer;
  // A stored run with columns as the store gives them: Float64Array and coded text.
  api.openRun = async () => ({
    samples: {
      names: ['frequency_hz', 'status'],
      numeric: { frequency_hz: BIG_COLUMN },
      text: { status: { levels: ['ok'], codes: new Uint8Array(BIG_COLUMN.length) } },
      rowCount: BIG_COLUMN.length,
    },
  });
  return api as unknown as BenchApi;
}

/** Noisy values (no rule to send instead of bytes), long enough to need several parts. */
const BIG_COLUMN = Float64Array.from({ length: 100_000 }, (_, i) => 4e8 + Math.sin(i * 0.37) * 1234.5678);

interface HttpAnswer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

function get(server: BrowserServer, path: string, headers: Record<string, string> = {}): Promise<HttpAnswer> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port: server.port, path, headers }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (body += chunk));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

/** Opens a socket; resolves with it when open, or with the refusing HTTP status. */
function openSocket(
  url: string,
  origin: string | undefined,
  headers: Record<string, string> = {},
): Promise<{ socket: WebSocket } | { status: number }> {
  return new Promise((resolve) => {
    const socket = new WebSocket(url, origin === undefined ? { headers } : { origin, headers });
    socket.once('open', () => resolve({ socket }));
    socket.once('unexpected-response', (_req, res) => {
      resolve({ status: res.statusCode ?? 0 });
      socket.terminate();
    });
    socket.once('error', () => resolve({ status: -1 }));
  });
}

function nextMessage(socket: WebSocket): Promise<Record<string, unknown>> {
  return new Promise((resolve) =>
    socket.once('message', (data: Buffer) => resolve(JSON.parse(data.toString()) as Record<string, unknown>)),
  );
}

describe('browser-mode server', () => {
  let root: string;
  let dir: string;
  let server: BrowserServer;
  const hub = new EventHub();
  const calls: unknown[][] = [];

  beforeAll(async () => {
    root = await mkdtemp(join(tmpdir(), 'tunebench-serve-'));
    dir = join(root, 'renderer');
    await mkdir(join(dir, 'assets'), { recursive: true });
    await writeFile(join(dir, 'index.html'), '<!doctype html><title>t</title>');
    await writeFile(join(dir, 'assets', 'app.js'), 'console.log(1)');
    await writeFile(join(root, 'tunebench-secret.txt'), 'secret');
    server = await startBrowserServer({ host: '127.0.0.1', port: 0, rendererDir: dir, api: fakeApi(hub, calls) });
  });

  afterAll(async () => {
    await server.close();
    await rm(root, { recursive: true, force: true });
  });

  it('prints a loopback URL carrying a long random token', () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[A-Za-z0-9_-]{43}$/);
  });

  it('refuses the page without the token or with a wrong one (401)', async () => {
    expect((await get(server, '/')).status).toBe(401);
    expect((await get(server, '/?token=nope')).status).toBe(401);
    const wrongSameLength = `${server.token.slice(0, -1)}${server.token.endsWith('A') ? 'B' : 'A'}`;
    expect((await get(server, `/?token=${wrongSameLength}`)).status).toBe(401);
    expect((await get(server, '/assets/app.js')).status).toBe(401);
  });

  it('serves the page with the token, sets a strict cookie and security headers', async () => {
    const page = await get(server, `/?token=${server.token}`);
    expect(page.status).toBe(200);
    expect(page.body).toContain('<title>t</title>');
    expect(String(page.headers['set-cookie'])).toMatch(/HttpOnly; SameSite=Strict; Path=\//);
    expect(page.headers['content-security-policy']).toContain("script-src 'self'");
    expect(page.headers['content-security-policy']).toContain("default-src 'self'");
    expect(page.headers['referrer-policy']).toBe('no-referrer');
    expect(page.headers['x-frame-options']).toBe('DENY');
    expect(page.headers['x-content-type-options']).toBe('nosniff');
  });

  it('serves assets with the cookie, but never a path outside the build', async () => {
    const page = await get(server, `/?token=${server.token}`);
    const cookie = String(page.headers['set-cookie']).split(';')[0] as string;
    const asset = await get(server, '/assets/app.js', { cookie });
    expect(asset.status).toBe(200);
    expect(asset.headers['content-type']).toContain('text/javascript');
    expect((await get(server, '/../tunebench-secret.txt', { cookie })).status).toBe(404);
    expect((await get(server, '/%2e%2e/tunebench-secret.txt', { cookie })).status).toBe(404);
    expect((await get(server, '/assets/missing.js', { cookie })).status).toBe(404);
  });

  it('refuses a Host header that is not its own (DNS rebinding)', async () => {
    const answer = await get(server, `/?token=${server.token}`, { host: `attacker.example:${server.port}` });
    expect(answer.status).toBe(421);
  });

  it('refuses the WebSocket without the token (401) and from another origin (403)', async () => {
    const base = `ws://127.0.0.1:${server.port}/api`;
    expect(await openSocket(base, server.origin)).toEqual({ status: 401 });
    expect(await openSocket(`${base}?token=wrong`, server.origin)).toEqual({ status: 401 });
    // The asset cookie alone never opens the API.
    expect(await openSocket(base, server.origin, { cookie: `tunebench_token_${server.port}=${server.token}` })).toEqual(
      { status: 401 },
    );
    expect(await openSocket(`${base}?token=${server.token}`, 'http://evil.example')).toEqual({ status: 403 });
    expect(await openSocket(`${base}?token=${server.token}`, undefined)).toEqual({ status: 403 });
  });

  it('answers calls, names the field of a malformed message, and keeps running', async () => {
    const opened = await openSocket(`ws://127.0.0.1:${server.port}/api?token=${server.token}`, server.origin);
    if (!('socket' in opened)) throw new Error(`socket refused: ${opened.status}`);
    const socket = opened.socket;
    socket.send('{not json');
    expect(await nextMessage(socket)).toMatchObject({ id: -1, ok: false, error: { field: 'message' } });
    socket.send(JSON.stringify({ id: 'x', method: 'getConnection', params: [] }));
    expect(await nextMessage(socket)).toMatchObject({ ok: false, error: { field: 'id' } });
    socket.send(JSON.stringify({ id: 2, method: 'formatDisk', params: [] }));
    expect(await nextMessage(socket)).toMatchObject({ id: 2, ok: false, error: { field: 'method' } });
    socket.send(
      JSON.stringify({
        id: 3,
        method: 'startSweep',
        params: [{ start: 0, stop: 1, step: 0.1, limits: { maxControlV: 'lots', currentLimitA: 0.05 } }, 'dut-1'],
      }),
    );
    const bad = await nextMessage(socket);
    expect(bad).toMatchObject({ id: 3, ok: false, error: { field: 'plan.limits.maxControlV' } });
    expect(calls).toHaveLength(0);
    socket.send(JSON.stringify({ id: 4, method: 'getConnection', params: [] }));
    expect(await nextMessage(socket)).toEqual({
      id: 4,
      ok: true,
      result: { connected: false, simulated: false, roles: [], error: null },
    });
    hub.emit({ type: 'error', message: 'pushed' });
    expect(await nextMessage(socket)).toEqual({ event: { type: 'error', message: 'pushed' } });
    socket.close();
  });

  it('sends a reply with typed arrays as consecutive binary parts that join into one frame, events after it', async () => {
    const opened = await openSocket(`ws://127.0.0.1:${server.port}/api?token=${server.token}`, server.origin);
    if (!('socket' in opened)) throw new Error(`socket refused: ${opened.status}`);
    const socket = opened.socket;
    const messages: { data: Buffer; isBinary: boolean }[] = [];
    socket.on('message', (data: Buffer, isBinary: boolean) => messages.push({ data, isBinary }));
    socket.send(JSON.stringify({ id: 5, method: 'openRun', params: ['r1'] }));
    await new Promise((resolve) => setTimeout(resolve, 50));
    hub.emit({ type: 'error', message: 'after' });
    await expect.poll(() => messages.some((m) => !m.isBinary && m.data.toString().includes('"after"'))).toBe(true);
    const parts = messages.filter((m) => m.isBinary);
    expect(parts.length).toBeGreaterThan(2);
    expect(parts.every((m) => m.data.byteLength <= PART_BYTES)).toBe(true);
    expect(messages[messages.length - 1]?.data.toString()).toContain('"after"'); // the event came after every part
    const assembler = new FrameAssembler();
    let frame: ArrayBuffer | null = null;
    for (const { data } of parts)
      frame = assembler.push(data.buffer.slice(data.byteOffset, data.byteOffset + data.byteLength) as ArrayBuffer);
    if (frame === null) throw new Error('frame incomplete');
    const reply = decodeBinaryReply(frame) as {
      id: number;
      ok: boolean;
      result: { samples: { numeric: { frequency_hz: Float64Array }; rowCount: number } };
    };
    expect(reply).toMatchObject({ id: 5, ok: true });
    expect(reply.result.samples.rowCount).toBe(BIG_COLUMN.length);
    expect(reply.result.samples.numeric.frequency_hz).toEqual(BIG_COLUMN);
    socket.close();
  });
});
