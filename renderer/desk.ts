/**
 * The review desk for one opened dataset: the night overview on top, the event sheet below (its
 * toolbar and traces). Clicking the overview opens the sheet on that moment.
 */
import type { HostApi, Dataset } from '../electron/contract';
import { isoFromMicros, type Micros } from '../core/time';
import type { FilterRequest } from '../core/dsp';
import { DataSession, OVERVIEW_BIN_MICROS } from './data/session';
import { siteStreams, type SiteStreams } from './data/sites';
import { Overview } from './overview';
import { TraceView, type SiteRow } from './traces/traceView';
import { makePiece, type ComponentTrace } from './traces/rowData';

export interface FilterPreset { label: string; filter: FilterRequest | null }

export const FILTER_PRESETS: FilterPreset[] = [
  { label: 'as recorded', filter: null },
  { label: '1\u201320 Hz', filter: { kind: 'bandpass', order: 4, corners: [1, 20] } },
  { label: '2\u201315 Hz', filter: { kind: 'bandpass', order: 4, corners: [2, 15] } },
  { label: '5\u201340 Hz', filter: { kind: 'bandpass', order: 4, corners: [5, 40] } },
  { label: '0.5\u20135 Hz', filter: { kind: 'bandpass', order: 4, corners: [0.5, 5] } },
  { label: 'above 1 Hz', filter: { kind: 'highpass', order: 4, corners: 1 } },
];

function el<K extends keyof HTMLElementTagNameMap>(tag: K, props: Partial<HTMLElementTagNameMap[K]> = {}, ...children: (Node | string)[]): HTMLElementTagNameMap[K] {
  const e = Object.assign(document.createElement(tag), props);
  e.append(...children);
  return e;
}

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
  private windowSpan: [Micros, Micros] | null = null;
  private ref: Micros = 0;
  private loadSeq = 0;

  constructor(host: HostApi, dataset: Dataset, private readonly setStatus: (text: string) => void) {
    this.session = new DataSession(host, dataset);
  }

  async open(onProgress: (fraction: number, note: string) => void): Promise<void> {
    await this.session.open(onProgress);
    this.sites = siteStreams(this.session.channels.keys());
    this.build();
  }

  private build(): void {
    const [t0, t1] = this.session.span;
    const overviewHost = el('section', { className: 'overview-host' });
    const headline = el('div', { className: 'overview-title' },
      el('span', {}, 'Night overview'),
      el('span', { className: 'muted' }, ` ${isoFromMicros(t0).slice(0, 16).replace('T', ' ')} \u2192 ${isoFromMicros(t1).slice(0, 16).replace('T', ' ')} UTC \u00b7 ${this.sites.length} sites \u00b7 level relative to each site\u2019s median; click to open`));
    overviewHost.append(headline);
    this.overview = new Overview(overviewHost, {
      binMicros: OVERVIEW_BIN_MICROS,
      span: [t0, t1],
      formatTime: (t) => isoFromMicros(t).slice(11, 19),
      onPick: (t) => void this.openWindow(t - OPEN_BEFORE_S * 1e6, t + OPEN_AFTER_S * 1e6),
    });
    this.overview.setSites(this.sites.map((s) => {
      const z = this.session.channels.get(s.channels[0]);
      const levels = new Map<number, number>();
      if (z) for (const [b, v] of z.levels) levels.set(b, v.rms);
      return { site: s.site, levels, flags: this.siteFlags(s) };
    }));

    const filterSelect = el('select', { title: 'Filter applied to every trace (causal unless zero-phase is ticked)' },
      ...FILTER_PRESETS.map((p, i) => el('option', { value: String(i), selected: i === this.filterIndex }, p.label)));
    filterSelect.addEventListener('change', () => { this.filterIndex = Number(filterSelect.value); void this.reload(); });
    const zp = el('input', { type: 'checkbox', checked: this.zeroPhase });
    zp.addEventListener('change', () => { this.zeroPhase = zp.checked; void this.reload(); });
    const vo = el('input', { type: 'checkbox', checked: this.verticalOnly });
    vo.addEventListener('change', () => { this.verticalOnly = vo.checked; void this.reload(); });
    const amp = el('select', { title: 'Amplitude scaling' }, el('option', { value: 'trace' }, 'each trace'), el('option', { value: 'common' }, 'common'));
    amp.addEventListener('change', () => this.traces?.setAmplitudeMode(amp.value as 'trace' | 'common'));
    const reset = el('button', { title: 'Show the whole window' }, 'Full window');
    reset.addEventListener('click', () => this.traces?.resetWindow());
    const toolbar = el('div', { className: 'sheet-toolbar' },
      this.sheetTitle,
      el('span', { className: 'spacer' }),
      el('label', {}, 'Filter ', filterSelect),
      el('label', { className: 'zero-phase', title: 'Forward and backward filtering moves energy ahead of onsets: for viewing, not for picking' }, zp, ' zero-phase (view only)'),
      el('label', {}, vo, ' vertical only'),
      el('label', {}, 'Scale ', amp),
      reset);
    const traceHost = el('div', { className: 'trace-host' });
    this.sheetHost.replaceChildren(toolbar, traceHost);
    this.traces = new TraceView(traceHost, {
      formatTime: (t, step) => {
        const iso = isoFromMicros(this.ref + Math.round(t * 1e6));
        return step >= 1 ? iso.slice(11, 19) : step >= 0.1 ? iso.slice(11, 21) : iso.slice(11, 23);
      },
      onWindow: (x0, x1) => this.overview?.setCursorSpan([this.ref + x0 * 1e6, this.ref + x1 * 1e6]),
    });
    this.root.replaceChildren(overviewHost, this.sheetHost, this.status);
    const problems = this.session.problems.length;
    this.status.textContent = `${this.session.files.length} files read${problems ? ` \u00b7 ${problems} problems (see the log)` : ''}`;
    // Start on the loudest moment of the night so the first view shows something to review.
    void this.openWindow(this.loudestMoment() - OPEN_BEFORE_S * 1e6, this.loudestMoment() + OPEN_AFTER_S * 1e6);
  }

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

  private siteFlags(s: SiteStreams): string[] {
    const flags: string[] = [];
    for (const key of s.channels) {
      const ch = this.session.channels.get(key);
      if (!ch) continue;
      if (ch.summaries.some((x) => x.segments.some((g) => g.questionableTimeRecords > 0 || (g.timingQualityMin !== null && g.timingQualityMin < 50)))) flags.push(`${key.split('.')[3]} timing questionable`);
      const gaps = ch.summaries.reduce((n, x) => n + x.gaps.length, 0);
      if (gaps) flags.push(`${key.split('.')[3]} ${gaps} gap${gaps > 1 ? 's' : ''}`);
      if (!ch.meta) flags.push(`${key.split('.')[3]} no metadata`);
    }
    return [...new Set(flags)];
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
    const [start, end] = this.windowSpan;
    const preset = FILTER_PRESETS[this.filterIndex];
    this.sheetTitle.textContent = `${isoFromMicros(start).slice(0, 19).replace('T', ' ')} UTC \u00b7 ${Math.round((end - start) / 1e6)} s \u00b7 ${preset.label}${this.zeroPhase && preset.filter ? ' (zero-phase view)' : ''}`;
    const keys = this.sites.flatMap((s) => (this.verticalOnly ? s.channels.slice(0, 1) : s.channels));
    const t0 = performance.now();
    const reply = await this.session.window(keys, start, end, preset.filter, this.zeroPhase);
    if (seq !== this.loadSeq) return;
    const byKey = new Map<string, typeof reply.pieces>();
    for (const p of reply.pieces) byKey.set(p.key, [...(byKey.get(p.key) ?? []), p]);
    const rows: SiteRow[] = [];
    for (const s of this.sites) {
      const comps: ComponentTrace[] = [];
      for (const key of this.verticalOnly ? s.channels.slice(0, 1) : s.channels) {
        const pieces = (byKey.get(key) ?? []).map((p) => makePiece((p.start - this.ref) / 1e6, p.sampleRate, p.samples));
        comps.push({ key, label: key.split('.')[3], pieces });
      }
      const flags = this.siteFlags(s);
      rows.push({ key: s.site, label: s.site.split('.')[1], detail: s.stream.split('.').slice(2).join('.') || undefined, components: comps, flags });
    }
    this.traces.setRows(rows, [0, (end - start) / 1e6]);
    this.setStatus(`window read and drawn in ${Math.round(performance.now() - t0)} ms${reply.notes.length ? ` \u00b7 ${reply.notes[0]}` : ''}`);
  }

  close(): void {
    this.traces?.destroy();
    this.session.close();
  }
}
