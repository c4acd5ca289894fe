import { describe, expect, it } from 'vitest';
import { amplitudeEditWindows, magnitudeRead, reviewMagnitude, withMagnitude } from '../../../core/review/reviewMagnitude';
import { reviewEventsToQuakeMl } from '../../../core/review/export';
import { magnitudesToCsv } from '../../../core/review/magnitudeCsv';
import { moveAmplitude, removeAmplitudes } from '../../../core/review/edits';
import { readQuakeMl, writeQuakeMl } from '../../../core/quakeml';
import { channelKey } from '../../../core/model';
import { magnitudeCase, piecesOf } from '../../support/magnitudeCase';

// Reference: the generator's stated magnitude (test/support/magnitudeCase.ts: core/synth amplitudes by
// the IASPEI 2013 ML formula on the larger horizontal) and its true arrival times as the analyst's picks.
describe('reviewMagnitude on a located review event of the generator (picks at the true arrivals)', () => {
  const c = magnitudeCase();
  it('asks for every horizontal of the located sites over a span holding their windows, and recovers ML 2.3 within 0.2', () => {
    const rd = magnitudeRead(c.ev, c.loc, c.metas, c.sites)!;
    // 6 of the 7 sites have horizontals (T04 is vertical only); T03 has two sensors (HH and HN): 14 channels.
    expect(rd.channels.sort()).toEqual(c.metas.filter((m) => m.dip === 0).map((m) => channelKey(m.id)).sort());
    expect(rd.from).toBeLessThan(c.sc.events[0].origin);
    const m = reviewMagnitude(c.ev, c.loc, piecesOf(c.rendered, rd.channels, rd.from, rd.to), (k) => c.byKey.get(k), c.sites)!;
    expect(m.skipped).toEqual([]);
    expect(Math.abs(m.magnitude!.mag - 2.3)).toBeLessThan(0.2);
    // The S picks set the windows: every amplitude names its site's S pick and is referenced to it.
    const sPick = new Map(c.ev.picks.filter((p) => p.phase === 'S').map((p) => [p.channel.split('.').slice(0, 2).join('.'), p]));
    for (const a of m.amplitudes) {
      const p = sPick.get(`${a.waveformId!.network}.${a.waveformId!.station}`)!;
      expect(a.pickId).toBe(`${c.ev.id}.${p.id}`);
      expect(a.timeWindow!.reference).toBe(p.time);
    }
    // Into QuakeML beside the review's origin: read back the same magnitude, its origin the exported one.
    const qe = withMagnitude(reviewEventsToQuakeMl(c.d, new Map([[c.ev.id, c.loc]]))[0], m);
    const back = readQuakeMl(writeQuakeMl({ events: [qe] }, { authority: 'daybreak.test', agencyId: 'XX', author: 'a', creationTime: 0 }), 'x').events[0];
    expect(back.magnitudes![0].mag).toBe(m.magnitude!.mag);
    expect(back.magnitudes![0].originId).toBe(back.preferredOriginId);
    expect(back.preferredMagnitudeId).toBe(m.magnitude!.id);
  });

  it('leaves out pieces the reader flagged clipped and channels without metadata', () => {
    const rd = magnitudeRead(c.ev, c.loc, c.metas, c.sites)!;
    const pieces = piecesOf(c.rendered, rd.channels, rd.from, rd.to).map((p) => (p.key.startsWith('XX.T00.') ? { ...p, clipped: true } : p));
    const m = reviewMagnitude(c.ev, c.loc, pieces, (k) => (k.startsWith('XX.T01.') ? undefined : c.byKey.get(k)), c.sites)!;
    expect(m.skipped.map((s) => s.why)).toEqual(['no metadata', 'no metadata']);
    expect(m.amplitudes.some((a) => a.waveformId!.station === 'T00' || a.waveformId!.station === 'T01')).toBe(false);
    expect(m.magnitude!.stationCount).toBe(4);
    expect(Math.abs(m.magnitude!.mag - 2.3)).toBeLessThan(0.2);
  });
});

describe('reviewMagnitude with the analyst\'s amplitude edits (same generated event)', () => {
  const c = magnitudeCase();
  const rd = magnitudeRead(c.ev, c.loc, c.metas, c.sites)!;
  const pieces = piecesOf(c.rendered, rd.channels, rd.from, rd.to);
  const metaOf = (k: string) => c.byKey.get(k);
  const base = reviewMagnitude(c.ev, c.loc, pieces, metaOf, c.sites)!;
  const staOf = (key: string) => key.split('.').slice(0, 2).join('.');
  const channelMags = new Map(base.network.stations.flatMap((s) => s.channels.map((ch) => [ch.key, ch.magnitude] as const)));

  it('removing both horizontals of one station takes it out: ML is the median of the other station magnitudes, computed here by hand', () => {
    expect(base.magnitude!.stationCount).toBe(6);
    const gone = 'XX.T02';
    const channels = rd.channels.filter((k) => staOf(k) === gone);
    expect(channels).toHaveLength(2);
    const doc = removeAmplitudes(c.d, c.ev.id, channels);
    const m = reviewMagnitude(doc.events[0], c.loc, pieces, metaOf, c.sites)!;
    // The others' station magnitudes are unchanged; the network value is their median (IASPEI 2013: median of the station values).
    const rest = base.network.stations.filter((s) => s.station !== gone).map((s) => s.magnitude as number).sort((a, b) => a - b);
    expect(rest).toHaveLength(5);
    expect(m.magnitude!.stationCount).toBe(5);
    expect(m.magnitude!.mag).toBeCloseTo(rest[2], 12);
    expect(m.magnitude!.mag).not.toBeCloseTo(base.magnitude!.mag, 6);
    expect(m.stationMagnitudes.map((s) => s.mag).sort((a, b) => a - b)).toEqual(rest);
    // Nothing of the station in the amplitudes; its automatic measurements come back as 'removed' (rejected) for drawing.
    expect(m.amplitudes.some((a) => a.waveformId!.station === 'T02')).toBe(false);
    expect(m.removed.map((a) => [a.id, a.value, a.time, a.evaluationStatus])).toEqual(
      base.amplitudes.filter((a) => a.waveformId!.station === 'T02').map((a) => [a.id, a.value, a.time, 'rejected']));
    expect(m.skipped.filter((s) => s.why === 'removed by the analyst').map((s) => s.key).sort()).toEqual([...channels].sort());
    // A magnitude made from data the analyst chose is manual; untouched amplitudes stay automatic.
    expect(m.magnitude!.evaluationMode).toBe('manual');
    expect(base.magnitude!.evaluationMode).toBe('automatic');
    expect(m.magnitude!.comment).toMatch(/; the analyst took 2 out$/);
    expect(new Set(m.amplitudes.map((a) => a.evaluationMode))).toEqual(new Set(['automatic']));
  });

  it('a moved amplitude is measured again near where it was dropped: the peak of that stretch, a manual amplitude, ML following log10 A', () => {
    // The channel that gives T05 its station magnitude (the larger horizontal), moved into its P coda.
    const st = base.network.stations.find((s) => s.station === 'XX.T05')!;
    const top = st.channels.find((ch) => ch.magnitude === st.magnitude)!;
    const pTime = c.ev.picks.find((p) => p.phase === 'P' && staOf(p.channel) === 'XX.T05')!.time;
    const dropped = pTime + 400_000;
    const doc = moveAmplitude(c.d, c.ev.id, top.key, dropped, 0.1);
    expect(amplitudeEditWindows(doc.events[0]).get(top.key)).toEqual({ start: dropped - 100_000, end: dropped + 100_000 });
    const m = reviewMagnitude(doc.events[0], c.loc, pieces, metaOf, c.sites)!;
    const a = m.amplitudes.find((x) => x.id === base.amplitudes.find((b) => b.time === top.amplitude.time)!.id)!;
    expect(a.evaluationMode).toBe('manual');
    expect(Math.abs(a.time! - dropped)).toBeLessThanOrEqual(100_000);
    // The P coda is smaller than the S peak the automatic window found.
    expect(a.value).toBeLessThan(top.amplitude.amplitudeM / 2);
    // IASPEI 2013 ML = log10(A) + 1.11 log10(R) + 0.00189 R - 2.09 (A in nm): at the same distance the
    // channel magnitude moves by log10(A_new / A_old).
    const newChannel = m.network.stations.find((s) => s.station === 'XX.T05')!.channels.find((ch) => ch.key === top.key)!;
    expect(newChannel.magnitude! - top.magnitude!).toBeCloseTo(Math.log10(a.value / top.amplitude.amplitudeM), 10);
    // The station now takes the larger of its two horizontals.
    const other = st.channels.find((ch) => ch !== top)!;
    expect(m.network.stations.find((s) => s.station === 'XX.T05')!.magnitude).toBeCloseTo(Math.max(newChannel.magnitude!, channelMags.get(other.key)!), 12);
  });

  it('an amplitude dropped on its own peak with a narrow search window keeps the automatic value and time', () => {
    const a0 = base.amplitudes[0];
    const key = `${a0.waveformId!.network}.${a0.waveformId!.station}.${a0.waveformId!.location}.${a0.waveformId!.channel}`;
    const doc = moveAmplitude(c.d, c.ev.id, key, a0.time!, 0.02);
    const m = reviewMagnitude(doc.events[0], c.loc, pieces, metaOf, c.sites)!;
    const a = m.amplitudes.find((x) => x.id === a0.id)!;
    expect([a.value, a.time, a.evaluationMode]).toEqual([a0.value, a0.time, 'manual']);
    expect(m.magnitude!.mag).toBe(base.magnitude!.mag);
  });

  it('reads far enough to measure an amplitude dragged beyond the automatic window', () => {
    const far = rd.to + 20e6;
    const doc = moveAmplitude(c.d, c.ev.id, rd.channels[0], far, 0.5);
    const rd2 = magnitudeRead(doc.events[0], c.loc, c.metas, c.sites)!;
    // The moved window's end plus the 5 s taper margin (and 10 % of the span) is read; the start is not cut.
    expect(rd2.to).toBeGreaterThanOrEqual(far + 500_000 + 5e6);
    expect(rd2.from).toBeLessThanOrEqual(rd.from);
  });

  it('exports reflect the edits: the moved amplitude manual in QuakeML and the magnitudes CSV, the removed station absent from both', () => {
    // T05's larger horizontal, dropped on its own peak (so it stays the station's datum), and T02 removed.
    const st = base.network.stations.find((x) => x.station === 'XX.T05')!;
    const top = st.channels.find((ch) => ch.magnitude === st.magnitude)!;
    const moveKey = top.key;
    const removed = rd.channels.filter((k) => staOf(k) === 'XX.T02');
    let doc = moveAmplitude(c.d, c.ev.id, moveKey, top.amplitude.time + 10_000, 0.03);
    doc = removeAmplitudes(doc, c.ev.id, removed);
    const m = reviewMagnitude(doc.events[0], c.loc, pieces, metaOf, c.sites)!;
    const qe = withMagnitude(reviewEventsToQuakeMl(doc, new Map([[c.ev.id, c.loc]]))[0], m);
    const back = readQuakeMl(writeQuakeMl({ events: [qe] }, { authority: 'daybreak.test', agencyId: 'XX', author: 'a', creationTime: 0 }), 'x').events[0];
    const key = (w: { network: string; station: string; location: string; channel: string }) => `${w.network}.${w.station}.${w.location}.${w.channel}`;
    expect(back.amplitudes!.filter((a) => a.evaluationMode === 'manual').map((a) => key(a.waveformId!))).toEqual([moveKey]);
    expect(back.amplitudes!.some((a) => a.waveformId!.station === 'T02')).toBe(false);
    expect(back.stationMagnitudes!.some((s) => s.id.includes('T02'))).toBe(false);
    expect(back.magnitudes![0]).toMatchObject({ mag: m.magnitude!.mag, stationCount: 5, evaluationMode: 'manual' });
    const rows = magnitudesToCsv([back]).trim().split('\n').slice(2).map((l) => l.split(','));
    expect(rows).toHaveLength(5);
    expect(rows.some((r) => r[9] === 'T02')).toBe(false);
    const t05 = rows.find((r) => r[9] === 'T05')!;
    expect(t05[3]).toBe(String(m.magnitude!.mag));
    // evaluation_mode of a row is its amplitude's: manual for the moved channel only.
    expect([t05[11], t05[24]]).toEqual([moveKey.split('.')[3], 'manual']);
    expect(rows.filter((r) => r[24] === 'manual')).toHaveLength(1);
  });
});
