/**
 * The review desk for one opened dataset: the night overview on top, the event sheet below (its
 * toolbar and traces). Clicking the overview opens the sheet on that moment.
 */
import type { HostApi, Dataset } from '../electron/contract';
import { isoFromMicros, type Micros } from '../core/time';
import { DataSession, OVERVIEW_BIN_MICROS } from './data/session';
import { siteStreams, type SiteStreams } from './data/sites';
import { Overview } from './overview';
import { TraceView, type SiteRow } from './traces/traceView';
import { makePiece, type ComponentTrace } from './traces/rowData';
import { sheetSites, type SheetLimit, type SheetSite, type SheetSites } from './traces/sheetSites';
import { piecesByChannel } from './data/session';
import type { WindowPiece } from './data/protocol';
import { EventList } from './eventList';
import { EventMeasures } from './eventMeasures';
import { drawPicks, hitPick, type PickMarks } from './picks/pickLayer';
import { openReview, ReviewSaver } from './data/reviewSync';
import {
  History, acceptAutomatic, addEvent, deletePick, movePick, placePick, setExcluded, setPickAttributes, setState, setUncertainty,
  mergeEvents, splitEvent, setNote,
  setEventType, EVENT_TYPES, REVIEW_STATES, reviewToCsv, reviewEventsToQuakeMl, quakemlStatus, mergeCandidates, type ReviewDocument, type ReviewEvent, type EventType,
  type ReviewState,
} from '../core/review';
import { microsFromIso } from '../core/time';
import { readQuakeMl } from '../core/quakeml';
import { EventPanels, LocationWorker, type EventPanelsState } from './panels';
import { readWhileLocating } from './panels/readWhileLocating';
import {
  DEFAULT_MODEL, parseVelocityModel, siteLocations, type ReviewLocation, type SiteLocation, type VelocityModel,
} from '../core/location';
import { KEY_MAP, actionForKey, type KeyAction } from './keys';
import { magnitudeRead, withMagnitude } from '../core/review/reviewMagnitude';
import { magnitudesToCsv } from '../core/review/magnitudeCsv';
import { writeQuakeMl } from '../core/quakeml';
import type { ReviewMagnitude } from '../core/review/reviewMagnitude';
import { AmplitudeTool, drawAmplitudes, magnitudeSummary } from './picks/amplitudeLayer';
import { MagnitudeWorker } from './picks/magnitudeClient';
import { el } from './dom';
import { RadialTransverseRows, horizontalAzimuth } from './traces/radialTransverse';
import { DepthControl, holdDepthKm } from './panels/depthControl';
import { setFixedDepth } from '../core/location/reviewDepth';
import { NoteField } from './noteField';
import { channelKey, type ChannelId } from '../core/model';
import { SpectrumPanel } from './spectrum/spectrumPanel';
import { FILTER_PRESETS, defaultFilterIndex } from './filterPresets';

/** Window the sheet opens around a moment picked on the overview: 20 s before, 70 s after. */
const OPEN_BEFORE_S = 20;
const OPEN_AFTER_S = 70;

export class Desk {
  readonly root = el('div', { className: 'desk' });
  private readonly session: DataSession;
  private overview: Overview | null = null;
  private readonly status = el('div', { className: 'status-line' });
  private readonly sheetHost = el('div', { className: 'sheet' });
  private readonly sheetTitle = el('div', { className: 'sheet-title' });
  private traces: TraceView | null = null;
  private sites: SiteStreams[] = [];
  private filterIndex = 1;
  private zeroPhase = false;
  private verticalOnly = false;
  /** Sites shown: the first N in arrival order and those within a distance (0: no limit). */
  private siteLimit: SheetLimit = { count: 0, km: 0 };
  /** Show the sites the limit leaves out too (after the others). */
  private showAllSites = false;
  private sheet: SheetSites | null = null;
  private readonly limitToggle = el('button', { className: 'limit-toggle', hidden: true });
  private windowSpan: [Micros, Micros] | null = null;
  private ref: Micros = 0;
  private loadSeq = 0;
  private history: History | null = null;
  private panels: EventPanels | null = null;
  private magnitude: ReviewMagnitude | null = null;
  /** Amplitude picks: selection, dragging, removal (renderer/picks/amplitudeLayer). */
  private readonly amplitudeTool = new AmplitudeTool({
    event: () => this.currentEv(), magnitude: () => this.magnitude, ref: () => this.ref,
    secondsPerPixel: () => this.traces?.secondsPerPixel() ?? 0.01, apply: (edit) => this.apply(edit),
    redraw: () => this.traces?.redrawMarks(), status: (text) => this.setStatus(text),
  });
  private magnitudeFor: ReviewEvent | null = null;
  /** The event whose magnitude is shown (magnitudeFor's comes when the worker answers). */
  private magnitudeShownFor: ReviewEvent | null = null;
  private magnitudeSeq = 0;
  private siteCoords = new Map<string, SiteLocation>();
  /** Horizontals as radial/transverse from the current location (view option, renderer/traces/radialTransverse). */
  private readonly rotation = new RadialTransverseRows(() => this.siteCoords, (k) => horizontalAzimuth(k, this.session.channels.get(k)?.meta?.azimuth));
  private readonly rotationBox = el('input', { type: 'checkbox', checked: false });
  /** The event bar's fixed-depth field (renderer/panels/depthControl). */
  private readonly depthField = new DepthControl({
    solvedDepthKm: () => this.solvedDepthKm(), onError: (m) => this.setStatus(m),
    onSet: (km) => { const ev = this.currentEv(); if (ev) this.apply((d) => setFixedDepth(d, ev.id, km)); },
  });
  /** The event bar's note field, kept across redraws (renderer/noteField). */
  private readonly noteField = new NoteField((id, text) => { this.apply((d) => setNote(d, id, text)); });
  private model: VelocityModel = DEFAULT_MODEL;
  private modelName = 'default-model';
  /** The model as the location summary names it (the file, or the built-in one and why). */
  private modelLabel = 'built-in crustal model (no model file in the folder)';
  private saver: ReviewSaver | null = null;
  private readOnly = false;
  private currentEvent: string | null = null;
  private selected: string | null = null;
  private drag: { pickId: string; part: 'line' | 'lower' | 'upper'; startT: number; preview: number } | null = null;
  /** RMS and magnitude per event for the list, worked out in the background when it is sorted by them. */
  private readonly measures = new EventMeasures((ev) => this.locateForList(ev), async (ev, loc) => (await this.eventMagnitude(ev, loc))?.magnitude?.mag ?? null, () => this.eventList.refresh());
  private readonly eventList = new EventList((id) => void this.openEvent(id), (e) => this.measures.get(e), (key, events) => this.measures.want(key, events));
  private readonly eventBar = el('div', { className: 'event-bar' });
  private readonly banner = el('div', { className: 'banner', hidden: true });
  /** The spectrum of the site under the pointer (N; renderer/spectrum). */
  private spectrum: SpectrumPanel | null = null;

  constructor(
    private readonly host: HostApi, dataset: Dataset, private readonly setStatus: (text: string) => void,
    /** Scan the night in the background on first opening (when the review has no detector events). */
    private readonly autoScan = true,
  ) {
    this.session = new DataSession(host, dataset);
  }

  async open(onProgress: (fraction: number, note: string) => void): Promise<void> {
    await this.session.open(onProgress);
    this.sites = siteStreams(this.session.channels.keys());
    if (this.sites.length === 0) {
      this.root.replaceChildren(el('div', { className: 'card' },
        el('h2', {}, 'No waveform data'),
        el('p', {}, `No readable miniSEED records were found under ${this.session.dataset.root}.`),
        el('ul', { className: 'problems' }, ...this.session.problems.slice(0, 50).map((p) =>
          el('li', {}, `${p.file}${p.offset !== undefined ? ` at byte ${p.offset}` : ''}: ${p.reason}`)))));
      return;
    }
    await this.openReviewFile(false);
    this.siteCoords = siteLocations([...this.session.channels.values()].map((c) => c.meta));
    const mf = this.session.dataset.files.find((f) => f.kind === 'model');
    const mr = mf ? await this.host.call('file.read', { root: this.session.dataset.root, path: mf.path }) : null;
    if (mf && mr?.ok) {
      try {
        this.model = parseVelocityModel(new TextDecoder().decode(mr.value), mf.path);
        this.modelName = mf.path.replace(/[^\w.\-]/g, '_');
        this.modelLabel = mf.path;
      } catch (e) {
        this.setStatus(`${e instanceof Error ? e.message : e}; using the default model`);
        this.modelLabel = `built-in crustal model (${mf.path} unreadable)`;
      }
    }
    this.build();
  }

  private async openReviewFile(force: boolean): Promise<void> {
    const r = await openReview(this.host, this.session.dataset.root, force);
    this.history = new History(r.doc);
    this.readOnly = r.lockedBy !== null;
    this.saver = new ReviewSaver(this.host, this.session.dataset.root, (st) => {
      this.saveState.textContent = st.state === 'saved' ? `saved (revision ${st.revision})` : st.state === 'saving' ? 'saving\u2026' : `NOT SAVED: ${st.message}`;
      this.saveState.className = `save-state ${st.state}`;
    });
    this.reviewPath = r.path;
    if (r.lockedBy) {
      const take = el('button', {}, 'Take over');
      take.addEventListener('click', () => void this.openReviewFile(true).then(() => this.afterDocChange(false)));
      this.banner.replaceChildren(
        `Another copy of Daybreak (process ${r.lockedBy.pid} on ${r.lockedBy.host}, since ${r.lockedBy.since}) has this review open. Edits are off here so neither copy overwrites the other. `,
        take);
      this.banner.hidden = false;
    } else {
      this.banner.hidden = true;
    }
  }

  private reviewPath = '';
  private readonly saveState = el('span', { className: 'save-state' }, 'no changes since opening');

  get doc(): ReviewDocument | null {
    return this.history?.doc ?? null;
  }

  private build(): void {
    const [t0, t1] = this.session.span;
    const positions = new Map<string, { latitude: number; longitude: number }>();
    for (const ch of this.session.channels.values()) {
      if (ch.meta) positions.set(`${ch.meta.id.network}.${ch.meta.id.station}`, { latitude: ch.meta.latitude, longitude: ch.meta.longitude });
    }
    this.filterIndex = defaultFilterIndex([...positions.values()]);
    const overviewHost = el('section', { className: 'overview-host' });
    const headline = el('div', { className: 'overview-title' },
      el('span', {}, 'Night overview'),
      el('span', { className: 'muted' }, ` ${isoFromMicros(t0).slice(0, 16).replace('T', ' ')} \u2192 ${isoFromMicros(t1).slice(0, 16).replace('T', ' ')} UTC \u00b7 ${this.sites.length} sites \u00b7 level relative to each site\u2019s median; vermillion top: clipped; click to open`));
    overviewHost.append(headline);
    this.overview = new Overview(overviewHost, {
      binMicros: OVERVIEW_BIN_MICROS,
      span: [t0, t1],
      formatTime: (t) => isoFromMicros(t).slice(11, 19),
      onPick: (t) => void this.openMoment(t),
    });
    this.overview.setSites(this.sites.map((s) => {
      const z = this.session.channels.get(s.channels[0]);
      const levels = new Map<number, number>();
      if (z) for (const [b, v] of z.levels) levels.set(b, v.rms);
      const clipped = new Set<number>();
      for (const key of s.channels) for (const [b, v] of this.session.channels.get(key)?.levels ?? []) if (v.clipped) clipped.add(b);
      return { site: s.site, levels, flags: this.siteFlags(s, true), clipped };
    }));

    const filterSelect = el('select', { title: 'Filter applied to every trace (causal unless zero-phase is ticked)' },
      ...FILTER_PRESETS.map((p, i) => el('option', { value: String(i), selected: i === this.filterIndex }, p.label)));
    filterSelect.addEventListener('change', () => { this.filterIndex = Number(filterSelect.value); void this.reload(); });
    const zp = el('input', { type: 'checkbox', checked: this.zeroPhase });
    zp.addEventListener('change', () => { this.zeroPhase = zp.checked; void this.reload(); });
    const vo = el('input', { type: 'checkbox', checked: this.verticalOnly });
    vo.addEventListener('change', () => { this.verticalOnly = vo.checked; void this.reload(); });
    const limit = el('select', { className: 'limit-count', title: 'How many sites to show: all, or the first N in arrival order (the rest stay a toggle away)' },
      ...[['0', 'all sites'], ['6', 'first 6'], ['12', 'first 12'], ['24', 'first 24']].map(([v, label]) => el('option', { value: v, selected: Number(v) === this.siteLimit.count }, label)));
    limit.addEventListener('change', () => { this.siteLimit = { ...this.siteLimit, count: Number(limit.value) }; this.showAllSites = false; void this.reload(); });
    const within = el('select', { className: 'limit-km', title: 'Only sites within this distance of the epicentre (of the first-arriving site when the event is not located)' },
      ...[0, 10, 20, 30, 50, 100].map((v) => el('option', { value: String(v), selected: v === this.siteLimit.km }, v ? `${v} km` : 'any distance')));
    within.addEventListener('change', () => { this.siteLimit = { ...this.siteLimit, km: Number(within.value) }; this.showAllSites = false; void this.reload(); });
    this.limitToggle.addEventListener('click', () => { this.showAllSites = !this.showAllSites; void this.reload(); });
    const amp = el('select', { title: 'Amplitude scaling' }, el('option', { value: 'trace' }, 'each trace'), el('option', { value: 'common' }, 'common'));
    amp.addEventListener('change', () => this.traces?.setAmplitudeMode(amp.value as 'trace' | 'common'));
    this.rotationBox.addEventListener('change', () => this.run('radialTransverse'));
    const reset = el('button', { title: 'Show the whole window' }, 'Full window');
    reset.addEventListener('click', () => this.traces?.resetWindow());
    const toolbar = el('div', { className: 'sheet-toolbar' },
      this.sheetTitle,
      el('span', { className: 'spacer' }),
      el('label', {}, 'Filter ', filterSelect),
      el('label', { className: 'zero-phase', title: 'Forward and backward filtering moves energy ahead of onsets: for viewing, not for picking' }, zp, ' zero-phase (view only)'),
      el('label', {}, vo, ' vertical only'),
      el('label', { title: 'Horizontals rotated to radial and transverse with the back-azimuth from each site to the current epicentre (Y)' }, this.rotationBox, ' R/T'),
      el('label', {}, 'Show ', limit), el('label', {}, 'within ', within), this.limitToggle,
      el('label', {}, 'Scale ', amp),
      reset);
    const traceHost = el('div', { className: 'trace-host' });
    const side = el('aside', { className: 'event-side' });
    this.sheetHost.replaceChildren(toolbar, el('div', { className: 'sheet-body' }, traceHost, side));
    this.panels = new EventPanels(side, { onHover: (site) => this.traces?.highlightRow(site), locator: this.locator, modelLabel: () => this.modelLabel });
    traceHost.addEventListener('pointermove', () => this.panels?.highlight(this.traces?.pointer()?.row.key ?? null));
    traceHost.addEventListener('pointerleave', () => this.panels?.highlight(null));
    this.sheetHost.dataset.filter = String(this.filterIndex);
    this.filterSelect = filterSelect;
    this.traces = new TraceView(traceHost, {
      formatTime: (t, step) => {
        const iso = isoFromMicros(this.ref + Math.round(t * 1e6));
        return step >= 1 ? iso.slice(11, 19) : step >= 0.1 ? iso.slice(11, 21) : iso.slice(11, 23);
      },
      onWindow: (x0, x1) => { this.overview?.setCursorSpan([this.ref + x0 * 1e6, this.ref + x1 * 1e6]); this.spectrum?.follow(); },
      drawMarks: (m) => { drawPicks(m, this.marks()); drawAmplitudes(m, this.amplitudeTool.marks()); },
      onPointerDown: (row, t, band) => this.pointerDown(row.key, t, band),
      onPointerDrag: (t) => this.pointerDrag(t),
      onPointerUp: (t) => this.pointerUp(t),
    });
    this.spectrum = new SpectrumPanel(traceHost, {
      view: () => this.traces && {
        span: [this.ref + Math.round(this.traces.window[0] * 1e6), this.ref + Math.round(this.traces.window[1] * 1e6)],
        firstPick: this.currentEv()?.picks.reduce<number | null>((m, p) => (m === null || p.time < m ? p.time : m), null) ?? null,
        filter: FILTER_PRESETS[this.filterIndex].filter, filterLabel: FILTER_PRESETS[this.filterIndex].label, zeroPhase: this.zeroPhase,
        channels: (site) => this.sites.find((s) => s.site === site)?.channels ?? [],
        units: (ch) => this.session.channels.get(ch)?.meta?.sensitivity?.outputUnits ?? null,
      },
      read: async (chs, a, b) => (await this.session.window(chs, a, b, null, false, 0, false)).pieces,
      status: (text) => this.setStatus(text),
    });
    const exportButton = el('button', { title: 'Write the review as QuakeML 1.2 and a CSV of picks beside the review file' }, 'Export QuakeML + CSV');
    exportButton.addEventListener('click', () => void this.exportAll());
    const foot = el('div', { className: 'event-list-foot' });
    const qml = this.session.dataset.files.filter((f) => f.kind === 'quakeml');
    if (qml.length) {
      const pickFile = el('select', { title: 'QuakeML files in the data folder (e.g. written overnight by daybreak scan)' },
        ...qml.map((f) => el('option', { value: f.path }, f.path)));
      const load = el('button', { title: 'Add the events of this QuakeML file to the review (events already worked on are left as they are)' }, 'Load candidates');
      load.addEventListener('click', () => void this.loadCandidates(pickFile.value));
      foot.append(el('div', { className: 'load-row' }, pickFile, load));
    }
    const rescan = el('button', { title: 'Run the detector and picker over the whole dataset again (events already worked on are kept as they are)' }, 'Scan the night');
    rescan.addEventListener('click', () => void this.runScan());
    foot.append(this.scanState, rescan, exportButton);
    this.eventList.root.append(foot);
    // First opening of a dataset: scan it in the background so candidate events appear.
    if (this.autoScan && !(this.doc?.events ?? []).some((e) => e.source === 'detector') && this.session.dataset.files.some((f) => f.kind === 'stationxml')) {
      void this.runScan();
    }
    const work = el('div', { className: 'desk-work' }, this.eventList.root, this.sheetHost);
    this.root.replaceChildren(overviewHost, this.banner, work, this.status);
    this.sheetHost.insertBefore(this.eventBar, this.sheetHost.children[1]);
    this.afterDocChange(false);
    document.addEventListener('keydown', this.onKey);
    // Read-only view state for end-to-end tests (seconds from the sheet's reference time).
    (window as unknown as { daybreakView: () => unknown }).daybreakView = () => {
      const [x0, x1] = this.traces?.window ?? [0, 0];
      return { x0, x1, secondsPerPixel: this.traces?.secondsPerPixel() ?? 0, ref: this.ref, selectedPick: this.selected, timings: this.timings, openMs: this.session.openMs, overviewMs: this.overview?.fullDrawMs ?? 0, frameMs: this.traces?.lastDrawMs ?? 0,
        sheet: this.sheet && { shown: this.sheet.shown.map((x) => x.streams.site), hidden: this.sheet.hidden.map((x) => x.streams.site), reference: this.sheet.reference, showAll: this.showAllSites },
        panels: this.panels && { event: this.panels.current.event?.id ?? null, location: this.panels.current.location, locateMs: this.panels.current.locateMs, drawMs: this.panels.current.drawMs, locatedBefore: this.panels.current.locatedBefore } };
    };
    // Read-only magnitude state for end-to-end tests: amplitudes (times µs), removed ones, station magnitudes, ML.
    (window as unknown as { daybreakMagnitude: () => unknown }).daybreakMagnitude = () => {
      const m = this.magnitude;
      const key = (a: { waveformId: ChannelId | null }) => (a.waveformId ? channelKey(a.waveformId) : '');
      return m && {
        event: this.magnitudeShownFor?.id ?? null, ref: this.ref, ml: m.magnitude?.mag ?? null, uncertainty: m.magnitude?.uncertainty ?? null, stationCount: m.magnitude?.stationCount ?? 0, evaluationMode: m.magnitude?.evaluationMode ?? null, computeMs: this.magnitudeMs,
        amplitudes: m.amplitudes.map((a) => ({ id: a.id, channel: key(a), time: a.time, value: a.value, mode: a.evaluationMode })),
        removed: m.removed.map((a) => ({ id: a.id, channel: key(a), time: a.time, value: a.value })),
        stationMagnitudes: m.stationMagnitudes.map((s) => ({ id: s.id, mag: s.mag, amplitudeId: s.amplitudeId })),
        selected: this.amplitudeTool.selected,
      };
    };
    const problems = this.session.problems.length;
    this.status.textContent = `${this.session.files.length} files read${problems ? ` \u00b7 ${problems} problems (see the log)` : ''}`;
    this.status.append(' \u00b7 ', this.saveState, ` \u00b7 review file ${this.reviewPath}`);
    // Start where the analyst stopped, else on the first event, else on the loudest moment of the night.
    const events = this.doc?.events ?? [];
    const resume = events.find((e) => e.state === 'started') ?? events.find((e) => e.state === 'todo');
    if (resume) void this.openEvent(resume.id);
    else void this.openWindow(this.loudestMoment() - OPEN_BEFORE_S * 1e6, this.loudestMoment() + OPEN_AFTER_S * 1e6);
  }

  private filterSelect: HTMLSelectElement | null = null;

  private loudestMoment(): Micros {
    const votes = new Map<number, number>();
    for (const s of this.sites) {
      const z = this.session.channels.get(s.channels[0]);
      if (!z) continue;
      const values = [...z.levels.values()].map((v) => v.rms).filter((v) => v > 0).sort((a, b) => a - b);
      const median = values[values.length >> 1] ?? 1;
      for (const [b, v] of z.levels) if (v.rms > 4 * median) votes.set(b, (votes.get(b) ?? 0) + 1);
    }
    let best = Math.floor(this.session.span[0] / OVERVIEW_BIN_MICROS);
    let bestVotes = -1;
    for (const [b, n] of votes) if (n > bestVotes) { best = b; bestVotes = n; }
    return best * OVERVIEW_BIN_MICROS;
  }

  /**
   * Warnings about a site's channels over the whole night. `withClipping`: also how many of the
   * night's bins each channel clipped in (for the overview; a row tells of its own window instead).
   */
  private siteFlags(s: SiteStreams, withClipping: boolean): string[] {
    const flags: string[] = [];
    for (const key of s.channels) {
      const ch = this.session.channels.get(key);
      if (!ch) continue;
      if (ch.summaries.some((x) => x.segments.some((g) => g.questionableTimeRecords > 0 || (g.timingQualityMin !== null && g.timingQualityMin < 50)))) flags.push(`${key.split('.')[3]} timing questionable`);
      const gaps = ch.summaries.reduce((n, x) => n + x.gaps.length, 0);
      if (gaps) flags.push(`${key.split('.')[3]} ${gaps} gap${gaps > 1 ? 's' : ''}`);
      if (!ch.meta) flags.push(`${key.split('.')[3]} no metadata`);
      if (!withClipping) continue;
      let clippedBins = 0;
      for (const v of ch.levels.values()) if (v.clipped) clippedBins++;
      if (clippedBins) flags.push(`${key.split('.')[3]} clipped in ${clippedBins} \u00d7 ${OVERVIEW_BIN_MICROS / 1e6} s of the night`);
    }
    return [...new Set(flags)];
  }

  /** Opens the event that holds `t`, else a window around `t` with no event open (browsing). */
  async openMoment(t: Micros): Promise<void> {
    const ev = this.doc?.events.find((e) => e.start <= t && t <= e.end);
    if (ev) return this.openEvent(ev.id);
    this.currentEvent = null;
    this.selected = null;
    this.afterDocChange(false);
    await this.openWindow(t - OPEN_BEFORE_S * 1e6, t + OPEN_AFTER_S * 1e6);
  }

  async openWindow(start: Micros, end: Micros): Promise<void> {
    this.windowSpan = [start, end];
    this.ref = start;
    await this.reload();
    this.traces?.resetWindow();
  }

  private async reload(): Promise<void> {
    if (!this.windowSpan || !this.traces) return;
    const seq = ++this.loadSeq;
    let drawn = () => {};
    this.sheetDrawn = new Promise<void>((r) => { drawn = r; });
    try {
      await this.loadWindow(seq, drawn);
    } finally {
      drawn();
    }
    this.spectrum?.follow();
  }

  /** Resolves once the window being loaded has its rows in view drawn (or was superseded). */
  private sheetDrawn: Promise<void> = Promise.resolve();

  private async loadWindow(seq: number, drawn: () => void): Promise<void> {
    if (!this.windowSpan || !this.traces) return;
    const [start, end] = this.windowSpan;
    const preset = FILTER_PRESETS[this.filterIndex];
    this.sheetTitle.textContent = `${isoFromMicros(start).slice(0, 19).replace('T', ' ')} UTC \u00b7 ${Math.round((end - start) / 1e6)} s \u00b7 ${preset.label}${this.zeroPhase && preset.filter ? ' (zero-phase view)' : ''}`;
    // Order and limit the sites first (picks and coordinates only), then read the rows in view before
    // the others, so the sheet is drawn while the rest is still being read and filtered.
    const channelsOf = (list: SheetSite[]) => list.flatMap((x) => (this.verticalOnly ? x.streams.channels.slice(0, 1) : x.streams.channels));
    const empty = new Map<string, WindowPiece[]>();
    const layoutFor = (st: EventPanelsState | null) => {
      const ev = this.currentEv();
      const h = st?.event === ev && st?.location?.ok ? st.location.value.hypocentre : null;
      const sheet = sheetSites(this.sites, ev?.picks ?? [], this.siteCoords, h ? { latitude: h.latDeg, longitude: h.lonDeg } : null, this.siteLimit);
      const listed = this.showAllSites ? [...sheet.shown, ...sheet.hidden] : sheet.shown;
      const blank = listed.map((x) => this.siteRow(x, empty));
      const [a, b] = this.traces!.rowsInView(blank);
      return { sheet, listed, blank, a, b, head: a < 0 ? listed : listed.slice(a, b + 1) };
    };
    // The open event's epicentre orders and limits them; it comes from the location worker, so the rows
    // in view are read meanwhile as the last solution drawn lays them out (renderer/panels/readWhileLocating).
    const drawnNow = this.panels?.current ?? null;
    const guess = layoutFor(drawnNow);
    const t0 = performance.now();
    const { layout, reply, waitMs } = await readWhileLocating(guess,
      // (no newer solution on its way, e.g. a re-filter: the guess is the layout)
      (this.panels?.settled() ?? Promise.resolve(null)).then((st) => (st === drawnNow ? guess : layoutFor(st))), (l) => channelsOf(l.head),
      (chs) => this.session.window(chs, start, end, preset.filter, this.zeroPhase));
    if (seq !== this.loadSeq) return;
    const { sheet, listed, blank, a, b } = layout;
    this.sheet = sheet;
    const byKey = piecesByChannel(reply.pieces);
    const rows = listed.map((x, i) => (a < 0 || (i >= a && i <= b) ? this.siteRow(x, byKey) : blank[i]));
    this.rowsBySite = new Map(rows.map((r) => [r.key, r]));
    this.renderSheetLimit();
    const t1 = performance.now();
    this.traces.setRows(rows, [0, (end - start) / 1e6]);
    // Until painted: the frame that shows the rows, then a task after its paint.
    await new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));
    const t2 = performance.now();
    drawn();
    const window1 = this.session.lastWindowTiming;
    this.timings = { readMs: t1 - t0, locateWaitMs: waitMs, drawMs: t2 - t1, drawnAt: t2, rows: rows.length, channels: channelsOf(listed).length, rowsDrawMs: this.traces.lastDrawMs, window: window1, allMs: t2 - t0, complete: false };
    const notes = [...reply.notes];
    const rest = listed.filter((_, i) => a >= 0 && (i < a || i > b));
    if (rest.length === 0) this.timings.complete = true;
    else {
      const more = await this.session.window(channelsOf(rest), start, end, preset.filter, this.zeroPhase);
      if (seq !== this.loadSeq) return;
      const moreByKey = piecesByChannel(more.pieces);
      const all = listed.map((x, i) => (i >= a && i <= b ? rows[i] : this.siteRow(x, moreByKey)));
      this.rowsBySite = new Map(all.map((r) => [r.key, r]));
      this.traces.updateRows(all);
      await new Promise((r) => requestAnimationFrame(() => setTimeout(r, 0)));
      this.timings = { ...this.timings, allMs: performance.now() - t0, rest: this.session.lastWindowTiming, complete: true };
      notes.push(...more.notes);
    }
    this.setStatus(`window read in ${Math.round(t1 - t0)} ms, drawn in ${Math.round(t2 - t1)} ms${notes.length ? ` \u00b7 ${notes[0]}` : ''}`);
  }

  /** The toggle beside the limits: how many sites the limits leave out, and from where distances count. */
  private renderSheetLimit(): void {
    const sh = this.sheet;
    const hidden = sh?.hidden.length ?? 0;
    const from = sh?.reference ? (sh.reference.kind === 'epicentre' ? 'from the epicentre' : `from ${sh.reference.site?.split('.')[1]} (first arrival)`) : 'no reference point';
    const text = this.showAllSites ? `hide the ${hidden} beyond the limit` : `+${hidden} more`;
    const title = `${sh?.shown.length ?? 0} sites within the limit, ${hidden} beyond it; distances ${from}`;
    // Written only when changed (a new filter on the same window changes none of it).
    if (this.limitToggle.hidden !== (hidden === 0)) this.limitToggle.hidden = hidden === 0;
    if (this.limitToggle.textContent !== text) this.limitToggle.textContent = text;
    if (this.limitToggle.title !== title) this.limitToggle.title = title;
  }

  /** The row of one site from its pieces (channels without pieces draw empty). */
  private siteRow(x: SheetSite, byKey: ReadonlyMap<string, WindowPiece[]>): SiteRow {
    const s = x.streams;
    const comps: ComponentTrace[] = [];
    for (const key of this.verticalOnly ? s.channels.slice(0, 1) : s.channels) {
      const pieces = (byKey.get(key) ?? []).map((p) => makePiece((p.start - this.ref) / 1e6, p.sampleRate, p.samples, p.envelope));
      comps.push({ key, label: key.split('.')[3], pieces });
    }
    // A row tells of clipping in its own window only (the night's count is the overview's).
    const flags = this.siteFlags(s, false);
    for (const key of s.channels) if ((byKey.get(key) ?? []).some((p) => p.clipped)) flags.push(`${key.split('.')[3]} clipped in this window`);
    for (const key of s.channels) {
      const pieces = byKey.get(key) ?? [];
      if (pieces.length && pieces.every((p) => p.flat)) flags.push(`${key.split('.')[3]} dead: one value throughout`);
    }
    const where = [s.stream.split('.').slice(2).join('.'), x.distanceKm === null ? '' : `${x.distanceKm.toFixed(1)} km`].filter(Boolean).join(' \u00b7 ');
    return this.rotation.shown({ key: s.site, label: s.site.split('.')[1], detail: where || undefined, components: comps, flags });
  }

  /** Last measured window load (for the status line and the benchmark). */
  timings: Record<string, unknown> & { readMs: number; drawMs: number; rows: number; channels: number } = { readMs: 0, drawMs: 0, rows: 0, channels: 0 };

  // ----- review document -----------------------------------------------------------------------

  private currentEv(): ReviewEvent | null {
    return this.doc?.events.find((e) => e.id === this.currentEvent) ?? null;
  }

  /** Local magnitude of the open event from its location and the horizontals (read in worker 1). */
  private async updateMagnitude(ev: ReviewEvent | null, loc: ReviewLocation | null): Promise<void> {
    const seq = ++this.magnitudeSeq;
    const rd = ev && loc ? magnitudeRead(ev, loc, this.channelMetas(), this.siteCoords) : null;
    if (!ev || !loc || !rd) {
      this.magnitude = null;
      this.magnitudeText.textContent = '';
      this.traces?.redrawMarks();
      return;
    }
    // Computed in a worker (renderer/picks/magnitudeWorker), which keeps the raw pieces: they are read
    // again only when the span or channels change (a pick moved the windows), not for an amplitude edit.
    let r: { value: ReviewMagnitude | null; ms: number };
    try {
      r = await this.magnitudeWorker.compute({
        ev, loc, evaluationStatus: quakemlStatus(ev.state), readKey: `${rd.channels.join(',')}|${rd.from}|${rd.to}`,
        read: async () => (await this.session.window(rd.channels, rd.from, rd.to, null, false, 0, false)).pieces,
        metas: () => this.channelMetas(), sites: () => this.siteCoords,
      });
    } catch (e) {
      if (seq === this.magnitudeSeq) this.setStatus(`no magnitude: ${e instanceof Error ? e.message : e}`);
      return;
    }
    if (seq !== this.magnitudeSeq) return;
    this.measures.record(ev, loc, r.value?.magnitude?.mag ?? null);
    this.magnitude = r.value;
    this.magnitudeShownFor = ev;
    this.magnitudeMs = r.ms;
    this.magnitudeText.textContent = magnitudeSummary(this.magnitude, ev);
    this.renderEventBar();
    this.traces?.redrawMarks();
  }

  /** The event's location for the list and the exports (4 picks at least), or null; located in the worker. */
  private async locateForList(ev: ReviewEvent): Promise<ReviewLocation | null> {
    if (ev.picks.length < 4) return null;
    // Already located for the list or the panels (events are immutable: the same object, the same solution).
    const known = this.measures.locationOf(ev);
    if (known !== undefined) return known;
    const r = await this.locator.locate(ev, this.siteCoords, this.model);
    return r.ok ? r.value : null;
  }

  /** The event's magnitude for the list and the exports, as the event bar works it out (null when there is none); computed in the worker. */
  private async eventMagnitude(ev: ReviewEvent, loc: ReviewLocation): Promise<ReviewMagnitude | null> {
    const rd = magnitudeRead(ev, loc, this.channelMetas(), this.siteCoords);
    if (!rd) return null;
    const { pieces } = await this.session.window(rd.channels, rd.from, rd.to, null, false, 0, false);
    return this.magnitudeWorker.measure({ ev, loc, evaluationStatus: quakemlStatus(ev.state), pieces, metas: () => this.channelMetas(), sites: () => this.siteCoords });
  }

  private readonly magnitudeText = el('span', { className: 'magnitude' });
  private readonly magnitudeWorker = new MagnitudeWorker();
  /** Locations of the open event (the panels), the list and the exports, off the interface thread. */
  private readonly locator = new LocationWorker();
  /** Time the last magnitude computation took in the worker (response removal, Wood-Anderson, peaks), ms. */
  private magnitudeMs = 0;

  private channelMetas() {
    return [...this.session.channels.values()].flatMap((c) => (c.meta ? [c.meta] : []));
  }

  private marks(): PickMarks {
    const ev = this.currentEv();
    let picks = ev?.picks ?? [];
    if (this.drag) {
      const d = this.drag;
      picks = picks.map((p) => {
        if (p.id !== d.pickId) return p;
        const tp = (p.time - this.ref) / 1e6;
        if (d.part === 'line') return { ...p, time: this.ref + Math.round(d.preview * 1e6) };
        if (d.part === 'lower') return { ...p, lower: Math.max(0, tp - d.preview) };
        return { ...p, upper: Math.max(0, d.preview - tp) };
      });
    }
    return { picks, selected: this.selected, guides: ev ? this.panels?.guidesAt(ev, this.ref) : undefined, toView: (t) => (t - this.ref) / 1e6 };
  }

  /** Applies an edit (unless the review is read-only here), saves, redraws. */
  private apply(edit: (doc: ReviewDocument) => ReviewDocument): boolean {
    if (!this.history) return false;
    if (this.readOnly) {
      this.setStatus('edits are off: another copy holds this review (see the banner)');
      return false;
    }
    try {
      this.history.apply(edit(this.history.doc));
    } catch (e) {
      this.setStatus(e instanceof Error ? e.message : String(e));
      return false;
    }
    this.afterDocChange(true);
    return true;
  }

  private listedEvents: readonly ReviewEvent[] | null = null;
  private listedCurrent: string | null = null;
  private markedStarts = '';

  private afterDocChange(save: boolean): void {
    const doc = this.doc;
    if (!doc) return;
    if (save) this.saver?.save(doc);
    if (this.currentEvent && !doc.events.some((e) => e.id === this.currentEvent)) this.currentEvent = null;
    const ev = this.currentEv();
    if (this.selected && !ev?.picks.some((p) => p.id === this.selected)) this.selected = null;
    // The list and the overview's marks change only with the events (a selection changes neither);
    // the overview redraws its whole canvas, so its marks are set only when the event times change.
    if (doc.events !== this.listedEvents || this.currentEvent !== this.listedCurrent) {
      this.eventList.set(doc.events, this.currentEvent);
      this.listedCurrent = this.currentEvent;
    }
    if (doc.events !== this.listedEvents) {
      const starts = doc.events.map((e) => e.start).join(',');
      if (starts !== this.markedStarts) {
        this.markedStarts = starts;
        this.overview?.setMarks(doc.events.map((e) => ({ t: e.start, label: e.id })));
      }
      this.listedEvents = doc.events;
    }
    this.renderEventBar();
    // Located in a worker (renderer/panels/locationClient): what follows from the solution comes with it.
    void this.panels?.update(ev, this.siteCoords, this.model).then((st) => { if (st) this.afterLocated(st); });
    this.traces?.redrawMarks();
  }

  /** What follows from the open event's solution once the panels have drawn it. */
  private afterLocated(located: EventPanelsState): void {
    const ev = located.event;
    if (ev !== this.currentEv()) return;
    if (located.location && !located.location.ok && ev && ev.picks.length > 0) this.setStatus(`not located: ${located.location.message}`);
    // The list shows the open event's RMS (and its ML once known) without locating it again.
    if (ev && located.location) this.measures.record(ev, located.location.ok ? located.location.value : null);
    if (this.rotation.setEpicentre(located.location?.ok ? located.location.value.hypocentre : null)) this.showRotation();
    // The magnitude follows the event's picks (not selection changes): same event object, no work.
    if (ev !== this.magnitudeFor) {
      this.magnitudeFor = ev;
      const loc = located.location?.ok ? located.location.value : null;
      // After the sheet's rows in view are drawn (a window being opened now starts before this runs).
      void Promise.resolve().then(() => this.sheetDrawn).then(() => this.updateMagnitude(ev, loc));
      // Then the list's next and previous events are located, so that stepping to one draws its panels at once.
      void this.sheetDrawn.then(() => this.panels?.prefetch(this.eventList.neighbours(this.currentEvent), this.siteCoords, this.model));
    }
    this.traces?.redrawMarks();
  }

  /** The event being worked on, made from the current window when there is none. */
  private ensureEvent(): string | null {
    if (this.currentEvent) return this.currentEvent;
    if (!this.windowSpan || !this.history) return null;
    const [start, end] = this.windowSpan;
    let id: string | null = null;
    if (this.apply((d) => { const r = addEvent(d, start, end); id = r.eventId; return r.doc; })) this.currentEvent = id;
    this.afterDocChange(false);
    return this.currentEvent;
  }

  async openEvent(id: string): Promise<void> {
    const ev = this.doc?.events.find((e) => e.id === id);
    if (!ev) return;
    this.currentEvent = id;
    this.selected = null;
    this.amplitudeTool.clear();
    this.afterDocChange(false);
    await this.openWindow(ev.start, ev.end);
  }

  private renderEventBar(): void {
    const ev = this.currentEv();
    if (!ev) {
      this.noteField.flush();
      const make = el('button', { title: 'Add an event the detector missed, over this window' }, 'Make this window an event');
      make.addEventListener('click', () => { this.ensureEvent(); });
      this.eventBar.replaceChildren(el('span', { className: 'muted' }, 'Browsing: no event open. '), make);
      return;
    }
    const state = el('select', { title: 'Review state' }, ...REVIEW_STATES.map((s) => el('option', { value: s, selected: s === ev.state }, s === 'todo' ? 'to do' : s)));
    state.addEventListener('change', () => this.apply((d) => setState(d, ev.id, state.value as ReviewState)));
    const type = el('select', { title: 'Event type (QuakeML)' }, el('option', { value: '' }, '(type not set)'),
      ...EVENT_TYPES.map((t) => el('option', { value: t, selected: t === ev.type }, t)));
    const certainty = el('select', { title: 'Type certainty' }, el('option', { value: 'known', selected: ev.typeCertainty !== 'suspected' }, 'known'), el('option', { value: 'suspected', selected: ev.typeCertainty === 'suspected' }, 'suspected'));
    const setType = () => this.apply((d) => setEventType(d, ev.id, (type.value || null) as EventType | null, type.value ? (certainty.value as 'known' | 'suspected') : null));
    type.addEventListener('change', setType);
    certainty.addEventListener('change', setType);
    const auto = ev.picks.filter((p) => p.mode === 'automatic' && p.status === 'preliminary').length;
    const accept = el('button', { title: 'Accept every automatic pick of this event (B)', disabled: auto === 0 }, `Accept ${auto} automatic`);
    accept.addEventListener('click', () => this.apply((d) => acceptAutomatic(d, ev.id)));
    const p = ev.picks.filter((x) => x.phase === 'P').length;
    const sCount = ev.picks.length - p;
    const note = this.noteField.show(ev);
    const events = this.doc?.events ?? [];
    const next = events[events.findIndex((e) => e.id === ev.id) + 1];
    const merge = el('button', { title: next ? `Merge the next event (${isoFromMicros(next.start).slice(11, 19)}) into this one: they are one event` : 'No later event to merge', disabled: !next }, 'Merge next');
    merge.addEventListener('click', () => { if (next) this.apply((d) => mergeEvents(d, ev.id, next.id)); void this.openEvent(ev.id); });
    const split = el('button', { title: 'Split this event in two at the centre of the view: picks before stay, picks after go to a new event' }, 'Split at centre');
    split.addEventListener('click', () => this.splitAtCentre());
    // The note and depth fields are kept across redraws; re-attaching one drops its focus and caret.
    const typing = document.activeElement instanceof HTMLInputElement && this.eventBar.contains(document.activeElement) ? document.activeElement : null;
    const caret = typing ? [typing.selectionStart, typing.selectionEnd] as const : null;
    this.eventBar.replaceChildren(
      el('span', { className: 'ev-id' }, ev.id),
      el('span', { className: 'muted' }, ` ${p} P \u00b7 ${sCount} S `),
      this.magnitudeText,
      el('label', {}, 'State ', state), el('label', {}, 'Type ', type, ' ', certainty),
      this.depthField.show(ev),
      accept, merge, split, note,
      el('span', { className: 'selected-pick' }, this.selectedText(ev) || this.amplitudeTool.selectedText()));
    if (typing?.isConnected && caret && document.activeElement !== typing) {
      typing.focus();
      typing.setSelectionRange(caret[0], caret[1]);
    }
  }

  private splitAtCentre(): void {
    const ev = this.currentEv();
    if (!ev || !this.traces) return;
    const [x0, x1] = this.traces.window;
    const at = this.ref + Math.round(((x0 + x1) / 2) * 1e6);
    let newId = '';
    if (this.apply((d) => { const r = splitEvent(d, ev.id, at); newId = r.newEventId; return r.doc; })) {
      this.setStatus(`split at ${isoFromMicros(at).slice(11, 23)}: the later part is ${newId}`);
    }
  }

  private selectedText(ev: ReviewEvent): string {
    const p = ev.picks.find((x) => x.id === this.selected);
    if (!p) return '';
    return `${p.phase} ${p.channel} ${isoFromMicros(p.time).slice(11, 23)} \u2212${p.lower.toFixed(3)}/+${p.upper.toFixed(3)} s \u00b7 ${p.onset} \u00b7 ${p.polarity ?? 'no polarity'} \u00b7 ${p.mode}${p.mode === 'automatic' ? ` (${p.status})` : ''}${p.excluded ? ' \u00b7 left out of the location' : ''}`;
  }

  // ----- pointer -------------------------------------------------------------------------------

  private pointerDown(site: string, t: number, band: number): boolean {
    const row = this.traces && this.currentEv() ? this.rowsBySite.get(site) : undefined;
    if (!row || !this.traces) return false;
    const hit = hitPick(row, band, t, this.traces.secondsPerPixel() * 6, this.marks());
    // An amplitude mark nearer the pointer than the pick hit (if any) takes the press.
    const amp = this.amplitudeTool.hit(row, band, t);
    const tp = hit ? (hit.pick.time - this.ref) / 1e6 : 0;
    const hitAt = !hit ? 0 : hit.part === 'line' ? tp : hit.part === 'lower' ? tp - hit.pick.lower : tp + hit.pick.upper;
    if (amp && (!hit || amp.distance < Math.abs(t - hitAt))) {
      this.selected = null;
      this.amplitudeTool.press(amp.amplitude, t);
      this.renderEventBar();
      return true;
    }
    if (this.amplitudeTool.selected) { this.amplitudeTool.clear(); this.renderEventBar(); this.traces.redrawMarks(); }
    if (!hit) {
      if (this.selected) { this.selected = null; this.afterDocChange(false); }
      return false;
    }
    this.selected = hit.pick.id;
    this.drag = { pickId: hit.pick.id, part: hit.part, startT: t, preview: hit.part === 'line' ? (hit.pick.time - this.ref) / 1e6 : t };
    this.afterDocChange(false);
    return true;
  }

  private pointerDrag(t: number): void {
    if (this.amplitudeTool.dragging) { this.amplitudeTool.dragTo(t); return; }
    if (!this.drag) return;
    if (this.drag.part === 'line') {
      const p = this.currentEv()?.picks.find((x) => x.id === this.drag!.pickId);
      if (p) this.drag.preview = (p.time - this.ref) / 1e6 + (t - this.drag.startT);
    } else this.drag.preview = t;
    this.traces?.redrawMarks();
  }

  private pointerUp(t: number): void {
    if (this.amplitudeTool.dragging) { this.amplitudeTool.release(t); return; }
    const d = this.drag;
    this.drag = null;
    const ev = this.currentEv();
    if (!d || !ev) return;
    const p = ev.picks.find((x) => x.id === d.pickId);
    if (!p) return;
    this.pointerDrag(t);
    if (Math.abs(t - d.startT) < 1e-9) { this.traces?.redrawMarks(); return; }
    const tp = (p.time - this.ref) / 1e6;
    if (d.part === 'line') this.apply((doc) => movePick(doc, ev.id, p.id, p.time + Math.round((t - d.startT) * 1e6)));
    else if (d.part === 'lower') this.apply((doc) => setUncertainty(doc, ev.id, p.id, round6(Math.max(0, tp - t)), p.upper));
    else this.apply((doc) => setUncertainty(doc, ev.id, p.id, p.lower, round6(Math.max(0, t - tp))));
  }

  private rowsBySite = new Map<string, SiteRow>();

  // ----- keys ----------------------------------------------------------------------------------

  private readonly onKey = (e: KeyboardEvent): void => {
    const target = e.target as HTMLElement | null;
    if (target && (target.tagName === 'INPUT' || target.tagName === 'SELECT' || target.tagName === 'TEXTAREA')) return;
    const action = actionForKey(e);
    if (!action) return;
    e.preventDefault();
    this.run(action);
  };

  /** Carries out a key action (also used by tests through the keyboard). */
  run(action: KeyAction): void {
    const ev = this.currentEv();
    const pick = ev?.picks.find((p) => p.id === this.selected) ?? null;
    const onPick = (f: (d: ReviewDocument, evId: string, pickId: string) => ReviewDocument) => {
      if (ev && pick) this.apply((d) => f(d, ev.id, pick.id));
      else this.setStatus('select a pick first (click it)');
    };
    switch (action) {
      case 'placeP':
      case 'placeS': {
        const spot = this.traces?.pointer();
        if (!spot) { this.setStatus('point at a trace to place a pick'); return; }
        const phase = action === 'placeP' ? 'P' : 'S';
        const comps = spot.row.components;
        // P on the vertical; S on the horizontal under the pointer (or the first horizontal).
        const channel = phase === 'P' ? comps[0].key : comps[spot.band > 0 ? spot.band : Math.min(1, comps.length - 1)].key;
        if (phase === 'S' && comps.length === 1) this.setStatus('S placed on a vertical-only site');
        const evId = this.ensureEvent();
        if (!evId) return;
        let newId = '';
        if (this.apply((d) => { const r = placePick(d, evId, { phase, channel, time: this.ref + Math.round(spot.t * 1e6) }); newId = r.pickId; return r.doc; })) {
          this.selected = newId;
          this.afterDocChange(false);
        }
        return;
      }
      case 'deletePick': if (!this.amplitudeTool.toggleSelected()) onPick((d, a, b) => deletePick(d, a, b)); return;
      case 'leaveOut':
        if (this.amplitudeTool.toggleStation()) return;
        if (ev && pick) {
          const out = !pick.excluded;
          if (this.apply((d) => setExcluded(d, ev.id, pick.id, out))) this.setStatus(`${pick.phase} at ${pick.channel} ${out ? 'left out of the location (kept, with its residual)' : 'used in the location again'}`);
        } else this.setStatus('select a pick or an amplitude mark first (click it)');
        return;
      case 'onsetImpulsive': onPick((d, a, b) => setPickAttributes(d, a, b, { onset: 'impulsive' })); return;
      case 'onsetEmergent': onPick((d, a, b) => setPickAttributes(d, a, b, { onset: 'emergent' })); return;
      case 'onsetQuestionable': onPick((d, a, b) => setPickAttributes(d, a, b, { onset: 'questionable' })); return;
      case 'polarityPositive': onPick((d, a, b) => setPickAttributes(d, a, b, { polarity: 'positive' })); return;
      case 'polarityUndecidable': onPick((d, a, b) => setPickAttributes(d, a, b, { polarity: 'undecidable' })); return;
      case 'polarityNegative': onPick((d, a, b) => setPickAttributes(d, a, b, { polarity: 'negative' })); return;
      case 'widen': if (pick) onPick((d, a, b) => setUncertainty(d, a, b, round6(Math.min(60, pick.lower * 1.5)), round6(Math.min(60, pick.upper * 1.5)))); return;
      case 'narrow': if (pick) onPick((d, a, b) => setUncertainty(d, a, b, round6(pick.lower / 1.5), round6(pick.upper / 1.5))); return;
      case 'uncertaintyFromZoom': {
        const u = round6(8 * (this.traces?.secondsPerPixel() ?? 0.01));
        onPick((d, a, b) => setUncertainty(d, a, b, u, u));
        return;
      }
      case 'zoomToPick': if (pick && this.traces) { const t = (pick.time - this.ref) / 1e6; this.traces.setWindow(t - 2, t + 3); } return;
      case 'wholeWindow': this.traces?.resetWindow(); return;
      case 'acceptAutomatic': if (ev) this.apply((d) => acceptAutomatic(d, ev.id)); return;
      case 'nextEvent':
      case 'previousEvent': {
        const id = this.eventList.neighbour(this.currentEvent, action === 'nextEvent' ? 1 : -1);
        if (id) void this.openEvent(id);
        return;
      }
      case 'sortNext': this.eventList.nextSortKey(); return;
      case 'sortReverse': this.eventList.reverse(); return;
      case 'filterNext': this.eventList.nextFilter(); return;
      case 'markDone': if (ev) this.apply((d) => setState(d, ev.id, 'done')); return;
      case 'discardEvent': if (ev) this.apply((d) => setState(d, ev.id, 'discarded')); return;
      case 'filter1': case 'filter2': case 'filter3': case 'filter4': case 'filter5': case 'filter6': case 'filter7': {
        const i = Number(action.slice(-1)) - 1;
        if (i < FILTER_PRESETS.length && this.filterSelect) {
          this.filterIndex = i;
          this.filterSelect.value = String(i);
          void this.reload();
        }
        return;
      }
      case 'panLeft':
      case 'panRight': {
        if (!this.traces) return;
        const [x0, x1] = this.traces.window;
        const step = ((x1 - x0) / 4) * (action === 'panLeft' ? -1 : 1);
        this.traces.setWindow(x0 + step, x1 + step);
        return;
      }
      case 'undo': if (this.history?.undo()) this.afterDocChange(true); return;
      case 'redo': if (this.history?.redo()) this.afterDocChange(true); return;
      case 'help': this.toggleHelp(); return;
      case 'spectrum': this.spectrum?.toggle(this.traces?.pointer()?.row.key ?? null); return;
      case 'holdDepth': {
        const z = this.solvedDepthKm();
        if (ev && ev.fixedDepthKm !== undefined) this.apply((d) => setFixedDepth(d, ev.id, null));
        else if (ev && z !== null) this.apply((d) => setFixedDepth(d, ev.id, holdDepthKm(z)));
        else this.setStatus('no located event to hold the depth of');
        return;
      }
      case 'radialTransverse': {
        this.rotation.on = !this.rotation.on;
        this.rotationBox.checked = this.rotation.on;
        this.showRotation();
        return;
      }
    }
  }

  /** The open event's solved depth, km (null when not located). */
  private solvedDepthKm(): number | null {
    const st = this.panels?.current;
    const loc = st && st.event === this.currentEv() ? st.location : null;
    return loc?.ok ? loc.value.hypocentre.depthKm : null;
  }

  /** Shows the rows read last again, rotated to R/T or as recorded (no new read). */
  private showRotation(): void {
    if (!this.traces) return;
    const rows = this.rotation.reshow([...this.rowsBySite.values()]);
    this.rowsBySite = new Map(rows.map((r) => [r.key, r]));
    this.traces.updateRows(rows);
    if (this.rotation.on && !this.rotation.active) this.setStatus('R/T needs a location of the open event');
    else if (this.rotation.active && this.rotation.skipped.size) this.setStatus(`R/T: ${this.rotation.skipped.size} sites as recorded (${[...this.rotation.skipped.values()].slice(0, 3).join('; ')})`);
  }

  private helpDialog: HTMLDialogElement | null = null;

  private toggleHelp(): void {
    if (!this.helpDialog) {
      const groups = new Map<string, HTMLElement[]>();
      for (const k of KEY_MAP) {
        const rows = groups.get(k.group) ?? [];
        rows.push(el('tr', {}, el('td', { className: 'key' }, k.keys), el('td', {}, k.what)));
        groups.set(k.group, rows);
      }
      this.helpDialog = el('dialog', { className: 'help', id: 'help' },
        el('h2', {}, 'Keys'),
        el('p', { className: 'muted' }, 'Left hand on the keys, right hand on the mouse. Columns of keys do one kind of thing, top row to bottom row.'),
        el('div', { className: 'help-groups' }, ...[...groups].map(([g, rows]) => el('section', {}, el('h3', {}, g), el('table', {}, ...rows)))),
        el('form', { method: 'dialog' }, el('button', {}, 'Close')));
      document.body.append(this.helpDialog);
    }
    if (this.helpDialog.open) this.helpDialog.close();
    else this.helpDialog.showModal();
  }

  private readonly scanState = el('div', { className: 'scan-state muted' });

  /** Starts the host's background scan and merges its candidates when it is done. */
  async runScan(): Promise<void> {
    const root = this.session.dataset.root;
    let st = await this.host.call('scan.start', { root });
    const cancel = el('button', { className: 'scan-cancel', title: 'Stop the scan (candidates already in the list stay)' }, 'Cancel');
    cancel.addEventListener('click', () => { cancel.disabled = true; void this.host.call('scan.cancel', { root }); });
    while (st.ok && st.value.state === 'running') {
      const v = st.value;
      const done = v.fraction === null ? '' : ` ${Math.floor(v.fraction * 100)} % (${v.message})`;
      this.scanState.replaceChildren(`Scanning the night\u2026${done} \u00b7 ${Math.round(v.seconds)} s `, cancel);
      await new Promise((r) => setTimeout(r, 500));
      st = await this.host.call('scan.status', { root });
    }
    if (st.ok && st.value.state === 'cancelled') {
      this.scanState.textContent = `Scan cancelled after ${Math.round(st.value.seconds)} s; "Scan the night" starts it again`;
      return;
    }
    if (!st.ok || st.value.state !== 'done') {
      this.scanState.textContent = `Scan failed: ${st.ok ? st.value.message : st.message}`;
      return;
    }
    const r = await this.host.call('scan.result', { root });
    if (!r.ok || r.value === null) { this.scanState.textContent = 'Scan gave no result'; return; }
    try {
      const events = readQuakeMl(r.value, 'daybreak-scan.xml').events;
      let summary = '';
      if (this.apply((d) => { const m = mergeCandidates(d, events); summary = `${m.added} new, ${m.refreshed} refreshed, ${m.keptAsReviewed} kept`; return m.doc; })) {
        // The settings the scan used ("near (auto: why)"); the reason goes in the tooltip.
        const used = st.value.settings ?? '';
        this.scanState.textContent = `Scan: ${events.length} candidates in ${Math.round(st.value.seconds)} s (${summary})${used ? `; ${used.replace(/ \(auto: .*$/, ' settings, chosen from the network\u2019s size')}` : ''}`;
        this.scanState.title = used;
        if (!this.currentEvent) {
          const first = this.doc?.events.find((e) => e.state === 'todo');
          if (first) void this.openEvent(first.id);
        }
      }
    } catch (e) {
      this.scanState.textContent = `Scan result unreadable: ${e instanceof Error ? e.message : e}`;
    }
  }

  /** Merges the events of a QuakeML file of the dataset into the review. */
  async loadCandidates(path: string): Promise<void> {
    const r = await this.host.call('file.read', { root: this.session.dataset.root, path });
    if (!r.ok) { this.setStatus(`could not read ${path}: ${r.message}`); return; }
    let events;
    try {
      events = readQuakeMl(new TextDecoder().decode(r.value), path).events;
    } catch (e) {
      this.setStatus(e instanceof Error ? e.message : String(e));
      return;
    }
    let summary = '';
    if (this.apply((d) => { const m = mergeCandidates(d, events); summary = `${m.added} added, ${m.refreshed} refreshed, ${m.keptAsReviewed} already worked on and left as they were`; return m.doc; })) {
      this.setStatus(`${path}: ${events.length} events \u2014 ${summary}`);
    }
  }

  /** Writes the review as QuakeML and CSV through the host; returns the paths written. */
  async exportAll(): Promise<string[]> {
    const doc = this.doc;
    if (!doc) return [];
    await this.flush();
    const settings = await this.host.call('settings.get', {});
    const s = settings.ok ? settings.value : { analyst: '', agency: '', authority: 'daybreak.local' };
    const now = new Date().toISOString();
    const stamp = now.slice(0, 19).replace(/[-:]/g, '');
    // Every event with enough picks gets its location as the preferred origin (located in the worker).
    const locations = new Map<string, ReviewLocation>();
    const located = await Promise.all(doc.events.map((ev) => (ev.state === 'discarded' ? null : this.locateForList(ev))));
    doc.events.forEach((ev, i) => { const loc = located[i]; if (loc) locations.set(ev.id, loc); });
    // Located events also get their local magnitude (amplitudes, station magnitudes, network ML), in the worker.
    const qevents = reviewEventsToQuakeMl(doc, locations, this.modelName);
    for (let i = 0; i < qevents.length; i++) {
      const ev = doc.events[i];
      const loc = locations.get(ev.id);
      if (loc) qevents[i] = withMagnitude(qevents[i], await this.eventMagnitude(ev, loc));
    }
    const xml = writeQuakeMl({ events: qevents }, {
      authority: s.authority, agencyId: s.agency || 'unknown', author: s.analyst || 'unknown',
      creationTime: microsFromIso(now), version: 'Daybreak',
    });
    const written: string[] = [];
    for (const [name, content] of [[`review-${stamp}.quakeml.xml`, xml], [`picks-${stamp}.csv`, reviewToCsv(doc)], [`magnitudes-${stamp}.csv`, magnitudesToCsv(qevents)]] as const) {
      const r = await this.host.call('export.write', { root: this.session.dataset.root, name, content });
      if (!r.ok) { this.setStatus(`export failed: ${r.message}`); return written; }
      written.push(r.value.path);
    }
    this.setStatus(`exported ${written.join(' and ')}${s.analyst ? '' : ' (set your name and agency in Settings)'}`);
    return written;
  }

  /** Waits until every edit so far is saved. */
  flush(): Promise<void> {
    return this.saver?.flush() ?? Promise.resolve();
  }

  /** Stops opening the dataset (reading and decoding in progress). */
  cancelOpen(): void {
    this.session.cancel();
  }

  close(): void {
    document.removeEventListener('keydown', this.onKey);
    this.traces?.destroy();
    this.spectrum?.destroy();
    this.session.close();
    this.magnitudeWorker.terminate();
    this.locator.terminate();
  }
}

// ---------------------------------------------------------------------------------------------
// Picking: the review document, its edits, the keys and the pointer.

function round6(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}
