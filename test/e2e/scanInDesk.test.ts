import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { REVIEW_FILE_NAME } from '../../electron/host/reviewStore';
import { writeSmallNight } from '../electron/host/cli/scanFixture';
import type { TruthArrival } from '../../core/synth/truth';
import { microsFromIso } from '../../core/time';

describe('the desk scans a new dataset in the background and lists the candidates (Chromium)', () => {
  let app: RunningApp;
  let data: string;
  let truth: TruthArrival[];

  beforeAll(async () => {
    data = mkdtempSync(join(tmpdir(), 'daybreak-scandesk-'));
    truth = writeSmallNight(data);
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir, height: 900 });
    await app.page.goto(app.server.url.replace('/#', `/?dataset=${encodeURIComponent(data)}#`));
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('finds both earthquakes of the generated night and opens the first with its automatic picks', async () => {
    // While it runs: how far it is, and a way to stop it.
    await app.page.locator('.scan-state button', { hasText: 'Cancel' }).waitFor({ timeout: 60_000 });
    expect(await app.page.locator('.scan-state').innerText()).toMatch(/^Scanning the night\u2026( \d+ % \(.+\))? \u00b7 \d+ s/);
    await app.page.getByText(/^Scan: /).waitFor({ timeout: 90_000 });
    expect(await app.page.locator('.scan-state button').count()).toBe(0);
    await app.page.waitForTimeout(500);
    await app.page.screenshot({ path: screenshotPath('scan-in-desk') });
    expect(await app.page.locator('.event-list li').count()).toBe(2);
    // The default scan setting (automatic) chose the local-earthquake preset for this network tens of km wide.
    expect(await app.page.locator('.scan-state').innerText()).toMatch(/; local settings, chosen from the network\u2019s size$/);
    const review = JSON.parse(readFileSync(join(data, REVIEW_FILE_NAME), 'utf8'));
    expect(review.events.map((e: { source: string; state: string }) => [e.source, e.state])).toEqual([['detector', 'todo'], ['detector', 'todo']]);
    // Every automatic P lies within 0.05 s of a true P at its station (the generator's truth file).
    for (const ev of review.events) {
      for (const p of ev.picks.filter((x: { phase: string }) => x.phase === 'P')) {
        const sta = p.channel.split('.')[1];
        const t = microsFromIso(p.time);
        const near = truth.filter((a) => a.station === sta && a.wave === 'P').map((a) => Math.abs(microsFromIso(a.recordedTime) - t) / 1e6);
        expect(Math.min(...near)).toBeLessThan(0.05);
        expect(p.mode).toBe('automatic');
      }
    }
    expect(existsSync(join(data, 'daybreak-scan.xml'))).toBe(true);
  });
});
