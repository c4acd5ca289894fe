import { describe, expect, it } from 'vitest';
import {
  AmplitudeTool, drawAmplitudes, hitAmplitude, magnitudeSummary, searchHalfWidth, type AmplitudeMarks,
} from '../../../renderer/picks/amplitudeLayer';
import { EMPTY_REVIEW, History, addEvent, type ReviewDocument } from '../../../core/review';
import type { ReviewMagnitude } from '../../../core/review/reviewMagnitude';
import type { QmlAmplitude, QmlMagnitude } from '../../../core/quakeml';
import type { RowMarksContext, SiteRow } from '../../../renderer/traces/traceView';

const T = 1_700_000_000_000_000;
function amp(id: string, channel: string, dt: number): QmlAmplitude {
  return {
    id, value: 1e-6, type: 'IAML', unit: 'm', periodS: null, snr: null, timeWindow: null, time: T + dt * 1e6,
    waveformId: { network: 'XX', station: 'A', location: '00', channel }, pickId: null, magnitudeHint: 'ML', evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  };
}
const row = { key: 'XX.A', label: 'A', components: [{ key: 'XX.A.00.HHZ' }, { key: 'XX.A.00.HHN' }, { key: 'XX.A.00.HHE' }] } as unknown as SiteRow;
const marks: AmplitudeMarks = { amplitudes: [amp('n', 'HHN', 5), amp('e', 'HHE', 5.1), amp('n2', 'HHN', 5.3)], stationMagnitudes: [], selected: null, toView: (t) => (t - T) / 1e6 };

describe('amplitude picks on the traces', () => {
  it('finds the nearest amplitude pick in the pointer band within the tolerance, none in another band or beyond it', () => {
    expect(hitAmplitude(row, 1, 5.12, 0.2, marks)?.id).toBe('n');
    expect(hitAmplitude(row, 1, 5.2, 0.2, marks)?.id).toBe('n2');
    expect(hitAmplitude(row, 2, 5.12, 0.2, marks)?.id).toBe('e');
    expect(hitAmplitude(row, 0, 5, 0.2, marks)).toBeNull();
    expect(hitAmplitude(row, 1, 5.7, 0.2, marks)).toBeNull();
  });
  it('looks for a dropped peak within 5 pixels either side, kept within 0.02-0.25 s', () => {
    expect(searchHalfWidth(0.01)).toBe(0.05);
    expect(searchHalfWidth(0.001)).toBe(0.02);
    expect(searchHalfWidth(0.2)).toBe(0.25);
    expect(() => searchHalfWidth(0)).toThrow('seconds per pixel must be > 0, got 0');
  });
});

describe('AmplitudeTool: pointer and keys to review edits', () => {
  function setup() {
    const added = addEvent(EMPTY_REVIEW, T - 10e6, T + 50e6);
    const history = new History(added.doc);
    const n = amp('XX.A.00.HHN', 'HHN', 5);
    const e = amp('XX.A.00.HHE', 'HHE', 5.1);
    let magnitude: ReviewMagnitude = {
      amplitudes: [n, e], removed: [], stationMagnitudes: [{ id: 's', originId: null, mag: 1.2, type: 'ML', amplitudeId: n.id, waveformId: n.waveformId }],
      magnitude: null, skipped: [], network: null as never,
    };
    let spp = 0.01;
    const tool = new AmplitudeTool({
      event: () => history.doc.events[0], magnitude: () => magnitude, ref: () => T - 10e6, secondsPerPixel: () => spp,
      apply: (edit: (d: ReviewDocument) => ReviewDocument) => { history.apply(edit(history.doc)); return true; },
      redraw: () => {}, status: () => {},
    });
    return { history, tool, n, e, set: (m: Partial<ReviewMagnitude>) => { magnitude = { ...magnitude, ...m }; }, zoom: (s: number) => { spp = s; } };
  }

  it('dragging a mark by 0.3 s records the mark time + 0.3 s and the half-width at this zoom; a click without moving records nothing', () => {
    const { history, tool, n, set } = setup();
    // View seconds count from T - 10 s: the HHN mark (T + 5 s) is at 15 s.
    const row2 = { ...row, key: 'XX.A' } as SiteRow;
    const hit = tool.hit(row2, 1, 15.02)!;
    expect(hit.amplitude.id).toBe(n.id);
    expect(hit.distance).toBeCloseTo(0.02, 12);
    tool.press(hit.amplitude, 15.02);
    tool.release(15.02);
    expect(history.canUndo).toBe(false);
    tool.press(hit.amplitude, 15.02);
    tool.dragTo(15.2);
    expect(tool.marks().drag).toEqual({ channel: 'XX.A.00.HHN', t: 15 + 0.18, halfWidth: 0.05 });
    tool.release(15.32);
    expect(history.doc.events[0].amplitudeEdits).toEqual([{ channel: 'XX.A.00.HHN', kind: 'moved', time: T + 5.3e6, halfWidth: 0.05 }]);
    expect(tool.dragging).toBe(false);
    // Shown where it was dropped until the magnitude measured with the edit arrives, then as measured.
    expect(tool.marks().drag).toEqual({ channel: 'XX.A.00.HHN', t: 15.3, halfWidth: 0.05 });
    set({ amplitudes: [] });
    expect(tool.marks().drag).toBeNull();
  });

  it('V takes the selected amplitude out and puts it back; Shift+V takes every horizontal of the station out, then back', () => {
    const { history, tool, n, e, set } = setup();
    tool.press(n, 15);
    tool.release(15);
    expect(tool.toggleSelected()).toBe(true);
    expect(history.doc.events[0].amplitudeEdits).toEqual([{ channel: 'XX.A.00.HHN', kind: 'removed' }]);
    set({ amplitudes: [e], removed: [{ ...n, evaluationStatus: 'rejected' }] });
    expect(tool.selectedText()).toMatch(/^amplitude XX\.A\.00\.HHN 1\.00e\+3 nm at .* \u00b7 out of ML$/);
    tool.toggleSelected();
    expect(history.doc.events[0].amplitudeEdits).toBeUndefined();
    set({ amplitudes: [n, e], removed: [] });
    tool.toggleStation();
    expect(history.doc.events[0].amplitudeEdits!.map((x) => [x.channel, x.kind])).toEqual([['XX.A.00.HHN', 'removed'], ['XX.A.00.HHE', 'removed']]);
    set({ amplitudes: [], removed: [n, e] });
    tool.toggleStation();
    expect(history.doc.events[0].amplitudeEdits).toBeUndefined();
    tool.clear();
    expect(tool.toggleSelected()).toBe(false);
  });

  it('summarises ML with what the analyst changed', () => {
    const { history, tool, n } = setup();
    const mag: QmlMagnitude = { id: 'm', mag: 1.234, uncertainty: 0.06, type: 'ML', originId: null, stationCount: 3, azimuthalGap: null, contributions: [], evaluationMode: 'manual', evaluationStatus: 'preliminary' };
    const m: ReviewMagnitude = { amplitudes: [], removed: [], stationMagnitudes: [], magnitude: mag, skipped: [], network: null as never };
    expect(magnitudeSummary(m, history.doc.events[0])).toBe('ML 1.2 \u00b1 0.1 (3 stations)');
    tool.press(n, 15);
    tool.release(15);
    tool.toggleStation();
    expect(magnitudeSummary(m, history.doc.events[0])).toBe('ML 1.2 \u00b1 0.1 (3 stations) \u00b7 2 out of ML (A)');
    expect(magnitudeSummary({ ...m, magnitude: null }, null)).toBe('no ML');
    expect(magnitudeSummary(null, null)).toBe('');
  });
});

describe('drawAmplitudes', () => {
  /** A canvas context that records the text drawn and ignores the rest. */
  function recorder(): { ctx: CanvasRenderingContext2D; texts: [string, number][] } {
    const texts: [string, number][] = [];
    const ctx = new Proxy({} as Record<string | symbol, unknown>, {
      get: (t, k) => (k === 'fillText' ? (text: string, x: number) => texts.push([text, x]) : k in t ? t[k] : () => {}),
      set: (t, k, v) => { t[k] = v; return true; },
    }) as unknown as CanvasRenderingContext2D;
    return { ctx, texts };
  }
  const context = (ctx: CanvasRenderingContext2D): RowMarksContext => ({
    row, ctx, left: 0, top: 0, width: 1000, height: 102, pxRatio: 1, xOf: (t) => t * 100, band: (c) => [c * 34, c * 34 + 34],
  });

  it('labels the station magnitude at its channel, struck-out marks "out of ML", and names a channel the row does not show', () => {
    const { ctx, texts } = recorder();
    const hidden = { ...amp('hn', 'HNN', 6), waveformId: { network: 'XX', station: 'A', location: '10', channel: 'HNN' } };
    drawAmplitudes(context(ctx), {
      amplitudes: [amp('n', 'HHN', 5), hidden], removed: [amp('e', 'HHE', 5.1)],
      stationMagnitudes: [{ id: 's1', originId: null, mag: 1.26, type: 'ML', amplitudeId: 'n', waveformId: null }, { id: 's2', originId: null, mag: 1.71, type: 'ML', amplitudeId: 'hn', waveformId: null }],
      selected: null, toView: (t) => (t - T) / 1e6,
    });
    // x = 100 px per second of view time, labels 6 px right of their mark.
    expect(texts).toEqual([['ML 1.3', 506], ['out of ML', 516], ['ML 1.7 (10.HNN)', 606]]);
  });
});
