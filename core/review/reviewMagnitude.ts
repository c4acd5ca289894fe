/**
 * The local magnitude of a review event, for the desk and its export: what to read (the horizontals
 * of the located event's sites over their amplitude windows plus a margin for the response-removal
 * taper), and the magnitude from the raw pieces read (core/magnitude eventMagnitude), with the
 * event's P and S picks setting the windows where the analyst placed them and the analyst's
 * amplitude edits (the event's `amplitudeEdits`) applied. Pieces flagged clipped give no magnitude.
 *
 * A moved amplitude is measured again, not taken from where the mark was dropped: the channel's
 * raw counts go through the same response removal and Wood-Anderson simulation as the automatic
 * measurement, and the peak (the largest |deflection| for the zero-to-peak measure) is looked for
 * only within ±halfWidth of the dropped time. The desk sets halfWidth from its zoom (a few pixels
 * either side of the pointer), so the mark lands on the Wood-Anderson peak of the swing the analyst
 * dropped it on, not on the largest swing of the whole window. The traces on screen are the
 * band-passed counts, whose extrema sit within a fraction of a period of the Wood-Anderson ones.
 */
import { parseChannelKey, stationKey } from '../model';
import type { Micros } from '../time';
import type { ChannelMeta } from '../stationxml/types';
import type { QmlEvent } from '../quakeml/types';
import type { ReviewLocation, SiteLocation } from '../location/fromReview';
import { channelResponse } from '../magnitude/response';
import type { TimeWindow } from '../magnitude/amplitude';
import type { HorizontalTrace } from '../magnitude/localMagnitude';
import {
  eventMagnitude, magnitudeOrigin, stationWindows, type EventMagnitude, type EventMagnitudeOptions, type MagnitudeOrigin, type MagnitudeStation,
} from '../magnitude/eventMagnitude';
import { reviewOrigin } from './export';
import type { ReviewEvent } from './types';
import type { QmlAmplitude } from '../quakeml/types';

/** The review's magnitude: the event magnitude plus the automatic amplitudes the analyst removed (for drawing). */
export interface ReviewMagnitude extends EventMagnitude {
  /**
   * The automatic measurement of each channel whose amplitude the analyst removed (evaluationStatus
   * rejected); none of them counts in the magnitude, and none is exported.
   */
  readonly removed: QmlAmplitude[];
}

/**
 * The event's amplitude edits as eventMagnitude takes them, by channel key: a moved amplitude's
 * search window (time ± halfWidth), or null for a removed one.
 */
export function amplitudeEditWindows(ev: ReviewEvent): Map<string, TimeWindow | null> {
  const out = new Map<string, TimeWindow | null>();
  for (const e of ev.amplitudeEdits ?? []) {
    if (e.kind === 'removed') { out.set(e.channel, null); continue; }
    const h = Math.round(e.halfWidth * 1e6);
    out.set(e.channel, { start: e.time - h, end: e.time + h });
  }
  return out;
}

/** A continuous run of raw counts of one channel, as the desk's window reader gives it. */
export interface RawPiece {
  /** "NET.STA.LOC.CHA". */
  readonly key: string;
  /** Time of samples[0], µs. */
  readonly start: Micros;
  readonly sampleRate: number;
  readonly samples: Float32Array | Float64Array | Int32Array;
  /** True when the reader saw the counts sit at their peak (clipped). */
  readonly clipped: boolean;
}

/** What to read for a review event's magnitude. */
export interface MagnitudeRead {
  /** Horizontal channel keys of the sites to measure. */
  readonly channels: string[];
  readonly from: Micros;
  readonly to: Micros;
}

/** Horizontals: channels whose dip is within 30° of horizontal (common practice for "1", "2", "N", "E"). */
function isHorizontal(meta: ChannelMeta): boolean {
  return meta.dip !== null && Math.abs(meta.dip) < 30;
}

function picksByStation(ev: ReviewEvent): Map<string, { p?: Micros; s?: Micros; sId?: string }> {
  const out = new Map<string, { p?: Micros; s?: Micros; sId?: string }>();
  for (const p of ev.picks) {
    const k = stationKey(parseChannelKey(p.channel));
    const e = out.get(k) ?? {};
    if (p.phase === 'P' && (e.p === undefined || p.time < e.p)) e.p = p.time;
    if (p.phase === 'S' && (e.s === undefined || p.time < e.s)) { e.s = p.time; e.sId = `${ev.id}.${p.id}`; }
    out.set(k, e);
  }
  return out;
}

/** The review event's origin for the magnitude (the exported origin's id), or null when it has none. */
export function reviewMagnitudeOrigin(ev: ReviewEvent, loc: ReviewLocation): MagnitudeOrigin | null {
  const o = reviewOrigin(ev, loc);
  return o ? magnitudeOrigin(o) : null;
}

/**
 * Channels and span to read: every horizontal in `metas` at a site in `sites`, from 10 % of the span
 * plus 5 s before the earliest noise window to as much after the latest amplitude window.
 */
export function magnitudeRead(
  ev: ReviewEvent, loc: ReviewLocation, metas: readonly ChannelMeta[], sites: ReadonlyMap<string, SiteLocation>,
): MagnitudeRead | null {
  const origin = reviewMagnitudeOrigin(ev, loc);
  if (!origin) return null;
  const picked = picksByStation(ev);
  const channels: string[] = [];
  let lo = Infinity, hi = -Infinity;
  for (const m of metas) {
    if (!isHorizontal(m)) continue;
    const sk = stationKey(m.id);
    const site = sites.get(sk);
    if (!site) continue;
    const pk = picked.get(sk) ?? {};
    const w = stationWindows(origin, { position: { latitude: site.latitude, longitude: site.longitude, elevationM: site.elevation }, p: pk.p ?? null, s: pk.s ?? null });
    channels.push(`${sk}.${m.id.location}.${m.id.channel}`);
    lo = Math.min(lo, w.noise.start);
    hi = Math.max(hi, w.window.end);
  }
  if (channels.length === 0) return null;
  // A moved amplitude's search window may lie outside the automatic window.
  for (const w of amplitudeEditWindows(ev).values()) {
    if (w) { lo = Math.min(lo, w.start); hi = Math.max(hi, w.end); }
  }
  const margin = Math.round(0.1 * (hi - lo)) + 5e6;
  return { channels, from: lo - margin, to: hi + margin };
}

/**
 * The event's magnitude from raw `pieces` (the longest piece per channel is used). `metaOf` gives a
 * channel's metadata by key; channels without metadata or a usable response are left out (listed in
 * `skipped`). `edits` are amplitude edits as eventMagnitude takes them; by default the event's own
 * (`amplitudeEditWindows(ev)`). When any edit applies, the network magnitude is manual (the
 * analyst chose its data); amplitudes not edited stay as `opts` says (automatic by default).
 */
export function reviewMagnitude(
  ev: ReviewEvent, loc: ReviewLocation, pieces: readonly RawPiece[], metaOf: (key: string) => ChannelMeta | undefined,
  sites: ReadonlyMap<string, SiteLocation>, edits?: ReadonlyMap<string, TimeWindow | null>, opts: Omit<EventMagnitudeOptions, 'amplitudeEdits' | 'idPrefix'> = {},
): ReviewMagnitude | null {
  const amplitudeEdits = edits ?? amplitudeEditWindows(ev);
  const origin = reviewMagnitudeOrigin(ev, loc);
  if (!origin) return null;
  const longest = new Map<string, RawPiece>();
  for (const p of pieces) {
    const cur = longest.get(p.key);
    if (!cur || p.samples.length > cur.samples.length) longest.set(p.key, p);
  }
  const picked = picksByStation(ev);
  const byStation = new Map<string, HorizontalTrace[]>();
  const skipped: { key: string; why: string }[] = [];
  for (const [key, p] of longest) {
    const meta = metaOf(key);
    if (!meta) { skipped.push({ key, why: 'no metadata' }); continue; }
    if (!isHorizontal(meta)) continue;
    let response;
    try { response = channelResponse(meta); } catch (e) { skipped.push({ key, why: e instanceof Error ? e.message : String(e) }); continue; }
    const sk = stationKey(meta.id);
    const list = byStation.get(sk) ?? [];
    list.push({ channel: meta.id, counts: p.samples, sampleRate: p.sampleRate, start: p.start, response, clipped: p.clipped });
    byStation.set(sk, list);
  }
  const stations: MagnitudeStation[] = [];
  for (const [sk, traces] of byStation) {
    const site = sites.get(sk);
    if (!site) { for (const t of traces) skipped.push({ key: `${sk}.${t.channel.location}.${t.channel.channel}`, why: 'no site position' }); continue; }
    const pk = picked.get(sk) ?? {};
    stations.push({
      position: { latitude: site.latitude, longitude: site.longitude, elevationM: site.elevation }, traces,
      p: pk.p ?? null, s: pk.s ?? null, sPickId: pk.sId ?? null,
    });
  }
  const idPrefix = `${ev.id}.ml`;
  const r = eventMagnitude(origin, stations, { ...opts, amplitudeEdits, idPrefix });
  // The removed channels measured as if untouched, only to draw them (struck out) where they were.
  const removedKeys = new Set([...amplitudeEdits].filter(([, w]) => w === null).map(([k]) => k));
  let removed: QmlAmplitude[] = [];
  if (removedKeys.size > 0) {
    const only = stations
      .map((st) => ({ ...st, traces: st.traces.filter((t) => removedKeys.has(`${stationKey(t.channel)}.${t.channel.location}.${t.channel.channel}`)) }))
      .filter((st) => st.traces.length > 0);
    removed = eventMagnitude(origin, only, { ...opts, idPrefix }).amplitudes.map((a) => ({ ...a, evaluationStatus: 'rejected' }));
  }
  let magnitude = r.magnitude;
  if (magnitude && amplitudeEdits.size > 0) {
    const out = removedKeys.size, moved = amplitudeEdits.size - out;
    const said = [moved ? `moved ${moved} amplitude${moved > 1 ? 's' : ''} (measured again where dropped)` : '', out ? `took ${out} out` : ''].filter(Boolean).join(' and ');
    magnitude = { ...magnitude, evaluationMode: 'manual', comment: `${magnitude.comment ? `${magnitude.comment}; ` : ''}the analyst ${said}` };
  }
  return { ...r, magnitude, skipped: [...skipped, ...r.skipped], removed };
}

/** `qe` with the magnitude's amplitudes, station magnitudes and (when there is one) preferred magnitude. */
export function withMagnitude(qe: QmlEvent, m: EventMagnitude | null): QmlEvent {
  if (!m) return qe;
  return {
    ...qe, amplitudes: m.amplitudes, stationMagnitudes: m.stationMagnitudes,
    ...(m.magnitude ? { magnitudes: [m.magnitude], preferredMagnitudeId: m.magnitude.id } : {}),
  };
}
