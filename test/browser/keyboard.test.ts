/**
 * One flow by keyboard alone (Tab, Shift+Tab, Enter, Space), in headless
 * Chromium against browser mode on the simulated bench (25× real time):
 * skip link, connect the simulated bench, start a sweep, read the key
 * figures, start again, pause, abort through its question. Then every
 * screen at 1280×800 is checked for controls whose words do not fit
 * (a select's chosen option wider than its box, a button's label cut or
 * wrapped). Screenshots go to test-artifacts/screens/.
 */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  byId,
  hasChromium,
  launchChromium,
  SCREENS_DIR,
  serveApp,
  SKIP_REASON,
  shotOnFailure,
  type ServedApp,
} from './harness.ts';

if (!hasChromium) console.warn(SKIP_REASON);

/** What has the keyboard now: its test id, else its id, else its tag. (In-page scripts are plain JS text.) */
const focused = (page: Page): Promise<string> =>
  page.evaluate<string>(`(() => {
    const at = document.activeElement;
    if (!at || at === document.body) return 'body';
    return at.getAttribute('data-testid') ?? (at.id ? '#' + at.id : at.tagName.toLowerCase());
  })()`);

/** Presses `key` until the focus is on `testId`; fails after `limit` presses. Returns the stops passed. */
async function tabTo(page: Page, testId: string, key: 'Tab' | 'Shift+Tab' = 'Tab', limit = 80): Promise<string[]> {
  const passed: string[] = [];
  for (let i = 0; i < limit; i++) {
    await page.keyboard.press(key);
    const at = await focused(page);
    if (at === testId) return passed;
    passed.push(at);
  }
  throw new Error(`${testId} not reached in ${limit} × ${key}; passed: ${passed.join(', ')}`);
}

interface Cramped {
  what: string;
  text: string;
  why: string;
}

/**
 * Controls on the page whose words do not fit: buttons whose label overflows (scrollWidth > clientWidth) or
 * wraps onto a second line, selects whose chosen option is wider than the box leaves for text.
 */
const crampedControls = (page: Page): Promise<Cramped[]> =>
  page.evaluate<Cramped[]>(`(() => {
    const found = [];
    const name = (el) => el.getAttribute('data-testid') ?? el.tagName.toLowerCase();
    const visible = (el) => el.offsetParent !== null && el.getClientRects().length > 0;
    for (const button of document.querySelectorAll('button, a.button')) {
      if (!visible(button)) continue;
      const text = (button.textContent ?? '').trim();
      if (button.scrollWidth > button.clientWidth + 1)
        found.push({ what: name(button), text, why: 'scrollWidth ' + button.scrollWidth + ' > ' + button.clientWidth });
      const range = document.createRange();
      range.selectNodeContents(button);
      const lines = new Set(Array.from(range.getClientRects(), (rect) => Math.round(rect.top)));
      if (lines.size > 1) found.push({ what: name(button), text, why: 'wraps onto ' + lines.size + ' lines' });
    }
    const probe = document.createElement('span');
    probe.style.cssText = 'position:absolute;visibility:hidden;white-space:pre;left:-9999px';
    document.body.append(probe);
    for (const select of document.querySelectorAll('select')) {
      if (!visible(select)) continue;
      const style = getComputedStyle(select);
      probe.style.font = style.font;
      probe.style.letterSpacing = style.letterSpacing;
      const text = select.selectedOptions[0]?.textContent ?? '';
      probe.textContent = text;
      // The text box of a select: its width less padding and the drop-down arrow (about 20 px in Chromium).
      const room = select.clientWidth - parseFloat(style.paddingLeft) - parseFloat(style.paddingRight) - 20;
      if (select.scrollWidth > select.clientWidth + 1 || probe.offsetWidth > room)
        found.push({ what: name(select), text, why: 'needs ' + probe.offsetWidth + ' px, has ' + Math.round(room) + ' px' });
    }
    probe.remove();
    return found;
  })()`);

describe.skipIf(!hasChromium)('keyboard only, and controls that fit at 1280×800 (Chromium, simulated bench)', () => {
  let app: ServedApp;
  let browser: Browser;
  let page: Page;
  const shot = (name: string) => page.screenshot({ path: join(SCREENS_DIR, `${name}.png`) });

  beforeAll(async () => {
    await mkdir(SCREENS_DIR, { recursive: true });
    app = await serveApp({ simSpeed: 25 });
    browser = await launchChromium();
    page = await browser.newPage({ viewport: { width: 1280, height: 800 }, colorScheme: 'dark' });
  }, 240_000); // may build the renderer first (vite), slow on a busy 2-core machine

  shotOnFailure('kb', () => page);

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('the first Tab reaches the skip link, which jumps past the top bar and the rail', async () => {
    await page.goto(app.server.url);
    await page.waitForSelector(byId('use-sim'), { timeout: 20_000 });
    await page.keyboard.press('Tab');
    expect(await focused(page)).toBe('skip-link');
    // Shown while it has the focus (it sits above the page otherwise).
    const box = await page.locator(byId('skip-link')).boundingBox();
    expect(box?.y ?? -1).toBeGreaterThanOrEqual(0);
    await shot('kb-01-skip-link');
    await page.keyboard.press('Enter');
    expect(await focused(page)).toBe('#stage');
    // The next stop is the screen's first control, not the rail.
    await page.keyboard.press('Tab');
    expect(await focused(page)).toBe('use-sim');
  });

  it('Enter on "Use the simulated bench" connects, and the keyboard carries on from the sweep screen', async () => {
    await page.keyboard.press('Enter');
    await page.waitForSelector(`${byId('connection-badge')}[data-kind="sim"]`, { timeout: 15_000 });
    await page.waitForSelector(byId('start-sweep'));
    expect(await focused(page)).toBe('#stage');
    const passed = await tabTo(page, 'start-sweep');
    // Straight through the plan, never back through the top bar or the rail.
    expect(passed.filter((stop) => stop.startsWith('nav-') || stop === 'theme-toggle')).toEqual([]);
  });

  it('Space on Start runs the sweep and puts the keyboard on Pause; the key figures are one skip link away', async () => {
    await page.keyboard.press('Space');
    await expect.poll(() => focused(page), { timeout: 15_000 }).toBe('pause-run');
    // The first time left comes from the plan: not "0 s" with most of the sweep still to do.
    const progress = page.locator(byId('progress'));
    await expect
      .poll(async () => Number(await progress.getAttribute('data-total')), { timeout: 15_000 })
      .toBeGreaterThan(0);
    const early = (await progress.textContent()) ?? '';
    const [, done, total] = /(\d+) of (\d+) points/.exec(early) ?? [];
    if (Number(done) < Number(total) / 2) expect(early).not.toMatch(/about 0 s left/);
    await shot('kb-02-focus-on-pause-after-start');
    await page.waitForSelector(`${byId('progress')}[data-status="complete"]`, { timeout: 120_000 });
    await expect.poll(async () => page.textContent(byId('kvco-typ')), { timeout: 60_000 }).toMatch(/Hz\/V/);
    // From wherever the keyboard is, back to the top and the second skip link.
    await tabTo(page, 'skip-figures', 'Shift+Tab', 120);
    await page.keyboard.press('Enter');
    expect(await focused(page)).toBe('key-figures');
    const figures = await page.evaluate<string>(`document.activeElement?.textContent ?? ''`);
    expect(figures).toMatch(/Kvco typ \(best line\)\s*\d.*Hz\/V/);
    await shot('kb-03-key-figures-focused');
  }, 240_000); // a sweep on a busy shared machine

  it('starts again, pauses with Space, and aborts through the question with Tab and Enter only', async () => {
    await tabTo(page, 'start-sweep', 'Shift+Tab', 120);
    await page.keyboard.press('Enter');
    await expect.poll(() => focused(page), { timeout: 15_000 }).toBe('pause-run');
    await page.keyboard.press('Space');
    await page.waitForSelector(`${byId('progress')}[data-paused="yes"]`, { timeout: 15_000 });
    // The button under the keyboard is now Resume: the focus stayed where it was.
    expect(await focused(page)).toBe('resume-run');
    await tabTo(page, 'stop-run', 'Tab', 3);
    await page.keyboard.press('Enter');
    await page.waitForSelector(byId('stop-run-confirm'));
    // The question opens on the harmless answer; Enter there would keep the run.
    expect(await focused(page)).toBe('stop-run-no');
    await shot('kb-04-abort-question');
    await page.keyboard.press('Shift+Tab');
    expect(await focused(page)).toBe('stop-run-yes');
    await page.keyboard.press('Enter');
    await page.waitForSelector(`${byId('strip-safe')}[data-reached="yes"]`, { timeout: 30_000 });
    await page.waitForSelector(`${byId('progress')}[data-status="aborted"]`, { timeout: 30_000 });
    const runs = await app.service.listRuns();
    expect(runs.filter((run) => run.kind === 'sweep').map((run) => run.status)).toEqual(
      expect.arrayContaining(['complete', 'aborted']),
    );
    await shot('kb-05-aborted-safe-state');
  }, 120_000);

  it('no control on any screen has words cut or wrapped at 1280×800', async () => {
    // The check itself finds a cramped select and a wrapping button (so an empty list below means something).
    await page.evaluate(`(() => {
      const box = document.createElement('div');
      box.id = 'cramped-sample';
      box.innerHTML =
        '<select data-testid="sample-select"><option>Rising, then falling</option></select>' +
        '<button type="button" data-testid="sample-button">Stop and keep the log</button>';
      // Widths through the CSSOM: the page's CSP refuses inline style attributes.
      box.firstElementChild.style.width = '70px';
      box.lastElementChild.style.width = '60px';
      document.getElementById('stage').prepend(box);
    })()`);
    expect((await crampedControls(page)).map((c) => c.what).sort()).toEqual(['sample-button', 'sample-select']);
    await page.evaluate(`document.getElementById('cramped-sample').remove()`);
    const seen: Record<string, Cramped[]> = {};
    for (const screen of ['bench', 'sweep', 'drift', 'runs', 'datasheet', 'loop']) {
      await page.click(byId(`nav-${screen}`));
      await page.waitForTimeout(300);
      seen[screen] = await crampedControls(page);
    }
    // The sweep plan's choices with their longest options chosen.
    await page.click(byId('nav-sweep'));
    await page.selectOption(byId('plan-direction'), 'up-down');
    seen['sweep, up-down'] = await crampedControls(page);
    // A drift log's stop question: "Stop and keep the log" on one line.
    await page.click(byId('nav-drift'));
    await page.fill(byId('drift-duration'), '30min');
    await page.click(byId('start-drift'));
    await page.click(byId('stop-run'));
    await page.waitForSelector(byId('stop-run-confirm'));
    seen['drift, stop question'] = await crampedControls(page);
    await shot('kb-06-drift-stop-question-1280');
    await page.click(byId('stop-run-yes'));
    await page.waitForSelector(`${byId('strip-safe')}[data-reached="yes"]`, { timeout: 30_000 });
    expect(seen).toEqual(Object.fromEntries(Object.keys(seen).map((key) => [key, []])));
  }, 120_000);
});
