/**
 * The spectrum panel of the event sheet: the amplitude spectra of one site's components over the
 * time span in view, beside the spectrum of a noise span of the same length before the event's first
 * pick (renderer/spectrum/spectrumWindows), on log-log axes with the traces' filter band shaded. The
 * spectra are of raw samples (mean removed, Hann window), whatever filter the traces show, in the
 * units the samples are recorded in (counts, as the StationXML names them, or said to be unknown).
 * It floats over the lower right of the traces, follows the zoom, pan and filter (`follow()`), and
 * closes by its button, the key that opened it or Escape (the desk's key map).
 */
import uPlot from 'uplot';
import type { FilterRequest } from '../../core/dsp';
import { isoFromMicros, type Micros } from '../../core/time';
import { el, watchTheme } from '../dom';
import { logTicks, tickLabel } from './logAxis';
import { readTheme } from '../panels/canvasPanel';
import {
  NOISE_GAP_MICROS, SPECTRUM_WINDOW, amplitudeUnits, channelSpectra, passBand, spectrumSpans, type ChannelSpectra, type SamplePiece, type SpectrumSpans,
} from './spectrumWindows';

/** A piece of a read, with its channel key ("NET.STA.LOC.CHA"). */
export type KeyedPiece = SamplePiece & { key: string };

/** What the desk shows now, asked for whenever the panel (re)computes. */
export interface SpectrumView {
  /** The span in view, µs. */
  span: [Micros, Micros];
  /** The event's earliest pick, µs, or null (no event open, or no pick). */
  firstPick: Micros | null;
  /** The traces' filter and its label (e.g. "1–20 Hz"), and whether it is the zero-phase view. */
  filter: FilterRequest | null;
  filterLabel: string;
  zeroPhase: boolean;
  /** The channels ("NET.STA.LOC.CHA") of a site ("NET.STA"), vertical first. */
  channels(site: string): string[];
  /** The units a channel's samples are recorded in (its StationXML sensitivity's output units, e.g. "count"), or null when not given. */
  units(channel: string): string | null;
}

export interface SpectrumPanelOptions {
  /** The desk's view now (null when no sheet is open). */
  view: () => SpectrumView | null;
  /** Raw samples of `channels` in [start, end) µs (no filter). */
  read: (channels: string[], start: Micros, end: Micros) => Promise<KeyedPiece[]>;
  status: (text: string) => void;
}

/** What the panel drew, for end-to-end tests (read-only). */
export interface SpectrumState {
  open: boolean;
  site: string | null;
  spans: SpectrumSpans | null;
  band: [number, number] | null;
  window: string;
  components: {
    channel: string; fftLength: number; samples: number; noiseSamples: number;
    /** Frequencies of the largest signal and noise amplitudes drawn, Hz. */
    peakHz: number; noisePeakHz: number;
    /** The columns drawn: frequencies (Hz), signal and noise amplitudes (the recorded units; null where none). */
    drawn: { hz: number[]; signal: (number | null)[]; noise: (number | null)[] };
  }[];
  /** Times the panel drew a new computation. */
  draws: number;
  /** Milliseconds the last one took: reading the raw samples, the spectra, drawing. */
  ms: number;
}


const WINDOW_LABEL: Record<string, string> = { hann: 'Hann', hamming: 'Hamming', rectangular: 'rectangular' };
const FOLLOW_DELAY_MS = 120;
const PLOT_HEIGHT = 150;

export class SpectrumPanel {
  readonly root = el('section', { className: 'spectrum-panel', hidden: true });
  private readonly head = el('div', { className: 'spectrum-head' });
  private readonly legend = el('div', { className: 'spectrum-legend' });
  private readonly plotsHost = el('div', { className: 'spectrum-plots' });
  private readonly readout = el('div', { className: 'spectrum-readout' });
  private plots: uPlot[] = [];
  private site: string | null = null;
  private seq = 0;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private readonly host: HTMLElement;
  private themeWatch: MutationObserver | null = null;
  private pointerY = 0;
  /** Units of the amplitudes drawn, for the readout. */
  private units = '';
  private state: SpectrumState = { open: false, site: null, spans: null, band: null, window: WINDOW_LABEL[SPECTRUM_WINDOW], components: [], draws: 0, ms: 0 };

  constructor(host: HTMLElement, private readonly opts: SpectrumPanelOptions) {
    const close = el('button', { className: 'spectrum-close', title: 'Close the spectrum (N or Escape)' }, '\u00d7');
    close.addEventListener('click', () => this.close());
    this.root.append(el('div', { className: 'spectrum-top' }, this.head, close), this.legend, this.plotsHost, this.readout);
    // Keys typed while the pointer is over the panel still go to the desk; the panel itself takes no focus.
    this.root.addEventListener('pointerdown', (e) => e.stopPropagation());
    this.root.addEventListener('wheel', (e) => e.stopPropagation());
    host.append(this.root);
    // Where the pointer last was over the traces: the panel opens in the half away from the row it shows.
    host.addEventListener('pointermove', (e) => { if (!this.root.contains(e.target as Node)) this.pointerY = e.clientY; });
    this.host = host;
    document.addEventListener('keydown', this.onEscape);
    // The colours come from the theme: drawn again when it changes while the panel is open.
    this.themeWatch = watchTheme(() => this.follow());
    (window as unknown as { daybreakSpectrum: () => SpectrumState }).daybreakSpectrum = () => structuredClone(this.state);
  }

  get open(): boolean {
    return !this.root.hidden;
  }

  /** Opens the panel on `site` (the site under the pointer), or closes it when it is open. */
  toggle(site: string | null): void {
    if (this.open) { this.close(); return; }
    if (!site) { this.opts.status('point at a trace row to see its spectrum'); return; }
    this.site = site;
    const box = this.host.getBoundingClientRect();
    this.root.classList.toggle('top', this.pointerY > box.top + box.height / 2);
    this.root.hidden = false;
    this.state = { ...this.state, open: true, site };
    void this.compute();
  }

  close(): void {
    if (!this.open) return;
    this.seq++;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.root.hidden = true;
    for (const p of this.plots) p.destroy();
    this.plots = [];
    this.plotsHost.replaceChildren();
    this.state = { ...this.state, open: false };
  }

  /** The view changed (zoom, pan, filter, another window): computed again shortly after, when open. */
  follow(): void {
    if (!this.open) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => { this.timer = null; void this.compute(); }, FOLLOW_DELAY_MS);
  }

  /** Escape closes the panel while it is open and no dialog is (a dialog takes Escape itself). */
  private readonly onEscape = (e: KeyboardEvent): void => {
    if (e.key !== 'Escape' || !this.open || document.querySelector('dialog[open]')) return;
    e.preventDefault();
    this.close();
  };

  destroy(): void {
    document.removeEventListener('keydown', this.onEscape);
    this.themeWatch?.disconnect();
    this.close();
    this.root.remove();
  }

  private async compute(): Promise<void> {
    const seq = ++this.seq;
    const t0 = performance.now();
    const view = this.opts.view();
    const site = this.site;
    if (!view || !site) return;
    const channels = view.channels(site);
    if (channels.length === 0) { this.head.textContent = `${site}: no channels`; return; }
    const spans = spectrumSpans(view.span, view.firstPick);
    const from = Math.min(spans.signal[0], spans.noise[0]);
    const to = Math.max(spans.signal[1], spans.noise[1]);
    let pieces: KeyedPiece[];
    try {
      pieces = await this.opts.read(channels, from, to);
    } catch (e) {
      if (seq === this.seq) this.opts.status(`spectrum: could not read ${site}: ${e instanceof Error ? e.message : e}`);
      return;
    }
    if (seq !== this.seq) return;
    const spectra = channels.map((c) => channelSpectra(c, pieces.filter((p) => p.key === c), spans));
    this.draw(site, view, spans, spectra);
    this.state.ms = performance.now() - t0;
  }

  private draw(site: string, view: SpectrumView, spans: SpectrumSpans, spectra: ChannelSpectra[]): void {
    const shown = spectra.filter((s) => s.signal);
    const rate = shown[0]?.sampleRate ?? 0;
    const band = rate ? passBand(view.filter, rate) : null;
    const seconds = (spans.signal[1] - spans.signal[0]) / 1e6;
    const fft = shown[0]?.signal?.fftLength ?? 0;
    const hhmmss = (t: Micros) => isoFromMicros(t).slice(11, 21);
    const units = amplitudeUnits(shown.map((s) => view.units(s.channel)));
    this.units = units.short;
    this.head.replaceChildren(
      el('b', {}, `Spectrum \u00b7 ${site}`),
      ` ${hhmmss(spans.signal[0])}\u2013${hhmmss(spans.signal[1])} UTC (${seconds.toFixed(1)} s in view)`,
      el('div', { className: 'muted' }, `raw samples, mean removed, ${WINDOW_LABEL[SPECTRUM_WINDOW]} window, ${fft}-point FFT; amplitude in ${units.long} (a sinusoid reads its amplitude)`));
    const noiseWhere = spans.noiseBefore === 'first pick' ? `ending ${NOISE_GAP_MICROS / 1e6} s before the first pick` : 'just before the span';
    const filterText = view.filter ? `traces\u2019 filter ${view.filterLabel}${view.zeroPhase ? ' (zero-phase view)' : ''}` : 'traces unfiltered';
    const item = (swatch: string, text: string) => el('span', { className: 'spectrum-key' }, el('span', { className: `swatch ${swatch}` }), ` ${text}`);
    this.legend.replaceChildren(
      item('signal', 'signal (span in view)'),
      item('noise', `noise, ${seconds.toFixed(1)} s ${noiseWhere} (${hhmmss(spans.noise[0])}\u2013${hhmmss(spans.noise[1])})`),
      item(`band${band ? '' : ' none'}`, filterText));
    for (const p of this.plots) p.destroy();
    this.plots = [];
    this.plotsHost.replaceChildren();
    const colours = themeColours(this.root);
    let yMax = 0;
    let yMin = Infinity;
    for (const s of shown) {
      for (const sp of [s.signal, s.noise]) {
        if (!sp) continue;
        for (let k = 1; k < sp.amplitudes.length; k++) {
          const a = sp.amplitudes[k];
          if (a > yMax) yMax = a;
          if (a > 0 && a < yMin) yMin = a;
        }
      }
    }
    // Decades around the data, at most 7 of them (the lowest bins of a Hann window fall far below the rest).
    const top = 10 ** Math.ceil(Math.log10(yMax || 1));
    const bottom = Math.max(10 ** Math.floor(Math.log10(Number.isFinite(yMin) ? yMin : top / 1e3)), top / 1e7);
    // The components side by side, so the panel stays low over the traces.
    this.plotsHost.style.gridTemplateColumns = `repeat(${spectra.length}, minmax(0, 1fr))`;
    const width = Math.max(180, Math.floor(((this.plotsHost.clientWidth || 840) - 8 * (spectra.length - 1)) / spectra.length));
    const components: SpectrumState['components'] = [];
    for (const s of spectra) {
      const box = el('div', { className: 'spectrum-plot' }, el('div', { className: 'spectrum-channel' }, s.channel.split('.')[3]));
      this.plotsHost.append(box);
      if (!s.signal) { box.append(el('div', { className: 'muted spectrum-empty' }, 'no data in the span')); continue; }
      const data = plotData(s);
      const fMin = s.signal.frequencies[1];
      const fMax = s.sampleRate / 2;
      const plot = new uPlot({
        width, height: PLOT_HEIGHT, legend: { show: false },
        cursor: { drag: { x: false, y: false }, points: { show: false } },
        scales: {
          x: { time: false, distr: 3, log: 10, range: [fMin, fMax] },
          y: { distr: 3, log: 10, range: [bottom, top] },
        },
        axes: [
          { ...axisStyle(colours), size: 22, splits: (_u, _i, lo, hi) => logTicks(lo, hi, [1, 2, 5]), values: (_u, vals) => vals.map(tickLabel) },
          { ...axisStyle(colours), size: 40, splits: (_u, _i, lo, hi) => logTicks(lo, hi, [1]), values: (_u, vals) => vals.map(tickLabel) },
        ],
        series: [
          {},
          { stroke: colours.trace, width: 1.25, spanGaps: true, points: { show: false } },
          { stroke: colours.noise, width: 1, dash: [4, 3], spanGaps: true, points: { show: false } },
        ],
        hooks: {
          drawClear: [(u) => shadeBand(u, band, colours.band)],
          setCursor: [(u) => this.showReadout(u, s.channel)],
        },
      }, data, box);
      this.plots.push(plot);
      components.push({
        channel: s.channel, fftLength: s.signal.fftLength, samples: s.signal.count, noiseSamples: s.noise?.count ?? 0,
        peakHz: drawnPeak(plot.data, 1), noisePeakHz: drawnPeak(plot.data, 2),
        drawn: { hz: Array.from(plot.data[0]), signal: Array.from(plot.data[1], (y) => y ?? null), noise: Array.from(plot.data[2], (y) => y ?? null) },
      });
    }
    const axisNote = el('div', { className: 'spectrum-axis muted' }, `frequency, Hz (log) \u00b7 amplitude, ${units.short} (log)`);
    this.plotsHost.append(axisNote);
    // A gap or the data's end inside a span: the spectrum is of the longest gap-free part, and says so.
    const cut = shown.filter((s) => s.signalSeconds < seconds - 1.5 / s.sampleRate);
    if (cut.length) this.legend.append(el('div', { className: 'spectrum-warn' }, `signal: only ${cut[0].signalSeconds.toFixed(1)} s without a gap on ${cut.map((s) => s.channel.split('.')[3]).join(', ')} (the longest part is used)`));
    const missing = shown.filter((s) => s.noiseSeconds + 1.5 / s.sampleRate < s.signalSeconds);
    if (missing.length && missing.every((s) => !s.noise)) this.legend.append(el('div', { className: 'spectrum-warn' }, 'noise: no data in the noise span (before the data\u2019s start or in a gap)'));
    else if (missing.length) this.legend.append(el('div', { className: 'spectrum-warn' }, `noise: only ${missing[0].noiseSeconds.toFixed(1)} s on ${missing.map((s) => s.channel.split('.')[3]).join(', ')} (data start or a gap): random noise reads \u221a(${seconds.toFixed(1)} / ${missing[0].noiseSeconds.toFixed(1)}) = ${Math.sqrt(seconds / missing[0].noiseSeconds).toFixed(1)}\u00d7 higher than over the full span`));
    this.state = { open: true, site, spans, band, window: WINDOW_LABEL[SPECTRUM_WINDOW], components, draws: this.state.draws + 1, ms: 0 };
  }

  private showReadout(u: uPlot, channel: string): void {
    const i = u.cursor.idx;
    if (i === null || i === undefined) { this.readout.textContent = ''; return; }
    const f = u.data[0][i];
    const v = (j: number) => { const y = u.data[j][i]; return typeof y === 'number' ? y.toPrecision(3) : '\u2013'; };
    this.readout.textContent = `${channel.split('.')[3]} ${f.toPrecision(3)} Hz: signal ${v(1)}, noise ${v(2)} ${this.units}`;
  }
}

/** The plot's columns: frequencies above 0 Hz, the signal and the noise amplitudes (joined when their grids differ). */
function plotData(s: ChannelSpectra): uPlot.AlignedData {
  const sig = s.signal!;
  const cut = (a: Float64Array) => Array.from(a.subarray(1), (y) => (y > 0 ? y : null));
  const xs = Array.from(sig.frequencies.subarray(1));
  if (!s.noise) return [xs, cut(sig.amplitudes), xs.map(() => null)];
  if (s.noise.fftLength === sig.fftLength) return [xs, cut(sig.amplitudes), cut(s.noise.amplitudes)];
  return uPlot.join([[xs, cut(sig.amplitudes)], [Array.from(s.noise.frequencies.subarray(1)), cut(s.noise.amplitudes)]]);
}

/** Frequency of the largest value drawn in series `j` (NaN when it has none). */
function drawnPeak(data: uPlot.AlignedData, j: number): number {
  const xs = data[0];
  const ys = data[j];
  let best = -Infinity;
  let at = NaN;
  for (let i = 0; i < xs.length; i++) {
    const y = ys[i];
    if (typeof y === 'number' && y > best) { best = y; at = xs[i]; }
  }
  return at;
}

/** Shades the filter's pass band under the spectra, edges drawn. */
function shadeBand(u: uPlot, band: [number, number] | null, colour: string): void {
  if (!band) return;
  const { left, top, width, height } = u.bbox;
  const [f0, f1] = u.scales.x.min !== undefined && u.scales.x.max !== undefined ? [Math.max(band[0], u.scales.x.min!), Math.min(band[1], u.scales.x.max!)] : band;
  if (!(f1 > f0)) return;
  const x0 = Math.max(left, u.valToPos(f0, 'x', true));
  const x1 = Math.min(left + width, u.valToPos(f1, 'x', true));
  const ctx = u.ctx;
  ctx.save();
  ctx.fillStyle = colour;
  ctx.globalAlpha = 0.13;
  ctx.fillRect(x0, top, x1 - x0, height);
  ctx.globalAlpha = 0.7;
  ctx.strokeStyle = colour;
  ctx.lineWidth = 1;
  ctx.beginPath();
  for (const x of [x0, x1]) { ctx.moveTo(Math.round(x) + 0.5, top); ctx.lineTo(Math.round(x) + 0.5, top + height); }
  ctx.stroke();
  ctx.restore();
}

function axisStyle(c: SpectrumColours): uPlot.Axis {
  return { stroke: c.muted, grid: { stroke: c.line, width: 1 }, ticks: { stroke: c.line, width: 1, size: 3 }, font: `10px ${c.font}`, gap: 2 };
}

interface SpectrumColours { trace: string; noise: string; band: string; muted: string; line: string; font: string }

/** The side panels' theme colours (renderer/panels/canvasPanel) plus the traces' and the warning colour. */
function themeColours(node: Element): SpectrumColours {
  const th = readTheme(node);
  const cs = getComputedStyle(node);
  return {
    trace: cs.getPropertyValue('--trace').trim() || '#c9ced8', noise: cs.getPropertyValue('--warn').trim() || th.orange,
    band: th.accent, muted: th.muted, line: th.line, font: th.font,
  };
}
