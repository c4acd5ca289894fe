/**
 * End-to-end helper: polls a reading of the page until it passes a check, else saves a screenshot
 * and fails naming what never happened and the last value read.
 */
import type { Page } from 'playwright-core';
import { screenshotPath } from './browserApp';

/** Reads `get` every 50 ms until `ok` holds (returns that value) or `ms` pass (screenshot `failureShot`, then throws). */
export async function pollUntil<T>(page: Page, failureShot: string, what: string, get: () => Promise<T>, ok: (x: T) => boolean, ms = 20_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const x = await get();
    if (ok(x)) return x;
    if (Date.now() > end) {
      await page.screenshot({ path: screenshotPath(failureShot) });
      throw new Error(`${what} never happened; last: ${JSON.stringify(x).slice(0, 600)}`);
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}
