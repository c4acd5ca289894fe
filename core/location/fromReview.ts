/**
 * Location of a reviewed event (core/review): the bridge between the analyst's picks and the
 * locator, and what the review desk draws from a solution.
 *
 * - `locateReviewEvent`: the event's P and S picks located by Geiger's method (geiger.ts), with the
 *   depth held where the analyst fixed it (the event's `fixedDepthKm`, see reviewDepth.ts). A pick's
 *   1-sigma timing uncertainty is the half-width of its interval, (lower + upper) / 2, at least
 *   `minUncertaintyS` (as core/scan does for automatic origins, so both weigh picks alike); picks
 *   whose record flags questionable timing are down-weighted (sigma x QUESTIONABLE_FACTOR) or left
 *   out; rejected picks (status 'rejected') and picks the analyst left out (`excluded`) only get a
 *   residual. Picks at sites without coordinates
 *   are skipped and named. Failures are values with a message for the analyst, never thrown.
 * - `predictedArrivals`: the first P and S at every site from a solution, as absolute times (µs),
 *   for guides on the traces of sites without picks.
 * - `wadatiOfEvent`: the Wadati fit (wadati.ts) of the sites with both a P and an S pick.
 * - `spCircles`: per site with P and S, the epicentral distance from the S-P time (straight rays at
 *   one average speed: D = (tS - tP) Vp / (Vp/Vs - 1), epicentral sqrt(D^2 - h^2)), for the map.
 *
 * Sites are keyed "NET.STA"; a pick's site is the first two fields of its channel "NET.STA.LOC.CHA".
 */
import type { Micros } from '../time';
import type { ReviewEvent, ReviewPick } from '../review/types';
import type { ChannelMeta } from '../stationxml/types';
import {
  azimuthDeg, locate, type GeigerOptions, type Hypocentre, type LocateFailure, type LocationPick, type LocationStation,
} from './geiger';
import { firstArrival } from './travelTime';
import type { VelocityModel } from './velocityModel';
import { localProjection, toLocalKm } from './projection';
import { spEpicentralKm, spHypocentralKm, wadati, type WadatiPoint, type WadatiResult } from './wadati';

/** Where a site is: degrees north and east (WGS84), elevation in metres above the model's datum. */
export interface SiteLocation {
  readonly latitude: number;
  readonly longitude: number;
  /** Metres above the model's datum (sea level for StationXML elevations). */
  readonly elevation: number;
}

export interface ReviewLocateOptions {
  /**
   * Hold the depth here, km below the datum ("operator assigned" depth); null: solve for it even
   * when the event holds a depth. Default: the event's own `fixedDepthKm` (set by the analyst).
   */
  fixedDepthKm?: number | null;
  /** Picks with questionable timing: 'downweight' (default, sigma x 3) or 'exclude'. */
  questionableTiming?: 'downweight' | 'exclude';
  /** Smallest 1-sigma timing uncertainty given to a pick, s (default 0.001). */
  minUncertaintyS?: number;
  maxIterations?: number;
  /** Depth limits, km below the datum (see GeigerOptions). */
  minDepthKm?: number;
  maxDepthKm?: number;
}

/** One review pick's part in a solution. */
export interface ReviewArrival {
  pickId: string;
  /** "NET.STA". */
  site: string;
  wave: 'P' | 'S';
  /** The model's first arrival ('Pg', 'Pn', 'S1', ...). */
  modelPhase: string;
  used: boolean;
  /** Observed minus computed, s. */
  residualS: number;
  /** Relative weight in the solution, 0 to 1 (0 when not used). */
  weight: number;
  /** Epicentral distance, km; azimuth from the epicentre to the site, degrees clockwise from north. */
  distanceKm: number;
  azimuthDeg: number;
}

export interface SkippedPick {
  pickId: string;
  site: string;
  reason: string;
}

export interface ReviewLocation {
  hypocentre: Hypocentre;
  /** One per located pick, in the event's pick order. */
  arrivals: ReviewArrival[];
  /** Picks not given to the locator (site without coordinates). */
  skipped: SkippedPick[];
}

export type ReviewLocateFailure = LocateFailure | 'unknown-stations';
export type ReviewLocateResult =
  | { ok: true; value: ReviewLocation }
  | { ok: false; code: ReviewLocateFailure; message: string; skipped: SkippedPick[] };

/**
 * Site coordinates ("NET.STA" -> latitude, longitude, elevation in m) from StationXML channel
 * epochs (core/stationxml); the first epoch given for a site wins (undefined entries are skipped).
 */
export function siteLocations(metas: Iterable<ChannelMeta | undefined>): Map<string, SiteLocation> {
  const out = new Map<string, SiteLocation>();
  for (const m of metas) {
    if (!m) continue;
    const key = `${m.id.network}.${m.id.station}`;
    if (!out.has(key)) out.set(key, { latitude: m.latitude, longitude: m.longitude, elevation: m.elevation });
  }
  return out;
}

/** "NET.STA" of a channel "NET.STA.LOC.CHA". Throws a RangeError naming the value when it has not four fields. */
export function siteOfChannel(channel: string): string {
  const f = typeof channel === 'string' ? channel.split('.') : [];
  if (f.length !== 4 || !f[0] || !f[1]) throw new RangeError(`channel must be "NET.STA.LOC.CHA", got ${JSON.stringify(channel)}`);
  return `${f[0]}.${f[1]}`;
}

function checkSite(key: string, s: SiteLocation): void {
  if (!(s.latitude >= -90 && s.latitude <= 90 && s.longitude >= -180 && s.longitude <= 360 && Math.abs(s.elevation) <= 10_000)) {
    throw new RangeError(`site ${key}: latitude in [-90, 90], longitude in [-180, 360] degrees and elevation in [-10000, 10000] m required, got (${s.latitude}, ${s.longitude}, ${s.elevation})`);
  }
}

/**
 * Locates a reviewed event from its picks. Bad arguments (malformed channels, coordinates out of
 * range, a bad option) throw; an event that cannot be located returns {ok: false} with a message.
 */
export function locateReviewEvent(
  event: ReviewEvent, stations: ReadonlyMap<string, SiteLocation>, model: VelocityModel, options: ReviewLocateOptions = {},
): ReviewLocateResult {
  const minSigma = options.minUncertaintyS ?? 0.001;
  if (!(minSigma > 0 && minSigma <= 10)) throw new RangeError(`minUncertaintyS must be in (0, 10] s, got ${minSigma}`);
  const locStations: LocationStation[] = [];
  const seen = new Set<string>();
  const picks: LocationPick[] = [];
  const ids: ReviewPick[] = [];
  const skipped: SkippedPick[] = [];
  for (const p of event.picks) {
    const site = siteOfChannel(p.channel);
    const s = stations.get(site);
    if (!s) {
      skipped.push({ pickId: p.id, site, reason: `no coordinates for site ${site}` });
      continue;
    }
    if (!seen.has(site)) {
      checkSite(site, s);
      seen.add(site);
      locStations.push({ key: site, latDeg: s.latitude, lonDeg: s.longitude, elevKm: s.elevation / 1000 });
    }
    if (!(p.lower >= 0 && p.upper >= 0)) throw new RangeError(`pick ${p.id}: lower and upper uncertainty must be >= 0 s, got ${p.lower}, ${p.upper}`);
    picks.push({
      stationKey: site, wave: p.phase, time: p.time,
      uncertaintyS: Math.min(100, Math.max(minSigma, (p.lower + p.upper) / 2)),
      use: p.status !== 'rejected' && !p.excluded,
      timingQuestionable: p.questionableTiming,
    });
    ids.push(p);
  }
  const geiger: GeigerOptions = {
    model, fixedDepthKm: options.fixedDepthKm === undefined ? event.fixedDepthKm : options.fixedDepthKm ?? undefined, questionableTiming: options.questionableTiming,
    maxIterations: options.maxIterations, minDepthKm: options.minDepthKm, maxDepthKm: options.maxDepthKm,
  };
  const r = locate(locStations, picks, geiger);
  if (!r.ok) {
    const missing = [...new Set(skipped.map((s) => s.site))];
    if (r.code === 'too-few-phases' && missing.length > 0) {
      return { ok: false, code: 'unknown-stations', message: `${r.message}; ${skipped.length} pick${skipped.length === 1 ? ' is' : 's are'} at sites without coordinates (${missing.join(', ')})`, skipped };
    }
    return { ok: false, code: r.code, message: r.message, skipped };
  }
  const h = r.value;
  const arrivals: ReviewArrival[] = h.arrivals.map((a) => ({
    pickId: ids[a.pickIndex].id, site: a.stationKey, wave: a.wave, modelPhase: a.phase, used: a.used,
    residualS: a.residualS, weight: a.weight, distanceKm: a.distanceKm, azimuthDeg: a.azimuthDeg,
  }));
  return { ok: true, value: { hypocentre: h, arrivals, skipped } };
}

/** A solution's position and time: what predictedArrivals needs (a Hypocentre fits). */
export interface OriginPoint {
  originTime: Micros;
  latDeg: number;
  lonDeg: number;
  /** km below the datum. */
  depthKm: number;
}

export interface PredictedArrival {
  site: string;
  /** Epicentral distance, km; azimuth from the epicentre, degrees clockwise from north. */
  distanceKm: number;
  azimuthDeg: number;
  /** First P and S arrival times, integer µs since the epoch. */
  p: Micros;
  s: Micros;
  /** The model's first-arrival names ('Pg', 'Pn', ...). */
  pPhase: string;
  sPhase: string;
}

/**
 * Predicted first P and S times at every site, from an origin. Distances are measured in a local
 * azimuthal equidistant projection centred on the epicentre (projection.ts), which gives the
 * geodesic distance from its centre to within about 1e-4 of it over a local network.
 */
export function predictedArrivals(origin: OriginPoint, stations: ReadonlyMap<string, SiteLocation>, model: VelocityModel): Map<string, PredictedArrival> {
  if (!Number.isSafeInteger(origin.originTime)) throw new RangeError(`originTime must be integer microseconds, got ${origin.originTime}`);
  if (!(Math.abs(origin.depthKm) <= 1000)) throw new RangeError(`depthKm must be in [-1000, 1000] km, got ${origin.depthKm}`);
  const proj = localProjection(origin.latDeg, origin.lonDeg);
  const xy = [0, 0];
  const out = new Map<string, PredictedArrival>();
  for (const [site, s] of stations) {
    checkSite(site, s);
    toLocalKm(proj, s.latitude, s.longitude > 180 ? s.longitude - 360 : s.longitude, xy);
    const d = Math.hypot(xy[0], xy[1]);
    const tp = firstArrival(model, 'P', d, origin.depthKm, s.elevation / 1000);
    const ts = firstArrival(model, 'S', d, origin.depthKm, s.elevation / 1000);
    out.set(site, {
      site, distanceKm: d, azimuthDeg: azimuthDeg(origin.latDeg, origin.lonDeg, s.latitude, s.longitude),
      p: origin.originTime + Math.round(tp.time * 1e6), s: origin.originTime + Math.round(ts.time * 1e6),
      pPhase: tp.phase, sPhase: ts.phase,
    });
  }
  return out;
}

/**
 * The P and S pick of each site that has both, for the Wadati diagram and the S-P circles. Rejected
 * and excluded picks are left out; of several picks of one phase at a site, the one with the
 * narrowest interval wins (then the earlier). Sites in order of their P time.
 */
export function spPairs(event: ReviewEvent): WadatiPoint[] {
  const best = new Map<string, { P?: ReviewPick; S?: ReviewPick }>();
  for (const p of event.picks) {
    if (p.status === 'rejected' || p.excluded) continue;
    const site = siteOfChannel(p.channel);
    const entry = best.get(site) ?? {};
    const cur = entry[p.phase];
    const w = p.lower + p.upper;
    if (!cur || w < cur.lower + cur.upper || (w === cur.lower + cur.upper && p.time < cur.time)) entry[p.phase] = p;
    best.set(site, entry);
  }
  const out: WadatiPoint[] = [];
  for (const [site, e] of best) if (e.P && e.S) out.push({ stationKey: site, pTime: e.P.time, sTime: e.S.time });
  return out.sort((a, b) => a.pTime - b.pTime);
}

/** The Wadati fit (Vp/Vs, origin time) of an event's sites with both P and S (see spPairs). */
export function wadatiOfEvent(event: ReviewEvent): WadatiResult {
  return wadati(spPairs(event));
}

/**
 * Average P and S speeds along a vertical path from the datum down to `depthKm`, km/s (total depth
 * over total vertical travel time, i.e. the depth-weighted harmonic mean of the layers crossed); the
 * top layer's speeds for a source at or above the datum. The straight-ray speeds for spCircles.
 */
export function verticalAverageSpeeds(model: VelocityModel, depthKm: number): { vp: number; vs: number } {
  if (!(Math.abs(depthKm) <= 1000)) throw new RangeError(`depthKm must be in [-1000, 1000] km, got ${depthKm}`);
  const L = model.layers;
  if (depthKm <= 0) return { vp: L[0].vp, vs: L[0].vs };
  let tp = 0;
  let ts = 0;
  for (let i = 0; i < L.length; i++) {
    const top = L[i].topKm;
    const bottom = i + 1 < L.length ? L[i + 1].topKm : Infinity;
    const dz = Math.min(bottom, depthKm) - Math.max(top, 0);
    if (dz <= 0) continue;
    tp += dz / L[i].vp;
    ts += dz / L[i].vs;
  }
  return { vp: depthKm / tp, vs: depthKm / ts };
}

export interface SpCircle {
  site: string;
  /** S-P time, s. */
  spS: number;
  /** Hypocentral and epicentral distance, km. */
  hypocentralKm: number;
  epicentralKm: number;
}

/**
 * Epicentral distance circles from S-P times: D = (tS - tP) vp / (vpVs - 1) (straight rays at one
 * speed; common practice), epicentral sqrt(D^2 - h^2) with h the source depth below the site
 * (depth plus the site's elevation), 0 when D < h. vp in km/s; vpVs > 1; depthKm below the datum.
 * Sites without coordinates are left out.
 */
export function spCircles(
  event: ReviewEvent, stations: ReadonlyMap<string, SiteLocation>, speeds: { vp: number; vpVs: number; depthKm: number },
): SpCircle[] {
  const { vp, vpVs, depthKm } = speeds;
  if (!(vp > 0 && vp < 20)) throw new RangeError(`vp must be in (0, 20) km/s, got ${vp}`);
  if (!(vpVs > 1 && vpVs < 10)) throw new RangeError(`vpVs must be in (1, 10), got ${vpVs}`);
  if (!(Math.abs(depthKm) <= 1000)) throw new RangeError(`depthKm must be in [-1000, 1000] km, got ${depthKm}`);
  const out: SpCircle[] = [];
  for (const pair of spPairs(event)) {
    const s = stations.get(pair.stationKey);
    if (!s) continue;
    const sp = Math.max(0, (pair.sTime - pair.pTime) / 1e6);
    const D = spHypocentralKm(sp, vp, vpVs);
    out.push({ site: pair.stationKey, spS: sp, hypocentralKm: D, epicentralKm: spEpicentralKm(D, depthKm + s.elevation / 1000) });
  }
  return out;
}
