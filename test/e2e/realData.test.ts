import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';

// Real records (see ../shared/data/real-microseismic/README.md): 5 files x 36 traces, 12 sites.
const REAL = resolve(__dirname, '..', '..', '..', 'shared', 'data', 'real-microseismic');

describe('review desk on the real microseismic records (Chromium, browser mode)', () => {
  let app: RunningApp;
  const errors: string[] = [];

  beforeAll(async () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL} (the shared data folder must sit beside the repository)`);
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir });
    app.page.on('pageerror', (e) => errors.push(e.message));
    await app.page.goto(`${app.server.url.replace('/#', `/?dataset=${encodeURIComponent(REAL)}#`)}`);
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('reads every file and shows one overview strip and one trace row per site', async () => {
    await app.page.locator('.trace-row').first().waitFor({ timeout: 30_000 });
    await app.page.waitForTimeout(500);
    await app.page.screenshot({ path: screenshotPath('real-desk') });
    expect(await app.page.locator('.overview-labels > div').count()).toBe(12);
    const rows = await app.page.locator('.trace-row:visible .trace-label .site').allInnerTexts();
    expect(rows.length).toBeGreaterThan(5);
    expect(errors).toEqual([]);
  });

  it('limits the sheet to the first sites when asked', async () => {
    await app.page.locator('label', { hasText: 'Show' }).locator('select').selectOption('6');
    await app.page.waitForTimeout(800);
    expect(await app.page.locator('.trace-row:visible').count()).toBe(6);
    await app.page.locator('label', { hasText: 'Show' }).locator('select').selectOption('0');
    await app.page.waitForTimeout(800);
    expect(await app.page.locator('.trace-row:visible').count()).toBeGreaterThan(6);
  });
});
