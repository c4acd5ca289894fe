/**
 * The Wadati diagram of the open event (core/location/wadati.ts): S-P time against P time after
 * the fitted origin time, one point per site with both picks, and the fitted line through the
 * origin with slope Vp/Vs - 1. The caption gives Vp/Vs and the origin-time estimate with their
 * 1-sigma errors (and how far that origin time is from the located one, when given). Hovering a
 * point highlights its site and calls `onHover(site)`.
 *
 *   const w = new WadatiPanel(column, { onHover });
 *   w.set({ result: wadatiOfEvent(event), locatedOrigin: hypocentre.originTime, highlight });
 */
import type { WadatiResult } from '../../core/location/wadati';
import { isoFromMicros, type Micros } from '../../core/time';
import { CanvasPanel, formatSeconds, niceStep, type PanelTheme } from './canvasPanel';

export interface WadatiInput {
  result: WadatiResult | null;
  /** The location's origin time, µs, to compare with (optional). */
  locatedOrigin?: Micros | null;
  highlight: string | null;
}

export interface WadatiPanelOptions {
  onHover?(site: string | null): void;
}

const PAD = { l: 38, r: 10, t: 10, b: 28 };
const HIT_PX = 9;

export class WadatiPanel extends CanvasPanel {
  private input: WadatiInput = { result: null, highlight: null };

  constructor(container: HTMLElement, options: WadatiPanelOptions = {}) {
    super(container, 'Wadati diagram', 'db-wadati', options.onHover);
    this.canvas.addEventListener('pointermove', (e) => this.setHover(this.siteAt(e.offsetX, e.offsetY)));
    this.canvas.addEventListener('pointerleave', () => this.setHover(null));
  }

  set(input: Partial<WadatiInput>): void {
    this.input = { ...this.input, ...input };
    this.draw();
  }

  siteAt(x: number, y: number): string | null {
    return this.nearestSpot(x, y, HIT_PX);
  }

  protected heightFor(width: number): number {
    return Math.round(width * 0.72);
  }

  protected paint(ctx: CanvasRenderingContext2D, th: PanelTheme): void {
    const W = this.width;
    const H = this.height;
    this.spots = [];
    ctx.fillStyle = th.panel;
    ctx.fillRect(0, 0, W, H);
    const r = this.input.result;
    if (!r || !r.ok) {
      ctx.fillStyle = th.muted;
      ctx.textAlign = 'center';
      const msg = r && !r.ok ? r.message : 'no event';
      wrapText(ctx, msg, W / 2, H / 2 - 8, W - 24, 14);
      this.caption.textContent = '';
      return;
    }
    const f = r.value;
    let xMax = 0;
    let yMax = 0;
    for (const p of f.points) { xMax = Math.max(xMax, p.pAfterOriginS); yMax = Math.max(yMax, p.spS); }
    xMax = Math.max(xMax * 1.08, 1e-3);
    yMax = Math.max(yMax * 1.12, 1e-3);
    let xMin = 0;
    for (const p of f.points) xMin = Math.min(xMin, p.pAfterOriginS);
    const X = (s: number) => PAD.l + ((s - xMin) / (xMax - xMin)) * (W - PAD.l - PAD.r);
    const Y = (s: number) => H - PAD.b - (s / yMax) * (H - PAD.t - PAD.b);

    // axes, grid, tick labels
    ctx.font = `10px ${th.font}`;
    ctx.lineWidth = 1;
    const xs = niceStep((xMax - xMin) / 4);
    const ys = niceStep(yMax / 4);
    ctx.textAlign = 'center';
    for (let v = Math.ceil(xMin / xs) * xs; v <= xMax + 1e-12; v += xs) {
      const x = Math.round(X(v)) + 0.5;
      ctx.strokeStyle = th.line;
      ctx.beginPath(); ctx.moveTo(x, PAD.t); ctx.lineTo(x, H - PAD.b); ctx.stroke();
      ctx.fillStyle = th.muted;
      ctx.fillText(tick(v, xs), x, H - PAD.b + 12);
    }
    ctx.textAlign = 'right';
    for (let v = 0; v <= yMax + 1e-12; v += ys) {
      const y = Math.round(Y(v)) + 0.5;
      ctx.strokeStyle = th.line;
      ctx.beginPath(); ctx.moveTo(PAD.l, y); ctx.lineTo(W - PAD.r, y); ctx.stroke();
      ctx.fillStyle = th.muted;
      ctx.fillText(tick(v, ys), PAD.l - 4, y + 3);
    }
    ctx.strokeStyle = th.muted;
    ctx.beginPath(); ctx.moveTo(PAD.l + 0.5, PAD.t); ctx.lineTo(PAD.l + 0.5, H - PAD.b + 0.5); ctx.lineTo(W - PAD.r, H - PAD.b + 0.5); ctx.stroke();
    ctx.fillStyle = th.muted;
    ctx.textAlign = 'center';
    ctx.fillText('P time after origin, s', (PAD.l + W - PAD.r) / 2, H - 4);
    ctx.save();
    ctx.translate(10, (PAD.t + H - PAD.b) / 2);
    ctx.rotate(-Math.PI / 2);
    ctx.fillText('S \u2212 P, s', 0, 0);
    ctx.restore();

    // the fitted line: S - P = (Vp/Vs - 1) (tP - t0)
    const k1 = f.vpVs - 1;
    const xe = Math.min(xMax, yMax / k1);
    ctx.strokeStyle = th.accent;
    ctx.lineWidth = 1.5;
    ctx.beginPath();
    ctx.moveTo(X(Math.max(0, xMin)), Y(k1 * Math.max(0, xMin)));
    ctx.lineTo(X(xe), Y(k1 * xe));
    ctx.stroke();

    const focus = this.hover ?? this.input.highlight;
    let focused: (typeof f.points)[number] | null = null;
    for (const p of f.points) {
      const x = X(p.pAfterOriginS);
      const y = Y(p.spS);
      this.spots.push({ site: p.stationKey, x, y });
      if (p.stationKey === focus) { focused = p; continue; }
      ctx.beginPath();
      ctx.arc(x, y, 3.5, 0, 2 * Math.PI);
      ctx.fillStyle = th.text;
      ctx.fill();
    }
    if (focused) {
      const x = X(focused.pAfterOriginS);
      const y = Y(focused.spS);
      ctx.beginPath();
      ctx.arc(x, y, 5.5, 0, 2 * Math.PI);
      ctx.fillStyle = th.orange;
      ctx.fill();
      ctx.strokeStyle = th.text;
      ctx.lineWidth = 1.5;
      ctx.stroke();
      ctx.fillStyle = th.text;
      ctx.textAlign = x > W / 2 ? 'right' : 'left';
      ctx.font = `bold 10px ${th.font}`;
      ctx.fillText(`${focused.stationKey.split('.')[1]} ${formatSeconds(focused.residualS)}`, x + (x > W / 2 ? -8 : 8), y - 6);
    }
    ctx.font = `11px ${th.font}`;
    ctx.fillStyle = th.text;
    ctx.textAlign = 'left';
    ctx.fillText(`Vp/Vs ${f.vpVs.toFixed(3)} \u00b1 ${f.vpVsError.toFixed(3)}`, PAD.l + 6, PAD.t + 12);

    const t0 = isoFromMicros(f.originTime).slice(11, 23);
    const lo = this.input.locatedOrigin;
    const diff = lo !== undefined && lo !== null ? ` (${formatSeconds((f.originTime - lo) / 1e6)} from the location)` : '';
    this.caption.textContent = `origin ${t0} \u00b1 ${f.originTimeErrorS.toFixed(3)} s${diff} \u00b7 ${f.count} sites`;
  }
}

function tick(v: number, step: number): string {
  const digits = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  return v.toFixed(digits);
}

function wrapText(ctx: CanvasRenderingContext2D, text: string, x: number, y: number, maxW: number, lineH: number): void {
  const words = text.split(' ');
  let line = '';
  let yy = y;
  for (const w of words) {
    const t = line ? `${line} ${w}` : w;
    if (ctx.measureText(t).width > maxW && line) {
      ctx.fillText(line, x, yy);
      line = w;
      yy += lineH;
    } else line = t;
  }
  if (line) ctx.fillText(line, x, yy);
}
