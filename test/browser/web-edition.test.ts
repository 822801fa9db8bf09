/**
 * The web edition (issue 16) in headless Chromium: `npm run build:web`'s
 * static site served by a plain static file server (node:http, 127.0.0.1,
 * ephemeral port; no tunebench server code). In the page: connect the
 * in-page simulated bench (25× real time through `?sim-speed=25`), run a
 * gain sweep and a short drift log, reload and find both runs in the
 * archive (OPFS) with their samples, download the sweep as a zip, unpack it
 * with the project's zip reader and run `tunebench analyze` on the folder:
 * the same figures as the page shows. Screenshots: test-artifacts/screens/web-*.png.
 */
import { execFile } from 'node:child_process';
import { createReadStream } from 'node:fs';
import { mkdir, mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { createServer, type Server } from 'node:http';
import { tmpdir } from 'node:os';
import { dirname, extname, join, normalize, sep } from 'node:path';
import { promisify } from 'node:util';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { PROJECT_ROOT } from '../../main/server/renderer-build.ts';
import { readZip } from '../../app/web/zip/zip-file.ts';
import { hasChromium, launchChromium, SCREENS_DIR, SKIP_REASON } from './harness.ts';
import { byId, shot, textMatches } from './page-steps.ts';

if (!hasChromium) console.warn(SKIP_REASON);

const WEB_DIR = join(PROJECT_ROOT, 'out', 'web');
const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
};

/** A plain static file server: files under `root`, nothing else. */
async function serveStatic(root: string): Promise<{ server: Server; origin: string }> {
  const server = createServer((request, response) => {
    const path = decodeURIComponent(new URL(request.url ?? '/', 'http://x').pathname);
    const file = normalize(join(root, path.endsWith('/') ? `${path}index.html` : path));
    if (!file.startsWith(root + sep)) {
      response.writeHead(403).end();
      return;
    }
    stat(file).then(
      (found) => {
        if (!found.isFile()) return void response.writeHead(404).end();
        response.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' });
        createReadStream(file).pipe(response);
      },
      () => response.writeHead(404).end(),
    );
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  if (address === null || typeof address === 'string') throw new Error('no port');
  return { server, origin: `http://127.0.0.1:${address.port}` };
}

/** The numbers of a figure such as "1.234 kHz – 28.80 kHz" with SI prefixes applied. */
function siValues(text: string): number[] {
  const scale: Record<string, number> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };
  // A figure "8.92 ± 0.09 kHz/V" carries its prefix after the ±: drop each "± u" so the value meets its unit.
  return [
    ...text
      .replace(/\u2212/g, '-')
      .replace(/ ± [\d.]+/g, '')
      .matchAll(/(-?\d+(?:\.\d+)?)\s*([pnuµmkMG]?)(?=Hz|V)/g),
  ].map((m) => Number(m[1]) * (scale[m[2] ?? ''] ?? 1));
}

/** Relative difference a figure shown to four significant digits may have from the full value. */
const SHOWN = 1e-3;

async function runIds(page: Page): Promise<string[]> {
  const ids: string[] = [];
  for (const row of await page.locator('[data-testid^="run-row-"]').all())
    ids.push(((await row.getAttribute('data-testid')) ?? '').slice('run-row-'.length));
  return ids;
}

describe.skipIf(!hasChromium)('the web edition, built static and served plainly (Chromium, issue 16)', () => {
  let served: { server: Server; origin: string };
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let scratch = '';
  let sweepId = '';
  let driftId = '';
  const shown: Record<string, string> = {};
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    await mkdir(SCREENS_DIR, { recursive: true });
    scratch = await mkdtemp(join(tmpdir(), 'tunebench-web-'));
    // As `npm run build:web` does it, in its own process (vitest's NODE_ENV=test would give React's development build).
    await promisify(execFile)(
      process.execPath,
      [
        join(PROJECT_ROOT, 'node_modules/vite/bin/vite.js'),
        'build',
        '--config',
        'app/web/vite.config.ts',
        '--logLevel',
        'warn',
      ],
      { cwd: PROJECT_ROOT, env: { ...process.env, NODE_ENV: 'production' }, maxBuffer: 16 * 1024 * 1024 },
    );
    served = await serveStatic(WEB_DIR);
    browser = await launchChromium();
    context = await browser.newContext({
      acceptDownloads: true,
      viewport: { width: 1280, height: 860 },
      colorScheme: 'dark',
    });
    page = await context.newPage();
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(error.message));
  }, 300_000); // vite builds the site first: slow on a busy 2-core machine

  afterEach(async (test) => {
    if (test.task.result?.state === 'fail')
      await shot(page, `web-failed-${test.task.name.slice(0, 40).replace(/\W+/g, '-')}`);
  });

  afterAll(async () => {
    await browser?.close();
    await new Promise((resolve) => served?.server.close(resolve));
    if (scratch) await rm(scratch, { recursive: true, force: true });
  }, 120_000);

  it('the build is static files only, and the page offers the simulated bench and a serial port in this browser', async () => {
    const index = await readFile(join(WEB_DIR, 'index.html'), 'utf8');
    expect(index).toMatch(/<script type="module"[^>]*src="\.\/assets\/index-[\w-]+\.js"/);
    await page.goto(`${served.origin}/?sim-speed=25`);
    await page.waitForSelector(byId('use-sim'), { timeout: 30_000 });
    await expect(page.locator(byId('browser-serial')).textContent()).resolves.toMatch(/serial port in this browser/i);
    await shot(page, 'web-01-bench');
  }, 120_000);

  it('connects the in-page simulated bench: identities and live readings as on the desktop', async () => {
    await page.click(byId('use-sim'));
    await page.waitForSelector(`${byId('connection-badge')}[data-kind="sim"]`, { timeout: 30_000 });
    await page.click(byId('nav-bench'));
    await page.waitForSelector(byId('sim-ribbon'));
    await textMatches(page, 'readout-temperature', /\d/);
    await expect(page.textContent(byId('identities'))).resolves.toContain('SIM-COUNTER');
    await shot(page, 'web-02-bench-simulated');
  }, 120_000);

  it('runs a gain sweep in the page to its Kvco figures', async () => {
    await page.click(byId('nav-sweep'));
    await page.waitForSelector(byId('start-sweep'));
    await page.click(byId('start-sweep'));
    await page.waitForSelector(byId('stall-region'), { timeout: 120_000 });
    for (const id of ['kvco-typ', 'kvco-min', 'kvco-max', 'tuning-range', 'stall-threshold', 'linearity'])
      shown[id] = await textMatches(page, id, /\d/, 120_000);
    console.log(`web edition sweep figures: ${JSON.stringify(shown)}`);
    expect(siValues(shown['kvco-typ'] ?? '')[0]).toBeGreaterThan(0);
    await shot(page, 'web-03-sweep-done');
  }, 120_000);

  it('logs a short drift in the page', async () => {
    await page.click(byId('nav-drift'));
    await page.fill(byId('drift-duration'), '60s');
    await page.fill(byId('drift-interval'), '1s');
    await page.click(byId('start-drift'));
    await page.waitForSelector(byId('adev-plot'), { timeout: 120_000 });
    await textMatches(page, 'drift-mean', /\d/, 120_000);
    await page.click(byId('nav-runs'));
    await expect
      .poll(async () => page.locator('[data-testid^="run-row-"] .status-complete').count(), { timeout: 60_000 })
      .toBe(2);
    await shot(page, 'web-04-drift-done');
  }, 120_000);

  it('after a reload both runs are in the archive, from OPFS, with their samples', async () => {
    await page.reload();
    await page.waitForSelector(byId('nav-runs'), { timeout: 30_000 });
    await page.click(byId('nav-runs'));
    await expect.poll(async () => (await runIds(page)).length, { timeout: 30_000 }).toBe(2);
    const ids = await runIds(page);
    const kinds = await Promise.all(ids.map((id) => page.textContent(byId(`run-row-${id}`))));
    sweepId = ids[kinds.findIndex((text) => text?.includes('sweep'))] ?? '';
    driftId = ids[kinds.findIndex((text) => text?.includes('drift'))] ?? '';
    expect(sweepId).not.toBe('');
    expect(driftId).not.toBe('');
    // The archive's Kvco column is worked out from the stored samples: the same figure as before the reload.
    const kvcoCell = await textMatches(page, `run-kvco-${sweepId}`, /\d/, 60_000);
    expect(Math.abs((siValues(kvcoCell)[0] ?? 0) / (siValues(shown['kvco-typ'] ?? '')[0] ?? 1) - 1)).toBeLessThan(
      SHOWN,
    );
    await page.click(byId(`run-open-${driftId}`));
    await page.waitForSelector(byId('run-detail'), { timeout: 30_000 });
    await shot(page, 'web-05-archive-after-reload');
  }, 120_000);

  it('downloads the sweep as a zip; tunebench analyze on its folder gives the figures the page showed', async () => {
    await page.selectOption(byId('run-zip-pick'), sweepId);
    const [download] = await Promise.all([page.waitForEvent('download'), page.click(byId('run-zip-export'))]);
    expect(download.suggestedFilename()).toBe(`${sweepId}.zip`);
    const zipPath = join(scratch, download.suggestedFilename());
    await download.saveAs(zipPath);
    const entries = await readZip(new Uint8Array(await readFile(zipPath)));
    expect(entries.map((e) => e.name).sort()).toEqual(
      ['events.jsonl', 'run.json', 'samples.csv'].map((f) => `${sweepId}/${f}`),
    );
    for (const entry of entries) {
      await mkdir(dirname(join(scratch, 'runs', entry.name)), { recursive: true });
      await writeFile(join(scratch, 'runs', entry.name), entry.bytes);
    }
    const samples = new TextDecoder().decode(entries.find((e) => e.name.endsWith('samples.csv'))?.bytes);
    expect(samples.trim().split('\n').length).toBeGreaterThan(50);
    const { stdout } = await promisify(execFile)(
      process.execPath,
      [join(PROJECT_ROOT, 'main/bin/tunebench.mjs'), 'analyze', join(scratch, 'runs', sweepId), '--json'],
      { maxBuffer: 64 * 1024 * 1024 },
    );
    const analysis = JSON.parse(stdout) as {
      kvco: { linear: { slopeHzPerV: number; maxLinearityErrorPct: number }; minHzPerV: number; maxHzPerV: number };
      tuningRange: { fMinHz: number; fMaxHz: number };
      stall: { thresholdV: number | null };
    };
    const close = (page: number | undefined, cli: number, shownDigits = SHOWN): void =>
      expect(Math.abs((page ?? NaN) / cli - 1)).toBeLessThan(shownDigits);
    const cli = {
      kvcoTyp: analysis.kvco.linear.slopeHzPerV,
      kvcoMin: analysis.kvco.minHzPerV,
      kvcoMax: analysis.kvco.maxHzPerV,
      linearityPct: analysis.kvco.linear.maxLinearityErrorPct,
      fMinHz: analysis.tuningRange.fMinHz,
      fMaxHz: analysis.tuningRange.fMaxHz,
      stallV: analysis.stall.thresholdV,
    };
    console.log(`tunebench analyze of the zipped web run: ${JSON.stringify(cli)}`);
    close(siValues(shown['kvco-typ'] ?? '')[0], cli.kvcoTyp);
    close(siValues(shown['kvco-min'] ?? '')[0], cli.kvcoMin);
    const [fMin, fMax] = siValues(shown['tuning-range'] ?? '');
    close(fMin, cli.fMinHz);
    close(fMax, cli.fMaxHz);
    close(siValues(shown['stall-threshold'] ?? '')[0], cli.stallV ?? NaN);
    close(siValues(shown['kvco-max'] ?? '')[0], cli.kvcoMax);
    // Linearity is shown to three digits.
    close(Number(/[\d.]+/.exec(shown.linearity ?? '')?.[0]), cli.linearityPct, 5e-3);
  }, 120_000);

  it('adds the zip back (after deleting the run) and shows it again; no page errors along the way', async () => {
    await page.click(byId(`run-delete-${sweepId}`));
    await expect.poll(async () => (await runIds(page)).includes(sweepId), { timeout: 20_000 }).toBe(false);
    await page.setInputFiles(byId('run-zip-import'), join(scratch, `${sweepId}.zip`));
    await textMatches(page, 'run-zip-message', /Added/, 30_000);
    await expect.poll(async () => (await runIds(page)).includes(sweepId), { timeout: 20_000 }).toBe(true);
    await shot(page, 'web-06-zip-added-back');
    expect(consoleErrors).toEqual([]);
  }, 120_000);
});
