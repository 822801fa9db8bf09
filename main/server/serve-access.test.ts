/**
 * Issue 14 items 2–4 against a real `tunebench serve` child over its
 * WebSocket, with the bench a `tunebench sim` child on 127.0.0.1 (ephemeral
 * ports) and the supply's state read back over TCP.
 */
import { get } from 'node:http';
import { createServer, type Server } from 'node:net';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WebSocket } from 'ws';
import { wireMessages } from '../../app/bridge/ws-client.ts';
import { MAX_IMPORT_BYTES } from '../../app/contract/wire.ts';
import { encodeImportParts } from '../../app/contract/wire-upload.ts';
import {
  openApi,
  readControlChannel,
  type ApiClient,
  startServe,
  startSim,
  stubRendererDir,
  type ServeChild,
  type SimChild,
} from '../../test/testing/serve-process.ts';

let sim: SimChild;
let serve: ServeChild;
const cleanup: string[] = [];

beforeAll(async () => {
  const [simChild, rendererDir, runsDir] = await Promise.all([
    startSim(),
    stubRendererDir(),
    mkdtemp(join(tmpdir(), 'tunebench-serve-access-')),
  ]);
  sim = simChild;
  cleanup.push(rendererDir, runsDir);
  serve = await startServe({ runsDir, rendererDir });
}, 90_000);

afterAll(async () => {
  serve?.process.kill('SIGTERM');
  sim?.process.kill('SIGTERM');
  await serve?.exited;
  await Promise.all(cleanup.map((dir) => rm(dir, { recursive: true, force: true })));
});

function httpGet(
  url: string,
  headers: Record<string, string> = {},
): Promise<{ status: number; cookie: string | null; body: string }> {
  return new Promise((resolve, reject) => {
    get(url, { headers }, (res) => {
      let body = '';
      res.on('data', (chunk: Buffer) => (body += chunk.toString()));
      res.on('end', () =>
        resolve({ status: res.statusCode ?? 0, cookie: res.headers['set-cookie']?.[0]?.split(';')[0] ?? null, body }),
      );
    }).on('error', reject);
  });
}

function upgradeStatus(url: string, origin: string): Promise<number> {
  return new Promise((resolve) => {
    const socket = new WebSocket(url, { origin });
    socket.once('open', () => {
      socket.close();
      resolve(101);
    });
    socket.once('unexpected-response', (_req, res) => resolve(res.statusCode ?? 0));
    socket.once('error', () => undefined);
  });
}

const SIM_BENCH = () => ({
  supply: { address: sim.supply, profile: 'supply-scpi' },
  counter: { address: sim.counter, profile: 'counter-scpi' },
  thermometer: { address: sim.thermometer, profile: 'thermometer-scpi' },
});

describe('browser mode against a real serve process', () => {
  it('14.2: the asset cookie holds a secret of its own that never opens the API', async () => {
    const page = await httpGet(serve.url);
    expect(page.status).toBe(200);
    const [name, value] = (page.cookie ?? '').split('=') as [string, string];
    expect(name).toMatch(/^tunebench_token_\d+$/);
    expect(value.length).toBeGreaterThan(30);
    expect(value).not.toBe(serve.token);
    // The cookie opens the page's assets…
    expect((await httpGet(`${serve.origin}/assets/app.js`, { cookie: page.cookie as string })).status).toBe(200);
    // …but neither as a cookie nor as a token does it open the API (a forged Origin does not help).
    const api = `${serve.origin.replace('http', 'ws')}/api`;
    expect(await upgradeStatus(`${api}?token=${value}`, serve.origin)).toBe(401);
    expect(await upgradeStatus(`${api}?token=${serve.token}`, serve.origin)).toBe(101);
  });

  it("14.3: a profile path reads no file; a peer's reply comes back only as a short, escaped excerpt", async () => {
    const api = await openApi(serve.origin, serve.token);
    const byPath = await api.call('connect', [
      { ...SIM_BENCH(), supply: { address: sim.supply, profile: '/etc/passwd' } },
    ]);
    expect(byPath.ok).toBe(false);
    expect(byPath.error?.field).toBe('config.supply.profile');
    expect(byPath.error?.message).not.toMatch(/root:/);
    // A service on loopback that is not an instrument: our own listener, talking nonsense at length.
    const secret = `BANNER-${'s3cr3t'.repeat(2000)}`;
    const listener: Server = createServer((socket) => {
      socket.on('error', () => undefined);
      socket.write(`${secret}\u001b[2J\u202e\n`);
      socket.on('data', () => socket.write(`${secret}\u001b[2J\n`));
    });
    await new Promise<void>((resolve) => listener.listen(0, '127.0.0.1', () => resolve()));
    const port = (listener.address() as { port: number }).port;
    const reply = await api.call('connect', [
      { ...SIM_BENCH(), counter: { address: `tcp://127.0.0.1:${port}`, profile: 'counter-scpi' } },
    ]);
    listener.close();
    const text = JSON.stringify(reply);
    expect(text.length).toBeLessThan(1200);
    expect(text).not.toContain('s3cr3t'.repeat(40));
    expect(text).not.toMatch(/\\u001b|\u001b|\u202e/); // escaped as text (\\u001b), never raw
    api.close();
  }, 60_000);

  it('14.4: Stop during a large import answers within 200 ms, leaves the supply safe, and the import still lands', async () => {
    const operator = await openApi(serve.origin, serve.token);
    expect((await operator.call('connect', [SIM_BENCH()])).ok).toBe(true);
    const plan = {
      controlV: 2,
      intervalS: 0.2,
      durationS: 3600,
      gateS: 0.05,
      settle: { mode: 'fixed', seconds: 0 },
      limits: { maxControlV: 5, currentLimitA: 0.05 },
    };
    const started = await operator.call('startDrift', [plan, 'stop-vs-import']);
    expect(started.ok, JSON.stringify(started.error)).toBe(true);
    await expect.poll(() => operator.events.some((event) => event.type === 'samples'), { timeout: 30_000 }).toBe(true);
    expect(await readControlChannel(sim.supply)).toEqual({ output: true, volts: 2 });

    // Another page imports ~20 MB of CSV, streamed in parts as the page's client sends it.
    const rows: string[] = ['control_v,frequency_hz'];
    for (let i = 0; rows.length < 1_000_000; i += 1) rows.push(`${(i % 5000) / 1000},${1_000_000 + i * 0.37}`);
    const csv = `${rows.join('\n')}\n`;
    const importer = await openApi(serve.origin, serve.token);
    const messages = wireMessages({ id: 77, method: 'importCsv', params: ['night.csv', csv, 'imported'] });
    expect(messages.length).toBeGreaterThan(50);
    const imported = importer.reply(77);
    let importDone = false;
    void imported.then(() => (importDone = true));
    for (const message of messages) importer.sendRaw(message);
    await expect.poll(() => importer.socket.bufferedAmount, { timeout: 60_000, interval: 20 }).toBe(0); // every part handed to the kernel
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(importDone).toBe(false); // the import is still being parsed
    const sentAt = performance.now();
    const stopped = await operator.call('stopRun', []);
    const answeredMs = performance.now() - sentAt;
    expect(stopped.ok).toBe(true);
    expect(importDone).toBe(false); // Stop was served while the import was still running
    console.log(`Stop answered in ${answeredMs.toFixed(0)} ms during a ${(csv.length / 1e6).toFixed(0)} MB import`);
    expect(answeredMs).toBeLessThan(200);
    // The safe state follows the answer; run-ended says when it is done.
    await expect
      .poll(() => operator.events.some((event) => event.type === 'run-ended'), { timeout: 30_000 })
      .toBe(true);
    expect(await readControlChannel(sim.supply)).toEqual({ output: false, volts: 0 });
    const result = await imported;
    expect(result.ok, JSON.stringify(result.error)).toBe(true);
    operator.close();
    importer.close();
  }, 120_000);

  it('14.4: an import past the cap is refused with the cap in the message, before main holds it all', async () => {
    const api = await openApi(serve.origin, serve.token);
    // A page that announces more parts than the cap allows is refused at its first part.
    const [first] = encodeImportParts({ id: 5, fileName: 'big.csv', dutId: 'd' }, 'x'.repeat(MAX_IMPORT_BYTES + 1));
    api.sendRaw(first as Uint8Array);
    const reply = await api.reply(5);
    expect(reply.ok).toBe(false);
    expect(reply.error?.message).toMatch(/too large \(at most 64 MiB/);
    api.close();
  });

  it('14.4: connections are capped at 8; each page is told how many others share the bench', async () => {
    const api = `${serve.origin.replace('http', 'ws')}/api?token=${serve.token}`;
    const pages: ApiClient[] = [];
    let refusal = '';
    // Pages of earlier tests may still be closing: open until the server says no.
    for (let i = 0; i < 9 && refusal === ''; i += 1) {
      try {
        pages.push(await openApi(serve.origin, serve.token));
      } catch (error) {
        refusal = String(error);
      }
    }
    expect(refusal).toMatch(/503/);
    expect(pages.length).toBeGreaterThan(0);
    expect(pages.length).toBeLessThanOrEqual(8);
    expect(await upgradeStatus(api, serve.origin)).toBe(503);
    await expect
      .poll(
        () =>
          pages
            .at(-1)
            ?.events.filter((event) => event.type === 'peers')
            .at(-1)?.others,
      )
      .toBeGreaterThanOrEqual(pages.length - 1);
    for (const page of pages) page.close();
  });
});
