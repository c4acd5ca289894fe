/**
 * How amplitude picks look on the traces, and what the pointer is over. An amplitude pick is a
 * short vertical double arrow at the time of the Wood-Anderson peak in its channel's band, in
 * Okabe-Ito bluish green (apart from the P blue and S vermillion), with its station magnitude
 * beside it; the measuring window is a faint bar along the band's foot. Automatic: outlined
 * arrowheads; manual (moved by the analyst): filled.
 */
import { channelKey } from '../../core/model';
import type { Micros } from '../../core/time';
import type { TimeWindow } from '../../core/magnitude';
import type { QmlAmplitude, QmlStationMagnitude } from '../../core/quakeml';
import type { RowMarksContext, SiteRow } from '../traces/traceView';

export const AMPLITUDE_COLOUR = '#009e73';

export interface AmplitudeMarks {
  amplitudes: readonly QmlAmplitude[];
  stationMagnitudes: readonly QmlStationMagnitude[];
  /** Id of the selected amplitude, or null. */
  selected: string | null;
  /** Seconds from the view's reference of a time (µs). */
  toView(time: number): number;
}

function bandOfAmplitude(row: SiteRow, a: QmlAmplitude): number {
  return a.waveformId ? row.components.findIndex((c) => c.key === channelKey(a.waveformId!)) : -1;
}

export function drawAmplitudes(m: RowMarksContext, marks: AmplitudeMarks): void {
  const { ctx, row, pxRatio } = m;
  const magOf = new Map(marks.stationMagnitudes.filter((s) => s.amplitudeId).map((s) => [s.amplitudeId as string, s.mag]));
  for (const a of marks.amplitudes) {
    if (a.time === null) continue;
    const band = bandOfAmplitude(row, a);
    if (band < 0) continue;
    const [bTop, bBottom] = m.band(band);
    const selected = a.id === marks.selected;
    ctx.strokeStyle = AMPLITUDE_COLOUR;
    ctx.fillStyle = AMPLITUDE_COLOUR;
    if (a.timeWindow) {
      const x0 = m.xOf(marks.toView(a.timeWindow.reference) - a.timeWindow.beginS);
      const x1 = m.xOf(marks.toView(a.timeWindow.reference) + a.timeWindow.endS);
      ctx.globalAlpha = 0.25;
      ctx.fillRect(x0, bBottom - 3 * pxRatio, x1 - x0, 3 * pxRatio);
      ctx.globalAlpha = 1;
    }
    const x = m.xOf(marks.toView(a.time));
    const y0 = bTop + 3 * pxRatio, y1 = bBottom - 5 * pxRatio, hw = 4 * pxRatio, hh = 6 * pxRatio;
    ctx.lineWidth = (selected ? 2.5 : 1.5) * pxRatio;
    ctx.beginPath();
    ctx.moveTo(x, y0);
    ctx.lineTo(x, y1);
    ctx.stroke();
    for (const [tip, dir] of [[y0, 1], [y1, -1]] as const) {
      ctx.beginPath();
      ctx.moveTo(x, tip);
      ctx.lineTo(x - hw, tip + dir * hh);
      ctx.lineTo(x + hw, tip + dir * hh);
      ctx.closePath();
      if (a.evaluationMode === 'manual') ctx.fill();
      else ctx.stroke();
    }
    const mag = magOf.get(a.id);
    if (mag !== undefined) {
      ctx.font = `${10 * pxRatio}px system-ui, sans-serif`;
      ctx.textBaseline = 'top';
      ctx.fillText(`ML ${mag.toFixed(1)}`, x + 6 * pxRatio, y0);
    }
  }
}

/** The amplitude pick in band `band` of `row` nearest time `t` (s from the reference) within `tol` s, or null. */
export function hitAmplitude(row: SiteRow, band: number, t: number, tol: number, marks: AmplitudeMarks): QmlAmplitude | null {
  let best: QmlAmplitude | null = null;
  let bestD = tol;
  for (const a of marks.amplitudes) {
    if (a.time === null || bandOfAmplitude(row, a) !== band) continue;
    const d = Math.abs(t - marks.toView(a.time));
    if (d < bestD) { best = a; bestD = d; }
  }
  return best;
}

/**
 * The window an amplitude pick dropped at `time` (µs) is measured in: ± `halfWidthS` (default
 * 0.25 s, a little more than half the 0.8 s Wood-Anderson period) around it.
 */
export function movedAmplitudeWindow(time: Micros, halfWidthS = 0.25): TimeWindow {
  if (!Number.isFinite(time)) throw new RangeError(`time must be finite µs, got ${time}`);
  if (!(halfWidthS > 0)) throw new RangeError(`half width must be > 0 s, got ${halfWidthS}`);
  const h = Math.round(halfWidthS * 1e6);
  return { start: time - h, end: time + h };
}
