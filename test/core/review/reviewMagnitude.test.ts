import { describe, expect, it } from 'vitest';
import { magnitudeRead, reviewMagnitude, withMagnitude, type RawPiece } from '../../../core/review/reviewMagnitude';
import { reviewEventsToQuakeMl } from '../../../core/review/export';
import { addEvent, placePick } from '../../../core/review/edits';
import { EMPTY_REVIEW } from '../../../core/review/types';
import { locateReviewEvent, siteLocations } from '../../../core/location';
import { readQuakeMl, writeQuakeMl } from '../../../core/quakeml';
import { channelKey } from '../../../core/model';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { scenarioInventory } from '../../../core/synth/inventory';
import { renderStation, type RenderedChannel } from '../../../core/synth/render';
import { quake, ringStations, tinyScenario } from '../synth/scenarioFixtures';

// Reference: the generator's stated magnitude (core/synth: amplitudes by the IASPEI 2013 ML formula on
// the larger horizontal) and its true arrival times as the analyst's picks.
function reviewCase() {
  const stations = ringStations(7, 20);
  const sc = tinyScenario(stations, [quake('a', 15, 2.3, 7, { strike: 120, dip: 60, rake: 30 }, -2, 4)], 90);
  const inv = scenarioInventory(sc);
  const metas: ChannelMeta[] = inv.networks[0].stations.flatMap((s) => s.channels);
  const byKey = new Map(metas.map((m) => [channelKey(m.id), m]));
  const sites = siteLocations(metas);
  const ev0 = sc.events[0];
  const r = addEvent(EMPTY_REVIEW, ev0.origin - 10e6, ev0.origin + 60e6);
  let d = r.doc;
  const rendered: RenderedChannel[] = [];
  for (const st of stations) {
    const rs = renderStation(sc, st.code);
    rendered.push(...rs.channels);
    const ea = rs.events[0];
    const loc = st.channels[0].location;
    const z = rs.channels.find((c) => c.id.location === loc && c.spec.dip !== 0)!;
    d = placePick(d, r.eventId, { phase: 'P', channel: channelKey(z.id), time: ea.p.time }).doc;
    const h = rs.channels.find((c) => c.id.location === loc && c.spec.dip === 0);
    if (h) d = placePick(d, r.eventId, { phase: 'S', channel: channelKey(h.id), time: ea.s.time }).doc;
  }
  const ev = d.events[0];
  const located = locateReviewEvent(ev, sites, sc.model);
  if (!located.ok) throw new Error(located.message);
  return { sc, d, ev, loc: located.value, metas, byKey, sites, rendered };
}

function piecesOf(rendered: RenderedChannel[], keys: readonly string[], from: number, to: number): RawPiece[] {
  const want = new Set(keys);
  return rendered.filter((c) => want.has(channelKey(c.id))).map((c) => {
    const a = Math.max(0, Math.ceil(((from - c.start) * c.sampleRate) / 1e6));
    const b = Math.min(c.samples.length, Math.floor(((to - c.start) * c.sampleRate) / 1e6));
    return { key: channelKey(c.id), start: c.start + Math.round((a * 1e6) / c.sampleRate), sampleRate: c.sampleRate, samples: Float32Array.from(c.samples.subarray(a, b)), clipped: false };
  });
}

describe('reviewMagnitude on a located review event of the generator (picks at the true arrivals)', () => {
  const c = reviewCase();
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
