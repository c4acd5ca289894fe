/**
 * A generated event for the magnitude tests (core/synth, invented: ML 2.3 under a ring of 7 sites, one
 * vertical-only, one with two sensors), with the analyst's picks at the true P and S arrivals and its
 * location, and the raw pieces a reader would return for a span of channels. The generator's stated
 * magnitude (IASPEI 2013 ML on the larger horizontal) is the reference the tests compare with.
 */
import type { RawPiece } from '../../core/review/reviewMagnitude';
import { addEvent, placePick } from '../../core/review/edits';
import { EMPTY_REVIEW } from '../../core/review/types';
import { locateReviewEvent, siteLocations } from '../../core/location';
import { channelKey } from '../../core/model';
import type { ChannelMeta } from '../../core/stationxml/types';
import { scenarioInventory } from '../../core/synth/inventory';
import { renderStation, type RenderedChannel } from '../../core/synth/render';
import { quake, ringStations, tinyScenario } from '../core/synth/scenarioFixtures';

/** The event, its review document, location, channel metadata (and by key), site coordinates and rendered channels. */
export function magnitudeCase() {
  const stations = ringStations(7, 20);
  const sc = tinyScenario(stations, [quake('a', 15, 2.3, 7, { strike: 120, dip: 60, rake: 30 }, -2, 4)], 90);
  const metas: ChannelMeta[] = scenarioInventory(sc).networks[0].stations.flatMap((s) => s.channels);
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

/** The rendered channels `keys` cut to [from, to) µs, as the reader's unclipped raw pieces. */
export function piecesOf(rendered: readonly RenderedChannel[], keys: readonly string[], from: number, to: number): RawPiece[] {
  const want = new Set(keys);
  return rendered.filter((c) => want.has(channelKey(c.id))).map((c) => {
    const a = Math.max(0, Math.ceil(((from - c.start) * c.sampleRate) / 1e6));
    const b = Math.min(c.samples.length, Math.floor(((to - c.start) * c.sampleRate) / 1e6));
    return { key: channelKey(c.id), start: c.start + Math.round((a * 1e6) / c.sampleRate), sampleRate: c.sampleRate, samples: Float32Array.from(c.samples.subarray(a, b)), clipped: false };
  });
}
