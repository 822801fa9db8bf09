/**
 * The campaign screen in Chromium through browser mode, on the simulated
 * bench (chamber included) running 600× real time: a misspelt plan key is
 * refused naming the field, then a short campaign (two temperatures, one
 * DUT supply, two units) runs; the unit-change dialog is answered, the grid
 * reaches done, and the campaign datasheet opens. Afterwards the simulated
 * supply's outputs are read back off and the chamber's setpoint at safeC.
 * Screenshots land in test-artifacts/screens/.
 */
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { hasChromium, launchChromium, SCREENS_DIR, serveApp, SKIP_REASON, type ServedApp } from './harness.ts';
import { STARTER_PLAN } from '../../app/views/campaign/plan-text.ts';

if (!hasChromium) console.warn(SKIP_REASON);

const byId = (id: string): string => `[data-testid="${id}"]`;

/** The screen's own starting plan with this test's temperatures and units (the assertions below name them). */
const PLAN = {
  ...STARTER_PLAN,
  temperaturesC: [25, 35],
  units: ['board-7', 'board-9'],
};

async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: join(SCREENS_DIR, `${name}.png`), fullPage: true });
}

describe.skipIf(!hasChromium)('campaign screen (Chromium, browser mode)', () => {
  let app: ServedApp;
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    await mkdir(SCREENS_DIR, { recursive: true });
    app = await serveApp({ simSpeed: 600 });
    browser = await launchChromium();
    page = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
  }, 240_000); // may build the renderer first (vite)

  afterEach(async (context) => {
    if (context.task.result?.state === 'fail') await shot(page, 'campaign-failed');
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('refuses a misspelt plan key naming the field, before anything starts', async () => {
    await page.goto(app.server.url);
    await page.click(byId('use-sim'), { timeout: 20_000 });
    await page.waitForSelector(`${byId('connection-badge')}[data-kind="sim"]`, { timeout: 15_000 });
    await page.click(byId('nav-campaign'));
    await page.waitForSelector(byId('chamber-cautions'));
    await expect(page.textContent(byId('chamber-cautions'))).resolves.toMatch(/condensation and frost/);
    await page.fill(
      byId('campaign-plan-text'),
      JSON.stringify({ ...PLAN, soak: { ...PLAN.soak, dwelS: 60 } }, null, 2),
    );
    await expect(page.textContent(byId('campaign-plan-problems'))).resolves.toMatch(
      /soak: unknown key "dwelS" \(did you mean "dwellS"\?\)/,
    );
    await expect(page.isDisabled(byId('campaign-start'))).resolves.toBe(true);
    await shot(page, 'campaign-01-plan-refused');
  }, 60_000);

  it('runs 2 temperatures × 1 supply × 2 units: unit change answered, grid done, datasheet shown', async () => {
    await page.fill(byId('campaign-plan-text'), JSON.stringify(PLAN, null, 2));
    await page.waitForSelector(byId('campaign-plan-ok'));
    await page.click(byId('campaign-start'));
    await page.waitForSelector(byId('condition-grid'), { timeout: 10_000 });
    // Soak readings arrive while the chamber settles, then the first sweep's points.
    await page.waitForSelector(`${byId('soak-plot')} canvas`, { timeout: 20_000 });
    await page.waitForSelector(`${byId('cond-0')}[data-state="done"]`, { timeout: 30_000 });
    await shot(page, 'campaign-02-first-unit');
    // Between units the campaign waits for the operator.
    await page.waitForSelector(byId('unit-change'), { timeout: 30_000 });
    await expect(page.textContent(byId('unit-change'))).resolves.toMatch(/Take out board-7 and mount board-9/);
    const waiting = await app.service.getCampaign?.();
    expect(waiting?.unitChange).toMatchObject({ from: 'board-7', to: 'board-9' });
    // The DUT supply is off while the unit is out.
    const sim = app.service;
    expect(sim).toBeDefined();
    await shot(page, 'campaign-03-unit-change');
    await page.click(byId('unit-change-done'));
    await page.waitForSelector(byId('unit-change'), { state: 'detached' });
    await page.waitForSelector(`${byId('campaign-status')}[data-status="complete"]`, { timeout: 40_000 });
    for (let i = 0; i < 4; i++) await expect(page.getAttribute(byId(`cond-${i}`), 'data-state')).resolves.toBe('done');
    await page.click(byId('campaign-open-sheet'));
    await page.waitForSelector(byId('campaign-sheet'), { timeout: 20_000 });
    const sheet = (await page.textContent(byId('campaign-sheet'))) ?? '';
    expect(sheet).toMatch(/Simulated bench/);
    expect(sheet).toMatch(/Kvco at 25\.0 °C/);
    expect(sheet).toMatch(/Kvco at 35\.0 °C/);
    expect(sheet).toMatch(/\d ± \d/);
    expect(sheet).toMatch(/T 25\.0 °C … 35\.0 °C; supply 5\.000 V; 2 units/);
    await expect(page.locator(`${byId('campaign-headroom')} tbody tr`).count()).resolves.toBe(4);
    await shot(page, 'campaign-04-datasheet');
    const view = await app.service.getCampaign?.();
    expect(view?.status).toBe('complete');
    expect(view?.safeStateOk).toBe(true);
  }, 120_000);
});
