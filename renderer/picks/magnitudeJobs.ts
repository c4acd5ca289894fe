/**
 * What the magnitude worker does, as a plain class (so tests can run it without a worker): holds the
 * channels' metadata and the sites, and the open event's raw pieces, and answers each request with
 * core/review/reviewMagnitude.
 */
import { reviewMagnitude, type RawPiece } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { SiteLocation } from '../../core/location/fromReview';
import type { MagnitudeReply, MagnitudeRequest } from './magnitudeProtocol';

export class MagnitudeJobs {
  private context: { key: number; metaOf: Map<string, ChannelMeta>; sites: Map<string, SiteLocation> } | null = null;
  private held: { readKey: string; pieces: RawPiece[] } | null = null;

  answer(req: MagnitudeRequest): MagnitudeReply {
    if (req.context) {
      const metaOf = new Map(req.context.metas.map((m) => [`${m.id.network}.${m.id.station}.${m.id.location}.${m.id.channel}`, m]));
      this.context = { key: req.context.key, metaOf, sites: new Map(req.context.sites) };
    }
    const p = req.pieces;
    if (p.kind === 'hold') this.held = { readKey: p.readKey, pieces: p.pieces };
    const c = this.context;
    if (!c || c.key !== req.contextKey) return { id: req.id, ok: false, message: 'metadata not held', stale: true };
    const pieces = p.kind === 'once' ? p.pieces : this.held && this.held.readKey === p.readKey ? this.held.pieces : null;
    if (!pieces) return { id: req.id, ok: false, message: 'pieces not held', stale: true };
    try {
      const t0 = performance.now();
      const value = reviewMagnitude(req.ev, req.loc, pieces, (k) => c.metaOf.get(k), c.sites, undefined, { evaluationStatus: req.evaluationStatus });
      return { id: req.id, ok: true, value, ms: performance.now() - t0 };
    } catch (err) {
      return { id: req.id, ok: false, message: err instanceof Error ? err.message : String(err), stale: false };
    }
  }
}
