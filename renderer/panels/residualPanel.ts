/**
 * Pick residuals (observed minus computed time) of the current solution: one row per site, a
 * horizontal bar from zero per pick, P above S within the row. P and S differ by colour (the
 * traces' P and S colours) and by the marker at the bar's end (P a circle, S a square); picks left
 * out of the solution are drawn open with a dashed bar. The scale is symmetric about zero, at least
 * +-50 ms; bars beyond it end in an arrow with the value written. Hovering a row highlights it and
 * calls `onHover(site)`.
 *
 *   const res = new ResidualPanel(column, { onHover });
 *   res.set({ residuals: location.arrivals, order: sitesByDistance, highlight });
 */
import { CanvasPanel, formatSeconds, niceStep, phaseMarker, type PanelTheme } from './canvasPanel';

export interface ResidualItem {
  site: string;
  wave: 'P' | 'S';
  /** Observed minus computed, s. */
  residualS: number;
  used: boolean;
}

export interface ResidualInput {
  residuals: readonly ResidualItem[];
  /** Site order top to bottom (e.g. by distance); sites not listed follow in order of appearance. */
  order?: readonly string[];
  highlight: string | null;
  /** RMS of the solution, s, shown in the caption. */
  rmsS?: number | null;
}

export interface ResidualPanelOptions {
  onHover?(site: string | null): void;
}

const ROW = 16;
const HEAD = 18;
const FOOT = 16;
const LABEL = 46;

export class ResidualPanel extends CanvasPanel {
  private input: ResidualInput = { residuals: [], highlight: null };
  private rows: string[] = [];

  constructor(container: HTMLElement, options: ResidualPanelOptions = {}) {
    super(container, 'Residuals (observed \u2212 computed)', 'db-residuals', options.onHover);
    this.canvas.addEventListener('pointermove', (e) => this.setHover(this.siteAt(e.offsetY)));
    this.canvas.addEventListener('pointerleave', () => this.setHover(null));
  }

  set(input: Partial<ResidualInput>): void {
    this.input = { ...this.input, ...input };
    const seen = new Set<string>();
    const present = new Set(this.input.residuals.map((r) => r.site));
    this.rows = [];
    for (const s of this.input.order ?? []) if (present.has(s) && !seen.has(s)) { seen.add(s); this.rows.push(s); }
    for (const r of this.input.residuals) if (!seen.has(r.site)) { seen.add(r.site); this.rows.push(r.site); }
    this.draw();
  }

  /** The site of the row at a height (CSS px of the canvas), or null. */
  siteAt(y: number): string | null {
    const i = Math.floor((y - HEAD) / ROW);
    return i >= 0 && i < this.rows.length ? this.rows[i] : null;
  }

  protected heightFor(): number {
    return HEAD + Math.max(1, this.rows.length) * ROW + FOOT;
  }

  protected paint(ctx: CanvasRenderingContext2D, th: PanelTheme): void {
    const W = this.width;
    const H = this.height;
    ctx.fillStyle = th.panel;
    ctx.fillRect(0, 0, W, H);
    const items = this.input.residuals;
    if (items.length === 0) {
      ctx.fillStyle = th.muted;
      ctx.textAlign = 'center';
      ctx.fillText('no solution', W / 2, HEAD + ROW * 0.7);
      this.caption.textContent = '';
      return;
    }
    let maxAbs = 0.05;
    const finite = items.filter((r) => Number.isFinite(r.residualS));
    const sorted = finite.map((r) => Math.abs(r.residualS)).sort((a, b) => a - b);
    // The scale follows the used picks (a far-off unused pick should not flatten the rest).
    for (const r of finite) if (r.used) maxAbs = Math.max(maxAbs, Math.abs(r.residualS));
    if (!finite.some((r) => r.used) && sorted.length) maxAbs = Math.max(maxAbs, sorted[sorted.length - 1]);
    const step = niceStep(maxAbs / 2);
    const range = Math.ceil(maxAbs / step) * step;
    const x0 = LABEL + 6;
    const x1 = W - 10;
    const xz = (x0 + x1) / 2;
    const X = (s: number) => xz + (s / range) * ((x1 - x0) / 2);
    const focus = this.hover ?? this.input.highlight;

    // grid and axis labels
    ctx.textAlign = 'center';
    ctx.font = `10px ${th.font}`;
    for (let v = -range; v <= range + 1e-12; v += step) {
      const x = Math.round(X(v)) + 0.5;
      ctx.strokeStyle = Math.abs(v) < 1e-12 ? th.muted : th.line;
      ctx.lineWidth = 1;
      ctx.beginPath();
      ctx.moveTo(x, HEAD - 2);
      ctx.lineTo(x, H - FOOT + 2);
      ctx.stroke();
    }
    // labels at the ends and at zero only (a narrow column has no room for more)
    ctx.fillStyle = th.muted;
    ctx.textAlign = 'left';
    ctx.fillText(formatSeconds(-range), x0 - 4, H - 4);
    ctx.textAlign = 'center';
    ctx.fillText('0', xz, H - 4);
    ctx.textAlign = 'right';
    ctx.fillText(formatSeconds(range), x1 + 4, H - 4);
    // legend
    ctx.textAlign = 'left';
    phaseMarker(ctx, 'P', 8, 8, 3.5, true, th.P);
    ctx.fillStyle = th.text;
    ctx.fillText('P', 15, 12);
    phaseMarker(ctx, 'S', 32, 8, 3.5, true, th.S);
    ctx.fillText('S', 39, 12);
    phaseMarker(ctx, 'P', 58, 8, 3.5, false, th.muted);
    ctx.fillStyle = th.muted;
    ctx.fillText('not used', 65, 12);

    const bySite = new Map<string, ResidualItem[]>();
    for (const r of items) bySite.set(r.site, [...(bySite.get(r.site) ?? []), r]);
    this.rows.forEach((site, i) => {
      const y = HEAD + i * ROW;
      if (site === focus) {
        ctx.fillStyle = th.orange;
        ctx.globalAlpha = 0.18;
        ctx.fillRect(0, y, W, ROW);
        ctx.globalAlpha = 1;
      }
      ctx.fillStyle = site === focus ? th.text : th.muted;
      ctx.font = `${site === focus ? 'bold ' : ''}10px ${th.font}`;
      ctx.textAlign = 'right';
      ctx.fillText(site.split('.')[1] ?? site, LABEL, y + ROW * 0.7);
      const list = bySite.get(site) ?? [];
      for (const r of list) {
        if (!Number.isFinite(r.residualS)) continue;
        const yy = y + (r.wave === 'P' ? ROW * 0.32 : ROW * 0.7);
        const colour = r.used ? th[r.wave] : th.muted;
        const clipped = Math.abs(r.residualS) > range;
        const v = Math.max(-range, Math.min(range, r.residualS));
        ctx.strokeStyle = colour;
        ctx.lineWidth = 3;
        ctx.setLineDash(r.used ? [] : [2, 2]);
        ctx.beginPath();
        ctx.moveTo(xz, yy);
        ctx.lineTo(X(v), yy);
        ctx.stroke();
        ctx.setLineDash([]);
        if (clipped) {
          const dir = Math.sign(r.residualS);
          const xe = X(v);
          ctx.fillStyle = colour;
          ctx.beginPath();
          ctx.moveTo(xe + dir * 5, yy); ctx.lineTo(xe - dir * 1, yy - 4); ctx.lineTo(xe - dir * 1, yy + 4); ctx.closePath();
          ctx.fill();
          ctx.font = `9px ${th.font}`;
          ctx.textAlign = dir > 0 ? 'right' : 'left';
          ctx.fillStyle = th.text;
          ctx.fillText(formatSeconds(r.residualS), xe - dir * 8, yy + 3);
        } else {
          phaseMarker(ctx, r.wave, X(v), yy, 3, r.used, colour);
        }
      }
    });
    const rms = this.input.rmsS;
    const used = items.filter((r) => r.used).length;
    this.caption.textContent = `${used} of ${items.length} picks used${rms !== undefined && rms !== null && Number.isFinite(rms) ? ` \u00b7 RMS ${formatSeconds(rms).replace('+', '')}` : ''}`;
  }
}
