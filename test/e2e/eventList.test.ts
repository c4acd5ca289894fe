import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { networkScenario, writeNetworkDataset } from '../support/siteNetwork';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { channelsOf, parseStationXml } from '../../core/stationxml';
import { locateReviewEvent, siteLocations, type SiteLocation } from '../../core/location/fromReview';
import { parseVelocityModel } from '../../core/location/velocityModel';
import type { ReviewDocument, ReviewEvent } from '../../core/review';
import type { Truth } from '../../core/synth';
import { readQuakeMl } from '../../core/quakeml';

/**
 * Great-circle distance on a sphere of the IUGG mean radius 6371.0088 km (haversine formula; Sinnott,
 * Sky and Telescope 68(2), 1984, p. 159; from memory). The app measures on the WGS84 ellipsoid, whose
 * radii of curvature at 43 N (about 6363 and 6388 km) differ from the mean radius by under 0.3 %: 0.09 km
 * at 30 km. The tests check that no site lies within 0.2 km of the limits used.
 */
function haversineKm(a: { latitude: number; longitude: number }, b: { latitude: number; longitude: number }): number {
  const r = Math.PI / 180;
  const h = Math.sin(((b.latitude - a.latitude) * r) / 2) ** 2 + Math.cos(a.latitude * r) * Math.cos(b.latitude * r) * Math.sin(((b.longitude - a.longitude) * r) / 2) ** 2;
  return 2 * 6371.0088 * Math.asin(Math.sqrt(h));
}

interface SheetView { shown: string[]; hidden: string[]; reference: { kind: string; latitude: number; longitude: number; site?: string } | null; showAll: boolean }
interface View { timings: { readMs: number; drawMs: number; complete?: boolean }; sheet: SheetView | null }

const SITES = 16;

describe('event list order and the sheet\'s distance limit (Chromium, browser mode, a generated network of 16 sites)', () => {
  let app: RunningApp;
  let data: string;
  let truth: Truth;
  let review: ReviewDocument;
  let coords: Map<string, SiteLocation>;
  const page = () => app.page;
  const view = async () => (await page().evaluate('window.daybreakView()')) as View;
  const eventOf = (i: number): ReviewEvent => review.events[i];

  /** Runs `act` and waits until the sheet has loaded again, every row included. */
  async function reloaded(act: () => Promise<unknown>): Promise<View> {
    const before = (await view()).timings;
    await act();
    for (let i = 0; i < 400; i++) {
      const v = await view();
      if (v.timings.complete && (v.timings.readMs !== before.readMs || v.timings.drawMs !== before.drawMs)) return v;
      await page().waitForTimeout(50);
    }
    throw new Error('the sheet did not load again within 20 s');
  }
  async function openEvent(ev: ReviewEvent): Promise<View> {
    return reloaded(() => page().locator(`.event-list li[data-id="${ev.id}"]`).click());
  }
  /** The sites named on the trace rows drawn on screen, top to bottom. */
  async function rowsOnScreen(): Promise<string[]> {
    const rows = await page().locator('.trace-row:visible').evaluateAll((els) => els
      .map((e) => ({ top: parseFloat((e as HTMLElement).style.top), site: e.querySelector('.site')?.textContent ?? '' })));
    return rows.sort((a, b) => a.top - b.top).map((r) => r.site);
  }
  async function listed(): Promise<{ id: string; sites: number; state: string; rms: string; ml: string }[]> {
    return page().locator('.event-list li[data-id]').evaluateAll((els) => els.map((e) => {
      const d = (e as HTMLElement).dataset;
      return { id: d.id ?? '', sites: Number(d.sites), state: d.state ?? '', rms: d.rms ?? '', ml: d.ml ?? '' };
    }));
  }
  async function blur(): Promise<void> {
    await page().evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
  }

  beforeAll(async () => {
    data = mkdtempSync(join(tmpdir(), 'daybreak-listdata-'));
    const sc = networkScenario(SITES, 300, [
      { at: 30, north: 3, east: -4, magnitude: 2.5 },
      { at: 100, north: -10, east: 6, magnitude: 2.0 },
      { at: 170, north: 12, east: 9, magnitude: 2.8 },
      { at: 240, north: -5, east: -12, magnitude: 1.6 },
    ]);
    const all = Array.from({ length: SITES }, (_, i) => i);
    const written = await writeNetworkDataset(data, sc, [
      { event: 0, before: 15, length: 60, sites: all, state: 'todo' },
      { event: 1, before: 15, length: 60, sites: [9, 4, 13], state: 'todo', pOnly: true },
      { event: 2, before: 15, length: 60, sites: all.slice(0, 8), state: 'done' },
      { event: 3, before: 15, length: 60, sites: [0, 2, 5, 7, 11], state: 'started' },
    ]);
    truth = written.truth;
    review = written.review!;
    const xml = join(data, 'stations.xml');
    coords = siteLocations(channelsOf(parseStationXml(readFileSync(xml, 'utf8'), xml)));
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir, width: 1400, height: 1000 });
    await page().goto(app.server.url.replace('/#', `/?scan=off&dataset=${encodeURIComponent(data)}#`));
    await page().locator('.trace-row').first().waitFor({ timeout: 60_000 });
  }, 180_000);
  afterAll(async () => { await app?.close(); });

  it('limits the sheet to exactly the sites within 30 km of the epicentre, the rest a toggle away', async () => {
    const ev = eventOf(0);
    await openEvent(ev);
    await reloaded(() => page().getByLabel('vertical only').check());
    const model = parseVelocityModel(readFileSync(join(data, 'model.json'), 'utf8'), 'model.json');
    const loc = locateReviewEvent(ev, coords, model);
    if (!loc.ok) throw new Error(loc.message);
    const epi = { latitude: loc.value.hypocentre.latDeg, longitude: loc.value.hypocentre.lonDeg };
    // The location from picks at the true times lands near the generator's epicentre.
    expect(haversineKm(epi, truth.events[0].origin)).toBeLessThan(2);
    const dist = new Map([...coords].map(([k, c]) => [k, haversineKm(c, epi)]));
    for (const d of dist.values()) expect(Math.abs(d - 30)).toBeGreaterThan(0.2);
    const within = [...dist].filter(([, d]) => d <= 30).map(([k]) => k).sort();
    expect(within.length).toBeGreaterThan(3);
    expect(within.length).toBeLessThan(SITES);

    const v = await reloaded(() => page().locator('select.limit-km').selectOption('30'));
    expect(v.sheet!.reference!.kind).toBe('epicentre');
    expect(v.sheet!.reference!.latitude).toBeCloseTo(epi.latitude, 9);
    expect([...v.sheet!.shown].sort()).toEqual(within);
    expect(v.sheet!.hidden).toHaveLength(SITES - within.length);
    // Every site has picks, so rows follow the first P: compare with the picks' own order.
    const byFirstP = [...within].sort((a, b) => Math.min(...ev.picks.filter((p) => p.channel.startsWith(`${a}.`)).map((p) => p.time))
      - Math.min(...ev.picks.filter((p) => p.channel.startsWith(`${b}.`)).map((p) => p.time)));
    expect(await rowsOnScreen()).toEqual(byFirstP.map((k) => k.split('.')[1]));
    const toggle = page().locator('button.limit-toggle');
    await expect.poll(() => toggle.innerText()).toBe(`+${SITES - within.length} more`);
    // The distance is on each row's label.
    const label = await page().locator('.trace-row:visible .detail').first().innerText();
    expect(Number(label.match(/([\d.]+) km/)![1])).toBeCloseTo(dist.get(byFirstP[0])!, 0);
    await page().screenshot({ path: screenshotPath('sheet-within-30km') });

    const all = await reloaded(() => toggle.click());
    expect(all.sheet!.showAll).toBe(true);
    expect((await rowsOnScreen()).length).toBe(SITES);
    await reloaded(() => toggle.click());
    expect((await rowsOnScreen()).length).toBe(within.length);
  });

  it('measures from the first-arriving site when the event cannot be located (three P picks)', async () => {
    const ev = eventOf(1);
    const v0 = await openEvent(ev);
    expect(ev.picks).toHaveLength(3);
    const first = ev.picks.reduce((a, b) => (b.time < a.time ? b : a));
    const firstSite = first.channel.split('.').slice(0, 2).join('.');
    expect(v0.sheet!.reference).toMatchObject({ kind: 'first-arrival', site: firstSite });
    const v = await reloaded(() => page().locator('select.limit-km').selectOption('20'));
    const from = coords.get(firstSite)!;
    const dist = new Map([...coords].map(([k, c]) => [k, haversineKm(c, from)]));
    for (const d of dist.values()) expect(Math.abs(d - 20)).toBeGreaterThan(0.2);
    expect([...v.sheet!.shown].sort()).toEqual([...dist].filter(([, d]) => d <= 20).map(([k]) => k).sort());
    expect(v.sheet!.shown[0]).toBe(firstSite);
    await reloaded(() => page().locator('select.limit-km').selectOption('0'));
  });

  it('sorts the list by sites with picks (most first), turns it round by key, and says so', async () => {
    await page().locator('select.sort-key').selectOption('sites');
    let rows = await listed();
    expect(rows.map((r) => r.sites)).toEqual([SITES, 8, 5, 3]);
    await expect.poll(() => page().locator('.sort-indicator').innerText()).toContain('sorted by sites with picks \u2193');
    expect(await page().locator('li[data-id] .sort-value').allInnerTexts()).toEqual([`${SITES} sites`, '8 sites', '5 sites', '3 sites']);
    await page().screenshot({ path: screenshotPath('event-list-by-sites') });
    await blur();
    await page().keyboard.press('~');
    rows = await listed();
    expect(rows.map((r) => r.sites)).toEqual([3, 5, 8, SITES]);
    expect(await page().locator('.sort-indicator').innerText()).toContain('\u2191 smallest first');
    // Tab walks the list in its order: from the first listed to the second.
    await openEvent(eventOf(1));
    await blur();
    await reloaded(() => page().keyboard.press('Tab'));
    expect(await page().locator('.event-list li.current').getAttribute('data-id')).toBe(rows[1].id);
  });

  it('sorts by review state with the key above Tab and lists one state at a time with Shift+Enter', async () => {
    await page().locator('select.sort-key').selectOption('time');
    await blur();
    await page().keyboard.press('`');
    expect(await page().locator('select.sort-key').inputValue()).toBe('state');
    const order = ['todo', 'started', 'done', 'discarded'];
    const states = (await listed()).map((r) => r.state);
    expect(states).toEqual([...states].sort((a, b) => order.indexOf(a) - order.indexOf(b)));
    expect(new Set(states).size).toBeGreaterThan(1);
    await page().keyboard.press('Shift+Enter');
    expect(await page().locator('select.state-filter').inputValue()).toBe('open');
    expect((await listed()).every((r) => r.state === 'todo' || r.state === 'started')).toBe(true);
    await page().keyboard.press('Shift+Enter');
    expect((await listed()).map((r) => r.state)).toEqual(['todo', 'todo']);
    await page().locator('select.state-filter').selectOption('all');
  });

  it('shows the open event\'s RMS and ML in the list as its panels and event bar give them, without a sort asking for them', async () => {
    await page().locator('select.sort-key').selectOption('time');
    const ev = eventOf(2);
    await openEvent(ev);
    await expect.poll(async () => ((await page().evaluate('window.daybreakMagnitude()')) as { event: string | null } | null)?.event, { timeout: 30_000 }).toBe(ev.id);
    const shown = (await page().evaluate('window.daybreakView()')) as { panels: { location: { ok: boolean; value: { hypocentre: { rmsS: number } } } } };
    const m = (await page().evaluate('window.daybreakMagnitude()')) as { ml: number | null };
    expect(m.ml).not.toBeNull();
    await expect.poll(async () => (await listed()).find((r) => r.id === ev.id)?.ml, { timeout: 10_000 }).toBe(String(m.ml));
    const row = (await listed()).find((r) => r.id === ev.id)!;
    expect(Number(row.rms)).toBe(shown.panels.location.value.hypocentre.rmsS);
    // The dataset's own model file is the one used, and the location summary says so.
    expect(await page().locator('.db-panels-summary .model-used').textContent()).toBe('model: model.json');
  });

  it('sorts by location RMS once measured, largest first, with events that cannot be located last', async () => {
    await page().locator('select.sort-key').selectOption('rms');
    const model = parseVelocityModel(readFileSync(join(data, 'model.json'), 'utf8'), 'model.json');
    await expect.poll(async () => (await listed()).filter((r) => r.rms !== '').length, { timeout: 30_000 }).toBe(3);
    const rows = await listed();
    expect(rows[3].id).toBe(eventOf(1).id); // three P picks: not located
    const values = rows.slice(0, 3).map((r) => Number(r.rms));
    expect(values).toEqual([...values].sort((a, b) => b - a));
    for (const r of rows.slice(0, 3)) {
      const loc = locateReviewEvent(review.events.find((e) => e.id === r.id)!, coords, model);
      if (!loc.ok) throw new Error(loc.message);
      expect(Number(r.rms)).toBeCloseTo(loc.value.hypocentre.rmsS, 9);
    }
  });

  it('sorts by local magnitude once measured, largest first, and shows the generator\'s order', async () => {
    await page().locator('select.sort-key').selectOption('magnitude');
    await expect.poll(async () => (await listed()).filter((r) => r.ml !== '').length, { timeout: 90_000, interval: 500 }).toBe(3);
    const rows = await listed();
    const ml = rows.slice(0, 3).map((r) => Number(r.ml));
    expect(ml).toEqual([...ml].sort((a, b) => b - a));
    // The generator's magnitudes of these events are 2.8, 2.5 and 1.6 (events 2, 0, 3): the same order.
    const idOf = (i: number) => eventOf(i).id;
    expect(rows.slice(0, 3).map((r) => r.id)).toEqual([idOf(2), idOf(0), idOf(3)]);
    await page().screenshot({ path: screenshotPath('event-list-by-magnitude') });
  }, 120_000);

  it('locates the list\'s next and previous events ahead: opening one draws its panels without waiting, with the core\'s solution', async () => {
    await page().locator('select.sort-key').selectOption('time');
    await openEvent(eventOf(2));
    await expect.poll(async () => ((await page().evaluate('window.daybreakMagnitude()')) as { event: string | null } | null)?.event, { timeout: 30_000 }).toBe(eventOf(2).id);
    await page().waitForTimeout(1000);
    const v = (await openEvent(eventOf(3))) as View & { panels: { event: string; locatedBefore: boolean; location: { ok: boolean; value: { hypocentre: { latDeg: number; lonDeg: number; depthKm: number; rmsS: number } } } } };
    expect(v.panels.event).toBe(eventOf(3).id);
    expect(v.panels.locatedBefore).toBe(true);
    const model = parseVelocityModel(readFileSync(join(data, 'model.json'), 'utf8'), 'model.json');
    const node = locateReviewEvent(eventOf(3), coords, model);
    if (!node.ok) throw new Error(node.message);
    const h = v.panels.location.value.hypocentre;
    for (const k of ['latDeg', 'lonDeg', 'depthKm', 'rmsS'] as const) expect(h[k]).toBeCloseTo(node.value.hypocentre[k], 6);
  });

  it('lists for each event the ML its event bar shows and its export holds, to the last digit (all from the magnitude worker)', async () => {
    const rows = (await listed()).filter((r) => r.ml !== '');
    expect(rows).toHaveLength(3);
    for (const r of rows) {
      await openEvent(review.events.find((e) => e.id === r.id)!);
      await expect.poll(async () => ((await page().evaluate('window.daybreakMagnitude()')) as { event: string | null } | null)?.event, { timeout: 30_000 }).toBe(r.id);
      const m = (await page().evaluate('window.daybreakMagnitude()')) as { ml: number | null };
      expect(m.ml).toBe(Number(r.ml));
    }
    await page().getByRole('button', { name: 'Export QuakeML + CSV' }).click();
    await page().getByText(/^exported /).waitFor({ timeout: 60_000 });
    const dir = join(data, 'daybreak-exports');
    const xmlName = readdirSync(dir).find((f) => f.endsWith('.quakeml.xml'))!;
    const exported = readQuakeMl(readFileSync(join(dir, xmlName), 'utf8'), xmlName).events;
    for (const r of rows) expect(exported.find((e) => e.id === r.id)?.magnitudes?.[0]?.mag).toBe(Number(r.ml));
    // the event of three P picks: not located, no magnitude in the list or the export
    expect(exported.find((e) => e.id === eventOf(1).id)?.magnitudes ?? []).toEqual([]);
  }, 120_000);
});
