/**
 * Picks of one candidate event over its sites, using what the network knows as a whole.
 *
 * The per-site pickers (onset.ts) look near one trigger. Two things go wrong there on local events
 * with weak P: the trigger (and so the "P" pick) comes on S when P is below the trigger level, and
 * a site whose P never reached the trigger level gets no pick at all. This module adds three steps
 * (Daybreak's rules, measured on the synthetic nights of test/bench/accuracy.bench.ts):
 *
 * 1. Phase check by particle motion: P arrives near-vertically at the surface (low-velocity ground
 *    bends rays towards the vertical), so its energy is mostly on the vertical; S energy is mostly
 *    horizontal. The horizontal share of the energy in the `shareSeconds` after an onset, each
 *    channel's pre-onset noise energy removed (`horizontalShare`), tells them apart; above
 *    `sShare` the onset is taken as S. A site without horizontals has no particle motion: its onset
 *    is taken as S when it comes later than more than half of the other sites' onsets allow for a
 *    P (tooLateForP: the bound of networkFirst). (Three-component polarization to tell P from S is
 *    a published idea: e.g. Cichowicz, 1993, BSSA 83(1), 180-189 - from memory.)
 * 2. An onset taken as S is picked as S (joint AIC of the horizontals around it), and P is sought
 *    before it: AIC on the vertical from `maxSMinusP` seconds before S (but not before the time the
 *    sites whose onsets were taken as P allow: their P less distance / vMin less slack) to 0.2 s
 *    before S. A P found there with SNR below `minSnr` is dropped (the S pick stays).
 * 3. Sites of the event without a trigger: the network's first P bounds where their first arrival
 *    can be (no later than distance / vMin after it, Fermat as in coincidence.ts); a lower trigger
 *    level (`retrigger`) on the STA/LTA ratio of that window, run from `lta` seconds before it,
 *    finds the onset, and the same steps 1-2 apply. A pick whose SNR is below `minSnr` is dropped.
 *
 * S at every site with horizontals then uses pickS with the S window bounded by the network's first
 * P: the origin time t0 lies in [tP_first - firstTravelMax, tP_first], so the P travel time at site i
 * lies in [tP_i - tP_first, tP_i - tP_first + firstTravelMax]. That bound holds for events within
 * about firstTravelMax seconds of P travel from the network. For events farther out (a regional event
 * whose Sn comes 25 s after Pn), the caller may pass `earliestOrigin`: given the P picks, it returns the
 * earliest t0 they allow (e.g. from a P-only location); when that is earlier than tP_first -
 * firstTravelMax, the upper bound of the P travel time grows to tP_i - t0, so the S window extends
 * with distance while a near event keeps its window. Such a distant event is taken to lie at least
 * firstTravelMax / 2 of P travel away (its lower bound too), so S is not sought in the P coda; and a
 * site without P whose onset taken as S comes no later than the network's P allows there (the
 * anchors' P plus distance / vMin plus slack) gets no S: that onset is P. (On generated regional
 * events the S of two sites had been picked on P, about 26 s early.)
 *
 * 4. P and S of a distant event re-read in a wider band. When the caller's `earliestOrigin` widened
 *    the S window (the event lies beyond firstTravelMax of P travel), each P pick is read again on the
 *    site's `distantVertical` (AIC from `distantP.before` seconds before it to `distantP.after` after
 *    it), then S is picked after that P as above and read again on the site's `distantHorizontals`
 *    (the same joint AIC from `distantS.before` seconds before the first S pick to `distantS.after`
 *    after it), when the site gives them: the traces with only a high-pass (the scan's: 1 Hz, order
 *    2, below which the microseism lies). A re-read pick replaces the first one when its SNR reaches
 *    `minSnr`. Why: after a few hundred km of attenuation (t* of S about 0.25 s at 250 km for
 *    Q = 250) the S pulse is emergent, and a causal attenuation operator sends its highest
 *    frequencies first; a band's upper corner (15 Hz for the local band) delays the rise the AIC
 *    sees, a high-pass alone keeps it. On generated regional events 136-300 km away
 *    (test/core/scan/regionalEvents.ts, Daybreak's measurements; filter and window chosen on three
 *    seeds, checked on four others), with the generator's attenuation of 2026-12-02 (Q constant up
 *    to 100 Hz whatever the sample rate, core/synth/pulse.ts), the re-read moved the median S error
 *    from 0.18-0.31 s late to 0.15-0.26 s late, S within 0.20 s from 13 to 27 of 39 sites (held out:
 *    16 to 36 of 52), and P within 0.05 s from 2 to 9 of 42 (held out: 3 to 21 of 56). The S front
 *    of such an event comes 0.15-0.2 s before the first per cent of the pulse, below any noise, and
 *    the AIC pick lies where the trace first leaves the noise (a step back from it to where a
 *    trailing 0.02-0.2 s energy envelope first exceeds 2-5 times its pre-pick mean changed P within
 *    0.05 s and S within 0.10 s by at most one site each on seeds 31-33, and was left out). What
 *    brings those picks closer is onset.ts's lead of slow onsets, which moves a pick ahead by the
 *    time its first swing keeps steepening (README, "Picking accuracy", for the figures).
 */
import type { Micros } from '../time';
import { pickP, pickS, type OnsetOptions, type SWindowOptions } from './onset';
import { siteDistanceKm, type SitePosition } from './coincidence';
import { staLtaRatio, type StaLtaOptions, LOCAL_EARTHQUAKE_STA_LTA } from './staLta';
import type { Pick, Trace } from './types';

/** One site's traces for an event (filtered causally; horizontals rotated to north and east). */
export interface EventSite {
  readonly vertical: Trace;
  readonly horizontals: readonly [Trace, Trace] | null;
  readonly position: SitePosition;
  /** The site's trigger-on time for this event (µs), or null when it did not trigger. */
  readonly trigger: Micros | null;
  /**
   * Optional, asked for only when the event is distant (step 4 of the module comment): the north and
   * east horizontals with a high-pass only (no upper corner), same start and rate as each other;
   * null when they cannot be made.
   */
  readonly distantHorizontals?: () => readonly [Trace, Trace] | null;
  /** Optional, as `distantHorizontals`: the vertical with a high-pass only (step 4). */
  readonly distantVertical?: () => Trace | null;
}

export interface EventPickOptions {
  readonly onset: Partial<OnsetOptions>;
  readonly sWindow: Partial<SWindowOptions>;
  readonly staLta: Partial<StaLtaOptions>;
  /** Horizontal energy share above which an onset is taken as S (0-1). */
  readonly sShare: number;
  /** Window after an onset for the energy share, s. */
  readonly shareSeconds: number;
  /** Longest S minus P time sought before an onset taken as S, s. */
  readonly maxSMinusP: number;
  /** Longest P travel time to the first site, s (bounds S as in the scan). */
  readonly firstTravelMax: number;
  /** Slowest P speed between sites, km/s, and slack, s (as coincidence.ts). */
  readonly vMin: number;
  readonly slack: number;
  /**
   * Slowest average P speed along a local event's rays, km/s: the network's first P must agree with
   * the other sites' P at it (see networkFirst).
   */
  readonly firstPSpeed: number;
  /** STA/LTA level that finds the onset at sites without a trigger. */
  readonly retrigger: number;
  /** Picks below this SNR at sites without a trigger are dropped. */
  readonly minSnr: number;
  /**
   * Optional: the earliest origin time the event's P picks allow (µs), e.g. a P-only location less
   * a margin for its uncertainty; null when none can be given. Only ever widens the S window (see
   * the module comment).
   */
  readonly earliestOrigin?: (pPicks: readonly OriginPick[]) => Micros | null;
  /** Distant events: the P re-read window on `distantVertical`, seconds before and after the first P pick. */
  readonly distantP: { readonly before: number; readonly after: number };
  /** Distant events: the S re-read window on `distantHorizontals`, seconds before and after the first S pick. */
  readonly distantS: { readonly before: number; readonly after: number };
}

/** A P pick with the position of its site, as `earliestOrigin` gets it. */
export interface OriginPick {
  readonly pick: Pick;
  readonly position: SitePosition;
}

/** Daybreak's defaults for local events (see the module comment). */
export const LOCAL_EVENT_PICKING: EventPickOptions = Object.freeze({
  onset: {},
  sWindow: {},
  staLta: LOCAL_EARTHQUAKE_STA_LTA,
  sShare: 0.6,
  shareSeconds: 0.5,
  maxSMinusP: 10,
  firstTravelMax: 10,
  vMin: 3,
  // Upper-crust P speeds are about 5.5-6.5 km/s (common practice, from memory); 5 leaves room for
  // slower rock near the surface, and the slack for the rest.
  firstPSpeed: 5,
  slack: 1,
  retrigger: 2.5,
  minSnr: 2,
  distantP: Object.freeze({ before: 0.5, after: 0.2 }),
  distantS: Object.freeze({ before: 1, after: 0.2 }),
});

function indexAt(t: Trace, time: Micros): number {
  return Math.round(((time - t.start) * t.sampleRate) / 1e6);
}

/** Energy of x over [from, to) less its noise energy per sample over [noiseFrom, from), clamped at 0. */
function excessEnergy(x: Trace, time: Micros, seconds: number): number {
  const fs = x.sampleRate;
  const k = indexAt(x, time);
  const n = Math.max(1, Math.round(seconds * fs));
  const nn = Math.max(1, Math.round(2 * fs));
  const s = x.samples;
  const a = Math.max(0, k - nn);
  let noise = 0;
  for (let i = a; i < k && i < s.length; i++) noise += s[i] * s[i];
  noise = k > a ? noise / (k - a) : 0;
  let sig = 0;
  const b = Math.min(s.length, k + n);
  for (let i = Math.max(0, k); i < b; i++) sig += s[i] * s[i];
  const m = b - Math.max(0, k);
  return m > 0 ? Math.max(0, sig / m - noise) : 0;
}

/**
 * Share of the energy on the horizontals in `seconds` after `time` (µs), each channel's noise energy
 * (2 s before) removed: near 0 for a P arriving steeply, near 1 for S. NaN when no energy rose.
 */
export function horizontalShare(vertical: Trace, north: Trace, east: Trace, time: Micros, seconds = 0.5): number {
  if (!(seconds > 0)) throw new RangeError(`seconds must be > 0, got ${seconds}`);
  const v = excessEnergy(vertical, time, seconds);
  const h = excessEnergy(north, time, seconds) + excessEnergy(east, time, seconds);
  return v + h > 0 ? h / (v + h) : NaN;
}

interface SiteState {
  readonly site: EventSite;
  onset: Micros;
  p: Pick | null;
  /** The onset was taken as S. */
  sLike: boolean;
}

function resolve(options: Partial<EventPickOptions>): EventPickOptions {
  const o = { ...LOCAL_EVENT_PICKING, ...options };
  for (const k of ['shareSeconds', 'maxSMinusP', 'firstTravelMax', 'vMin', 'firstPSpeed', 'retrigger'] as const) {
    if (!(o[k] > 0 && Number.isFinite(o[k]))) throw new RangeError(`${k} must be a finite number > 0, got ${o[k]}`);
  }
  if (!(o.sShare > 0 && o.sShare <= 1)) throw new RangeError(`sShare must be in (0, 1], got ${o.sShare}`);
  if (!(o.slack >= 0) || !(o.minSnr >= 0)) throw new RangeError(`slack and minSnr must be >= 0, got ${o.slack}, ${o.minSnr}`);
  for (const k of ['distantP', 'distantS'] as const) {
    const d = o[k];
    if (!d || !(d.before > 0 && d.after > 0 && Number.isFinite(d.before + d.after))) {
      throw new RangeError(`${k}.before and ${k}.after must be finite numbers > 0 (s), got ${d?.before}, ${d?.after}`);
    }
  }
  return o;
}

/** First sample time at or after `from` where the STA/LTA ratio of the vertical reaches `level`, or null. */
function firstRise(t: Trace, from: Micros, to: Micros, o: EventPickOptions): Micros | null {
  const fs = t.sampleRate;
  const lta = (o.staLta.lta ?? LOCAL_EARTHQUAKE_STA_LTA.lta);
  const a = Math.max(0, indexAt(t, from - Math.round(lta * 1e6)));
  const i0 = indexAt(t, from);
  const b = Math.min(t.samples.length, indexAt(t, to) + 1);
  if (i0 < a + fs || b - i0 < 16) return null;
  const r = staLtaRatio(t.samples.subarray(a, b), fs, { ...o.staLta, warmUp: Math.min((i0 - a) / fs, o.staLta.warmUp ?? 1) });
  for (let i = i0 - a; i < r.length; i++) if (r[i] >= o.retrigger) return t.start + Math.round(((a + i) * 1e6) / fs);
  return null;
}

/**
 * P and S picks of one event at its sites (see the module comment). Returns the picks, P before S
 * per site, sites in the order given.
 */
export function pickEventSites(sites: readonly EventSite[], options: Partial<EventPickOptions> = {}): Pick[] {
  const o = resolve(options);
  const states: SiteState[] = [];
  for (const site of sites) {
    if (site.trigger === null) continue;
    const p = pickP(site.vertical, site.trigger, o.onset);
    if (!p) continue;
    states.push({ site, onset: p.time, p, sLike: isSLike(site, p.time, o) });
  }
  const trusted = states.filter((s) => !s.sLike);
  if (trusted.length === 0 && states.length === 0) return [];
  let first = networkFirst((trusted.length ? trusted : states).map((s) => ({ time: s.onset, position: s.site.position, snr: s.p?.snr ?? Infinity })), o);
  // Sites without a trigger: look for a first arrival where the network allows one.
  const triggered = sites.filter((s) => s.trigger !== null);
  for (const site of sites) {
    if (site.trigger !== null) continue;
    const near = Math.min(...triggered.map((t) => siteDistanceKm(t.position, site.position)));
    const to = first + Math.round((near / o.vMin + o.slack + 2) * 1e6);
    const rise = firstRise(site.vertical, first - Math.round(o.slack * 1e6), to, o);
    if (rise === null) continue;
    const p = pickP(site.vertical, rise, o.onset);
    if (!p || p.snr < o.minSnr) continue;
    states.push({ site, onset: p.time, p, sLike: isSLike(site, p.time, o) });
  }
  // Vertical-only sites have no particle motion to tell S by: an onset there that comes later than
  // most of the other sites' onsets allow for P is taken as S (step 1, by moveout).
  markLateVerticalOnly(states, o);
  // Onsets taken as S: P is sought before them.
  const anchors = states.filter((s) => !s.sLike);
  for (const s of states) {
    if (!s.sLike) continue;
    // P here is no earlier than an anchor's P less the straight-path time at vMin (Fermat) and slack.
    let earliest = -Infinity;
    for (const a of anchors) {
      const t = a.onset - Math.round((siteDistanceKm(a.site.position, s.site.position) / o.vMin + o.slack) * 1e6);
      if (t > earliest) earliest = t;
    }
    const lead = Math.min(o.maxSMinusP, Math.max(0.5, (s.onset - 200_000 - earliest) / 1e6));
    const p = pickP(s.site.vertical, s.onset - 200_000, { ...o.onset, before: lead, after: 0.05 });
    s.p = p && p.snr >= o.minSnr ? p : null;
  }
  const ps = states.filter((s) => s.p !== null);
  if (ps.length) first = Math.min(first, networkFirst(ps.map((s) => ({ time: s.p!.time, position: s.site.position, snr: s.p!.snr })), o));
  // Origin time in [earliest, first]: first - firstTravelMax, or earlier where the caller's estimate says so.
  let earliest = first - Math.round(o.firstTravelMax * 1e6);
  let distant = false;
  if (o.earliestOrigin && ps.length) {
    const e = o.earliestOrigin(ps.map((s) => ({ pick: s.p!, position: s.site.position })));
    if (e !== null && Number.isFinite(e) && Math.round(e) < earliest) {
      earliest = Math.round(e);
      distant = true;
    }
  }
  if (distant) for (const s of states) if (s.p && s.site.distantVertical) s.p = rereadDistantP(s.site.distantVertical, s.p, o);
  const out: Pick[] = [];
  for (const s of states) {
    if (s.p) out.push(s.p);
    const h = s.site.horizontals;
    if (!h) continue;
    let sp: Pick | null;
    if (s.p) {
      // A distant event lies beyond about firstTravelMax of P travel (see the module comment): half
      // of that is taken as the least P travel time, so its S window starts clear of the P coda.
      const tp = Math.max(distant ? o.firstTravelMax / 2 : 0, (s.p.time - first) / 1e6);
      const tpMax = Math.max(tp + 1e-3, (s.p.time - earliest) / 1e6);
      sp = pickS(h[0], h[1], s.p.time, { ...o.sWindow, pTravelTime: { min: tp, max: tpMax } }, o.onset);
      if (sp && distant && s.site.distantHorizontals) sp = rereadDistantS(s.site.distantHorizontals, s.p.time, sp, o);
    } else {
      // S only: the joint AIC of the horizontals within 1 s around the onset taken as S. For a
      // distant event, S comes many seconds after P, so an onset no later than the latest P the
      // network's P picks allow here (Fermat, as in step 2) is P taken for S: no S is picked.
      if (distant && s.onset <= latestP(s.site, anchors, o)) continue;
      sp = pickS(h[0], h[1], s.onset - 1_000_000, { ...o.sWindow, pTravelTime: { min: 0, max: 2 / ((o.sWindow.vpVsMax ?? 2) - 1) } }, o.onset);
    }
    if (sp) out.push(sp);
  }
  return out;
}

/**
 * The network's first P (µs): the earliest onset that has an SNR of at least `minSnr` and that at
 * least half of the other sites' onsets agree with. Two P onsets of one event agree when they lie no
 * farther apart in time than their sites' distance at `firstPSpeed` plus slack: the difference of
 * two hypocentral distances is at most the sites' distance, and P covers it at the rays' average P
 * speed. A lone early onset, such as a P read on local noise at one site seconds before the event,
 * would otherwise move every site's S window late (on the demo night a P read 5.6 s early on a
 * sawmill's noise implied 2-4.9 km/s to the other sites; the true first P, 7-27 km/s). The plain
 * earliest onset when none qualifies.
 */
export function networkFirst(onsets: readonly { time: Micros; position: SitePosition; snr: number }[], o: EventPickOptions): Micros {
  const sorted = [...onsets].sort((a, b) => a.time - b.time);
  for (const a of sorted) {
    if (!(a.snr >= o.minSnr)) continue;
    const agree = sorted.filter((b) => b !== a && Math.abs(b.time - a.time) <= pSpread(a.position, b.position, o)).length;
    if (agree > 0 && 2 * agree >= sorted.length - 1) return a.time;
  }
  return sorted[0].time;
}

/** Latest time (µs) P can reach `site` after the anchors' P: each one's P plus distance / vMin plus slack, the least of those. */
function latestP(site: EventSite, anchors: readonly SiteState[], o: EventPickOptions): Micros {
  let latest = Infinity;
  for (const a of anchors) {
    if (!a.p) continue;
    const t = a.p.time + Math.round((siteDistanceKm(a.site.position, site.position) / o.vMin + o.slack) * 1e6);
    if (t < latest) latest = t;
  }
  return latest;
}

/** Step 4 of the module comment: P read again on the wide-band vertical within distantP around `p`. */
function rereadDistantP(make: () => Trace | null, p: Pick, o: EventPickOptions): Pick {
  const z = make();
  if (!z) return p;
  const r = pickP(z, p.time, { ...o.onset, before: o.distantP.before, after: o.distantP.after });
  return r && r.snr >= o.minSnr ? r : p;
}

/**
 * Step 4 of the module comment: S read again on the wide-band horizontals within distantS around the
 * first pick `sp`, after the P pick at pTime (µs). Returns the new pick, or `sp` when none is made or
 * its SNR is below minSnr.
 */
function rereadDistantS(make: () => readonly [Trace, Trace] | null, pTime: Micros, sp: Pick, o: EventPickOptions): Pick {
  const h = make();
  if (!h) return sp;
  // pickS bounds S by Vp/Vs times the P travel time; with Vp/Vs fixed at 2, S - P = Tp, so the
  // travel-time bounds below are the re-read window's start and end after P.
  const from = Math.max(0, (sp.time - pTime) / 1e6 - o.distantS.before);
  const to = (sp.time - pTime) / 1e6 + o.distantS.after;
  const r = pickS(h[0], h[1], pTime, { vpVsMin: 2, vpVsMax: 2, pTravelTime: { min: from, max: to } }, o.onset);
  return r && r.snr >= o.minSnr ? r : sp;
}

/**
 * Step 1 for sites without horizontals: an onset there is taken as S when it comes later than at
 * least half of the other sites' onsets taken as P allow for a P (`tooLateForP`), with at least
 * three such sites to judge by. A P read on S at a vertical-only site, where P lay in the noise,
 * otherwise stays a P seconds late and pulls the event's location (Daybreak's rule; README,
 * "Automatic locations").
 */
function markLateVerticalOnly(states: SiteState[], o: EventPickOptions): void {
  const others = states.filter((s) => !s.sLike);
  for (const s of states) {
    if (s.sLike || s.site.horizontals) continue;
    const judges = others.filter((b) => b !== s).map((b) => ({ time: b.onset, position: b.site.position }));
    if (judges.length >= 3 && tooLateForP({ time: s.onset, position: s.site.position }, judges, o)) s.sLike = true;
  }
}

/**
 * True when onset `a` (µs) comes later than more than half of the `others` allow for a P: each
 * other onset's time plus the two sites' distance at `firstPSpeed` plus `slack` (the bound
 * networkFirst uses for two P onsets that agree).
 */
export function tooLateForP(
  a: { time: Micros; position: SitePosition }, others: readonly { time: Micros; position: SitePosition }[],
  o: { readonly firstPSpeed: number; readonly slack: number },
): boolean {
  const late = others.filter((b) => a.time > b.time + pSpread(a.position, b.position, o)).length;
  return 2 * late > others.length;
}

/**
 * The most two P onsets of one event at sites a and b can lie apart, µs: the sites' distance at
 * `firstPSpeed` plus `slack` (networkFirst's module comment says why).
 */
export function pSpread(a: SitePosition, b: SitePosition, o: { readonly firstPSpeed: number; readonly slack: number }): Micros {
  return Math.round((siteDistanceKm(a, b) / o.firstPSpeed + o.slack) * 1e6);
}

function isSLike(site: EventSite, time: Micros, o: EventPickOptions): boolean {
  const h = site.horizontals;
  if (!h) return false;
  const share = horizontalShare(site.vertical, h[0], h[1], time, o.shareSeconds);
  return share > o.sShare;
}
