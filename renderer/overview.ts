/**
 * The night at a glance: one strip per site across the whole span, each bin coloured by its signal
 * level relative to that site's own median level (so quiet and noisy sites read alike), empty bins
 * left dark, candidate events marked across all strips. Drawn straight into a canvas: 100 sites x
 * a night of 20 s bins is under 200,000 cells.
 */
import type { Micros } from '../core/time';

/** Tallest the strips get, CSS px: with many sites each strip is thinner (down to 3 px), so the event sheet keeps its room. */
export const OVERVIEW_MAX_PX = 220;

export interface OverviewSite {
  site: string;
  /** Level per absolute bin number (RMS, counts). */
  levels: Map<number, number>;
  /** Flags to show at the strip's label (e.g. "timing", "gap"). */
  flags: string[];
  /** Absolute bin numbers where one of the site's channels looks clipped (marked on the strip). */
  clipped?: ReadonlySet<number>;
}

/** Okabe-Ito vermillion: the top of a strip where the data look clipped. */
const CLIPPED_RGB: [number, number, number] = [213, 94, 0];

export interface OverviewOptions {
  binMicros: number;
  span: [Micros, Micros];
  onPick: (t: Micros, site: string | null) => void;
  formatTime: (t: Micros) => string;
}

/** Cividis-like ramp (blue to yellow), readable with every common colour-vision deficiency. */
const RAMP: [number, number, number][] = [
  [0, 32, 77], [33, 55, 110], [87, 92, 109], [124, 123, 120], [166, 157, 117], [212, 194, 95], [253, 231, 55],
];

export function rampColour(x: number): [number, number, number] {
  const t = Math.min(1, Math.max(0, x)) * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(t));
  const f = t - i;
  const a = RAMP[i];
  const b = RAMP[i + 1];
  return [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f, a[2] + (b[2] - a[2]) * f];
}

export class Overview {
  readonly root: HTMLDivElement;
  private readonly canvas: HTMLCanvasElement;
  private readonly labels: HTMLDivElement;
  private readonly hover: HTMLDivElement;
  private sites: OverviewSite[] = [];
  private marks: { t: Micros; label: string }[] = [];
  private cursorSpan: [Micros, Micros] | null = null;
  /** Height of one site's strip, px: 11, smaller with many sites so the strips stay within OVERVIEW_MAX_PX. */
  private rowHeight = 11;
  /** The strips as last drawn (without the cursor and marks), and what they were drawn for. */
  private base: { canvas: HTMLCanvasElement; key: string } | null = null;
  private readonly labelWidth = 96;

  constructor(container: HTMLElement, private readonly opts: OverviewOptions) {
    this.root = document.createElement('div');
    this.root.className = 'overview';
    this.labels = document.createElement('div');
    this.labels.className = 'overview-labels';
    this.canvas = document.createElement('canvas');
    this.canvas.className = 'overview-canvas';
    this.hover = document.createElement('div');
    this.hover.className = 'overview-hover';
    this.root.append(this.labels, this.canvas, this.hover);
    container.append(this.root);
    this.canvas.addEventListener('click', (e) => {
      const { t, site } = this.at(e);
      this.opts.onPick(t, site);
    });
    this.canvas.addEventListener('mousemove', (e) => {
      const { t, site } = this.at(e);
      this.hover.textContent = `${this.opts.formatTime(t)}${site ? `  ${site}` : ''}`;
    });
    this.canvas.addEventListener('mouseleave', () => { this.hover.textContent = ''; });
    new ResizeObserver(() => this.draw()).observe(this.root);
  }

  setSites(sites: OverviewSite[]): void {
    this.sites = sites;
    this.base = null;
    this.rowHeight = Math.max(3, Math.min(11, Math.floor(OVERVIEW_MAX_PX / Math.max(1, sites.length))));
    // Names need about 8 px; below that they are left out (the pointer's read-out names the site).
    this.labels.classList.toggle('names-hidden', this.rowHeight < 8);
    this.labels.replaceChildren(...sites.map((s) => {
      const d = document.createElement('div');
      d.textContent = s.site.split('.')[1] ?? s.site;
      d.title = s.flags.length ? `${s.site}: ${s.flags.join(', ')}` : s.site;
      if (s.flags.length) d.className = 'flagged';
      d.style.height = `${this.rowHeight}px`;
      return d;
    }));
    this.draw();
  }

  setMarks(marks: { t: Micros; label: string }[]): void {
    this.marks = marks;
    this.draw();
  }

  /** Shows which stretch the sheet is looking at. */
  setCursorSpan(span: [Micros, Micros] | null): void {
    this.cursorSpan = span;
    this.draw();
  }

  private at(e: MouseEvent): { t: Micros; site: string | null } {
    const r = this.canvas.getBoundingClientRect();
    const [t0, t1] = this.opts.span;
    const t = Math.round(t0 + ((e.clientX - r.left) / r.width) * (t1 - t0));
    const row = Math.floor((e.clientY - r.top) / this.rowHeight);
    return { t, site: this.sites[row]?.site ?? null };
  }

  /** Time the last draw took, ms; and the last one that drew the strips afresh (not only the cursor and marks). */
  lastDrawMs = 0;
  fullDrawMs = 0;

  draw(): void {
    const t0 = performance.now();
    const had = this.base;
    this.drawInner();
    this.lastDrawMs = performance.now() - t0;
    if (this.base !== had) this.fullDrawMs = this.lastDrawMs;
  }

  private drawInner(): void {
    const width = Math.max(50, this.root.clientWidth - this.labelWidth);
    const height = Math.max(this.rowHeight, this.sites.length * this.rowHeight);
    const dpr = window.devicePixelRatio || 1;
    const W = Math.round(width * dpr);
    const H = Math.round(height * dpr);
    if (this.canvas.width !== W || this.canvas.height !== H) {
      this.canvas.width = W;
      this.canvas.height = H;
      this.canvas.style.width = `${width}px`;
      this.canvas.style.height = `${height}px`;
    }
    const ctx = this.canvas.getContext('2d');
    if (!ctx) return;
    // The strips change only with the sites and the size: the cursor and marks are drawn over a copy.
    const key = `${W}x${H}`;
    if (this.base?.key !== key) {
      const c = document.createElement('canvas');
      c.width = W;
      c.height = H;
      const bctx = c.getContext('2d');
      if (!bctx) return;
      this.drawStrips(bctx, W, H, dpr);
      this.base = { canvas: c, key };
    }
    ctx.drawImage(this.base.canvas, 0, 0);
    const [t0, t1] = this.opts.span;
    const xOf = (t: Micros) => ((t - t0) / (t1 - t0)) * W;
    if (this.cursorSpan) {
      ctx.strokeStyle = '#56b4e9';
      ctx.lineWidth = Math.max(1, dpr);
      const a = xOf(this.cursorSpan[0]);
      const b = xOf(this.cursorSpan[1]);
      ctx.strokeRect(a, 0.5, Math.max(2, b - a), this.canvas.height - 1);
    }
    ctx.fillStyle = '#ffffff';
    for (const m of this.marks) {
      const x = xOf(m.t);
      ctx.beginPath();
      ctx.moveTo(x - 4 * dpr, 0);
      ctx.lineTo(x + 4 * dpr, 0);
      ctx.lineTo(x, 6 * dpr);
      ctx.fill();
    }
  }

  /** The sites' strips, coloured by level, into a W x H (device pixels) context. */
  private drawStrips(ctx: CanvasRenderingContext2D, W: number, H: number, dpr: number): void {
    const [t0, t1] = this.opts.span;
    const bin = this.opts.binMicros;
    const firstBin = Math.floor(t0 / bin);
    const lastBin = Math.floor(t1 / bin);
    const nBins = lastBin - firstBin + 1;
    const img = ctx.createImageData(W, H);
    const rowPx = this.rowHeight * dpr;
    const clippedCols = new Uint8Array(W);
    this.sites.forEach((s, row) => {
      const values = [...s.levels.values()].filter((v) => v > 0).sort((a, b) => a - b);
      const median = values.length ? values[values.length >> 1] : 1;
      const y0 = Math.round(row * rowPx);
      const y1 = Math.round((row + 1) * rowPx) - Math.max(1, Math.round(dpr));
      for (let px = 0; px < W; px++) {
        // The loudest bin under this pixel column, so a short event is never averaged away.
        const b0 = firstBin + Math.floor((px / W) * nBins);
        const b1 = Math.max(b0 + 1, firstBin + Math.floor(((px + 1) / W) * nBins));
        let level = -1;
        let clipped = false;
        for (let b = b0; b < b1; b++) {
          const v = s.levels.get(b);
          if (v !== undefined && v > level) level = v;
          if (s.clipped?.has(b)) clipped = true;
        }
        let rgb: [number, number, number];
        if (level < 0) rgb = [40, 40, 44];
        else if (level === 0) rgb = [120, 30, 30];
        else rgb = rampColour((Math.log10(level / median) + 0.3) / 1.8);
        if (clipped) clippedCols[px] = 1;
        for (let y = y0; y < y1; y++) {
          const o = (y * W + px) * 4;
          img.data[o] = rgb[0]; img.data[o + 1] = rgb[1]; img.data[o + 2] = rgb[2]; img.data[o + 3] = 255;
        }
      }
      // Clipped stretches: the strip's upper part in vermillion, at least 5 CSS px wide so one bin shows.
      const half = Math.round(2 * dpr);
      const yClip = y0 + Math.max(1, Math.round((y1 - y0) * 0.45));
      for (let px = 0; px < W; px++) {
        if (!clippedCols[px]) continue;
        clippedCols[px] = 0;
        for (let x = Math.max(0, px - half); x <= Math.min(W - 1, px + half); x++) {
          for (let y = y0; y < yClip; y++) {
            const o = (y * W + x) * 4;
            img.data[o] = CLIPPED_RGB[0]; img.data[o + 1] = CLIPPED_RGB[1]; img.data[o + 2] = CLIPPED_RGB[2]; img.data[o + 3] = 255;
          }
        }
      }
    });
    ctx.putImageData(img, 0, 0);
  }
}
