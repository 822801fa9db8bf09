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
import { byId, hasChromium, launchChromium, SCREENS_DIR, serveApp, SKIP_REASON, type ServedApp } from './harness.ts';
import { shot, textMatches } from './page-steps.ts';

if (!hasChromium) console.warn(SKIP_REASON);

/** Reads a number out of a figure such as "1.234 MHz/V" (SI prefix applied). */
function siValue(text: string): number {
  // A figure "9.08 ± 0.22 kHz/V": the value, then the prefix after its ±.
  const match = /(-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)\s*([pnuµmkMG]?)/.exec(
    text.replace(/\u2212/g, '-').replace(/ ± [\d.]+/, ''),
  );
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
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  afterEach(async (context) => {
    // A failing step leaves a picture of what the user would have seen.
    if (context.task.result?.state === 'fail')
      await shot(page, `failed-${context.task.name.slice(0, 40).replace(/\W+/g, '-')}`);
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
    await expect
      .poll(async () => Number((await progress.getAttribute('data-done')) ?? 0), { timeout: 20_000, interval: 50 })
      .toBeGreaterThanOrEqual(20);
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
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.click(byId(`datasheet-export-${format}`)),
      ]);
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

  it('logs a short drift of 100 readings, stops it, and shows the drift and Allan deviation plots', async () => {
    await page.click(byId('nav-drift'));
    // Long enough that the log is still running when 100 readings are in, however slow the machine: at 25×
    // a 1 s slot is 40 ms of real time, and a loaded machine lets slots pass (by design the log never creeps
    // to catch up), so the test counts the readings the run recorded instead of trusting a duration.
    await page.fill(byId('drift-duration'), '1h');
    await page.fill(byId('drift-interval'), '1s');
    await page.click(byId('start-drift'));
    await page.waitForSelector(byId('drift-plot'), { timeout: 20_000 });
    const runningId = async (): Promise<string> =>
      (await app.service.listRuns()).find((run) => run.kind === 'drift' && run.status === 'running')?.id ?? '';
    await expect.poll(runningId, { timeout: 20_000, interval: 200 }).not.toBe('');
    const id = await runningId();
    const readings = async (): Promise<number> =>
      (await app.service.openRun(id)).samples.numeric.frequency_hz?.length ?? 0;
    await expect.poll(readings, { timeout: 180_000, interval: 500 }).toBeGreaterThanOrEqual(100);
    await page.click(byId('stop-run'));
    await page.click(byId('stop-run-yes'));
    await page.waitForSelector(byId('adev-plot'), { timeout: 60_000 });
    await textMatches(page, 'drift-mean', /\d/, 60_000);
    await shot(page, '07-drift-done');
    // Stopping a log by hand keeps it as a finished log with every reading it took.
    await expect.poll(async () => (await app.service.openRun(id)).meta.status, { timeout: 30_000 }).toBe('complete');
    const detail = await app.service.openRun(id);
    const times = Array.from(detail.samples.numeric.time_s ?? []);
    expect(times.length).toBeGreaterThanOrEqual(100);
    // One reading per 1 s slot at most: the log is scheduled on its slots, never faster than the interval asks.
    const span = (times.at(-1) ?? 0) - (times[0] ?? 0);
    expect(times.length - 1).toBeLessThanOrEqual(Math.floor(span / 1) + 1);
    expect(Array.from(detail.samples.numeric.frequency_hz ?? []).every((f) => f > 0)).toBe(true);
  }, 300_000); // bounded by the reading count, not by the machine's speed

  it('a drift log runs while the Bench screen shows its live frequency and "output on", from the run itself', async () => {
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.click(byId('nav-drift'));
    await page.fill(byId('drift-duration'), '30min');
    await page.fill(byId('drift-interval'), '1s');
    await page.click(byId('start-drift'));
    await page.click(byId('nav-bench'));
    await page.waitForSelector(`${byId('strip-output')}[data-output="on"]`, { timeout: 20_000 });
    await textMatches(page, 'readout-output', /^on$/);
    const shown = siValue(await textMatches(page, 'readout-frequency', /kHz/));
    // The figure is one of the run's own readings: the service's status comes from the run, not a second query.
    const status = await app.service.getBenchStatus();
    expect(status.source).toBe('run');
    const drift = (await app.service.listRuns()).find((run) => run.kind === 'drift' && run.status === 'running');
    const rows = (await app.service.openRun(drift?.id ?? '')).samples.numeric.frequency_hz ?? [];
    expect(Array.from(rows).some((f) => Math.abs(f - shown) <= 0.5)).toBe(true);
    await expect(page.textContent(byId('readout-source'))).resolves.toMatch(/run in progress/);
    // What would disturb the run is locked, and the screen says why.
    await expect(page.isDisabled(byId('use-sim'))).resolves.toBe(true);
    await expect(page.isDisabled(byId('connect-bench'))).resolves.toBe(true);
    await expect(page.isDisabled(byId('limit-max-control'))).resolves.toBe(true);
    await expect(page.textContent(byId('bench-locked'))).resolves.toMatch(/locked until it ends/);
    await shot(page, '09-bench-during-drift-1280-dark');
    await page.emulateMedia({ colorScheme: 'light' });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await shot(page, '09-bench-during-drift-1920-light');
    await page.click(byId('nav-drift'));
    await page.waitForSelector(byId('drift-plot-key'));
    await shot(page, '10-drift-running-1920-light');
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.setViewportSize({ width: 1280, height: 800 });
    await shot(page, '10-drift-running-1280-dark');
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow

  it('pause shows since when and where the control sits; stopping asks first, then says "safe state reached"', async () => {
    await page.click(byId('pause-run'));
    await page.waitForSelector(`${byId('progress')}[data-paused="yes"]`);
    await textMatches(page, 'strip-paused', /Paused since \d\d:\d\d:\d\d · control held at 2\.500* V/);
    await expect(page.textContent(byId('progress'))).resolves.toMatch(/^Paused since .* control held at 2\.500* V/);
    await shot(page, '11-drift-paused');
    await page.click(byId('resume-run'));
    await page.waitForSelector(`${byId('progress')}[data-paused="no"]`);
    await page.click(byId('stop-run'));
    const question = await textMatches(page, 'stop-run-confirm', /output turns off/);
    expect(question).toMatch(/control voltage goes to 0 V/);
    await shot(page, '12-stop-asks-first');
    // "Keep running" leaves the run alone.
    await page.click(byId('stop-run-no'));
    await expect.poll(async () => (await app.service.getBenchStatus()).source).toBe('run');
    await page.click(byId('stop-run'));
    await page.click(byId('stop-run-yes'));
    await page.waitForSelector(`${byId('strip-safe')}[data-reached="yes"]`, { timeout: 20_000 });
    await textMatches(page, 'strip-safe', /^Safe state reached \d\d:\d\d:\d\d · output off$/);
    await page.waitForSelector(`${byId('strip-output')}[data-output="off"]`);
    await shot(page, '13-safe-state-reached');
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow

  it('runs an up-down sweep and shows both directions, their readout and the hysteresis', async () => {
    await page.click(byId('nav-sweep'));
    await page.selectOption(byId('plan-direction'), 'up-down');
    await page.click(byId('start-sweep'));
    await textMatches(page, 'hysteresis', /Hz/, 90_000);
    const runs = await app.service.listRuns();
    const upDown = runs.find((run) => run.kind === 'sweep' && run.id !== sweepId && run.status === 'complete');
    const detail = await app.service.openRun(upDown?.id ?? '');
    const direction = detail.samples.text.direction;
    const levels = direction && !Array.isArray(direction) ? direction.levels : [...new Set(direction ?? [])];
    expect(levels).toEqual(expect.arrayContaining(['up', 'down']));
    // The cursor readout gives both directions at one setpoint.
    const over = page.locator(`${byId('sweep-plot')} .u-over`);
    const box = await over.boundingBox();
    if (!box) throw new Error('no plot area');
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height / 2);
    const values = await page.locator(`${byId('sweep-plot')} .u-legend .u-series .u-value`).allTextContents();
    // Rising and falling, each to the counter's 10 Hz (0.1 s gate): "12.80 kHz", never "12.8000 kHz".
    expect(values[1]).toMatch(/^\d{1,2}\.\d\d kHz$/);
    expect(values[2]).toMatch(/^\d{1,2}\.\d\d kHz$/);
    // The control voltage to the supply's 1 mV setting step.
    expect(values[0]).toMatch(/^(\d\.\d{3} V|\d{3} mV)$/);
    // Two cursors by clicking two readings: ΔV, Δf and the slope between them.
    await page.mouse.click(box.x + box.width * 0.5, box.y + box.height / 2);
    await page.mouse.click(box.x + box.width * 0.8, box.y + box.height / 2);
    const deltas = await textMatches(page, 'sweep-plot-deltas', /^ΔV .*V · Δf .*Hz · slope .*Hz\/V$/);
    // Rising with the voltage on this oscillator: B lies right of A, so the slope is positive.
    expect(deltas).not.toMatch(/slope −/);
    // ΔV to 1 mV, Δf to 10 Hz, the slope with the ± the two readings' quantisation leaves.
    expect(deltas).toMatch(/^ΔV (\d\.\d{3} V|\d{1,3} mV) · Δf \d{1,2}\.\d\d kHz · slope [\d.]+ ± [\d.]+ kHz\/V$/);
    await shot(page, '14-sweep-up-down');
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow

  it('exports the sweep plot as PNG and SVG and its data as CSV', async () => {
    const saved: Record<string, Buffer> = {};
    for (const format of ['png', 'svg', 'csv']) {
      const [download] = await Promise.all([page.waitForEvent('download'), page.click(byId(`sweep-plot-${format}`))]);
      expect(download.suggestedFilename()).toBe(`sweep-plot.${format}`);
      const path = join(app.downloadsDir, `plot.${format}`);
      await download.saveAs(path);
      saved[format] = await readFile(path);
    }
    // PNG signature (ISO/IEC 15948 §5.2, section number from memory) and a real image, not an empty canvas.
    expect([...(saved.png ?? Buffer.alloc(0)).subarray(0, 8)]).toEqual([
      0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a,
    ]);
    expect(saved.png?.length ?? 0).toBeGreaterThan(10_000);
    const svg = saved.svg?.toString('utf8') ?? '';
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svg).toContain('Control voltage');
    expect((svg.match(/<circle /g) ?? []).length).toBeGreaterThan(20);
    const csv = (saved.csv?.toString('utf8') ?? '').trim().split(/\r\n/);
    expect(csv[0]).toBe('Control,Rising,Falling,Fitted curve');
    expect(csv.length).toBeGreaterThan(20);
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow

  it('sorts and filters the archive, shows Kvco per sweep, and overlays two sweeps with a difference plot', async () => {
    await page.click(byId('nav-runs'));
    const kvco = siValue(await textMatches(page, `run-kvco-${sweepId}`, /Hz\/V/));
    // The archive's Kvco is the same best-line slope the sweep screen showed (4 significant digits there).
    expect(Math.abs(kvco / shownKvcoTyp - 1)).toBeLessThan(1e-3);
    await page.selectOption(byId('runs-filter-kind'), 'drift');
    await expect(page.locator(byId(`run-row-${sweepId}`)).count()).resolves.toBe(0);
    await page.selectOption(byId('runs-filter-kind'), 'sweep');
    await page.click(byId('runs-sort-kvco'));
    const sweeps = (await app.service.listRuns()).filter((run) => run.kind === 'sweep');
    for (const run of sweeps.slice(0, 2)) await page.check(byId(`run-pick-${run.id}`));
    await page.waitForSelector(byId('difference-plot'), { timeout: 20_000 });
    await shot(page, '15-archive-overlay-difference');
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow

  it('looks right on every screen at 1280×800 and 1920×1080 in both themes', async () => {
    for (const [width, height] of [
      [1280, 800],
      [1920, 1080],
    ] as const) {
      for (const theme of ['dark', 'light'] as const) {
        await page.setViewportSize({ width, height });
        await page.emulateMedia({ colorScheme: theme });
        for (const screen of ['bench', 'sweep', 'drift', 'runs', 'datasheet', 'loop']) {
          await page.click(byId(`nav-${screen}`));
          await page.waitForTimeout(300);
          await page.screenshot({ path: join(SCREENS_DIR, `20-${screen}-${width}-${theme}.png`) });
        }
      }
    }
    await page.setViewportSize({ width: 1280, height: 860 });
    await page.emulateMedia({ colorScheme: 'dark' });
  }, 180_000);

  it('shows the loop-filter screen with a design for the chosen sweep, and no script errors happened on the way', async () => {
    await page.click(byId('nav-loop'));
    // The form's first lock point is the run's own: a design, no error next to the reference field.
    await page.waitForSelector(byId('loop-magnitude-plot'), { timeout: 30_000 });
    await expect(page.locator(byId('loop-reference-error')).count()).resolves.toBe(0);
    await shot(page, '08-loop-filter');
    expect(consoleErrors).toEqual([]);
  });

  it('aborts a sweep: Abort asks first and says what the safe state does, then "safe state reached"', async () => {
    await page.click(byId('nav-sweep'));
    await page.selectOption(byId('plan-direction'), 'up');
    // Fine steps and more readings: a sweep long enough to still run while the question is answered.
    await page.fill(byId('plan-step'), '0.01');
    await page.fill(byId('plan-readings'), '5');
    const before = new Set((await app.service.listRuns()).map((run) => run.id));
    await page.click(byId('start-sweep'));
    const made = async () => (await app.service.listRuns()).find((run) => !before.has(run.id));
    await expect.poll(async () => (await made())?.status, { timeout: 30_000, interval: 100 }).toBe('running');
    await page.click(byId('stop-run'));
    const question = await textMatches(page, 'stop-run-confirm', /output turns off/);
    expect(question).toMatch(/control voltage goes to 0 V/);
    await shot(page, '16-sweep-abort-asks-first');
    await page.click(byId('stop-run-yes'));
    await page.waitForSelector(`${byId('progress')}[data-status="aborted"]`, { timeout: 30_000 });
    await textMatches(page, 'strip-safe', /^Safe state reached \d\d:\d\d:\d\d · output off$/);
    await page.waitForSelector(`${byId('strip-output')}[data-output="off"]`);
    // What the screen says is what the run recorded: aborted, every safe-state step read back.
    const id = (await made())?.id ?? '';
    await expect.poll(async () => (await app.service.openRun(id)).meta.status, { timeout: 30_000 }).toBe('aborted');
    const status = await app.service.getBenchStatus();
    expect(status.safeState?.runId).toBe(id);
    expect(status.safeState?.reached).toBe(true);
    expect(status.safeState?.failures).toEqual([]);
    await shot(page, '17-sweep-aborted-safe-state');
    expect(consoleErrors).toEqual([]);
  }, 120_000); // a busy shared machine can make Chromium and the simulated bench slow
});
