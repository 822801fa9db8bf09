/**
 * Times opening a stored run from the run archive, inside the page: from
 * the click on "Open" to the first drift plot drawn and painted (the pixel
 * preview for a big run), to the plot drawn again from the full columns,
 * (a log held in main: from main's first window of every reading, app/views/drift/held-log.ts)
 * and to the analysis shown (the tempco plot). The page's own performance
 * marks split the time (app/state/runs-store.ts, app/bridge/ws-inbound.ts,
 * app/plots/PlotPanel.tsx).
 */
import type { Page } from 'playwright-core';

export interface OpenTiming {
  /** Click to the first drift plot painted. */
  firstDrawMs: number;
  /** Click to the plot painted from every reading. */
  fullDrawMs: number;
  /** Click to the tempco plot (the analysis) on screen; NaN when it did not show within the wait. */
  analysedMs: number;
  /** Whether the first plot was the preview (its note was on screen with it). */
  previewFirst: boolean;
  /** Every mark after the click, ms from the click (first of each name). */
  marks: Record<string, number>;
}

/** In-page script (a string: tsx's helpers do not exist in the page). `__ID__` is replaced by the run id. */
const SCRIPT = `new Promise((resolve, reject) => {
  const drawn = 'tunebench:plot-drawn:drift-plot';
  const start = performance.now();
  const marks = {};
  let firstDrawMs = null;
  let previewFirst = false;
  let fullDrawMs = null;
  let analysedMs = null;
  let fullColumnsAt = null;
  const painted = (then) => requestAnimationFrame(() => requestAnimationFrame(() => then(performance.now() - start)));
  const finish = () => {
    if (firstDrawMs === null || firstDrawMs < 0 || fullDrawMs === null || fullDrawMs < 0 || analysedMs === null) return;
    observer.disconnect();
    resolve({ firstDrawMs, fullDrawMs, analysedMs, previewFirst, marks });
  };
  const observer = new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) {
      if (entry.startTime < start) continue;
      if (!(entry.name in marks)) marks[entry.name] = entry.startTime - start;
      // The full data: every reading's columns in the page, or (a log held in main) main's first window of them.
      if (entry.name === 'tunebench:open-run:columns' && fullColumnsAt === null) fullColumnsAt = entry.startTime;
      if (entry.name === 'tunebench:open-run:window' && fullColumnsAt === null) {
        fullColumnsAt = entry.startTime;
        if (fullDrawMs === null && firstDrawMs !== null) {
          fullDrawMs = -1;
          painted((ms) => { fullDrawMs = ms; finish(); });
        }
      }
      if (entry.name !== drawn) continue;
      if (firstDrawMs === null) {
        firstDrawMs = -1;
        previewFirst = document.querySelector('[data-testid="drift-preview-note"]') !== null;
        painted((ms) => { firstDrawMs = ms; if (!previewFirst) fullDrawMs = ms; finish(); });
      }
      if (fullDrawMs === null && fullColumnsAt !== null && entry.startTime >= fullColumnsAt) {
        fullDrawMs = -1;
        painted((ms) => { fullDrawMs = ms; finish(); });
      }
    }
  });
  observer.observe({ type: 'mark', buffered: false });
  const poll = setInterval(() => {
    if (analysedMs === null && document.querySelector('[data-testid="tempco-plot"] canvas')) {
      analysedMs = performance.now() - start;
      clearInterval(poll);
      finish();
    }
  }, 20);
  document.querySelector('[data-testid="run-open-__ID__"]').click();
  setTimeout(() => {
    clearInterval(poll);
    if (firstDrawMs !== null && firstDrawMs >= 0 && fullDrawMs !== null && fullDrawMs >= 0) {
      resolve({ firstDrawMs, fullDrawMs, analysedMs: NaN, previewFirst, marks });
    } else reject(new Error('the drift plot was not drawn from the full data within __WAIT__ ms'));
  }, __WAIT__);
})`;

export async function timeRunOpen(page: Page, id: string, waitMs = 120_000): Promise<OpenTiming> {
  return page.evaluate<OpenTiming>(SCRIPT.replaceAll('__ID__', id).replaceAll('__WAIT__', String(waitMs)));
}
