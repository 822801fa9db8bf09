/**
 * A new user's first session in browser mode, in headless Chromium against
 * `tunebench serve` (in-process, 127.0.0.1, ephemeral port) on the
 * simulated bench running 25× faster than real time: choose the simulated
 * bench, run a gain sweep and watch it fill in, read the Kvco figures, open
 * the run from the archive, export the gain table and check the files, log a
 * short drift. A screenshot of each screen goes to test-artifacts/screens/.
 */
import { mkdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { hasChromium, launchChromium, SCREENS_DIR, serveApp, SKIP_REASON, type ServedApp } from './harness.ts';

if (!hasChromium) console.warn(SKIP_REASON);

const byId = (id: string): string => `[data-testid="${id}"]`;

/** Waits until the text of a test id matches. */
async function textMatches(page: Page, testId: string, pattern: RegExp, timeoutMs = 30_000): Promise<string> {
  const locator = page.locator(byId(testId)).first();
  await expect.poll(async () => ((await locator.count()) > 0 ? ((await locator.textContent()) ?? '') : ''), { timeout: timeoutMs, interval: 100 }).toMatch(pattern);
  return (await locator.textContent()) ?? '';
}

async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: join(SCREENS_DIR, `${name}.png`), fullPage: true });
}

/** Reads a number out of a figure such as "1.234 MHz/V" (SI prefix applied). */
function siValue(text: string): number {
  const match = /(-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)\s*([pnuµmkMG]?)/.exec(text.replace(/\u2212/g, '-'));
  if (!match) return Number.NaN;
  const scale: Record<string, number> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };
  return Number(match[1]) * (scale[match[2] ?? ''] ?? 1);
}

describe.skipIf(!hasChromium)('a new user in browser mode (Chromium, simulated bench)', () => {
  let app: ServedApp;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let sweepId = '';
  /** Kvco typ as the sweep screen showed it, Hz/V. */
  let shownKvcoTyp = Number.NaN;
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    await mkdir(SCREENS_DIR, { recursive: true });
    app = await serveApp({ simSpeed: 25 });
    browser = await launchChromium();
    context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 860 }, colorScheme: 'dark' });
    page = await context.newPage();
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(error.message));
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  afterEach(async (context) => {
    // A failing step leaves a picture of what the user would have seen.
    if (context.task.result?.state === 'fail') await shot(page, `failed-${context.task.name.slice(0, 40).replace(/\W+/g, '-')}`);
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('opens the printed URL and is offered the simulated bench', async () => {
    const response = await page.goto(app.server.url);
    expect(response?.status()).toBe(200);
    await page.waitForSelector(byId('use-sim'), { timeout: 20_000 });
    await expect(page.textContent(byId('connection-badge'))).resolves.toMatch(/\S/);
    await shot(page, '01-bench-first-open');
  });

  it('connects to the simulated bench and shows live readings', async () => {
    await page.click(byId('use-sim'));
    await page.waitForSelector(`${byId('connection-badge')}[data-kind="sim"]`, { timeout: 15_000 });
    // The app goes on to the sweep screen; come back to look at the bench.
    await page.click(byId('nav-bench'));
    await page.waitForSelector(byId('sim-ribbon'));
    // Idle, the tuning port sits at 0 V (the DUT stalled, no frequency); the temperature reads.
    await textMatches(page, 'readout-temperature', /\d/);
    await expect(page.textContent(byId('identities'))).resolves.toContain('SIM-COUNTER');
    await shot(page, '02-bench-simulated');
  });

  it('runs a gain sweep: points arrive, the stall region appears, then the Kvco figures', async () => {
    await page.click(byId('nav-sweep'));
    await page.waitForSelector(byId('start-sweep'));
    await page.click(byId('start-sweep'));
    // Points arriving: the progress count moves while the run is still going.
    const progress = page.locator(byId('progress')).first();
    await expect.poll(async () => Number((await progress.getAttribute('data-done')) ?? 0), { timeout: 20_000, interval: 50 }).toBeGreaterThanOrEqual(20);
    await shot(page, '03-sweep-running');
    await page.waitForSelector(byId('stall-region'), { timeout: 60_000 });
    const runs = await app.service.listRuns();
    sweepId = runs.find((run) => run.kind === 'sweep')?.id ?? '';
    expect(sweepId).not.toBe('');
    await textMatches(page, 'kvco-typ', /\d/, 60_000);
    const typ = siValue((await page.textContent(byId('kvco-typ'))) ?? '');
    const min = siValue((await page.textContent(byId('kvco-min'))) ?? '');
    const max = siValue((await page.textContent(byId('kvco-max'))) ?? '');
    // A working VCO has a positive gain, and the typical lies between the extremes.
    expect(typ).toBeGreaterThan(0);
    shownKvcoTyp = typ;
    expect(min).toBeLessThanOrEqual(typ);
    expect(max).toBeGreaterThanOrEqual(typ);
    await expect(page.textContent(byId('stall-threshold'))).resolves.toMatch(/\d.*V/);
    await expect(page.textContent(byId('tuning-range'))).resolves.toMatch(/Hz/);
    await shot(page, '04-sweep-done');
    const ended = await app.service.openRun(sweepId);
    expect(ended.meta.status).toBe('complete');
  });

  it('opens the run from the run archive', async () => {
    await page.click(byId('nav-runs'));
    await page.waitForSelector(byId(`run-row-${sweepId}`), { timeout: 15_000 });
    await expect(page.textContent(byId(`run-row-${sweepId}`))).resolves.toContain('sweep');
    await page.click(byId(`run-open-${sweepId}`));
    await page.waitForSelector(byId('run-detail'), { timeout: 15_000 });
    await shot(page, '05-runs-opened');
  });

  it('exports the gain table as CSV, Markdown and HTML with the run in it', async () => {
    await page.click(byId('nav-datasheet'));
    const pick = page.locator(byId(`datasheet-pick-${sweepId}`));
    await pick.waitFor({ timeout: 15_000 });
    if (!(await pick.isChecked())) await pick.check();
    await page.waitForSelector(byId('datasheet-table'), { timeout: 30_000 });
    await shot(page, '06-datasheet');
    const saved: Record<string, string> = {};
    for (const format of ['csv', 'md', 'html']) {
      const [download] = await Promise.all([page.waitForEvent('download'), page.click(byId(`datasheet-export-${format}`))]);
      const path = join(app.downloadsDir, `sheet.${format}`);
      await download.saveAs(path);
      expect(download.suggestedFilename()).toMatch(new RegExp(`\\.${format}$`));
      saved[format] = await readFile(path, 'utf8');
    }
    // CSV in SI base units: the best-line Kvco equals the figure on the sweep screen (shown to 4 digits).
    const csvLines = (saved.csv ?? '').trim().split(/\r?\n/);
    expect(csvLines[0]).toBe('key,parameter,conditions,min,typ,max,unit,runs,uncertainty,significant,bench');
    const bestLine = csvLines.find((line) => /best straight line/i.test(line))?.split(',') ?? [];
    expect(bestLine.at(-5)).toBe('Hz/V');
    expect(Math.abs(Number(bestLine.at(-7)) / shownKvcoTyp - 1)).toBeLessThan(1e-3);
    // A run of the simulated bench says so in every export.
    expect(bestLine.at(-1)).toBe('simulated');
    expect(saved.md).toMatch(/SIMULATED BENCH/);
    expect(saved.html).toMatch(/SIMULATED BENCH/);
    expect(saved.md).toMatch(/^\|.*\|$/m);
    expect(saved.md).toMatch(/\| *-+/);
    expect(saved.html).toMatch(/<table[\s>]/);
    // The table names the DUT of the run it was built from.
    expect(saved.md).toContain('clkmul-vco-01');
  });

  it('logs a short drift and shows the drift and Allan deviation plots', async () => {
    await page.click(byId('nav-drift'));
    await page.fill(byId('drift-duration'), '120s');
    await page.fill(byId('drift-interval'), '1s');
    await page.click(byId('start-drift'));
    await page.waitForSelector(byId('drift-plot'), { timeout: 20_000 });
    await page.waitForSelector(byId('adev-plot'), { timeout: 60_000 });
    await textMatches(page, 'drift-mean', /\d/, 60_000);
    await shot(page, '07-drift-done');
    const drift = (await app.service.listRuns()).find((run) => run.kind === 'drift');
    expect(drift?.status).toBe('complete');
    const detail = await app.service.openRun(drift?.id ?? '');
    expect(detail.samples.numeric.frequency_hz?.length).toBeGreaterThanOrEqual(100);
  });

  it('shows the loop-filter screen, and no script errors happened on the way', async () => {
    await page.click(byId('nav-loop'));
    await page.waitForTimeout(500);
    await shot(page, '08-loop-filter');
    expect(consoleErrors).toEqual([]);
  });
});
