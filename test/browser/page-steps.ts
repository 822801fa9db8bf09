/** Steps the Chromium tests share: find by test id, wait for a text, take a screenshot. */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { byId, SCREENS_DIR } from './harness.ts';

export { byId };

/** Waits until the text of a test id matches; returns it. */
export async function textMatches(page: Page, testId: string, pattern: RegExp, timeoutMs = 30_000): Promise<string> {
  const locator = page.locator(byId(testId)).first();
  await expect
    .poll(async () => ((await locator.count()) > 0 ? ((await locator.textContent()) ?? '') : ''), {
      timeout: timeoutMs,
      interval: 100,
    })
    .toMatch(pattern);
  return (await locator.textContent()) ?? '';
}

/** A full-page screenshot into test-artifacts/screens/NAME.png. */
export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: join(SCREENS_DIR, `${name}.png`), fullPage: true });
}
