import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';

describe('app shell in browser mode (Chromium)', () => {
  let app: RunningApp;
  const errors: string[] = [];

  beforeAll(async () => {
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    mkdirSync(join(demoDir, 'waveforms'));
    writeFileSync(join(demoDir, 'waveforms', 'ZZ.QRS.00.HHZ.2026-12-01.mseed'), Buffer.alloc(4096));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir });
    app.page.on('pageerror', (e) => errors.push(e.message));
    app.page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('opens the demo folder through the host and says which file held no readable records, and why', async () => {
    await app.page.getByText('No waveform data').waitFor({ timeout: 30_000 });
    await app.page.screenshot({ path: screenshotPath('shell') });
    const problems = await app.page.locator('ul.problems li').allInnerTexts();
    expect(problems.length).toBeGreaterThan(0);
    expect(problems[0]).toMatch(/^waveforms\/ZZ\.QRS\.00\.HHZ\.2026-12-01\.mseed at byte 0: /);
  });

  it('shows the caution about preliminary results on every screen and in the about box', async () => {
    await expect(app.page.locator('footer.caution').innerText()).resolves.toMatch(/preliminary/);
    await app.page.getByRole('button', { name: 'About' }).click();
    await expect(app.page.locator('dialog#about').innerText()).resolves.toMatch(/life-safety/);
  });

  it('removes the token from the address bar after reading it', () => {
    expect(app.page.url()).not.toContain('token=');
  });

  it('raises no script errors and no CSP violations', () => {
    expect(errors).toEqual([]);
  });
});
