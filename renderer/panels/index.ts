/**
 * The event panels beside the traces, stacked in one column (260-300 px wide): plan view, pick
 * residuals, Wadati diagram. `EventPanels.update` has the event located in a worker
 * (locationClient.ts: core/location/fromReview.ts off the interface thread) and redraws all three
 * when the answer comes, unless a newer update was asked for meanwhile (a stale answer is never
 * drawn over a newer one); `guides` gives the predicted P and S times for the pick layer; hovering a
 * site in any panel highlights it in all three and calls `onHover` so the desk can highlight its row.
 *
 *   const panels = new EventPanels(sideColumn, { onHover: (site) => traces.highlight(site) });
 *   const r = await panels.update(event, siteLocations(metas), model);   // after every pick edit; null when superseded
 *   marks.guides = panels.guidesAt(event, ref);                           // PickMarks.guides (memoised)
 *   panels.prefetch([next, previous], sites, model);                     // located ahead, drawn at once when opened
 *   panels.highlight(site);                                               // a row hovered in the desk
 */
import './panels.css';
import {
  locateReviewEvent, siteLocations, spCircles, verticalAverageSpeeds, siteOfChannel,
  type PredictedArrival, type ReviewLocateOptions, type ReviewLocateResult, type SiteLocation,
} from '../../core/location/fromReview';
import type { VelocityModel } from '../../core/location/velocityModel';
import type { WadatiResult } from '../../core/location/wadati';
import type { ReviewEvent } from '../../core/review/types';
import { isoFromMicros, type Micros } from '../../core/time';
import { SupersededError } from '../latestOnly';
import { LocationWorker } from './locationClient';
import { eventLocation, type EventLocation } from './locationJobs';
import { PlanView } from './planView';
import { ResidualPanel } from './residualPanel';
import { WadatiPanel } from './wadatiPanel';

export { siteLocations };
export { PlanView, type PlanInput, type PlanStation } from './planView';
export { ResidualPanel, type ResidualInput, type ResidualItem } from './residualPanel';
export { WadatiPanel, type WadatiInput } from './wadatiPanel';
export { LocationWorker } from './locationClient';

export interface EventPanelsOptions {
  /** A site hovered in any panel (null when none). */
  onHover?(site: string | null): void;
  /** Passed to locateReviewEvent (e.g. a fixed depth). */
  locate?: ReviewLocateOptions;
  /** The worker that locates (default: one of the panels' own). */
  locator?: LocationWorker;
  /** Which velocity model the location uses, said under the solution (e.g. the file's name). */
  modelLabel?: () => string;
}

/** What update() found, for the desk's status line and the QuakeML origin. */
export interface EventPanelsState {
  /** The event these results are of (null: no event open). */
  event: ReviewEvent | null;
  location: ReviewLocateResult | null;
  wadati: WadatiResult | null;
  predicted: Map<string, PredictedArrival> | null;
  /** Time the worker spent locating, and the interface thread drawing, ms. */
  locateMs: number;
  /** Whether the location had been asked for before the update (located ahead, or the same event open before): no wait. */
  locatedBefore: boolean;
  drawMs: number;
}

export class EventPanels {
  readonly root = document.createElement('div');
  readonly plan: PlanView;
  readonly residuals: ResidualPanel;
  readonly wadati: WadatiPanel;
  private readonly summary = document.createElement('div');
  private state: EventPanelsState = { event: null, location: null, wadati: null, predicted: null, locateMs: 0, drawMs: 0, locatedBefore: false };
  private highlighted: string | null = null;

  private readonly locator: LocationWorker;
  /** Number of the newest update asked for. */
  private seq = 0;

  constructor(container: HTMLElement, private readonly options: EventPanelsOptions = {}) {
    this.locator = options.locator ?? new LocationWorker();
    this.root.className = 'db-panels';
    this.summary.className = 'db-panels-summary';
    this.root.append(this.summary);
    container.append(this.root);
    const hover = (site: string | null) => {
      this.highlight(site);
      this.options.onHover?.(site);
    };
    this.plan = new PlanView(this.root, { onHover: hover });
    this.residuals = new ResidualPanel(this.root, { onHover: hover });
    this.wadati = new WadatiPanel(this.root, { onHover: hover });
  }

  /** The last results drawn. */
  get current(): EventPanelsState {
    return this.state;
  }

  /**
   * Has `event` located with the sites' coordinates and the model, its Wadati line fitted (in the
   * worker), and redraws the three panels with the answer. Call after every pick edit and when
   * another event opens (null: no event). Resolves with what was drawn, or null when a newer update
   * was asked for before the answer came (nothing is drawn then: the newer one will be).
   */
  update(event: ReviewEvent | null, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel): Promise<EventPanelsState | null> {
    // Review events are immutable values (an edit makes a new one): the same event, sites and model
    // need no new solution (a click that only selects a pick costs nothing).
    const last = this.lastInput;
    if (last && last.event === event && last.sites === sites && last.model === model) return last.result;
    const result = this.locateAndDraw(++this.seq, event, sites, model);
    this.lastInput = { event, sites, model, result };
    return result;
  }

  /** The results of the newest update once it is drawn (at once when none is on its way). */
  async settled(): Promise<EventPanelsState> {
    for (;;) {
      const p = this.lastInput?.result;
      if (!p) return this.state;
      const r = await p;
      if (p === this.lastInput?.result) return r ?? this.state;
    }
  }

  private lastInput: { event: ReviewEvent | null; sites: ReadonlyMap<string, SiteLocation>; model: VelocityModel; result: Promise<EventPanelsState | null> } | null = null;

  /**
   * Has `events` located in the background (after any update), so that opening one of them draws at
   * once. Events already located with these sites and model are skipped. Results are kept per event
   * object, and so is every update's: an edited event is a new object and is located again.
   */
  prefetch(events: readonly ReviewEvent[], sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel): void {
    for (const event of events) {
      const had = this.known.get(event);
      if (had && had.sites === sites && had.model === model) continue;
      const result = this.locator.panelsLater(event, sites, model, this.options.locate);
      const entry = { sites, model, result, answered: false };
      this.known.set(event, entry);
      result.then(() => { entry.answered = true; }, () => { if (this.known.get(event) === entry) this.known.delete(event); });
    }
  }

  /** Locations asked for, by event object, with the sites and model they were asked with. */
  private readonly known = new WeakMap<ReviewEvent, {
    sites: ReadonlyMap<string, SiteLocation>; model: VelocityModel; result: Promise<{ value: EventLocation; ms: number }>;
    /** Whether the worker has answered (a located-ahead job may still wait behind the list's). */
    answered: boolean;
  }>();

  /**
   * The event's location: the answer to one asked for before with the same sites and model, else a
   * new panels job (also when one asked ahead still waits: it may be queued behind the list's jobs).
   */
  private located(event: ReviewEvent, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel): Promise<{ value: EventLocation; ms: number }> {
    const had = this.known.get(event);
    if (had && had.answered && had.sites === sites && had.model === model) return had.result;
    const result = this.locator.panels(event, sites, model, this.options.locate);
    const entry = { sites, model, result, answered: false };
    this.known.set(event, entry);
    // A job dropped for a newer one (or failed) is not kept: asked again if this event opens again.
    result.then(() => { entry.answered = true; }, () => { if (this.known.get(event) === entry) this.known.delete(event); });
    return result;
  }

  private async locateAndDraw(seq: number, event: ReviewEvent | null, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel): Promise<EventPanelsState | null> {
    let found: EventLocation | null = null;
    let locateMs = 0;
    const had = event ? this.known.get(event) : undefined;
    const locatedBefore = !!had && had.answered && had.sites === sites && had.model === model;
    if (event) {
      try {
        const r = await this.located(event, sites, model);
        found = r.value;
        locateMs = r.ms;
      } catch (e) {
        if (e instanceof SupersededError) return null;
        const message = e instanceof Error ? e.message : String(e);
        found = { location: { ok: false, code: 'did-not-converge', message, skipped: [] }, wadati: { ok: false, code: 'degenerate', message }, predicted: null };
      }
    }
    if (seq !== this.seq) return null;
    const t1 = performance.now();
    this.draw(event, sites, model, found);
    this.state = { event, location: found?.location ?? null, wadati: found?.wadati ?? null, predicted: found?.predicted ?? null, locateMs, drawMs: performance.now() - t1, locatedBefore };
    return this.state;
  }

  /** Draws the three panels and the summary from a location (null: no event). */
  private draw(event: ReviewEvent | null, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel, found: EventLocation | null): void {
    const location = found?.location ?? null;
    const wadati = found?.wadati ?? null;
    const predicted = found?.predicted ?? null;
    const picked = new Set((event?.picks ?? []).map((p) => siteOfChannel(p.channel)));
    const stations = [...sites].map(([site, s]) => ({ site, latitude: s.latitude, longitude: s.longitude, picked: picked.has(site) }));
    let circles: { site: string; epicentralKm: number }[] = [];
    const h = location?.ok ? location.value.hypocentre : null;
    if (event && h) {
      const sp = verticalAverageSpeeds(model, h.depthKm);
      // The event's own Vp/Vs when the Wadati fit is well determined (5 sites or more, 1-sigma under
      // 0.05), else the model's along the vertical path.
      const w = wadati?.ok ? wadati.value : null;
      const vpVs = w && w.count >= 5 && w.vpVsError < 0.05 && w.vpVs > 1.2 && w.vpVs < 3 ? w.vpVs : sp.vp / sp.vs;
      circles = spCircles(event, sites, { vp: sp.vp, vpVs, depthKm: h.depthKm });
    }
    this.plan.set({
      stations, origin: h ? { latDeg: h.latDeg, lonDeg: h.lonDeg } : null, ellipse: h ? h.ellipse : null, circles, highlight: this.highlighted,
    });
    const order = predicted ? [...predicted.values()].sort((a, b) => a.distanceKm - b.distanceKm).map((p) => p.site) : undefined;
    this.residuals.set({
      residuals: location?.ok ? location.value.arrivals.map((a) => ({ site: a.site, wave: a.wave, residualS: a.residualS, used: a.used })) : [],
      order, highlight: this.highlighted, rmsS: h ? h.rmsS : null,
    });
    this.wadati.set({ result: wadati, locatedOrigin: h ? h.originTime : null, highlight: this.highlighted });
    this.summary.replaceChildren(...summaryLines(event, location, this.options.modelLabel?.() ?? null));
    this.summary.classList.toggle('failed', !!location && !location.ok);
  }

  /** Highlights a site in all three panels (null: none); does not call onHover. */
  highlight(site: string | null): void {
    if (site === this.highlighted) return;
    this.highlighted = site;
    this.plan.set({ highlight: site });
    this.residuals.set({ highlight: site });
    this.wadati.set({ highlight: site });
  }

  /**
   * Predicted-arrival guides for the pick layer (PickMarks.guides): for every site, the P and S of
   * the current solution that the event has no pick of; `toView` turns µs into the view's seconds.
   * None while the solution drawn is of another event (the event's own is on its way).
   */
  guides(event: ReviewEvent | null, toView: (t: number) => number): Map<string, { phase: 'P' | 'S'; t: number }[]> {
    const out = new Map<string, { phase: 'P' | 'S'; t: number }[]>();
    const pred = this.state.predicted;
    if (!pred || !event || this.state.event?.id !== event.id) return out;
    const have = new Set((event?.picks ?? []).filter((p) => p.status !== 'rejected').map((p) => `${siteOfChannel(p.channel)}|${p.phase}`));
    for (const [site, a] of pred) {
      const list: { phase: 'P' | 'S'; t: number }[] = [];
      if (!have.has(`${site}|P`)) list.push({ phase: 'P', t: toView(a.p) });
      if (!have.has(`${site}|S`)) list.push({ phase: 'S', t: toView(a.s) });
      if (list.length) out.set(site, list);
    }
    return out;
  }

  /**
   * guides() with view seconds from `ref` (µs), kept until the solution, the event or `ref` changes:
   * cheap enough to call from the pick layer's draw of every row.
   */
  guidesAt(event: ReviewEvent | null, ref: Micros): Map<string, { phase: 'P' | 'S'; t: number }[]> {
    const m = this.guideMemo;
    if (m && m.state === this.state && m.event === event && m.ref === ref) return m.guides;
    const guides = this.guides(event, (t) => (t - ref) / 1e6);
    this.guideMemo = { state: this.state, event, ref, guides };
    return guides;
  }

  private guideMemo: { state: EventPanelsState; event: ReviewEvent | null; ref: Micros; guides: Map<string, { phase: 'P' | 'S'; t: number }[]> } | null = null;

  destroy(): void {
    if (!this.options.locator) this.locator.terminate();
    this.plan.destroy();
    this.residuals.destroy();
    this.wadati.destroy();
    this.root.remove();
  }
}

function summaryLines(event: ReviewEvent | null, r: ReviewLocateResult | null, model: string | null): HTMLElement[] {
  const line = (cls: string, text: string) => Object.assign(document.createElement('div'), { className: cls, textContent: text });
  if (!event || !r) return [line('db-muted', 'No event open')];
  if (!r.ok) return [line('db-fail', `Not located: ${r.message}`)];
  const h = r.value.hypocentre;
  const km = (x: number) => (x >= 1 ? `${x.toFixed(1)} km` : `${Math.round(x * 1000)} m`);
  const out = [
    line('db-strong', `${isoFromMicros(h.originTime).slice(0, 23).replace('T', ' ')} \u00b1 ${h.originTimeErrorS.toFixed(3)} s`),
    line('', `${h.latDeg.toFixed(4)}\u00b0 ${h.lonDeg.toFixed(4)}\u00b0 \u00b7 depth ${h.depthFixed ? `${km(h.depthKm)} (fixed)` : `${km(h.depthKm)} \u00b1 ${km(h.depthErrorKm)}`}`),
    line('', `RMS ${(h.rmsS * 1000).toFixed(1)} ms \u00b7 ${h.phaseCount} phases, ${h.stationCount} sites \u00b7 gap ${Math.round(h.gapDeg)}\u00b0`),
  ];
  if (h.errorsScaled) {
    // The residuals exceed the pick uncertainties: errors and ellipse widened (geiger.ts).
    out.push(line('db-warn errors-scaled', `errors \u00d7${h.errorScale.toFixed(1)} from the misfit (variance factor ${h.varianceFactor.toFixed(1)}) \u00b7 ellipse ${km(h.ellipse.semiMajorKm)} \u00d7 ${km(h.ellipse.semiMinorKm)}`));
  } else {
    out.push(line('db-muted', `ellipse ${km(h.ellipse.semiMajorKm)} \u00d7 ${km(h.ellipse.semiMinorKm)} (68 %)`));
  }
  if (r.value.skipped.length) out.push(line('db-warn', `${r.value.skipped.length} picks at sites without coordinates`));
  if (model) out.push(line('db-muted model-used', `model: ${model}`));
  return out;
}

// ---- demonstration hook for the end-to-end test (test/e2e/panels.test.ts) ---------------------

/** What the test page passes: plain data (Maps as entry lists). */
export interface PanelsDemoInput {
  event: ReviewEvent;
  sites: [string, SiteLocation][];
  model: VelocityModel;
  highlight?: string | null;
  theme?: 'light' | 'dark';
  /** Ask for this event's location first and for `event`'s at once after it (an edit before the answer came). */
  before?: ReviewEvent;
}

let demo: { host: HTMLElement; panels: EventPanels; hovered: (string | null)[] } | null = null;

/**
 * Shows the panels in a fixed column at the right of the page with `input` (located in the worker);
 * returns timings, where things are, and whether the worker's answer is the same, value for value,
 * as eventLocation called here on the page's own thread.
 */
async function panelsDemo(input: PanelsDemoInput) {
  if (input.theme) document.documentElement.dataset.theme = input.theme;
  if (!demo) {
    const host = document.createElement('div');
    host.className = 'db-panels-demo';
    document.body.append(host);
    const hovered: (string | null)[] = [];
    demo = { host, panels: new EventPanels(host, { onHover: (s) => hovered.push(s) }), hovered };
  }
  const sites = new Map(input.sites);
  const older = input.before ? demo.panels.update(input.before, sites, input.model) : null;
  const asked = demo.panels.update(input.event, sites, input.model);
  const st = await asked;
  if (!st) throw new Error('the panels update was superseded although no other was asked for');
  const memoised = demo.panels.update(input.event, sites, input.model) === asked;
  const direct = eventLocation(input.event, sites, input.model);
  const fromWorker = { location: st.location, wadati: st.wadati, predicted: st.predicted };
  demo.panels.highlight(input.highlight ?? null);
  // redraw timings of each panel alone, best of 20 (the first draw pays for fonts and layout)
  const best = (p: { draw(): number }) => Math.min(...Array.from({ length: 20 }, () => p.draw()));
  const box = (el: HTMLElement) => { const b = el.getBoundingClientRect(); return { x: b.x, y: b.y, width: b.width, height: b.height }; };
  const spots: Record<string, { x: number; y: number }> = {};
  const canvas = demo.panels.plan.root.querySelector('canvas') as HTMLCanvasElement;
  const cb = canvas.getBoundingClientRect();
  for (const [site] of input.sites) {
    const s = demo.panels.plan.spotOf(site);
    if (s) spots[site] = { x: cb.x + s.x, y: cb.y + s.y };
  }
  // locating again once the code is warm (the first call also compiles it), best of 5
  const locateWarmMs = Math.min(...Array.from({ length: 5 }, () => {
    const t = performance.now();
    locateReviewEvent(input.event, sites, input.model);
    return performance.now() - t;
  }));
  const loc = st.location;
  return {
    ok: loc?.ok ?? false,
    message: loc && !loc.ok ? loc.message : '',
    hypocentre: loc?.ok ? { ...loc.value.hypocentre, arrivals: undefined, covariance: undefined } : null,
    vpVs: st.wadati?.ok ? st.wadati.value.vpVs : null,
    locateMs: st.locateMs,
    locateWarmMs,
    updateDrawMs: st.drawMs,
    drawMs: { plan: best(demo.panels.plan), residuals: best(demo.panels.residuals), wadati: best(demo.panels.wadati) },
    guides: [...demo.panels.guidesAt(input.event, input.event.start)],
    updateMemoised: memoised,
    guidesMemoised: demo.panels.guidesAt(input.event, input.event.start) === demo.panels.guidesAt(input.event, input.event.start),
    workerDiffers: firstDifference(fromWorker, direct, 'result'),
    /** What the update asked for first resolved with (null: superseded, not drawn); undefined without `before`. */
    beforeDrawn: older ? ((await older) === null ? null : 'drawn') : undefined,
    drawnEvent: demo.panels.current.event?.id ?? null,
    summary: demo.panels.root.querySelector('.db-panels-summary')?.textContent ?? '',
    planCaption: demo.panels.plan.root.querySelector('.db-panel-caption')?.textContent ?? '',
    labels: {
      shown: demo.panels.plan.labelBoxes.length,
      hidden: demo.panels.plan.hiddenLabels,
      overlapping: demo.panels.plan.labelBoxes.filter((a, i) => demo!.panels.plan.labelBoxes.some((b, j) => j !== i && a.x0 < b.x1 && a.x1 > b.x0 && a.y0 < b.y1 && a.y1 > b.y0)).length,
    },
    spots,
    column: box(demo.panels.root),
    hovered: demo.hovered,
  };
}

export type PanelsDemoOutput = Awaited<ReturnType<typeof panelsDemo>>;

/** Where `a` and `b` first differ (a path), or null when they are the same value for value (NaN equals NaN, Maps by entries). */
function firstDifference(a: unknown, b: unknown, path: string): string | null {
  if (Object.is(a, b)) return null;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return `${path}: ${String(a)} vs ${String(b)}`;
  if (a instanceof Map || b instanceof Map) {
    if (!(a instanceof Map && b instanceof Map)) return `${path}: a Map and something else`;
    return firstDifference([...a], [...b], path);
  }
  if (Array.isArray(a) !== Array.isArray(b)) return `${path}: an array and something else`;
  const ka = Object.keys(a);
  const kb = Object.keys(b);
  if (ka.length !== kb.length || ka.some((k, i) => k !== kb[i])) return `${path}: keys ${ka.join(',')} vs ${kb.join(',')}`;
  for (const k of ka) {
    const d = firstDifference((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
    if (d) return d;
  }
  return null;
}

(window as unknown as { daybreakPanelsDemo: typeof panelsDemo }).daybreakPanelsDemo = panelsDemo;
