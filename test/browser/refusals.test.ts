/**
 * Browser mode refuses, as seen from a real browser: no token, a wrong
 * token, a page of another origin opening the API socket, and malformed
 * messages (answered with an error naming the field; the server goes on).
 */
import { mkdir } from 'node:fs/promises';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hasChromium, launchChromium, SCREENS_DIR, serveApp, SKIP_REASON, type ServedApp } from './harness.ts';

if (!hasChromium) console.warn(SKIP_REASON);

/** Opens the API socket from inside the page; resolves 'open' or 'refused'. */
const tryOpenSocket = (url: string): Promise<string> =>
  new Promise((resolve) => {
    const socket = new WebSocket(url);
    socket.onopen = () => {
      socket.close();
      resolve('open');
    };
    socket.onerror = () => resolve('refused');
  });

describe.skipIf(!hasChromium)('browser mode refusals (Chromium)', () => {
  let app: ServedApp;
  let browser: Browser;
  let other: Server;
  let otherOrigin: string;

  beforeAll(async () => {
    app = await serveApp();
    browser = await launchChromium();
    // A page of another origin (another port on loopback is another origin).
    other = createServer((_req, res) => {
      res.writeHead(200, { 'Content-Type': 'text/html' });
      res.end('<!doctype html><title>elsewhere</title>');
    });
    await new Promise<void>((resolve) => other.listen(0, '127.0.0.1', resolve));
    otherOrigin = `http://127.0.0.1:${(other.address() as AddressInfo).port}`;
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  afterAll(async () => {
    await browser?.close();
    await new Promise((resolve) => other?.close(resolve));
    await app?.close();
  });

  it('refuses the page without the token and with a wrong one', async () => {
    const page = await browser.newPage();
    const bare = await page.goto(`${app.server.origin}/`);
    expect(bare?.status()).toBe(401);
    expect(await page.textContent('body')).toContain('Access token missing or wrong');
    const wrong = await page.goto(`${app.server.origin}/?token=not-the-token`);
    expect(wrong?.status()).toBe(401);
    const asset = await page.goto(`${app.server.origin}/index.html`);
    expect(asset?.status()).toBe(401);
    await page.close();
  });

  it('serves the app with the token, with the CSP header set', async () => {
    const page = await browser.newPage();
    const response = await page.goto(app.server.url);
    expect(response?.status()).toBe(200);
    expect(response?.headers()['content-security-policy']).toContain("script-src 'self'");
    await page.waitForSelector('#root *', { timeout: 15_000 });
    await page.close();
  });

  it('tells each page when another page drives the same bench (one bench, one operator)', async () => {
    const first = await browser.newPage({ viewport: { width: 1280, height: 500 } });
    await first.goto(app.server.url);
    await first.waitForSelector('#root *', { timeout: 15_000 });
    expect(await first.locator('[data-testid="peer-count"]').count()).toBe(0);
    const second = await browser.newPage();
    await second.goto(app.server.url);
    await first.waitForSelector('[data-testid="peer-count"]', { timeout: 15_000 });
    expect(await first.textContent('[data-testid="peer-count"]')).toMatch(
      /One other page connected to this bench: whoever is there can stop, pause or rename a run too/,
    );
    await mkdir(SCREENS_DIR, { recursive: true });
    await first.screenshot({ path: join(SCREENS_DIR, 'peer-notice.png') });
    await second.close();
    await first.waitForSelector('[data-testid="peer-count"]', { state: 'detached', timeout: 15_000 });
    await first.close();
  });

  it('refuses the API socket to a page of another origin, even with the token', async () => {
    const page = await browser.newPage();
    await page.goto(otherOrigin);
    const url = `ws://127.0.0.1:${app.server.port}/api?token=${app.server.token}`;
    expect(await page.evaluate(tryOpenSocket, url)).toBe('refused');
    await page.close();
  });

  it('refuses the API socket without the token, from the app origin', async () => {
    const page = await browser.newPage();
    await page.goto(app.server.url);
    expect(await page.evaluate(tryOpenSocket, `ws://127.0.0.1:${app.server.port}/api`)).toBe('refused');
    expect(await page.evaluate(tryOpenSocket, `ws://127.0.0.1:${app.server.port}/api?token=${app.server.token}`)).toBe(
      'open',
    );
    await page.close();
  });

  it('answers malformed messages with an error naming the field, and keeps serving', async () => {
    const page = await browser.newPage();
    await page.goto(app.server.url);
    const url = `ws://127.0.0.1:${app.server.port}/api?token=${app.server.token}`;
    const replies = await page.evaluate(
      (socketUrl) =>
        new Promise<unknown[]>((resolve) => {
          const socket = new WebSocket(socketUrl);
          const got: unknown[] = [];
          const messages = [
            '{"id": 1, "method": "getConnection"',
            '{"id": 2, "method": "openRun", "params": ["../../etc/passwd"]}',
            '{"id": 3, "method": "startDrift", "params": [{"controlV": "two volts"}, "osc"]}',
            '{"id": 4, "method": "getConnection", "params": []}',
          ];
          socket.onopen = () => messages.forEach((m) => socket.send(m));
          socket.onmessage = (message) => {
            const data = JSON.parse(String(message.data)) as { id?: number };
            if (data.id === undefined) return; // a pushed event
            got.push(data);
            if (got.length === messages.length) {
              socket.close();
              resolve(got);
            }
          };
        }),
      url,
    );
    const byId = new Map((replies as { id: number }[]).map((r) => [r.id, r]));
    expect(byId.get(-1)).toMatchObject({
      ok: false,
      error: { field: 'message', message: expect.stringContaining('not valid JSON') },
    });
    expect(byId.get(2)).toMatchObject({ ok: false, error: { field: 'id' } });
    expect(byId.get(3)).toMatchObject({ ok: false, error: { field: 'plan.controlV' } });
    expect(byId.get(4)).toMatchObject({ ok: true, result: { connected: false } });
    const again = await page.goto(app.server.url);
    expect(again?.status()).toBe(200);
    await page.close();
  });
});
