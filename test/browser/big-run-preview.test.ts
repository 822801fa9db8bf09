/**
 * A big drift run opens from its pixel preview (issue 12 item 2): opened
 * from the run archive, the drift plot is drawn first from the preview main
 * sends before the full columns, with its note on screen and no analysis,
 * then again from every reading, with the tempco and Allan deviation plots.
 * A 200,000-reading run keeps the test quick; the speed figures are in
 * `npm run bench -- browser` and `big-runs`.
 */
import { mkdtemp, rm } from 'node:fs/promises';
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
  }, 120_000);
});
