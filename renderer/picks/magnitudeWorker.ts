/**
 * The open event's local magnitude, computed off the interface thread: response removal and
 * Wood-Anderson simulation of every horizontal take 10-20 ms per channel, which on the interface
 * thread would hold up drawing and the pointer for a second at a dozen stations. The worker keeps
 * the last raw pieces it was sent, so an edit that does not change what is read (an amplitude moved
 * or removed) sends only the event.
 */
import { reviewMagnitude } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { SiteLocation } from '../../core/location/fromReview';
import type { MagnitudeData, MagnitudeReply, MagnitudeRequest } from './magnitudeProtocol';

let held: { data: MagnitudeData; metaOf: Map<string, ChannelMeta>; sites: Map<string, SiteLocation> } | null = null;

const post = (msg: MagnitudeReply) => (self as unknown as Worker).postMessage(msg);

self.onmessage = (e: MessageEvent<MagnitudeRequest>) => {
  const req = e.data;
  if (req.data) {
    const metaOf = new Map(req.data.metas.map((m) => [`${m.id.network}.${m.id.station}.${m.id.location}.${m.id.channel}`, m]));
    held = { data: req.data, metaOf, sites: new Map(req.data.sites) };
  }
  if (!held || held.data.readKey !== req.readKey) {
    post({ id: req.id, ok: false, message: 'pieces not held', stale: true });
    return;
  }
  try {
    const t0 = performance.now();
    const h = held;
    const value = reviewMagnitude(req.ev, req.loc, h.data.pieces, (k) => h.metaOf.get(k), h.sites, undefined, { evaluationStatus: req.evaluationStatus });
    post({ id: req.id, ok: true, value, ms: performance.now() - t0 });
  } catch (err) {
    post({ id: req.id, ok: false, message: err instanceof Error ? err.message : String(err), stale: false });
  }
};
