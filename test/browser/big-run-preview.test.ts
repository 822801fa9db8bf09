/**
 * A big drift run opens from its pixel preview (issue 12 item 2): opened
 * from the run archive, the drift plot is drawn first from the preview main
 * sends before the full columns, with its note on screen and no analysis,
 * then from the slices main cuts of every reading (the page never receives
 * the readings: app/contract/run-window.ts), with main's analysis (tempco and
 * Allan deviation plots); a zoom is refined from main down to the readings
 * themselves, and the CSV export holds every reading, from main.
 * A 200,000-reading run keeps the test quick; the speed and memory figures
 * are in `npm run bench -- browser` and `big-runs`.
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeSyntheticDriftRun } from '../bench/drift-run-writer.ts';
import { byId, hasChromium, launchChromium, SCREENS_DIR, serveApp, shotOnFailure, SKIP_REASON } from './harness.ts';
import type { ServedApp } from './harness.ts';

if (!hasChromium) console.warn(SKIP_REASON);

/** What the page showed, recorded by a MutationObserver from before the click (a string: runs in the page). */
const WATCH = `(() => {
  const seen = [];
  window.__previewSeen = seen;
  const look = () => {
    const note = document.querySelector('[data-testid="drift-preview-note"]');
    const canvas = document.querySelector('[data-testid="drift-plot"] canvas');
    const figures = document.querySelector('[data-testid="drift-figures"]');
    const state = {
      preview: note !== null,
      plot: canvas !== null,
      tempco: document.querySelector('[data-testid="tempco-plot"]') !== null,
      note: note ? note.textContent : null,
      figures: figures ? figures.textContent : null,
    };
    const last = seen[seen.length - 1];
    if (!last || last.preview !== state.preview || last.plot !== state.plot || last.tempco !== state.tempco) seen.push(state);
  };
  new MutationObserver(look).observe(document.body, { childList: true, subtree: true });
})()`;

interface Seen {
  preview: boolean;
  plot: boolean;
  tempco: boolean;
  note: string | null;
  figures: string | null;
}

describe.skipIf(!hasChromium)('a big drift run opens from its pixel preview (Chromium)', () => {
  let app: ServedApp;
  let browser: Browser;
  let page: Page | undefined;
  let scratch: string;
  let id: string;
  shotOnFailure('big-run-preview', () => page);

  beforeAll(async () => {
    scratch = await mkdtemp(join(tmpdir(), 'tunebench-big-run-'));
    const runsDir = join(scratch, 'runs');
    id = await writeSyntheticDriftRun({ runsDir, samples: 200_000 });
    app = await serveApp({ runsDir });
    browser = await launchChromium();
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await rm(scratch, { recursive: true, force: true });
  });

  it('draws the preview, marked, before the full data, and analyses only the full data', async () => {
    page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await page.goto(app.server.url);
    await page.click(byId('nav-runs'));
    await page.waitForSelector(byId(`run-open-${id}`));
    await page.evaluate(WATCH);
    await page.click(byId(`run-open-${id}`));
    await page.waitForSelector(`${byId('tempco-plot')} canvas`, { timeout: 60_000 });
    await page.waitForSelector(byId('drift-plot-key'));
    expect(await page.$(byId('drift-preview-note'))).toBeNull();
    await page.screenshot({ path: join(SCREENS_DIR, 'big-run-full.png') });
    const seen = await page.evaluate<Seen[]>('window.__previewSeen');
    const first = seen.findIndex((s) => s.plot);
    // The first plot on screen is the preview, with its note and no analysis yet.
    expect(seen[first]).toMatchObject({ preview: true, plot: true, tempco: false });
    expect(seen[first]?.note).toContain('Preview: 200,000 readings drawn at screen resolution');
    expect(seen[first]?.figures).toContain('Analysed once every reading has arrived.');
    // Then the full data: the note gone, the analysis' plots there.
    expect(seen.slice(first).some((s) => !s.preview && s.plot && s.tempco)).toBe(true);
    // The run's readings as the full view counts them.
    expect(await page.textContent(byId('run-facts'))).toContain('200000 readings');
    // Its readings stayed in main: the page never asked for the full columns.
    const marks = await page.evaluate<string[]>("performance.getEntriesByType('mark').map((m) => m.name)");
    expect(marks).toContain('tunebench:open-run:window');
    expect(marks).not.toContain('tunebench:open-run:fetched');
  }, 120_000);

  it('refines a zoom from main down to the readings themselves, and exports every reading as CSV', async () => {
    if (!page) throw new Error('no page');
    const p = page;
    const over = p.locator(`${byId('drift-plot')} .u-over`);
    await over.scrollIntoViewIfNeeded();
    await p.screenshot({ path: join(SCREENS_DIR, 'big-run-open.png'), fullPage: true });
    const box = await over.boundingBox();
    if (!box) throw new Error('no plot area');
    // 200,000 readings at 1/16 s span 12,500 s; zoom twice by dragging along x: to about 1/50, then again.
    const drag = async (from: number, to: number): Promise<void> => {
      await p.mouse.move(box.x + box.width * from, box.y + box.height * 0.5);
      await p.mouse.down();
      await p.mouse.move(box.x + box.width * to, box.y + box.height * 0.5, { steps: 6 });
      await p.mouse.up();
    };
    // What main sent for the newest view (app/views/drift/held-log.ts marks each window with it).
    const LAST_WINDOW =
      "(performance.getEntriesByName('tunebench:open-run:window').at(-1) || { detail: { points: -1, dense: true } }).detail";
    const lastWindow = (): Promise<{ points: number; dense: boolean }> => p.evaluate(LAST_WINDOW);
    expect(await lastWindow()).toMatchObject({ dense: true });
    expect((await lastWindow()).points).toBeLessThanOrEqual(1280 / 4);
    await drag(0.5, 0.52);
    await p.waitForSelector(byId('drift-plot-reset'));
    await drag(0.3, 0.32);
    // Zoomed to fewer readings than a quarter of the plot's pixels: main sends the readings themselves, drawn with markers.
    // (Polled from here: the page's CSP refuses waitForFunction's string evaluation.)
    let shown = await lastWindow();
    for (let tries = 0; tries < 300 && shown.dense; tries += 1) {
      await p.waitForTimeout(100);
      shown = await lastWindow();
    }
    expect(shown.dense).toBe(false);
    // About 5 s of the log at 16 readings a second, each reading drawn (and one beyond each edge).
    expect(shown.points).toBeGreaterThan(20);
    expect(shown.points).toBeLessThan(200);
    await p.waitForTimeout(500); // the frame that draws it
    await p.locator(byId('drift-plot')).screenshot({ path: join(SCREENS_DIR, 'big-run-zoomed.png') });
    // Zoomed onto readings that vary by less than one tick step the counter resolves, the frequency axis still
    // labels at least two ticks (it once drew none: the scale was narrower than its finest allowed step).
    const [svgDownload] = await Promise.all([p.waitForEvent('download'), p.click(byId('drift-plot-svg'))]);
    const svgPath = join(scratch, 'drift-zoomed.svg');
    await svgDownload.saveAs(svgPath);
    const frequencyLabels = [...(await readFile(svgPath, 'utf8')).matchAll(/>([\d.]+) MHz</g)].map((m) => m[1]);
    expect(
      new Set(frequencyLabels).size,
      `frequency tick labels: ${frequencyLabels.join(', ')}`,
    ).toBeGreaterThanOrEqual(2);
    const [download] = await Promise.all([p.waitForEvent('download'), p.click(byId('drift-plot-csv'))]);
    const path = join(scratch, 'drift.csv');
    await download.saveAs(path);
    const lines = (await readFile(path, 'utf8')).split('\r\n');
    expect(lines[0]).toBe('time_s,frequency_hz,temperature_c');
    // Every reading (header + 200,000 rows + the final line break), not the slices on screen.
    expect(lines.length).toBe(200_002);
    // The first reading of ./drift-run-writer.ts' oscillator: 400 MHz less its 2 kHz warm-up, at 23 °C.
    expect(lines[1]).toMatch(/^0,3999980\d\d(\.\d+)?,23$/);
  }, 120_000);
});
