import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { build } from 'vite';
import { buildRenderer, openApp, screenshotPath, type RunningApp } from '../support/browserApp';
import { DEMO_COMPLETE_MARKER } from '../../electron/host/service';
import { locateReviewEvent, predictedArrivals, siteLocations, type SiteLocation } from '../../core/location/fromReview';
import { firstArrival } from '../../core/location/travelTime';
import { checkVelocityModel, DEFAULT_MODEL, type VelocityModel } from '../../core/location/velocityModel';
import { fromLocalKm, localProjection } from '../../core/location/projection';
import { channelsOf, parseStationXml } from '../../core/stationxml';
import { microsFromIso } from '../../core/time';
import type { ReviewEvent, ReviewPick } from '../../core/review/types';
import { realEvent } from '../support/realPicks';
import type { PanelsDemoInput, PanelsDemoOutput } from '../../renderer/panels';

// The real records (../shared/data/real-microseismic): the app opens on a copy of them, and the first
// panel input is one of their events with the analyst's own (manual) P and S picks.
const REAL = resolve(__dirname, '..', '..', '..', 'shared', 'data', 'real-microseismic');
const repoRoot = resolve(__dirname, '..', '..');


describe('event panels: plan view, residuals and Wadati diagram (Chromium, browser mode)', () => {
  let app: RunningApp;
  let sites: Map<string, SiteLocation>;

  async function show(input: PanelsDemoInput): Promise<PanelsDemoOutput> {
    return app.page.evaluate((arg) => (window as unknown as { daybreakPanelsDemo: (i: unknown) => PanelsDemoOutput }).daybreakPanelsDemo(arg), input);
  }

  beforeAll(async () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    const data = mkdtempSync(join(tmpdir(), 'daybreak-paneldata-'));
    cpSync(REAL, data, { recursive: true, filter: (src) => !src.endsWith('.lock') });
    const file = join(REAL, 'stations', 'inv.xml');
    sites = siteLocations(channelsOf(parseStationXml(readFileSync(file, 'utf8'), file)));
    // The panels as a module of their own, served beside the app (script-src 'self' allows it).
    const staticDir = await buildRenderer();
    await build({
      // base './': the location worker's file is found beside panels.js (the app's build does the same)
      configFile: false, root: repoRoot, logLevel: 'warn', base: './',
      build: {
        outDir: join(staticDir, 'panels-demo'), emptyOutDir: true, sourcemap: false, target: 'es2022',
        lib: { entry: join(repoRoot, 'renderer', 'panels', 'index.ts'), formats: ['es'], fileName: () => 'panels.js', cssFileName: 'panels' },
      },
    });
    const demoDir = mkdtempSync(join(tmpdir(), 'daybreak-demo-'));
    writeFileSync(join(demoDir, DEMO_COMPLETE_MARKER), '{}');
    app = await openApp({ demoDir, width: 1400, height: 1000 });
    await app.page.goto(app.server.url.replace('/#', `/?dataset=${encodeURIComponent(data)}#`));
    await app.page.locator('.trace-row').first().waitFor({ timeout: 60_000 });
    const css = readdirSync(join(staticDir, 'panels-demo')).find((f) => f.endsWith('.css'));
    if (!css) throw new Error('the panels build wrote no stylesheet');
    const base = new URL(app.server.url).origin;
    await app.page.addStyleTag({ url: `${base}/panels-demo/${css}` });
    await app.page.addScriptTag({ url: `${base}/panels-demo/panels.js`, type: 'module' });
    for (let i = 0; i < 100 && !(await app.page.evaluate(() => 'daybreakPanelsDemo' in window)); i++) await app.page.waitForTimeout(50);
  }, 180_000);
  afterAll(async () => { await app?.close(); });

  it('locates a real event from its manual picks as the core does, draws each panel in under 5 ms, and shows it', async () => {
    // Half-space at 4.2 km/s, the median speed the catalogue's own origins imply (geiger.test.ts), Vp/Vs 1.73.
    const model = checkVelocityModel([{ topKm: 0, vp: 4.2, vs: 4.2 / 1.73 }], 'mine half-space');
    const event = realEvent(REAL, '2019-01-21T11-50-32-914c4.xml', 8_000_000);
    expect(event.picks.filter((p) => p.phase === 'S')).toHaveLength(4);
    const out = await show({ event, sites: [...sites], model, highlight: null, theme: 'dark' });
    const node = locateReviewEvent(event, sites, model);
    if (!node.ok) throw new Error(node.message);
    expect(out.ok).toBe(true);
    const h = out.hypocentre!;
    // located in the worker: the same values as the core called on the page's own thread, and as in Node
    expect(out.workerDiffers).toBeNull();
    expect(h.originTime).toBe(node.value.hypocentre.originTime);
    expect(h.latDeg).toBeCloseTo(node.value.hypocentre.latDeg, 9);
    expect(h.depthKm).toBeCloseTo(node.value.hypocentre.depthKm, 6);
    expect(out.vpVs).not.toBeNull();
    // 12 sites, picks at most: the sites without P or S get guides at the predicted times
    const pred = predictedArrivals(node.value.hypocentre, sites, model);
    const picked = new Set(event.picks.map((p) => `${p.channel.split('.').slice(0, 2).join('.')}|${p.phase}`));
    const expectedGuides = [...pred.keys()].filter((s) => !picked.has(`${s}|S`) || !picked.has(`${s}|P`)).sort();
    expect(out.guides.map(([s]) => s).sort()).toEqual(expectedGuides);
    for (const [site, gs] of out.guides) {
      for (const g of gs) {
        const t = g.phase === 'P' ? pred.get(site)!.p : pred.get(site)!.s;
        expect(g.t).toBeCloseTo((t - event.start) / 1e6, 6);
      }
    }
    expect(out.guidesMemoised).toBe(true);
    expect(out.updateMemoised).toBe(true);
    expect(out.column.width).toBeGreaterThanOrEqual(260);
    expect(out.column.width).toBeLessThanOrEqual(300);
    console.log(`real event: locate ${out.locateMs.toFixed(2)} ms (warm ${out.locateWarmMs.toFixed(2)} ms), update draw ${out.updateDrawMs.toFixed(2)} ms, redraw plan ${out.drawMs.plan.toFixed(2)} / residuals ${out.drawMs.residuals.toFixed(2)} / Wadati ${out.drawMs.wadati.toFixed(2)} ms`);
    for (const ms of Object.values(out.drawMs)) expect(ms).toBeLessThan(5);
    await app.page.locator('.db-panels-demo').screenshot({ path: screenshotPath('panels-real-event') });
  });

  it('hovering a site on the plan view highlights it in all panels and reports it once', async () => {
    const model = checkVelocityModel([{ topKm: 0, vp: 4.2, vs: 4.2 / 1.73 }], 'mine half-space');
    const event = realEvent(REAL, '2019-01-21T11-50-32-914c4.xml', 8_000_000);
    const out = await show({ event, sites: [...sites], model, highlight: null });
    const spot = out.spots['1.8'];
    expect(spot).toBeDefined();
    await app.page.mouse.move(spot.x + 1, spot.y + 1);
    await app.page.waitForTimeout(50);
    await app.page.locator('.db-panels-demo').screenshot({ path: screenshotPath('panels-hover') });
    const after = await show({ event, sites: [...sites], model, highlight: null });
    expect(after.hovered.filter((s) => s === '1.8')).toHaveLength(1);
    await app.page.mouse.move(5, 5);
    const left = await show({ event, sites: [...sites], model, highlight: null });
    expect(left.hovered[left.hovered.length - 1]).toBeNull();
  });

  it('draws a km-scale network in the light theme with S-P circles through the epicentre and a late pick showing', async () => {
    // Geometry invented for the picture only; times from the layered travel times.
    const proj = localProjection(46, 8);
    const km: [string, number, number][] = [['A1', -18, 12], ['B2', 14, 20], ['C3', 22, -9], ['D4', -6, -21], ['E5', 3, 4], ['F6', -25, -4], ['G7', 30, 8], ['H8', 9, -30]];
    const net = new Map<string, SiteLocation>(km.map(([code, e, n]) => {
      const [lat, lon] = fromLocalKm(proj, e, n);
      return [`XX.${code}`, { latitude: lat, longitude: lon, elevation: 300 }];
    }));
    const model: VelocityModel = DEFAULT_MODEL;
    const T0 = microsFromIso('2025-12-02T03:14:15.000000Z');
    const [elat, elon] = fromLocalKm(proj, 4, -3);
    const pred = predictedArrivals({ originTime: T0, latDeg: elat, lonDeg: elon, depthKm: 9 }, net, model);
    const picks: ReviewPick[] = [];
    let i = 0;
    for (const [site, a] of pred) {
      if (site === 'XX.H8') continue; // no picks here: guides only
      const late = site === 'XX.C3' ? 250_000 : 0;
      picks.push({ id: `k${i++}`, phase: 'P', channel: `${site}.00.HHZ`, time: a.p + late, lower: 0.03, upper: 0.03, onset: 'impulsive', polarity: 'positive', mode: 'manual', status: 'confirmed', snr: null, questionableTiming: false });
      if (site !== 'XX.G7') picks.push({ id: `k${i++}`, phase: 'S', channel: `${site}.00.HHN`, time: a.s, lower: 0.06, upper: 0.06, onset: 'emergent', polarity: null, mode: 'manual', status: site === 'XX.F6' ? 'rejected' : 'confirmed', snr: null, questionableTiming: false });
    }
    const event: ReviewEvent = { id: 'km', source: 'analyst', start: T0, end: T0 + 60e6, state: 'started', type: null, typeCertainty: null, note: '', picks };
    const out = await show({ event, sites: [...net], model, highlight: 'XX.C3', theme: 'light' });
    expect(out.ok).toBe(true);
    expect(out.workerDiffers).toBeNull();
    expect(out.hypocentre!.phaseCount).toBe(12); // 7 P + 6 S, one of them rejected
    expect(out.guides.find(([s]) => s === 'XX.H8')?.[1].map((g) => g.phase)).toEqual(['P', 'S']);
    expect(out.guides.find(([s]) => s === 'XX.G7')?.[1].map((g) => g.phase)).toEqual(['S']);
    // firstArrival is what the guides come from: H8's P guide at the model's time (within the 0.25 s late pick's pull)
    const dH8 = pred.get('XX.H8')!.distanceKm;
    expect(pred.get('XX.H8')!.p - T0).toBe(Math.round(firstArrival(model, 'P', dH8, 9, 0.3).time * 1e6));
    for (const ms of Object.values(out.drawMs)) expect(ms).toBeLessThan(5);
    // Eight sites tens of km apart: every name shown, none over another.
    expect(out.labels).toEqual({ shown: 8, hidden: 0, overlapping: 0 });
    expect(out.planCaption).not.toMatch(/names hidden/);
    console.log(`km network: locate ${out.locateMs.toFixed(2)} ms (warm ${out.locateWarmMs.toFixed(2)} ms), redraw plan ${out.drawMs.plan.toFixed(2)} / residuals ${out.drawMs.residuals.toFixed(2)} / Wadati ${out.drawMs.wadati.toFixed(2)} ms`);
    await app.page.locator('.db-panels-demo').screenshot({ path: screenshotPath('panels-km-network-light') });
  });

  it('leaves out site names that would cover others on a dense network of 100 sites, and says how many', async () => {
    // Geometry invented for the picture only: a 10 x 10 grid 2 km apart, P picked at 12 sites.
    const proj = localProjection(46, 8);
    const net = new Map<string, SiteLocation>();
    for (let i = 0; i < 100; i++) {
      const [lat, lon] = fromLocalKm(proj, 2 * (i % 10) - 9, 2 * Math.floor(i / 10) - 9);
      net.set(`XX.N${String(i).padStart(2, '0')}`, { latitude: lat, longitude: lon, elevation: 300 });
    }
    const T0 = microsFromIso('2025-12-02T04:00:00.000000Z');
    const [elat, elon] = fromLocalKm(proj, 1, 2);
    const pred = predictedArrivals({ originTime: T0, latDeg: elat, lonDeg: elon, depthKm: 6 }, net, DEFAULT_MODEL);
    const picks: ReviewPick[] = [...pred].filter((_, k) => k % 8 === 0).map(([site, a], k) => ({
      id: `n${k}`, phase: 'P' as const, channel: `${site}.00.HHZ`, time: a.p, lower: 0.03, upper: 0.03, onset: 'impulsive' as const, polarity: null,
      mode: 'manual' as const, status: 'confirmed' as const, snr: null, questionableTiming: false,
    }));
    expect(picks.length).toBe(13);
    const event: ReviewEvent = { id: 'dense', source: 'analyst', start: T0, end: T0 + 60e6, state: 'started', type: null, typeCertainty: null, note: '', picks };
    const out = await show({ event, sites: [...net], model: DEFAULT_MODEL, highlight: null, theme: 'dark' });
    expect(out.ok).toBe(true);
    expect(out.labels.overlapping).toBe(0);
    expect(out.labels.shown + out.labels.hidden).toBe(100);
    expect(out.labels.hidden).toBeGreaterThan(0);
    expect(out.planCaption).toContain(`${out.labels.hidden} names hidden (point at a site)`);
    await app.page.locator('.db-panels-demo').screenshot({ path: screenshotPath('panels-dense-network') });
  });

  it('draws only the newest of two updates asked for one after the other: the older answer is dropped, never drawn over it', async () => {
    const model = checkVelocityModel([{ topKm: 0, vp: 4.2, vs: 4.2 / 1.73 }], 'mine half-space');
    const older = realEvent(REAL, '2019-01-21T11-50-32-914c4.xml', 8_000_000);
    // the analyst moved the first P by 40 ms before the first answer came
    const newer: ReviewEvent = { ...older, id: 'moved', picks: older.picks.map((p, i) => (i === 0 ? { ...p, time: p.time + 40_000 } : p)) };
    const out = await show({ event: newer, before: older, sites: [...sites], model, highlight: null, theme: 'dark' });
    expect(out.beforeDrawn).toBeNull();
    expect(out.drawnEvent).toBe('moved');
    expect(out.workerDiffers).toBeNull();
    const a = locateReviewEvent(newer, sites, model);
    const b = locateReviewEvent(older, sites, model);
    if (!a.ok || !b.ok) throw new Error('not located');
    expect(out.hypocentre!.originTime).toBe(a.value.hypocentre.originTime);
    expect(a.value.hypocentre.originTime).not.toBe(b.value.hypocentre.originTime);
    expect(out.summary).toContain(`RMS ${(a.value.hypocentre.rmsS * 1000).toFixed(1)} ms`);
  });
});
