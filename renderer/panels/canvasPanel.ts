/**
 * What the three small panels beside the traces share: a titled box holding one canvas sized to its
 * box at the device's pixel ratio, the theme's colours read from the CSS variables, and a few
 * drawing helpers. Each panel draws at once when given new input (a redraw is well under a
 * millisecond to a few milliseconds, so no batching is needed) and again when its box resizes.
 */
import { PICK_COLOURS } from '../picks/pickLayer';
import { watchTheme } from '../dom';

/** The theme's colours (CSS variables of style.css), read when a panel draws. */
export interface PanelTheme {
  text: string; muted: string; line: string; accent: string; panel: string; bg: string;
  /** Okabe-Ito: orange, sky, green, blue, vermillion, purple. */
  orange: string; sky: string; green: string; blue: string; vermillion: string; purple: string;
  /** P and S as the traces draw them (pickLayer.ts), so a phase has one colour everywhere. */
  P: string; S: string;
  font: string;
}

export function readTheme(el: Element): PanelTheme {
  const cs = getComputedStyle(el);
  const v = (name: string, fallback: string): string => cs.getPropertyValue(name).trim() || fallback;
  return {
    text: v('--text', '#d9dce2'), muted: v('--muted', '#8b919c'), line: v('--line', '#30343c'), accent: v('--accent', '#56b4e9'),
    panel: v('--panel', '#1f2228'), bg: v('--bg', '#17191d'),
    orange: v('--okabe-orange', '#e69f00'), sky: v('--okabe-sky', '#56b4e9'), green: v('--okabe-green', '#009e73'),
    blue: v('--okabe-blue', '#0072b2'), vermillion: v('--okabe-vermillion', '#d55e00'), purple: v('--okabe-purple', '#cc79a7'),
    P: PICK_COLOURS.P, S: PICK_COLOURS.S,
    font: v('--font', 'system-ui, sans-serif'),
  };
}

/** A titled panel with one canvas. Subclasses implement paint(); draw() sizes the canvas and calls it. */
export abstract class CanvasPanel {
  readonly root: HTMLElement;
  protected readonly canvas = document.createElement('canvas');
  protected readonly ctx: CanvasRenderingContext2D;
  protected readonly caption = document.createElement('div');
  /** CSS pixels of the canvas, as last drawn. */
  protected width = 0;
  protected height = 0;
  /** Milliseconds the last draw took. */
  lastDrawMs = 0;
  private readonly resize: ResizeObserver;
  /** The site under the pointer, drawn highlighted. */
  protected hover: string | null = null;
  /** Where sites were last drawn (CSS px of the canvas), for hit tests. */
  protected spots: { site: string; x: number; y: number }[] = [];

  constructor(container: HTMLElement, title: string, className: string, private readonly onHover?: (site: string | null) => void) {
    this.root = document.createElement('section');
    this.root.className = `db-panel ${className}`;
    const h = document.createElement('h3');
    h.className = 'db-panel-title';
    h.textContent = title;
    this.caption.className = 'db-panel-caption';
    this.canvas.className = 'db-panel-canvas';
    this.root.append(h, this.canvas, this.caption);
    container.append(this.root);
    this.ctx = this.canvas.getContext('2d')!;
    let lastW = -1;
    this.resize = new ResizeObserver(() => {
      const w = this.canvas.parentElement?.clientWidth ?? 0;
      if (w !== lastW) { lastW = w; this.draw(); }
    });
    this.resize.observe(this.root);
    // The theme's colours are read at each draw: draw again when the theme changes (and stop
    // watching once the panel has left the page).
    const theme = watchTheme(() => {
      if (this.root.isConnected) this.draw();
      else theme.disconnect();
    });
  }

  /** The drawn site nearest to a point (CSS px of the canvas) within `radius` px, or null. */
  protected nearestSpot(x: number, y: number, radius: number): string | null {
    let best: string | null = null;
    let bestD = radius;
    for (const s of this.spots) {
      const d = Math.hypot(s.x - x, s.y - y);
      if (d <= bestD) { bestD = d; best = s.site; }
    }
    return best;
  }

  /** Sets the hovered site, redraws and tells the listener (only when it changed). */
  protected setHover(site: string | null): void {
    if (site === this.hover) return;
    this.hover = site;
    this.canvas.style.cursor = site ? 'pointer' : '';
    this.draw();
    this.onHover?.(site);
  }

  /** Height in CSS pixels the panel wants for a given width. */
  protected abstract heightFor(width: number): number;
  protected abstract paint(ctx: CanvasRenderingContext2D, theme: PanelTheme): void;

  /** Draws now; returns the time taken, ms. */
  draw(): number {
    const t0 = performance.now();
    const w = Math.max(120, this.root.clientWidth || 280);
    const h = Math.max(40, Math.round(this.heightFor(w)));
    const dpr = window.devicePixelRatio || 1;
    if (this.canvas.width !== Math.round(w * dpr) || this.canvas.height !== Math.round(h * dpr)) {
      this.canvas.width = Math.round(w * dpr);
      this.canvas.height = Math.round(h * dpr);
      this.canvas.style.width = `${w}px`;
      this.canvas.style.height = `${h}px`;
    }
    this.width = w;
    this.height = h;
    const ctx = this.ctx;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    const theme = readTheme(this.root);
    ctx.clearRect(0, 0, w, h);
    ctx.font = `11px ${theme.font}`;
    ctx.textBaseline = 'alphabetic';
    this.paint(ctx, theme);
    this.lastDrawMs = performance.now() - t0;
    return this.lastDrawMs;
  }

  destroy(): void {
    this.resize.disconnect();
    this.root.remove();
  }
}

/** A round step (1, 2 or 5 times a power of ten) near `target`. */
export function niceStep(target: number): number {
  if (!(target > 0) || !Number.isFinite(target)) return 1;
  const p = 10 ** Math.floor(Math.log10(target));
  const f = target / p;
  return (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * p;
}

/** Filled or open marker of a phase: P a circle, S a square (shape as well as colour). */
export function phaseMarker(ctx: CanvasRenderingContext2D, wave: 'P' | 'S', x: number, y: number, r: number, filled: boolean, colour: string): void {
  ctx.beginPath();
  if (wave === 'P') ctx.arc(x, y, r, 0, 2 * Math.PI);
  else ctx.rect(x - r * 0.9, y - r * 0.9, 1.8 * r, 1.8 * r);
  if (filled) { ctx.fillStyle = colour; ctx.fill(); }
  ctx.strokeStyle = colour;
  ctx.lineWidth = 1.5;
  ctx.stroke();
}

/** Seconds with a sign and a unit that suits the size (ms under a second). */
export function formatSeconds(s: number): string {
  const a = Math.abs(s);
  if (a < 1) return `${s < 0 ? '\u2212' : s > 0 ? '+' : ''}${(a * 1000).toFixed(a < 0.01 ? 1 : 0)} ms`;
  return `${s < 0 ? '\u2212' : '+'}${a.toFixed(2)} s`;
}
