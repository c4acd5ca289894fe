/**
 * Amplitude picks on the traces: how they look, what the pointer is over, and how the analyst edits
 * them (AmplitudeTool).
 *
 * An amplitude pick is a short vertical double arrow at the time of the Wood-Anderson peak in its
 * channel's band, in Okabe-Ito bluish green (apart from the P blue and S vermillion); the channel
 * that gives its station's magnitude carries the station magnitude beside it. The measuring window
 * is a faint bar along the band's foot. Automatic: outlined arrowheads; manual (moved by the
 * analyst): filled. Removed by the analyst: grey, dashed, crossed out and labelled "out of ML", so
 * it is plain which data the magnitude leaves out (shape and label, not only colour).
 *
 * Editing: press on a mark to select it, drag it to another swing and let go. The review records
 * where it was dropped and a search half-width of a few pixels at the current zoom
 * (`searchHalfWidth`); core/review/reviewMagnitude then measures the Wood-Anderson peak again within
 * that stretch of the channel, so the mark lands on the peak of the swing it was dropped on. The
 * delete key takes the selected amplitude out of the magnitude, or puts a removed one back; with
 * Shift it does so for all the station's horizontals. Undo and redo work as for picks.
 */
import { channelKey } from '../../core/model';
import { isoFromMicros, type Micros } from '../../core/time';
import type { QmlAmplitude, QmlStationMagnitude } from '../../core/quakeml';
import { amplitudeEditOf, moveAmplitude, removeAmplitudes, restoreAmplitudes, type ReviewDocument, type ReviewEvent } from '../../core/review';
import type { ReviewMagnitude } from '../../core/review/reviewMagnitude';
import type { RowMarksContext, SiteRow } from '../traces/traceView';

export const AMPLITUDE_COLOUR = '#009e73';
const REMOVED_COLOUR = '#8c8c8c';

export interface AmplitudeMarks {
  amplitudes: readonly QmlAmplitude[];
  stationMagnitudes: readonly QmlStationMagnitude[];
  /** Automatic amplitudes the analyst removed: drawn grey and crossed out. */
  removed?: readonly QmlAmplitude[];
  /** Channel key ("NET.STA.LOC.CHA") of the selected amplitude, or null. */
  selected: string | null;
  /** A mark being dragged: its channel, where it would land (s from the reference) and the search half-width, s. */
  drag?: { channel: string; t: number; halfWidth: number } | null;
  /** Seconds from the view's reference of a time (µs). */
  toView(time: number): number;
}

function keyOf(a: QmlAmplitude): string | null {
  return a.waveformId ? channelKey(a.waveformId) : null;
}

function bandOfAmplitude(row: SiteRow, a: QmlAmplitude): number {
  const key = keyOf(a);
  return key === null ? -1 : row.components.findIndex((c) => c.key === key);
}

function drawArrow(m: RowMarksContext, x: number, band: number, filled: boolean, width: number): [number, number] {
  const { ctx, pxRatio } = m;
  const [bTop, bBottom] = m.band(band);
  const y0 = bTop + 3 * pxRatio, y1 = bBottom - 5 * pxRatio, hw = 4 * pxRatio, hh = 6 * pxRatio;
  ctx.lineWidth = width * pxRatio;
  ctx.beginPath();
  ctx.moveTo(x, y0);
  ctx.lineTo(x, y1);
  ctx.stroke();
  ctx.setLineDash([]);
  for (const [tip, dir] of [[y0, 1], [y1, -1]] as const) {
    ctx.beginPath();
    ctx.moveTo(x, tip);
    ctx.lineTo(x - hw, tip + dir * hh);
    ctx.lineTo(x + hw, tip + dir * hh);
    ctx.closePath();
    if (filled) ctx.fill();
    else ctx.stroke();
  }
  return [y0, y1];
}

export function drawAmplitudes(m: RowMarksContext, marks: AmplitudeMarks): void {
  const { ctx, row, pxRatio } = m;
  const magOf = new Map(marks.stationMagnitudes.filter((s) => s.amplitudeId).map((s) => [s.amplitudeId as string, s.mag]));
  ctx.font = `${10 * pxRatio}px system-ui, sans-serif`;
  ctx.textBaseline = 'top';
  for (const a of marks.amplitudes) {
    if (a.time === null) continue;
    const band = bandOfAmplitude(row, a);
    if (band < 0) continue;
    const [, bBottom] = m.band(band);
    const selected = keyOf(a) === marks.selected;
    const dragged = marks.drag?.channel === keyOf(a);
    ctx.strokeStyle = AMPLITUDE_COLOUR;
    ctx.fillStyle = AMPLITUDE_COLOUR;
    if (a.timeWindow && !dragged) {
      const x0 = m.xOf(marks.toView(a.timeWindow.reference) - a.timeWindow.beginS);
      const x1 = m.xOf(marks.toView(a.timeWindow.reference) + a.timeWindow.endS);
      ctx.globalAlpha = 0.25;
      ctx.fillRect(x0, bBottom - 3 * pxRatio, x1 - x0, 3 * pxRatio);
    }
    // While dragged, the mark stays faint where it was.
    ctx.globalAlpha = dragged ? 0.35 : 1;
    const x = m.xOf(marks.toView(a.time));
    const [y0] = drawArrow(m, x, band, a.evaluationMode === 'manual', selected ? 2.5 : 1.5);
    const mag = magOf.get(a.id);
    if (mag !== undefined) ctx.fillText(`ML ${mag.toFixed(1)}`, x + 6 * pxRatio, y0);
    ctx.globalAlpha = 1;
  }
  for (const a of marks.removed ?? []) {
    if (a.time === null) continue;
    const band = bandOfAmplitude(row, a);
    if (band < 0) continue;
    const selected = keyOf(a) === marks.selected;
    const x = m.xOf(marks.toView(a.time));
    ctx.strokeStyle = REMOVED_COLOUR;
    ctx.fillStyle = REMOVED_COLOUR;
    ctx.setLineDash([3 * pxRatio, 3 * pxRatio]);
    const [y0, y1] = drawArrow(m, x, band, false, selected ? 2.5 : 1.5);
    // A cross over the middle of the arrow, and the words.
    const yc = (y0 + y1) / 2, s = 5 * pxRatio;
    ctx.lineWidth = 2 * pxRatio;
    ctx.beginPath();
    ctx.moveTo(x - s, yc - s); ctx.lineTo(x + s, yc + s);
    ctx.moveTo(x - s, yc + s); ctx.lineTo(x + s, yc - s);
    ctx.stroke();
    ctx.fillText('out of ML', x + 6 * pxRatio, y0);
  }
  // A station magnitude from a channel the row does not show (e.g. a strong-motion sensor beside
  // the broadband): its label at the peak time in the first horizontal band, naming the channel.
  const shown = new Set(row.components.map((c) => c.key));
  const ampById = new Map(marks.amplitudes.map((a) => [a.id, a]));
  for (const sm of marks.stationMagnitudes) {
    const a = sm.amplitudeId ? ampById.get(sm.amplitudeId) : undefined;
    const key = a ? keyOf(a) : null;
    if (!a || a.time === null || key === null || shown.has(key) || !key.startsWith(`${row.key}.`) || row.components.length < 2) continue;
    const [bTop] = m.band(1);
    const x = m.xOf(marks.toView(a.time));
    ctx.fillStyle = AMPLITUDE_COLOUR;
    ctx.fillText(`ML ${sm.mag.toFixed(1)} (${key.split('.').slice(2).join('.')})`, x + 6 * pxRatio, bTop + 3 * pxRatio);
  }
  const d = marks.drag;
  if (d) {
    const band = row.components.findIndex((c) => c.key === d.channel);
    if (band >= 0) {
      // Where it would land, and the stretch its peak will be looked for in.
      const [bTop, bBottom] = m.band(band);
      const x0 = m.xOf(d.t - d.halfWidth), x1 = m.xOf(d.t + d.halfWidth);
      ctx.fillStyle = AMPLITUDE_COLOUR;
      ctx.strokeStyle = AMPLITUDE_COLOUR;
      ctx.globalAlpha = 0.18;
      ctx.fillRect(x0, bTop, Math.max(x1 - x0, pxRatio), bBottom - bTop);
      ctx.globalAlpha = 1;
      ctx.setLineDash([4 * pxRatio, 2 * pxRatio]);
      drawArrow(m, m.xOf(d.t), band, true, 2);
    }
  }
  ctx.setLineDash([]);
}

/** The amplitude pick in band `band` of `row` nearest time `t` (s from the reference) within `tol` s, or null. */
export function hitAmplitude(row: SiteRow, band: number, t: number, tol: number, marks: AmplitudeMarks): QmlAmplitude | null {
  let best: QmlAmplitude | null = null;
  let bestD = tol;
  for (const a of [...marks.amplitudes, ...(marks.removed ?? [])]) {
    if (a.time === null || bandOfAmplitude(row, a) !== band) continue;
    const d = Math.abs(t - marks.toView(a.time));
    if (d < bestD) { best = a; bestD = d; }
  }
  return best;
}

/** Pixels either side of a dropped mark its peak is looked for in. */
export const SEARCH_PIXELS = 5;
/**
 * Bounds of the search half-width, s: at least two samples either side at 100 Hz; at most 0.25 s, so
 * the 0.5 s stretch holds at most one peak of each sign of a swing of 1 Hz or lower. Faster swings
 * need a closer zoom, and the half-width follows the zoom.
 */
export const SEARCH_HALF_WIDTH_MIN = 0.02;
export const SEARCH_HALF_WIDTH_MAX = 0.25;

/**
 * Half-width of the stretch a dropped mark's peak is looked for in, s, at `secondsPerPixel`:
 * `SEARCH_PIXELS` pixels, kept within [0.02, 0.25] s. Zoomed in, the analyst's placement is precise
 * and the stretch narrow (it cannot jump to a neighbouring swing); zoomed out it covers the swing
 * under the pointer.
 */
export function searchHalfWidth(secondsPerPixel: number): number {
  if (!(secondsPerPixel > 0) || !Number.isFinite(secondsPerPixel)) throw new RangeError(`seconds per pixel must be > 0, got ${secondsPerPixel}`);
  const h = Math.min(SEARCH_HALF_WIDTH_MAX, Math.max(SEARCH_HALF_WIDTH_MIN, SEARCH_PIXELS * secondsPerPixel));
  return Math.round(h * 1e6) / 1e6;
}

/** What the amplitude tool needs from the desk. */
export interface AmplitudeToolHost {
  event(): ReviewEvent | null;
  magnitude(): ReviewMagnitude | null;
  /** The view's reference time, µs (view seconds count from it). */
  ref(): Micros;
  secondsPerPixel(): number;
  /** Applies an edit to the review (saved and undoable); false when it was refused. */
  apply(edit: (doc: ReviewDocument) => ReviewDocument): boolean;
  redraw(): void;
  status(text: string): void;
}

/** Selection and dragging of amplitude picks, turned into review edits. */
export class AmplitudeTool {
  /** Channel key of the selected amplitude, or null. */
  selected: string | null = null;
  private drag: { channel: string; markT: number; startT: number; t: number; halfWidth: number } | null = null;
  /** A dropped mark shown where it was dropped until the magnitude measured with it arrives. */
  private pending: { channel: string; t: number; halfWidth: number; before: ReviewMagnitude | null } | null = null;

  constructor(private readonly host: AmplitudeToolHost) {}

  marks(): AmplitudeMarks {
    const m = this.host.magnitude();
    const ref = this.host.ref();
    const d = this.drag;
    if (this.pending && this.pending.before !== m) this.pending = null;
    const p = this.pending;
    return {
      amplitudes: m?.amplitudes ?? [], stationMagnitudes: m?.stationMagnitudes ?? [], removed: m?.removed ?? [],
      selected: this.selected,
      drag: d && d.t !== d.markT ? { channel: d.channel, t: d.t, halfWidth: d.halfWidth } : p ? { channel: p.channel, t: p.t, halfWidth: p.halfWidth } : null,
      toView: (t) => (t - ref) / 1e6,
    };
  }

  /** The amplitude under the pointer within `tolPixels` and its distance in seconds, or null. */
  hit(row: SiteRow, band: number, t: number, tolPixels = 6): { amplitude: QmlAmplitude; distance: number } | null {
    const marks = this.marks();
    const a = hitAmplitude(row, band, t, tolPixels * this.host.secondsPerPixel(), marks);
    return a ? { amplitude: a, distance: Math.abs(t - marks.toView(a.time as number)) } : null;
  }

  /** Selects `a` and starts dragging it from `t` (s from the reference). */
  press(a: QmlAmplitude, t: number): void {
    const key = keyOf(a);
    if (key === null || a.time === null) return;
    this.selected = key;
    const markT = (a.time - this.host.ref()) / 1e6;
    const removed = this.host.magnitude()?.removed.some((x) => keyOf(x) === key) ?? false;
    // A removed amplitude is selected (to put it back) but not dragged.
    this.drag = removed ? null : { channel: key, markT, startT: t, t: markT, halfWidth: searchHalfWidth(this.host.secondsPerPixel()) };
    this.host.redraw();
  }

  dragTo(t: number): void {
    if (!this.drag) return;
    this.drag.t = this.drag.markT + (t - this.drag.startT);
    this.host.redraw();
  }

  /** Ends a drag at `t`: a mark moved by any amount is measured again where it was dropped. */
  release(t: number): void {
    const d = this.drag;
    this.drag = null;
    const ev = this.host.event();
    if (!d || !ev || t === d.startT) { this.host.redraw(); return; }
    const time = this.host.ref() + Math.round((d.markT + (t - d.startT)) * 1e6);
    this.pending = { channel: d.channel, t: d.markT + (t - d.startT), halfWidth: d.halfWidth, before: this.host.magnitude() };
    if (!this.host.apply((doc) => moveAmplitude(doc, ev.id, d.channel, time, d.halfWidth))) { this.pending = null; this.host.redraw(); }
  }

  /** True when a drag is going on. */
  get dragging(): boolean {
    return this.drag !== null;
  }

  /** Forgets the selection (e.g. a pick was selected, or another event opened). */
  clear(): void {
    this.selected = null;
    this.drag = null;
    this.pending = null;
  }

  /** Takes the selected amplitude out of the magnitude, or puts it back when it is out. False when none is selected. */
  toggleSelected(): boolean {
    const ev = this.host.event();
    if (!ev || !this.selected) return false;
    const key = this.selected;
    if (amplitudeEditOf(ev, key)?.kind === 'removed') this.host.apply((d) => restoreAmplitudes(d, ev.id, [key]));
    else this.host.apply((d) => removeAmplitudes(d, ev.id, [key]));
    return true;
  }

  /**
   * The same for every horizontal of the selected amplitude's station: all out, or all back when
   * all are out. False when none is selected.
   */
  toggleStation(): boolean {
    const ev = this.host.event();
    const m = this.host.magnitude();
    if (!ev || !this.selected) return false;
    const station = this.selected.split('.').slice(0, 2).join('.');
    const keys = [...new Set([...(m?.amplitudes ?? []), ...(m?.removed ?? [])].map(keyOf).filter((k): k is string => k !== null && k.startsWith(`${station}.`)))];
    if (keys.length === 0) { this.host.status(`no amplitudes measured at ${station}`); return true; }
    if (keys.every((k) => amplitudeEditOf(ev, k)?.kind === 'removed')) this.host.apply((d) => restoreAmplitudes(d, ev.id, keys));
    else this.host.apply((d) => removeAmplitudes(d, ev.id, keys));
    return true;
  }

  /** One line on the selected amplitude for the event bar, or '' when none is selected. */
  selectedText(): string {
    const m = this.host.magnitude();
    const key = this.selected;
    if (!m || !key) return '';
    const removed = m.removed.find((a) => keyOf(a) === key);
    const a = removed ?? m.amplitudes.find((x) => keyOf(x) === key);
    if (!a) return '';
    const sm = removed ? undefined : m.stationMagnitudes.find((s) => s.amplitudeId === a.id);
    const when = a.time !== null ? isoFromMicros(a.time).slice(11, 23) : '?';
    return `amplitude ${key} ${(a.value * 1e9).toPrecision(3)} nm at ${when} \u00b7 ${removed ? 'out of ML' : a.evaluationMode}${sm ? ` \u00b7 station ML ${sm.mag.toFixed(2)}` : ''}`;
  }
}

/** The event bar's magnitude line: ML, spread, station count and how many amplitudes the analyst changed. */
export function magnitudeSummary(m: ReviewMagnitude | null, ev: ReviewEvent | null): string {
  if (!m) return '';
  const v = m.magnitude;
  const edits = ev?.amplitudeEdits ?? [];
  const moved = edits.filter((e) => e.kind === 'moved').length;
  const out = edits.filter((e) => e.kind === 'removed');
  const outStations = [...new Set(out.map((e) => e.channel.split('.')[1]))].join(' ');
  const changed = [
    moved ? `${moved} amplitude${moved > 1 ? 's' : ''} moved` : '',
    out.length ? `${out.length} out of ML (${outStations})` : '',
  ].filter(Boolean).join(', ');
  const head = v ? `ML ${v.mag.toFixed(1)} \u00b1 ${(v.uncertainty ?? 0).toFixed(1)} (${v.stationCount} stations)` : 'no ML';
  return changed ? `${head} \u00b7 ${changed}` : head;
}
