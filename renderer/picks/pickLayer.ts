/**
 * How picks look on the traces, and what the pointer is over. Automatic and manual picks differ by
 * shape and line style, not only colour: a manual pick is a solid line with a filled tab, an
 * automatic one a dashed line with an open tab (a confirmed automatic pick's tab gets a tick). P and
 * S differ by colour (Okabe-Ito blue and vermillion) and by the tab's letter. The uncertainty is a
 * bar through the pick's own band with a handle at each end. A pick left out of the location is a
 * faint dotted line, its tab struck through.
 */
import type { ReviewPick } from '../../core/review';
import type { RowMarksContext, SiteRow } from '../traces/traceView';

export const PICK_COLOURS = { P: '#3d9be9', S: '#e0702a' } as const;

export interface PickMarks {
  picks: readonly ReviewPick[];
  selected: string | null;
  /** Predicted arrival guides (site -> phase -> time, s from the view's reference). */
  guides?: Map<string, { phase: 'P' | 'S'; t: number }[]>;
  /** Seconds from the view's reference of a pick time (µs). */
  toView(time: number): number;
}

/** Band of a row a pick belongs to: its channel's band, else the vertical for P and the first horizontal for S. */
export function bandOf(row: SiteRow, pick: ReviewPick): number {
  const i = row.components.findIndex((c) => c.key === pick.channel);
  if (i >= 0) return i;
  return pick.phase === 'P' ? 0 : Math.min(1, row.components.length - 1);
}

export function drawPicks(m: RowMarksContext, marks: PickMarks): void {
  const { ctx, row, top, height, pxRatio } = m;
  const site = row.key;
  for (const g of marks.guides?.get(site) ?? []) {
    const x = m.xOf(g.t);
    ctx.strokeStyle = PICK_COLOURS[g.phase];
    ctx.globalAlpha = 0.45;
    ctx.setLineDash([2 * pxRatio, 4 * pxRatio]);
    ctx.lineWidth = pxRatio;
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.globalAlpha = 1;
  }
  for (const p of marks.picks) {
    if (!p.channel.startsWith(`${site}.`)) continue;
    const x = m.xOf(marks.toView(p.time));
    const colour = PICK_COLOURS[p.phase];
    const selected = p.id === marks.selected;
    const [bTop, bBottom] = m.band(bandOf(row, p));
    ctx.strokeStyle = colour;
    ctx.fillStyle = colour;
    ctx.lineWidth = (selected ? 2.5 : 1.5) * pxRatio;
    ctx.setLineDash(p.excluded ? [1.5 * pxRatio, 3.5 * pxRatio] : p.mode === 'automatic' ? [5 * pxRatio, 3 * pxRatio] : []);
    const faint = p.excluded ? 0.6 : 1;
    ctx.globalAlpha = faint;
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.setLineDash([]);
    ctx.globalAlpha = 1;
    // Tab with the phase letter at the top of the pick's band.
    const w = 13 * pxRatio;
    const h = 12 * pxRatio;
    const ty = bTop + 1 * pxRatio;
    ctx.beginPath();
    ctx.rect(x, ty, w, h);
    ctx.lineWidth = pxRatio;
    if (p.mode === 'manual') ctx.fill();
    else { ctx.fillStyle = 'rgba(0,0,0,0.55)'; ctx.fill(); ctx.stroke(); }
    ctx.fillStyle = p.mode === 'manual' ? '#111' : colour;
    ctx.font = `bold ${10 * pxRatio}px system-ui, sans-serif`;
    ctx.textBaseline = 'middle';
    ctx.fillText(p.phase, x + 3 * pxRatio, ty + h / 2 + 0.5 * pxRatio);
    if (p.excluded) {
      // Struck through, corner to corner, in the tab's own letter colour.
      ctx.strokeStyle = p.mode === 'manual' ? '#111' : colour;
      ctx.lineWidth = 1.5 * pxRatio;
      ctx.beginPath();
      ctx.moveTo(x, ty + h);
      ctx.lineTo(x + w, ty);
      ctx.stroke();
    }
    if (p.mode === 'automatic' && p.status === 'confirmed') {
      ctx.strokeStyle = colour;
      ctx.beginPath();
      ctx.moveTo(x + w + 2 * pxRatio, ty + h * 0.55);
      ctx.lineTo(x + w + 5 * pxRatio, ty + h * 0.9);
      ctx.lineTo(x + w + 10 * pxRatio, ty + h * 0.1);
      ctx.stroke();
    }
    // Polarity arrow beside the tab (up positive, down negative).
    if (p.polarity === 'positive' || p.polarity === 'negative') {
      const ax = x - 6 * pxRatio;
      const up = p.polarity === 'positive';
      ctx.fillStyle = colour;
      ctx.beginPath();
      ctx.moveTo(ax - 4 * pxRatio, ty + (up ? h : 0));
      ctx.lineTo(ax + 4 * pxRatio, ty + (up ? h : 0));
      ctx.lineTo(ax, ty + (up ? 0 : h));
      ctx.fill();
    }
    // Uncertainty bar through the middle of the pick's band, with end handles.
    const y = (bTop + bBottom) / 2;
    const x0 = m.xOf(marks.toView(p.time) - p.lower);
    const x1 = m.xOf(marks.toView(p.time) + p.upper);
    ctx.strokeStyle = colour;
    ctx.lineWidth = (selected ? 3 : 2) * pxRatio;
    ctx.globalAlpha = (selected ? 0.9 : 0.6) * faint;
    ctx.beginPath();
    ctx.moveTo(x0, y);
    ctx.lineTo(x1, y);
    ctx.stroke();
    const hh = (selected ? 7 : 5) * pxRatio;
    ctx.lineWidth = (selected ? 2.5 : 1.5) * pxRatio;
    ctx.beginPath();
    ctx.moveTo(x0, y - hh); ctx.lineTo(x0, y + hh);
    ctx.moveTo(x1, y - hh); ctx.lineTo(x1, y + hh);
    ctx.stroke();
    ctx.globalAlpha = 1;
  }
}

export type PickHit = { pick: ReviewPick; part: 'line' | 'lower' | 'upper' };

/**
 * What is under the pointer at time `t` (s from the reference) in band `band` of `row`:
 * an uncertainty handle of a pick in that band (within `tol` seconds), else a pick line.
 */
export function hitPick(row: SiteRow, band: number, t: number, tol: number, marks: PickMarks): PickHit | null {
  let best: PickHit | null = null;
  let bestD = tol;
  for (const p of marks.picks) {
    if (!p.channel.startsWith(`${row.key}.`)) continue;
    const tp = marks.toView(p.time);
    if (bandOf(row, p) === band) {
      const dl = Math.abs(t - (tp - p.lower));
      const du = Math.abs(t - (tp + p.upper));
      if (dl < bestD && p.lower > tol) { best = { pick: p, part: 'lower' }; bestD = dl; }
      if (du < bestD && p.upper > tol) { best = { pick: p, part: 'upper' }; bestD = du; }
    }
    const d = Math.abs(t - tp);
    if (d < bestD) { best = { pick: p, part: 'line' }; bestD = d; }
  }
  return best;
}
