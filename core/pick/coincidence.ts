/**
 * Network coincidence: station triggers that agree in time become candidate events.
 *
 * Consistency rule: P can reach station j no later than d_ij / vMin after it reaches station i, where
 * d_ij is their distance and vMin the slowest P velocity anywhere along the way (Fermat: the first
 * arrival's travel time is at most that of the straight path, and that is at most d_ij / vMin). So two
 * triggers belong together when |t_i - t_j| <= d_ij / vMin + slack, `slack` covering how late a trigger
 * comes after its onset (about the STA window) and clock error. The largest such difference across the
 * network is aperture / vMin + slack, where aperture is the largest station distance.
 *
 * Grouping (deterministic, independent of input order): triggers are sorted by on-time (then by channel
 * key). Each trigger not yet used seeds a group; later triggers, each from a site not yet in the
 * group, join when they are consistent with every member; the search stops at seed + aperture / vMin +
 * slack. A group with at least `minSites` sites is a candidate event and its triggers are used; later
 * triggers of its sites that start before the last member's off time plus that same largest move-out
 * are kept as `secondary` (e.g. S triggers, which reach the far sites later) and are used too, so they
 * cannot seed an event of their own. A group
 * that is too small uses nothing: its seed may be a noise trigger, and the next trigger seeds afresh.
 *
 * Identifiers: `${network}.${YYYYMMDDThhmmss}` from the earliest member trigger's on-time
 * rounded down to a grid of `idGrid` seconds (default 1 s); events falling in the same grid cell get
 * "b", "c", ... in time order. A re-scan gives the same identifier as long as the earliest trigger
 * stays in the same grid cell; to keep identifiers across a re-scan in which late data add an earlier
 * trigger, pass the earlier scan's events as `previous`: a new event whose member on-times overlap a
 * previous event's span [time, last member on-time] (within `slack`) takes that event's identifier.
 *
 * A second event seconds after another joins the first one's candidate (as members at sites the first
 * did not reach, as secondary triggers at the others); once the candidate is located,
 * `unexplainedTriggers` gives the triggers its origin does not explain, for the coincidence again.
 */
import { stationKey, channelKey } from '../model';
import { isoFromMicros, type Micros } from '../time';
import type { CandidateEvent, StationTrigger } from './types';

/** Station position: flat coordinates in km, or geographic in degrees. */
export type SitePosition = { readonly x: number; readonly y: number } | { readonly latitude: number; readonly longitude: number };

export interface CoincidenceOptions {
  /** Sites that must agree, at least 1 (default 3). */
  readonly minSites: number;
  /** Slowest P velocity the rule allows, km/s (default 3.0: near-surface rock; smaller is safer). */
  readonly vMin: number;
  /** Extra seconds allowed between two triggers (default 1.0: trigger delay and clock error). */
  readonly slack: number;
  /** Network code used in identifiers. */
  readonly network: string;
  /** Grid of the identifier's time, seconds (default 1). */
  readonly idGrid: number;
  /** Events of an earlier scan of the same span, whose identifiers are reused (see the module comment). */
  readonly previous?: readonly CandidateEvent[];
  /** Identifiers already given to other events, which new ones skip (a suffix letter is added). */
  readonly reserved?: ReadonlySet<string>;
}

export const DEFAULT_COINCIDENCE: Omit<CoincidenceOptions, 'network'> = Object.freeze({
  minSites: 3,
  vMin: 3.0,
  slack: 1.0,
  idGrid: 1,
});

const EARTH_RADIUS_KM = 6371.0; // mean radius (IUGG)

/** Distance between two positions, km: Euclidean for flat ones, great-circle (haversine) for geographic. */
export function siteDistanceKm(a: SitePosition, b: SitePosition): number {
  if ('x' in a && 'x' in b) return Math.hypot(a.x - b.x, a.y - b.y);
  if ('latitude' in a && 'latitude' in b) {
    const rad = Math.PI / 180;
    const p1 = a.latitude * rad;
    const p2 = b.latitude * rad;
    const dp = p2 - p1;
    const dl = (b.longitude - a.longitude) * rad;
    const h = Math.sin(dp / 2) ** 2 + Math.cos(p1) * Math.cos(p2) * Math.sin(dl / 2) ** 2;
    return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(h)));
  }
  throw new TypeError('site positions must all be flat {x, y} (km) or all geographic {latitude, longitude} (degrees)');
}

/** "YYYYMMDDThhmmss" of t rounded down to a grid of `grid` seconds. */
export function idTime(t: number, grid: number): string {
  const g = Math.round(grid * 1e6);
  const q = Math.floor(t / g) * g;
  const iso = isoFromMicros(q); // 2026-12-02T03:29:24.000000Z
  return iso.slice(0, 4) + iso.slice(5, 7) + iso.slice(8, 10) + 'T' + iso.slice(11, 13) + iso.slice(14, 16) + iso.slice(17, 19);
}

/**
 * Groups station triggers into candidate events. `positions` maps "NET.STA" to the site's position;
 * triggers of sites without a position are left out (the caller reports them).
 */
export function coincidence(
  triggers: readonly StationTrigger[], positions: ReadonlyMap<string, SitePosition>,
  options: Partial<CoincidenceOptions> & { network: string },
): CandidateEvent[] {
  const o: CoincidenceOptions = { ...DEFAULT_COINCIDENCE, ...options };
  if (!Number.isInteger(o.minSites) || o.minSites < 1) throw new RangeError(`minSites must be an integer >= 1, got ${o.minSites}`);
  if (!(o.vMin > 0 && Number.isFinite(o.vMin))) throw new RangeError(`vMin (km/s) must be > 0, got ${o.vMin}`);
  if (!(o.slack >= 0 && Number.isFinite(o.slack))) throw new RangeError(`slack (s) must be >= 0, got ${o.slack}`);
  if (!(o.idGrid > 0 && Number.isFinite(o.idGrid))) throw new RangeError(`idGrid (s) must be > 0, got ${o.idGrid}`);
  if (typeof o.network !== 'string' || !/^[A-Za-z0-9_-]{1,16}$/.test(o.network)) {
    throw new RangeError(`network must be 1-16 letters, digits, "_" or "-", got "${String(o.network)}"`);
  }
  const list = triggers
    .filter((t) => positions.has(stationKey(t.id)))
    .slice()
    .sort((a, b) => a.on - b.on || (channelKey(a.id) < channelKey(b.id) ? -1 : channelKey(a.id) > channelKey(b.id) ? 1 : 0));
  const sites = list.map((t) => stationKey(t.id));
  // Aperture: largest distance between any two sites that triggered.
  const uniq = [...new Set(sites)];
  let aperture = 0;
  for (let i = 0; i < uniq.length; i++) {
    for (let j = i + 1; j < uniq.length; j++) {
      aperture = Math.max(aperture, siteDistanceKm(positions.get(uniq[i])!, positions.get(uniq[j])!));
    }
  }
  const slackUs = Math.round(o.slack * 1e6);
  const maxSpan = Math.round((aperture / o.vMin) * 1e6) + slackUs;
  const used = new Uint8Array(list.length);
  const groups: { members: number[]; secondary: number[] }[] = [];
  for (let s = 0; s < list.length; s++) {
    if (used[s]) continue;
    const members = [s];
    const inGroup = new Set([sites[s]]);
    for (let j = s + 1; j < list.length && list[j].on - list[s].on <= maxSpan; j++) {
      if (used[j] || inGroup.has(sites[j])) continue;
      let ok = true;
      for (const m of members) {
        const d = siteDistanceKm(positions.get(sites[m])!, positions.get(sites[j])!);
        if (Math.abs(list[j].on - list[m].on) > Math.round((d / o.vMin) * 1e6) + slackUs) {
          ok = false;
          break;
        }
      }
      if (ok) {
        members.push(j);
        inGroup.add(sites[j]);
      }
    }
    if (members.length < o.minSites) continue;
    let lastOff = list[s].off;
    for (const m of members) {
      used[m] = 1;
      lastOff = Math.max(lastOff, list[m].off);
    }
    const secondary: number[] = [];
    for (let j = s + 1; j < list.length && list[j].on <= lastOff + maxSpan; j++) {
      if (!used[j] && inGroup.has(sites[j])) {
        used[j] = 1;
        secondary.push(j);
      }
    }
    groups.push({ members, secondary });
  }
  // Identifiers.
  const events: CandidateEvent[] = [];
  const taken = new Set<string>();
  const prev = o.previous ?? [];
  for (const g of groups) {
    const trig = g.members.map((m) => list[m]);
    const time = trig[0].on;
    const lastOn = trig[trig.length - 1].on;
    let id: string | undefined;
    for (const p of prev) {
      const pLast = p.triggers.length ? p.triggers[p.triggers.length - 1].on : p.time;
      if (!taken.has(p.id) && time <= pLast + slackUs && lastOn >= p.time - slackUs) {
        id = p.id;
        break;
      }
    }
    if (id === undefined) {
      const base = `${o.network}.${idTime(time, o.idGrid)}`;
      id = base;
      const given = (x: string) => taken.has(x) || prev.some((p) => p.id === x) || (o.reserved?.has(x) ?? false);
      for (let n = 1; given(id); n++) id = base + String.fromCharCode(97 + n);
    }
    taken.add(id);
    events.push({
      id,
      time,
      start: Math.min(...trig.map((t) => t.start)),
      end: Math.max(...trig.map((t) => t.end)),
      sites: trig.map((t) => stationKey(t.id)),
      triggers: trig,
      secondary: g.secondary.map((m) => list[m]),
    });
  }
  return events;
}

/** Predicted P and S arrival times (µs) of a located event at a site ("NET.STA"), or null when none can be given. */
export type PredictedArrivals = (site: string) => { readonly P: Micros; readonly S: Micros } | null;

/**
 * The triggers of a located candidate (its members and its secondary triggers) that its origin does
 * not explain: whose on-time lies more than `slack` seconds from both the P and the S time the origin
 * predicts at their site. A trigger at a site without a prediction counts as explained (nothing to
 * judge it by). In time order; none when the origin explains the triggers of fewer than `minSites`
 * sites (it is then not the event the coincidence found, and a candidate made of what it leaves
 * could be the same one again).
 *
 * Why: a second earthquake 3-20 s after another (a doublet, an early aftershock) triggers inside the
 * first one's coincidence window, so its triggers join the first candidate, as members at sites the
 * first did not reach and as secondary triggers at the others, and it gets no candidate of its own.
 * One origin explains a trigger at its P or its S (a trigger comes after its onset by about the STA
 * window, and `slack` - coincidence's own allowance for that and clock error - covers it); triggers
 * it explains at neither are another source's. The caller runs `coincidence` on them again: three
 * or more sites that agree make a candidate of their own (Daybreak's rule; README, "Automatic
 * locations").
 */
export function unexplainedTriggers(event: CandidateEvent, predicted: PredictedArrivals, slack: number, minSites: number): StationTrigger[] {
  if (!(slack >= 0 && Number.isFinite(slack))) throw new RangeError(`slack (s) must be >= 0, got ${slack}`);
  if (!Number.isInteger(minSites) || minSites < 1) throw new RangeError(`minSites must be an integer >= 1, got ${minSites}`);
  const slackUs = Math.round(slack * 1e6);
  const out: StationTrigger[] = [];
  const explained = new Set<string>();
  for (const t of [...event.triggers, ...event.secondary]) {
    const site = stationKey(t.id);
    const at = predicted(site);
    if (!at || Math.abs(t.on - at.P) <= slackUs || Math.abs(t.on - at.S) <= slackUs) explained.add(site);
    else out.push(t);
  }
  return explained.size >= minSites ? out.sort((a, b) => a.on - b.on) : [];
}
