import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import type { RunningApp } from '../support/browserApp';
import { screenshotPath } from '../support/browserApp';
import { openDataset } from '../support/openDataset';
import { writeSmallNight } from '../electron/host/cli/scanFixture';

/** The colour a CSS custom property of the page's root resolves to, as [r, g, b]. */
async function cssColour(page: Page, name: string): Promise<[number, number, number]> {
  return page.evaluate((n) => {
    const probe = document.createElement('div');
    probe.style.color = `var(${n})`;
    document.body.append(probe);
    const m = /rgb\((\d+), (\d+), (\d+)\)/.exec(getComputedStyle(probe).color);
    probe.remove();
    return m ? [Number(m[1]), Number(m[2]), Number(m[3])] as [number, number, number] : [-1, -1, -1] as [number, number, number];
  }, name);
}

/** Pixels of the canvases under `selector` within `tol` of `rgb` in every channel (opaque ones only). */
async function pixelsNear(page: Page, selector: string, rgb: [number, number, number], tol = 6): Promise<number> {
  return page.locator(selector).evaluateAll((canvases, [c, t]) => {
    let n = 0;
    for (const el of canvases) {
      const canvas = el as HTMLCanvasElement;
      const g = canvas.getContext('2d');
      if (!g || canvas.width === 0 || canvas.height === 0) continue;
      const d = g.getImageData(0, 0, canvas.width, canvas.height).data;
      for (let o = 0; o < d.length; o += 4) {
        if (d[o + 3] === 255 && Math.abs(d[o] - c[0]) <= t && Math.abs(d[o + 1] - c[1]) <= t && Math.abs(d[o + 2] - c[2]) <= t) n++;
      }
    }
    return n;
  }, [rgb, tol] as const);
}

// Generated data (core/synth, invented): the small five-site night of the scan tests.
describe('switching the theme redraws what is on screen in the new colours (Chromium, browser mode)', () => {
  let app: RunningApp;
  const errors: string[] = [];

  beforeAll(async () => {
    const data = mkdtempSync(join(tmpdir(), 'daybreak-theme-'));
    writeSmallNight(data);
    app = await openDataset(data, { width: 1300, height: 800 }, errors);
    await app.page.waitForTimeout(500);
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('draws the traces and the side panels in the light theme\'s colours after the switch, and none in the dark one\'s', async () => {
    const page = app.page;
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    const dark = await cssColour(page, '--trace');
    // style.css's dark --panel, #1f2228, is what the panels are filled with before the switch.
    expect(await cssColour(page, '--panel')).toEqual([0x1f, 0x22, 0x28]);
    expect(await pixelsNear(page, '.trace-plot canvas', dark)).toBeGreaterThan(100);
    await page.getByRole('button', { name: 'Theme' }).click();
    await page.waitForTimeout(500);
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('light');
    const light = await cssColour(page, '--trace');
    expect(light).not.toEqual(dark);
    expect(await pixelsNear(page, '.trace-plot canvas', light)).toBeGreaterThan(100);
    expect(await pixelsNear(page, '.trace-plot canvas', dark)).toBe(0);
    // The side panels (plan view, residuals, Wadati) fill with the theme's panel colour.
    const darkPanel: [number, number, number] = [0x1f, 0x22, 0x28];
    const lightPanel = await cssColour(page, '--panel');
    expect(lightPanel).not.toEqual(darkPanel);
    expect(await pixelsNear(page, '.db-panel-canvas', lightPanel)).toBeGreaterThan(1000);
    // Exactly (the light theme's text, #22252b, lies within a few units of the dark panel colour).
    expect(await pixelsNear(page, '.db-panel-canvas', darkPanel, 0)).toBe(0);
    await page.screenshot({ path: screenshotPath('theme-light') });
    // And back.
    await page.getByRole('button', { name: 'Theme' }).click();
    await page.waitForTimeout(500);
    expect(await pixelsNear(page, '.trace-plot canvas', dark)).toBeGreaterThan(100);
    expect(await pixelsNear(page, '.trace-plot canvas', light)).toBe(0);
    expect(errors).toEqual([]);
  });
});
