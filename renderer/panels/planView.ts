/**
 * Plan view of an event, drawn by the app (no map tiles): the sites as labelled triangles (filled
 * when the event has picks there), the epicentre, its 68 % error ellipse, and the S-P distance
 * circles. The frame holds the sites with picks (all sites when none has) and the epicentre with
 * its ellipse; other sites outside it are left out of the picture. Positions are km east and north in the location code's local projection, centred on the
 * middle of what is shown, with one scale for both axes (north up). A scale bar and a north arrow
 * say how big and which way. Hovering a site highlights it and calls `onHover(site)` (null when the
 * pointer leaves every site), so the desk can highlight the same site elsewhere.
 *
 *   const plan = new PlanView(column, { onHover: (site) => desk.highlight(site) });
 *   plan.set({ stations, origin, ellipse, circles, highlight });
 */
import { localProjection, toLocalKm } from '../../core/location/projection';
import { CanvasPanel, niceStep, type PanelTheme } from './canvasPanel';

export interface PlanStation {
  /** "NET.STA"; the label is the station code. */
  site: string;
  latitude: number;
  longitude: number;
  /** The open event has a pick at this site (drawn filled). */
  picked?: boolean;
}

export interface PlanInput {
  stations: readonly PlanStation[];
  /** Epicentre, degrees; null when there is no solution. */
  origin: { latDeg: number; lonDeg: number } | null;
  /** The 68 % epicentral error ellipse (semi-axes km, major axis azimuth degrees from north). */
  ellipse: { semiMajorKm: number; semiMinorKm: number; majorAzimuthDeg: number } | null;
  /** S-P epicentral distance circles around sites, km. */
  circles: readonly { site: string; epicentralKm: number }[];
  /** Site drawn highlighted (e.g. hovered in another panel), or null. */
  highlight: string | null;
}

export interface PlanViewOptions {
  onHover?(site: string | null): void;
}

const EMPTY: PlanInput = { stations: [], origin: null, ellipse: null, circles: [], highlight: null };
const HIT_PX = 10;

export class PlanView extends CanvasPanel {
  private input: PlanInput = EMPTY;
  /** Site names left out of the last drawing because they would have covered others. */
  hiddenLabels = 0;
  /** Where the last drawing put site names (CSS px of the canvas), for tests. */
  labelBoxes: readonly { x0: number; x1: number; y0: number; y1: number }[] = [];

  constructor(container: HTMLElement, options: PlanViewOptions = {}) {
    super(container, 'Plan view', 'db-plan', options.onHover);
    this.canvas.addEventListener('pointermove', (e) => this.setHover(this.siteAt(e.offsetX, e.offsetY)));
    this.canvas.addEventListener('pointerleave', () => this.setHover(null));
  }

  /** Replaces what is shown and draws. */
  set(input: Partial<PlanInput>): void {
    this.input = { ...this.input, ...input };
    this.draw();
  }

  /** The site under a point (CSS px of the canvas), or null. */
  siteAt(x: number, y: number): string | null {
    return this.nearestSpot(x, y, HIT_PX);
  }

  /** Where a site was drawn (CSS px of the canvas), for tests and tooltips. */
  spotOf(site: string): { x: number; y: number } | null {
    const s = this.spots.find((p) => p.site === site);
    return s ? { x: s.x, y: s.y } : null;
  }

  protected heightFor(width: number): number {
    return width;
  }

  protected paint(ctx: CanvasRenderingContext2D, th: PanelTheme): void {
    const { stations, origin, ellipse, circles, highlight } = this.input;
    const W = this.width;
    const H = this.height;
    this.spots = [];
    ctx.fillStyle = th.panel;
    ctx.fillRect(0, 0, W, H);
    if (stations.length === 0 && !origin) {
      ctx.fillStyle = th.muted;
      ctx.textAlign = 'center';
      ctx.fillText('no site coordinates', W / 2, H / 2);
      this.caption.textContent = '';
      return;
    }
    // Frame: the sites, the epicentre and the ellipse's extent (circles may reach far: they are clipped).
    let lat0 = 0;
    let lon0 = 0;
    const pts = (stations.some((s) => s.picked) ? stations.filter((s) => s.picked) : stations).map((s) => [s.latitude, s.longitude]);
    if (origin) pts.push([origin.latDeg, origin.lonDeg]);
    let la0 = Infinity; let la1 = -Infinity; let lo0 = Infinity; let lo1 = -Infinity;
    for (const [la, lo] of pts) { la0 = Math.min(la0, la); la1 = Math.max(la1, la); lo0 = Math.min(lo0, lo); lo1 = Math.max(lo1, lo); }
    lat0 = (la0 + la1) / 2;
    lon0 = (lo0 + lo1) / 2;
    const proj = localProjection(lat0, lon0);
    const xy = [0, 0];
    const st = stations.map((s) => { toLocalKm(proj, s.latitude, s.longitude, xy); return { s, e: xy[0], n: xy[1] }; });
    let oe = 0; let on = 0;
    if (origin) { toLocalKm(proj, origin.latDeg, origin.lonDeg, xy); oe = xy[0]; on = xy[1]; }
    let e0 = Infinity; let e1 = -Infinity; let n0 = Infinity; let n1 = -Infinity;
    const grow = (e: number, n: number, r = 0) => { e0 = Math.min(e0, e - r); e1 = Math.max(e1, e + r); n0 = Math.min(n0, n - r); n1 = Math.max(n1, n + r); };
    // Frame the sites with picks (and the epicentre): an outlying site without picks should not
    // shrink the network the analyst is working on; sites outside the frame are clipped.
    const framed = st.some((p) => p.s.picked) ? st.filter((p) => p.s.picked) : st;
    for (const p of framed) grow(p.e, p.n);
    if (origin) grow(oe, on, ellipse && Number.isFinite(ellipse.semiMajorKm) ? Math.min(ellipse.semiMajorKm, 3 * Math.max(e1 - e0, n1 - n0, 0.01)) : 0);
    const span = Math.max(e1 - e0, n1 - n0, 0.02);
    const pad = { l: 14, r: 14, t: 14, b: 30 };
    const scale = Math.min((W - pad.l - pad.r) / span, (H - pad.t - pad.b) / span) / 1.08; // px per km
    const ce = (e0 + e1) / 2;
    const cn = (n0 + n1) / 2;
    const cx = pad.l + (W - pad.l - pad.r) / 2;
    const cy = pad.t + (H - pad.t - pad.b) / 2;
    const X = (e: number) => cx + (e - ce) * scale;
    const Y = (n: number) => cy - (n - cn) * scale;

    ctx.save();
    ctx.beginPath();
    ctx.rect(0, 0, W, H);
    ctx.clip();
    // light grid at the scale bar's step
    const step = niceStep((W * 0.3) / scale);
    ctx.strokeStyle = th.line;
    ctx.lineWidth = 1;
    ctx.beginPath();
    for (let e = Math.ceil((ce - W / 2 / scale) / step) * step; X(e) < W; e += step) { ctx.moveTo(Math.round(X(e)) + 0.5, 0); ctx.lineTo(Math.round(X(e)) + 0.5, H); }
    for (let n = Math.ceil((cn - H / 2 / scale) / step) * step; Y(n) > 0; n += step) { ctx.moveTo(0, Math.round(Y(n)) + 0.5); ctx.lineTo(W, Math.round(Y(n)) + 0.5); }
    ctx.globalAlpha = 0.5;
    ctx.stroke();
    ctx.globalAlpha = 1;

    const focus = this.hover ?? highlight;
    // S-P circles (dashed; the focused site's solid)
    const pos = new Map(st.map((p) => [p.s.site, p]));
    for (const c of circles) {
      const p = pos.get(c.site);
      if (!p || !(c.epicentralKm >= 0)) continue;
      const isFocus = c.site === focus;
      ctx.strokeStyle = isFocus ? th.orange : th.muted;
      ctx.globalAlpha = isFocus ? 1 : 0.7;
      ctx.lineWidth = isFocus ? 1.5 : 1;
      ctx.setLineDash(isFocus ? [] : [4, 3]);
      ctx.beginPath();
      ctx.arc(X(p.e), Y(p.n), Math.max(0.5, c.epicentralKm * scale), 0, 2 * Math.PI);
      ctx.stroke();
    }
    ctx.setLineDash([]);
    ctx.globalAlpha = 1;

    // ellipse and epicentre
    if (origin) {
      const x = X(oe);
      const y = Y(on);
      if (ellipse && Number.isFinite(ellipse.semiMajorKm) && Number.isFinite(ellipse.semiMinorKm)) {
        ctx.beginPath();
        // canvas angles run clockwise from +x (east); an azimuth runs clockwise from north
        ctx.ellipse(x, y, Math.max(0.5, ellipse.semiMajorKm * scale), Math.max(0.5, ellipse.semiMinorKm * scale), ((ellipse.majorAzimuthDeg - 90) * Math.PI) / 180, 0, 2 * Math.PI);
        ctx.fillStyle = th.vermillion;
        ctx.globalAlpha = 0.18;
        ctx.fill();
        ctx.globalAlpha = 1;
        ctx.strokeStyle = th.vermillion;
        ctx.lineWidth = 1.5;
        ctx.stroke();
      }
      star(ctx, x, y, 7, th.vermillion, th.panel);
    }

    // sites
    ctx.textAlign = 'left';
    ctx.textBaseline = 'middle';
    const drawMarker = (p: (typeof st)[number], isFocus: boolean) => {
      const x = X(p.e);
      const y = Y(p.n);
      this.spots.push({ site: p.s.site, x, y });
      const r = isFocus ? 7 : 5;
      ctx.beginPath();
      ctx.moveTo(x, y - r);
      ctx.lineTo(x + r * 0.95, y + r * 0.7);
      ctx.lineTo(x - r * 0.95, y + r * 0.7);
      ctx.closePath();
      ctx.fillStyle = isFocus ? th.orange : p.s.picked ? th.sky : th.panel;
      ctx.fill();
      ctx.strokeStyle = isFocus ? th.text : p.s.picked ? th.sky : th.muted;
      ctx.lineWidth = isFocus ? 1.5 : 1.2;
      ctx.stroke();
    };
    // Labels after all markers, most wanted first (the site under the pointer, then sites with picks),
    // each on the right of its marker or else on the left, and left out where it would cover a label
    // already drawn or another site's marker (a site with picks may cover the marker of one without):
    // with many sites the names stay readable and the pointer names any site.
    const placed: { x0: number; x1: number; y0: number; y1: number }[] = [];
    const markers = st.map((p) => ({ site: p.s.site, picked: p.s.picked, x: X(p.e), y: Y(p.n) }));
    let hidden = 0;
    const drawLabel = (p: (typeof st)[number], isFocus: boolean) => {
      const x = X(p.e);
      const y = Y(p.n);
      const r = isFocus ? 7 : 5;
      const label = p.s.site.split('.')[1] ?? p.s.site;
      ctx.font = `${isFocus ? 'bold ' : ''}10px ${th.font}`;
      const tw = ctx.measureText(label).width;
      const free = (lx: number) => lx >= 0 && lx + tw <= W
        && !placed.some((b) => lx - 1 < b.x1 && lx + tw + 1 > b.x0 && y - 6 < b.y1 && y + 6 > b.y0)
        && !markers.some((m) => m.site !== p.s.site && (m.picked || !p.s.picked) && lx - 1 < m.x + 5 && lx + tw + 1 > m.x - 5 && y - 6 < m.y + 4 && y + 6 > m.y - 5);
      const right = x + r + 2;
      const left = x - r - 2 - tw;
      const lx = free(right) ? right : free(left) ? left : isFocus ? (right + tw > W - 2 ? left : right) : null;
      if (lx === null) { hidden++; return; }
      placed.push({ x0: lx - 1, x1: lx + tw + 1, y0: y - 6, y1: y + 6 });
      ctx.fillStyle = th.panel;
      ctx.globalAlpha = 0.7;
      ctx.fillRect(lx - 1, y - 6, tw + 2, 12);
      ctx.globalAlpha = 1;
      ctx.fillStyle = isFocus ? th.text : p.s.picked ? th.text : th.muted;
      ctx.fillText(label, lx, y);
    };
    for (const p of st) if (p.s.site !== focus) drawMarker(p, false);
    const f = st.find((p) => p.s.site === focus);
    if (f) drawMarker(f, true);
    if (f) drawLabel(f, true);
    for (const p of st) if (p !== f && p.s.picked) drawLabel(p, false);
    for (const p of st) if (p !== f && !p.s.picked) drawLabel(p, false);
    this.hiddenLabels = hidden;
    this.labelBoxes = placed;
    ctx.restore();
    ctx.font = `11px ${th.font}`;
    ctx.textBaseline = 'alphabetic';

    // scale bar (bottom left) and north arrow (top right)
    const barKm = niceStep((W * 0.28) / scale);
    const barPx = barKm * scale;
    const bx = 10;
    const by = H - 10;
    ctx.strokeStyle = th.text;
    ctx.lineWidth = 2;
    ctx.beginPath();
    ctx.moveTo(bx, by - 4); ctx.lineTo(bx, by); ctx.lineTo(bx + barPx, by); ctx.lineTo(bx + barPx, by - 4);
    ctx.stroke();
    ctx.fillStyle = th.text;
    ctx.textAlign = 'left';
    ctx.fillText(barKm >= 1 ? `${barKm} km` : `${Math.round(barKm * 1000)} m`, bx + barPx + 5, by);
    const ax = W - 14;
    ctx.beginPath();
    ctx.moveTo(ax, 8); ctx.lineTo(ax + 5, 22); ctx.lineTo(ax, 19); ctx.lineTo(ax - 5, 22); ctx.closePath();
    ctx.fillStyle = th.text;
    ctx.fill();
    ctx.textAlign = 'center';
    ctx.fillText('N', ax, 33);

    const o = origin ? `epicentre ${origin.latDeg.toFixed(4)}\u00b0, ${origin.lonDeg.toFixed(4)}\u00b0` : 'not located';
    const el = ellipse && origin ? ` \u00b7 68 % ellipse ${fmtKm(ellipse.semiMajorKm)} \u00d7 ${fmtKm(ellipse.semiMinorKm)}` : '';
    const names = this.hiddenLabels ? ` \u00b7 ${this.hiddenLabels} names hidden (point at a site)` : '';
    this.caption.textContent = `${o}${el}${circles.length ? ` \u00b7 ${circles.length} S\u2212P circles` : ''}${names}`;
  }
}

function fmtKm(km: number): string {
  return km >= 1 ? `${km.toFixed(1)}\u00a0km` : `${Math.round(km * 1000)}\u00a0m`;
}

function star(ctx: CanvasRenderingContext2D, x: number, y: number, r: number, fill: string, edge: string): void {
  ctx.beginPath();
  for (let i = 0; i < 10; i++) {
    const a = -Math.PI / 2 + (i * Math.PI) / 5;
    const rr = i % 2 === 0 ? r : r * 0.45;
    if (i === 0) ctx.moveTo(x + rr * Math.cos(a), y + rr * Math.sin(a));
    else ctx.lineTo(x + rr * Math.cos(a), y + rr * Math.sin(a));
  }
  ctx.closePath();
  ctx.fillStyle = fill;
  ctx.fill();
  ctx.strokeStyle = edge;
  ctx.lineWidth = 1;
  ctx.stroke();
}
