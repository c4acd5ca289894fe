import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { writeScenario } from '../../electron/host/scenario';
import { demoScenario, type Truth } from '../../core/synth';

// Generated data (core/synth, invented): four demo sites around the demo's largest local event, whose
// S drives KIRN's high-gain digitiser to full scale. The generator's truth file says which arrivals
// it clipped (it applies the digitiser's range itself): that is the reference, not the desk's rule.
describe('the night overview marks clipped data (Chromium, browser mode)', () => {
  let app: RunningApp;
  let truth: Truth;
  const errors: string[] = [];

  beforeAll(async () => {
    const demo = demoScenario();
    const event = demo.events.find((e) => e.id === 'eq-2317a');
    if (!event) throw new Error('the demo no longer has its largest local event eq-2317a');
    const stations = demo.stations.filter((s) => ['KIRN', 'BRAE', 'DUNM', 'LUNE'].includes(s.code));
    expect(stations).toHaveLength(4);
    const data = mkdtempSync(join(tmpdir(), 'daybreak-clipdata-'));
    await writeScenario(data, {
      // BRAE's east component dead (stuck at one value), as in the demo night.
      scenario: {
        ...demo, name: 'clipping check (invented)', stations, faults: [{ kind: 'deadChannel', channel: 'XX.BRAE.00.HHE', value: -211 }],
        events: [event], start: event.origin - 60_000_000, end: event.origin + 120_000_000,
      },
    });
    truth = JSON.parse(readFileSync(join(data, 'truth.json'), 'utf8')) as Truth;
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir });
    app.page.on('pageerror', (e) => errors.push(e.message));
    await app.page.goto(app.server.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
    await app.page.locator('.trace-row').first().waitFor({ timeout: 60_000 });
  }, 120_000);
  afterAll(async () => { await app?.close(); });

  it('flags exactly the sites the generator clipped, and paints the clipped stretch on the strip', async () => {
    const clippedSites = [...new Set(truth.events[0].arrivals.filter((a) => a.clipped).map((a) => a.station))].sort();
    expect(clippedSites).toEqual(['KIRN']);
    const labels = await app.page.locator('.overview-labels > div').evaluateAll((ds) => ds.map((d) => ({ text: d.textContent ?? '', title: (d as HTMLElement).title })));
    const flagged = labels.filter((l) => /clipped in \d+ × 20 s of the night/.test(l.title)).map((l) => l.text.trim()).sort();
    expect(flagged).toEqual(clippedSites);
    // The strip's upper part is vermillion (Okabe-Ito, 213 94 0) somewhere on KIRN's row, nowhere else.
    const rows = labels.map((l) => l.text.trim());
    const vermillionRows = await app.page.locator('.overview canvas').first().evaluate((c, n) => {
      const canvas = c as HTMLCanvasElement;
      const g = canvas.getContext('2d');
      if (!g) return [];
      const img = g.getImageData(0, 0, canvas.width, canvas.height).data;
      const hits = new Set<number>();
      for (let y = 0; y < canvas.height; y++) {
        for (let x = 0; x < canvas.width; x++) {
          const o = (y * canvas.width + x) * 4;
          if (img[o] === 213 && img[o + 1] === 94 && img[o + 2] === 0) hits.add(Math.floor((y / canvas.height) * (n as number)));
        }
      }
      return [...hits];
    }, rows.length);
    expect(vermillionRows.map((r) => rows[r])).toEqual(['KIRN']);
    await app.page.screenshot({ path: screenshotPath('overview-clipping') });
    // The sheet opened on the loudest moment: KIRN's row says which of its channels clipped there, one
    // warning per line, none cut off at the label's edge.
    const kirn = app.page.locator('.trace-row', { has: app.page.locator('.site', { hasText: 'KIRN' }) }).first();
    const lines = await kirn.locator('.flags > div').evaluateAll((ds) => ds.map((d) => ({ text: d.textContent ?? '', cut: d.scrollWidth > d.clientWidth })));
    expect(lines.length).toBeGreaterThan(0);
    expect(lines.some((l) => /clipped in this window/.test(l.text))).toBe(true);
    expect(lines.filter((l) => l.cut)).toEqual([]);
    // The dead component is named as such (and is not taken for clipped), on its row only.
    const deadRows = await app.page.locator('.trace-row').evaluateAll((rows) => rows
      .filter((r) => /dead: one value throughout/.test(r.querySelector('.flags')?.textContent ?? ''))
      .map((r) => r.querySelector('.site')?.textContent ?? ''));
    expect(deadRows).toEqual(['BRAE']);
    const brae = app.page.locator('.trace-row', { has: app.page.locator('.site', { hasText: 'BRAE' }) }).first();
    expect(await brae.locator('.flags > div').allTextContents()).toEqual(['\u25b2 HHE dead: one value throughout']);
    expect(errors).toEqual([]);
  });
});
