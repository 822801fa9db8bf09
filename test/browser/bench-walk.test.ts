/**
 * The parts of issue 11 a bench user meets that the new-user test does not
 * walk, in Chromium against browser mode on the simulated bench (25× real
 * time): bring-up by hand on the Bench screen (item 10), the marks' key and
 * the stall edge's ± on the sweep plot (item 8), zoom along y and in a box
 * with the visible reset (item 10), Disconnect during a run asking first
 * (item 2), the drift plot's axes in clock units with no label touching
 * another at 1280×800 while running (item 5), and what a reload keeps
 * (item 9). Steps wait on what the run recorded, never on a duration.
 */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { byId, hasChromium, launchChromium, SCREENS_DIR, serveApp, shotOnFailure, SKIP_REASON } from './harness.ts';
import type { ServedApp } from './harness.ts';
import { shot, textMatches } from './page-steps.ts';

if (!hasChromium) console.warn(SKIP_REASON);

/** A text element's box on the page, as laid out by Chromium. */
interface TextBox {
  text: string;
  left: number;
  right: number;
  top: number;
  bottom: number;
}

/** Lays an exported SVG out in the page and returns each text's box (in-page script as text: no DOM types here). */
async function svgTextBoxes(page: Page, svg: string): Promise<TextBox[]> {
  return page.evaluate<TextBox[]>(`(() => {
    const host = document.createElement('div');
    host.id = 'svg-probe';
    host.innerHTML = ${JSON.stringify(svg)};
    document.body.append(host);
    const boxes = Array.from(host.querySelectorAll('text'), (t) => {
      const r = t.getBoundingClientRect();
      return { text: t.textContent ?? '', left: r.left, right: r.right, top: r.top, bottom: r.bottom };
    });
    host.remove();
    return boxes;
  })()`);
}

const touches = (a: TextBox, b: TextBox): boolean =>
  a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;

describe.skipIf(!hasChromium)('a bench user walks the status, marks, zoom, locks and reload (Chromium)', () => {
  let app: ServedApp;
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let driftId = '';
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    await mkdir(SCREENS_DIR, { recursive: true });
    app = await serveApp({ simSpeed: 25 });
    browser = await launchChromium();
    context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 800 } });
    page = await context.newPage();
    await page.emulateMedia({ colorScheme: 'dark' });
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(error.message));
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  shotOnFailure('walk', () => page);

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('item 10: bring-up by hand sets the control voltage and the output under the limits, read back', async () => {
    await page.goto(app.server.url);
    await page.click(byId('use-sim'));
    await page.waitForSelector(`${byId('connection-badge')}[data-kind="sim"]`, { timeout: 20_000 });
    await page.click(byId('nav-bench'));
    await page.waitForSelector(byId('manual-control'));
    // Above the limit (5 V): refused next to the field, nothing sent.
    await page.fill(byId('manual-level'), '7');
    await textMatches(page, 'manual-level-error', /\S/);
    await expect(page.isDisabled(byId('manual-on'))).resolves.toBe(true);
    await page.fill(byId('manual-level'), '1.5');
    await page.click(byId('manual-on'));
    await page.waitForSelector(`${byId('strip-output')}[data-output="on"]`, { timeout: 20_000 });
    await textMatches(page, 'readout-control-set', /^1\.500 V$/);
    const status = await app.service.getBenchStatus();
    expect(status.output).toBe(true);
    expect(status.controlSetV).toBeCloseTo(1.5, 6);
    await shot(page, 'walk-01-bring-up-by-hand');
    await page.click(byId('manual-off'));
    await page.waitForSelector(`${byId('strip-output')}[data-output="off"]`, { timeout: 20_000 });
  }, 120_000);

  it('item 8 and 10: the sweep plot keys its marks, the stall edge carries its ±; y and box zoom reset visibly', async () => {
    await page.click(byId('nav-sweep'));
    await page.selectOption(byId('plan-direction'), 'up-down');
    await page.click(byId('start-sweep'));
    await textMatches(page, 'hysteresis', /Hz/, 120_000);
    await textMatches(page, 'stall-threshold', / ± .*V/);
    for (const key of ['key-stall', 'key-unstable']) await expect(page.locator(byId(key)).count()).resolves.toBe(1);
    await expect(page.locator(byId('stall-region')).count()).resolves.toBeGreaterThan(0);
    const over = page.locator(`${byId('sweep-plot')} .u-over`);
    const box = await over.boundingBox();
    if (!box) throw new Error('no plot area');
    for (const mode of ['y', 'box'] as const) {
      await page.selectOption(byId('sweep-plot-zoom-mode'), mode);
      await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.3);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.7, { steps: 8 });
      await page.mouse.up();
      await page.waitForSelector(byId('sweep-plot-reset'), { timeout: 10_000 });
      // "Whole range" on one line at 1280 px, as tall as its neighbours (item 11: no control's words wrap).
      const reset = await page.locator(byId('sweep-plot-reset')).boundingBox();
      const png = await page.locator(byId('sweep-plot-png')).boundingBox();
      expect(Math.abs((reset?.height ?? 0) - (png?.height ?? 0))).toBeLessThan(2);
      if (mode === 'box') await shot(page, 'walk-02-sweep-marks-box-zoom');
      await page.click(byId('sweep-plot-reset'));
      await page.waitForSelector(byId('sweep-plot-reset'), { state: 'detached', timeout: 10_000 });
    }
    await page.selectOption(byId('sweep-plot-zoom-mode'), 'x');
    await page.emulateMedia({ colorScheme: 'light' });
    await page.setViewportSize({ width: 1920, height: 1080 });
    await shot(page, 'walk-03-sweep-marks-1920-light');
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.setViewportSize({ width: 1280, height: 800 });
  }, 180_000);

  it('item 2 and 5: Disconnect during a log asks first; the running drift plot reads in clock units, nothing touching', async () => {
    await page.click(byId('nav-drift'));
    await page.fill(byId('drift-duration'), '30min');
    await page.fill(byId('drift-interval'), '1s');
    await page.click(byId('start-drift'));
    const running = async (): Promise<string> =>
      (await app.service.listRuns()).find((run) => run.kind === 'drift' && run.status === 'running')?.id ?? '';
    await expect.poll(running, { timeout: 30_000, interval: 200 }).not.toBe('');
    driftId = await running();
    // Disconnect asks first and says what it would do; "keep" leaves the log running.
    await page.click(byId('nav-bench'));
    await page.click(byId('disconnect-bench'));
    const question = await textMatches(page, 'disconnect-bench-confirm', /\S/);
    expect(question).toMatch(/0 V|output/);
    await shot(page, 'walk-04-disconnect-asks-first');
    await page.click(byId('disconnect-bench-no'));
    await expect.poll(async () => (await app.service.getBenchStatus()).source).toBe('run');
    // 150 readings: past two minutes, so the time axis steps in minutes and seconds.
    const readings = async (): Promise<number> =>
      (await app.service.openRun(driftId)).samples.numeric.frequency_hz?.length ?? 0;
    await expect.poll(readings, { timeout: 240_000, interval: 500 }).toBeGreaterThanOrEqual(150);
    await page.click(byId('nav-drift'));
    await page.waitForSelector(byId('drift-plot'));
    for (const theme of ['dark', 'light'] as const) {
      await page.emulateMedia({ colorScheme: theme });
      const [download] = await Promise.all([page.waitForEvent('download'), page.click(byId('drift-plot-svg'))]);
      const path = join(app.downloadsDir, `drift-${theme}.svg`);
      await download.saveAs(path);
      const { readFile } = await import('node:fs/promises');
      const boxes = await svgTextBoxes(page, await readFile(path, 'utf8'));
      // The time ticks: round clock units ("1 min 30 s", "2 min"), never "0.333333 min".
      const timeTicks = boxes.filter((b) => /^\d+ (s|min)( \d\d s)?$/.test(b.text));
      expect(timeTicks.length).toBeGreaterThanOrEqual(2);
      expect(timeTicks.some((b) => /min/.test(b.text))).toBe(true);
      expect(boxes.some((b) => /\d\.\d{3,} min/.test(b.text))).toBe(false);
      // The frequency ticks step no finer than a count: the log's 0.1 s gate (the screen's default) reads in
      // 10 Hz counts (resolution 1/gate, common practice), so ticks 2 Hz apart would draw a scale the data lack.
      const frequencyTicks = boxes
        .map((b) => /^([\d.]+) (k?)Hz$/.exec(b.text))
        .filter((m): m is RegExpExecArray => m !== null)
        .map((m) => {
          const scale = m[2] === 'k' ? 1e3 : 1;
          return { hz: Number(m[1]) * scale, lastDigitHz: 10 ** -(m[1]?.split('.')[1] ?? '').length * scale };
        });
      expect(frequencyTicks.length).toBeGreaterThanOrEqual(2);
      const tickHz = [...new Set(frequencyTicks.map((t) => t.hz))].sort((a, b) => a - b);
      const tickSteps = tickHz.slice(1).map((hz, i) => hz - (tickHz[i] as number));
      expect(Math.min(...tickSteps), `frequency ticks ${tickHz.join(', ')} Hz`).toBeGreaterThanOrEqual(10 - 1e-6);
      // …and their labels write no digit below 10 Hz ("13.78 kHz", never "13.782 kHz").
      expect(Math.min(...frequencyTicks.map((t) => t.lastDigitHz))).toBeGreaterThanOrEqual(10 - 1e-6);
      // No label touches another: ticks, axis titles (the right one beside its ticks), legend.
      const clashes: string[] = [];
      for (let i = 0; i < boxes.length; i++)
        for (let j = i + 1; j < boxes.length; j++)
          if (touches(boxes[i] as TextBox, boxes[j] as TextBox)) clashes.push(`${boxes[i]?.text} / ${boxes[j]?.text}`);
      expect(clashes).toEqual([]);
      await shot(page, `walk-05-drift-running-1280-${theme}`);
    }
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.click(byId('stop-run'));
    await textMatches(page, 'stop-run-confirm', /output turns off/);
    await page.click(byId('stop-run-yes'));
    await page.waitForSelector(`${byId('strip-safe')}[data-reached="yes"]`, { timeout: 30_000 });
    await expect
      .poll(async () => (await app.service.openRun(driftId)).meta.status, { timeout: 30_000 })
      .toBe('complete');
  }, 360_000);

  it('item 9: after a reload the sweep and drift screens show the latest stored runs, the hold voltage and the run facts', async () => {
    await page.reload();
    await page.waitForSelector(byId('status-strip'), { timeout: 20_000 });
    await page.click(byId('nav-sweep'));
    await textMatches(page, 'stored-from', /Latest stored sweep/);
    await textMatches(page, 'kvco-typ', /Hz\/V/, 60_000);
    await shot(page, 'walk-06-sweep-after-reload');
    await page.click(byId('nav-drift'));
    await textMatches(page, 'stored-from', /Latest stored drift log/);
    await textMatches(page, 'drift-hold', /^2\.500 V$/);
    await shot(page, 'walk-07-drift-after-reload');
    await page.click(byId('nav-runs'));
    await page.click(byId(`run-open-${driftId}`));
    await page.waitForSelector(byId('run-detail'), { timeout: 20_000 });
    const sweep = (await app.service.listRuns()).find((run) => run.kind === 'sweep');
    await page.click(byId(`run-open-${sweep?.id ?? ''}`));
    await textMatches(page, 'run-plan', /\S/);
    await textMatches(page, 'run-instruments', /SIM/);
    await textMatches(page, 'run-conditions', /V/);
    await shot(page, 'walk-08-run-details');
    expect(consoleErrors).toEqual([]);
  }, 120_000);
});
