/**
 * Which sites the event sheet shows, in which order: sites with picks in the open event first, in
 * order of their first pick; then the others by distance from the reference point (nearest first),
 * or by name when there is no reference. The rows can be limited to the first N and to those within
 * a distance of the reference point; the rest are returned as `hidden`, a toggle away.
 *
 * The reference point is the event's epicentre when it is located, else the site with the earliest
 * pick (the first-arriving site), else there is none. Distances are those of the location code's
 * local projection (core/location/projection.ts: ellipsoidal to about 1e-4 within 50 km), in km.
 */
import { localProjection, toLocalKm } from '../../core/location/projection';
import type { SiteLocation } from '../../core/location/fromReview';
import type { Micros } from '../../core/time';
import type { SiteStreams } from '../data/sites';

export interface SheetSite {
  streams: SiteStreams;
  /** Time of the site's first pick in the open event, µs; null when it has none. */
  firstPick: Micros | null;
  /** Distance from the reference point, km; null when either has no coordinates. */
  distanceKm: number | null;
}

export interface SheetLimit {
  /** Most sites shown; 0 for no limit by count. */
  count: number;
  /** Largest distance shown, km; 0 for no limit by distance. Sites of unknown distance are hidden by it. */
  km: number;
}

export interface SheetReference {
  kind: 'epicentre' | 'first-arrival';
  latitude: number;
  longitude: number;
  /** "NET.STA" of the first-arriving site (kind 'first-arrival'). */
  site?: string;
}

export interface SheetSites {
  shown: SheetSite[];
  hidden: SheetSite[];
  reference: SheetReference | null;
}

/** A pick as far as ordering goes: its channel "NET.STA.LOC.CHA" and time in µs. */
export interface SheetPick { channel: string; time: Micros }

const NATURAL = new Intl.Collator('en', { numeric: true });

function siteOf(channel: string): string {
  const f = channel.split('.');
  return `${f[0]}.${f[1]}`;
}

/**
 * Orders and limits `sites` for the sheet. `epicentre` is the open event's located epicentre
 * (degrees) or null; `coords` holds the sites' coordinates ("NET.STA" -> location).
 */
export function sheetSites(
  sites: readonly SiteStreams[], picks: readonly SheetPick[], coords: ReadonlyMap<string, SiteLocation>,
  epicentre: { latitude: number; longitude: number } | null, limit: SheetLimit,
): SheetSites {
  if (!(Number.isInteger(limit.count) && limit.count >= 0)) throw new RangeError(`count limit must be an integer >= 0 (0: none), got ${limit.count}`);
  if (!(limit.km >= 0 && Number.isFinite(limit.km))) throw new RangeError(`distance limit must be a finite number of km >= 0 (0: none), got ${limit.km}`);
  const first = new Map<string, Micros>();
  for (const p of picks) {
    const s = siteOf(p.channel);
    const had = first.get(s);
    if (had === undefined || p.time < had) first.set(s, p.time);
  }
  let reference: SheetReference | null = null;
  if (epicentre) reference = { kind: 'epicentre', latitude: epicentre.latitude, longitude: epicentre.longitude };
  else {
    let best: string | null = null;
    for (const [s, t] of first) if (coords.has(s) && (best === null || t < first.get(best)!)) best = s;
    if (best) reference = { kind: 'first-arrival', latitude: coords.get(best)!.latitude, longitude: coords.get(best)!.longitude, site: best };
  }
  const proj = reference ? localProjection(reference.latitude, reference.longitude) : null;
  const xy = [0, 0];
  const all: SheetSite[] = sites.map((streams) => {
    const c = coords.get(streams.site);
    let distanceKm: number | null = null;
    if (proj && c) {
      toLocalKm(proj, c.latitude, c.longitude, xy);
      distanceKm = Math.hypot(xy[0], xy[1]);
    }
    return { streams, firstPick: first.get(streams.site) ?? null, distanceKm };
  });
  all.sort((a, b) => {
    if (a.firstPick !== null || b.firstPick !== null) {
      if (a.firstPick === null) return 1;
      if (b.firstPick === null) return -1;
      if (a.firstPick !== b.firstPick) return a.firstPick - b.firstPick;
    }
    const da = a.distanceKm ?? Infinity;
    const db = b.distanceKm ?? Infinity;
    if (da !== db) return da - db;
    return NATURAL.compare(a.streams.site, b.streams.site);
  });
  const shown: SheetSite[] = [];
  const hidden: SheetSite[] = [];
  for (const s of all) {
    const far = limit.km > 0 && (s.distanceKm === null || s.distanceKm > limit.km);
    if (far || (limit.count > 0 && shown.length >= limit.count)) hidden.push(s);
    else shown.push(s);
  }
  return { shown, hidden, reference };
}
