/**
 * Picking accuracy on synthetic nights: builds short nights on the demo network (core/synth) with
 * random local events, renders them, runs a picking chain over every station and scores the picks
 * against the truth arrivals (core/synth/truth: true time, polarity, SNR as issue 4 defines it:
 * RMS of 1 s after over RMS of 5 s before, 1-20 Hz).
 *
 * Two chains run on the same samples:
 * - `projectChain`: core/pick (band-pass 2-15 Hz causal, recursive STA/LTA with a 20 s LTA, network
 *   coincidence, then pickEventSites: pickP on the vertical, a particle-motion check that the onset
 *   is not S, a lower re-trigger at sites without a trigger, pickS on the rotated horizontals with
 *   the S window bounded by the network's first P).
 * - `textbookChain`: the plain floor written here in a few lines (band-pass, recursive STA/LTA after
 *   Withers et al. 1998, trigger coincidence on 3 sites, Maeda's (1985) AIC on the vertical, the same
 *   AIC on the horizontal energy N^2 + E^2 in a fixed window after P, polarity from the sign of the
 *   first sample after the pick).
 *
 * Scoring: every truth arrival with a measured SNR is one trial, at its true time (the rendered
 * samples carry no clock fault) and with the polarity the vertical records (reversed on a channel
 * wired the wrong way round, which the metadata do not say). A pick of the same phase at the same
 * station counts for the arrival nearest to it; an arrival without a pick within MATCH_SECONDS is a
 * miss and counts as a failure in every share. Events found: every event whose P has SNR > 5 at 4 or
 * more stations must have a candidate event with a trigger within 3 s of one of its P arrivals. False
 * candidate events: candidates none of whose member triggers lies within 3 s of a truth arrival at
 * that station.
 */
import { designForChannel } from '../../core/dsp/designForChannel';
import { rotateToNorthEast } from '../../core/dsp/rotate';
import { sosfilt } from '../../core/dsp/sosfilt';
import type { ChannelId } from '../../core/model';
import { stationKey } from '../../core/model';
import {
  coincidence, type EventSite, LOCAL_EARTHQUAKE_BUSY, pickEventSites, staLtaTriggers, type CandidateEvent, type Pick,
  type SitePosition, type StationTrigger,
} from '../../core/pick';
import { demoScenario } from '../../core/synth/demo';
import { offsetPoint } from '../../core/synth/geometry';
import { Rng } from '../../core/synth/random';
import { renderStation } from '../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../core/synth/truth';
import type { EventSpec, Scenario } from '../../core/synth/types';
import type { Micros } from '../../core/time';

/** A pick farther than this from its arrival is a miss, s. */
export const MATCH_SECONDS = 1.5;
/** The causal band-pass both chains pick on (common practice for local events, as the scan's). */
export const PICK_BAND: [number, number] = [2, 15];

export interface NightOptions {
  /** Length of the night, minutes. */
  readonly minutes: number;
  /** Events in it (at least 100 s apart). */
  readonly events: number;
  /** Magnitude range of the events (uniform). */
  readonly magnitudes: readonly [number, number];
}

/**
 * A night on the demo network (stations, noise, velocity model of `demoScenario(seed)`), `minutes`
 * long, with `events` local earthquakes drawn from `seed`: epicentres within 30 km of the centre,
 * depths 2-15 km, magnitudes uniform in the given range, origins 100 s or more apart. No faults of
 * the recording (spikes, gaps, clock errors are the scan's tests' business, not the picker's).
 */
export function accuracyNight(seed: number, o: NightOptions): Scenario {
  const base = demoScenario(seed);
  const rng = new Rng(seed, 7);
  const start = base.start;
  const end = start + Math.round(o.minutes * 60e6);
  const slot = (end - start - 60e6) / o.events;
  const centre = { latitude: 43.38, longitude: 2.66 };
  const events: EventSpec[] = [];
  for (let i = 0; i < o.events; i++) {
    const origin = start + 20e6 + Math.round(i * slot + rng.uniform(0, Math.max(0, slot - 100e6)));
    const p = offsetPoint(centre.latitude, centre.longitude, rng.uniform(-30, 30), rng.uniform(-30, 30));
    events.push({
      id: `ev-${String(i + 1).padStart(2, '0')}`, type: 'earthquake', origin: Math.round(origin / 1e4) * 1e4,
      latitude: p.latitude, longitude: p.longitude, depthKm: Math.round(rng.uniform(2, 15) * 10) / 10,
      magnitude: Math.round(rng.uniform(o.magnitudes[0], o.magnitudes[1]) * 10) / 10,
      mechanism: { strike: Math.round(rng.uniform(0, 359)), dip: Math.round(rng.uniform(35, 89)), rake: Math.round(rng.uniform(-180, 180)) },
    });
  }
  return { ...base, name: `accuracy night ${seed}`, end, events, faults: [] };
}

/** One site's first sensor, as float samples (counts). */
export interface SiteData {
  readonly code: string;
  readonly position: SitePosition;
  readonly sampleRate: number;
  readonly start: Micros;
  readonly vertical: { readonly id: ChannelId; readonly samples: Float64Array };
  /** Rotated to north and east; null for a vertical-only site. */
  readonly horizontals: { readonly north: { id: ChannelId; samples: Float64Array }; readonly east: { id: ChannelId; samples: Float64Array } } | null;
}

export interface RenderedNight {
  readonly scenario: Scenario;
  readonly sites: SiteData[];
  readonly truth: TruthArrival[];
  /** Event id of each truth arrival (same order). */
  readonly truthEvent: string[];
  readonly hours: number;
}

/**
 * One hour-long piece of a scenario (its stations, events and faults; arrivals within 35 s of the
 * piece's start have no SNR in the truth and are not scored).
 */
export function scenarioPiece(sc: Scenario, start: Micros, minutes: number): Scenario {
  return { ...sc, start, end: Math.min(sc.end, start + Math.round(minutes * 60e6)) };
}

export function renderNight(sc: Scenario): RenderedNight {
  const sites: SiteData[] = [];
  const truth: TruthArrival[] = [];
  const truthEvent: string[] = [];
  for (const st of sc.stations) {
    const rs = renderStation(sc, st.code);
    for (const [ev, arr] of stationTruth(sc, rs)) for (const a of arr) {
      truth.push(a);
      truthEvent.push(ev);
    }
    const loc = st.channels[0].location;
    const chans = rs.channels.filter((c) => c.id.location === loc);
    const z = chans.find((c) => Math.abs(c.spec.dip) > 45)!;
    const hs = chans.filter((c) => Math.abs(c.spec.dip) <= 45);
    let horizontals: SiteData['horizontals'] = null;
    if (hs.length === 2) {
      const { north, east } = rotateToNorthEast(hs[0].samples, hs[1].samples, hs[0].spec.azimuth, hs[1].spec.azimuth);
      horizontals = { north: { id: hs[0].id, samples: north }, east: { id: hs[1].id, samples: east } };
    }
    sites.push({
      code: `${sc.network.code}.${st.code}`, position: { latitude: st.latitude, longitude: st.longitude },
      sampleRate: z.sampleRate, start: z.start, vertical: { id: z.id, samples: Float64Array.from(z.samples) }, horizontals,
    });
  }
  return { scenario: sc, sites, truth, truthEvent, hours: (sc.end - sc.start) / 3.6e9 };
}

export interface ChainResult {
  readonly picks: Pick[];
  readonly events: CandidateEvent[];
}

function bandPass(x: Float64Array, fs: number): Float64Array {
  return sosfilt(designForChannel({ kind: 'bandpass', order: 4, corners: PICK_BAND }, fs).sos, x);
}

interface FilteredSite {
  readonly site: SiteData;
  readonly z: Float64Array;
  readonly n: Float64Array | null;
  readonly e: Float64Array | null;
}

function filterSites(night: RenderedNight): FilteredSite[] {
  return night.sites.map((s) => ({
    site: s, z: bandPass(s.vertical.samples, s.sampleRate),
    n: s.horizontals ? bandPass(s.horizontals.north.samples, s.sampleRate) : null,
    e: s.horizontals ? bandPass(s.horizontals.east.samples, s.sampleRate) : null,
  }));
}

/** Longest P travel time to the first site of an event, s (the scan's `firstTravelMax`). */
const FIRST_TRAVEL_MAX = 10;

/**
 * The project's chain: core/pick's LOCAL_EARTHQUAKE_BUSY trigger (20 s LTA), coincidence with its
 * defaults, and pickEventSites (phase check, sites without a trigger, S bounded by the network's P).
 */
export function projectChain(night: RenderedNight): ChainResult {
  const fsites = filterSites(night);
  const triggers: StationTrigger[] = [];
  for (const f of fsites) triggers.push(...staLtaTriggers(f.site.vertical.id, f.z, f.site.sampleRate, f.site.start, LOCAL_EARTHQUAKE_BUSY.staLta));
  const positions = new Map(night.sites.map((s) => [s.code, s.position]));
  const events = coincidence(triggers, positions, { network: night.scenario.network.code });
  const picks: Pick[] = [];
  for (const ev of events) {
    const on = new Map(ev.triggers.map((t) => [stationKey(t.id), t.on]));
    const sites: EventSite[] = fsites.map((f) => ({
      vertical: { id: f.site.vertical.id, samples: f.z, sampleRate: f.site.sampleRate, start: f.site.start },
      horizontals: f.n && f.e && f.site.horizontals
        ? [
          { id: f.site.horizontals.north.id, samples: f.n, sampleRate: f.site.sampleRate, start: f.site.start },
          { id: f.site.horizontals.east.id, samples: f.e, sampleRate: f.site.sampleRate, start: f.site.start },
        ]
        : null,
      position: f.site.position,
      trigger: on.get(f.site.code) ?? null,
    }));
    picks.push(...pickEventSites(sites, { firstTravelMax: FIRST_TRAVEL_MAX, staLta: LOCAL_EARTHQUAKE_BUSY.staLta }));
  }
  return { picks, events };
}

// ---------------------------------------------------------------------------------------------
// The textbook floor.

/** Maeda (1985) AIC over x[from, to): k log var(x[from..k]) + (n-k-1) log var(x[k+1..to]); returns the index of its minimum. */
export function plainAic(x: Float64Array, from: number, to: number): number {
  const n = to - from;
  let best = Infinity, at = from;
  for (let k = 2; k < n - 2; k++) {
    let s1 = 0, q1 = 0, s2 = 0, q2 = 0;
    for (let i = 0; i <= k; i++) { const v = x[from + i]; s1 += v; q1 += v * v; }
    for (let i = k + 1; i < n; i++) { const v = x[from + i]; s2 += v; q2 += v * v; }
    const v1 = Math.max(q1 / (k + 1) - (s1 / (k + 1)) ** 2, 1e-30);
    const v2 = Math.max(q2 / (n - k - 1) - (s2 / (n - k - 1)) ** 2, 1e-30);
    const a = k * Math.log(v1) + (n - k - 1) * Math.log(v2);
    if (a < best) { best = a; at = from + k; }
  }
  return at;
}

/** Same minimum as plainAic, with running sums (O(n)). */
function fastAic(x: Float64Array, from: number, to: number): number {
  const n = to - from;
  const cs = new Float64Array(n + 1), cq = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) { const v = x[from + i]; cs[i + 1] = cs[i] + v; cq[i + 1] = cq[i] + v * v; }
  let best = Infinity, at = from;
  for (let k = 2; k < n - 2; k++) {
    const m1 = k + 1, m2 = n - k - 1;
    const v1 = Math.max(cq[m1] / m1 - (cs[m1] / m1) ** 2, 1e-30);
    const v2 = Math.max((cq[n] - cq[m1]) / m2 - ((cs[n] - cs[m1]) / m2) ** 2, 1e-30);
    const a = k * Math.log(v1) + m2 * Math.log(v2);
    if (a < best) { best = a; at = from + k; }
  }
  return at;
}

/** Recursive STA/LTA (Withers et al. 1998) triggers on x^2: on-times of ratio >= 4 until it drops below 2. */
function recursiveTriggers(x: Float64Array, fs: number): number[] {
  const cs = 1 / (0.5 * fs), cl = 1 / (60 * fs);
  let sta = 0, lta = 0;
  let on = -1;
  const out: number[] = [];
  const warm = Math.round(10 * fs);
  for (let i = 0; i < x.length; i++) {
    const e = x[i] * x[i];
    sta += cs * (e - sta);
    lta += cl * (e - lta);
    if (i < warm) continue;
    const r = lta > 0 ? sta / lta : 0;
    if (on < 0 && r >= 4) { on = i; out.push(i); } else if (on >= 0 && r < 2) on = -1;
  }
  return out;
}

/** The textbook floor (see the module comment). */
export function textbookChain(night: RenderedNight): ChainResult {
  const fsites = filterSites(night);
  const trig: { f: FilteredSite; i: number; t: Micros }[] = [];
  for (const f of fsites) {
    for (const i of recursiveTriggers(f.z, f.site.sampleRate)) trig.push({ f, i, t: f.site.start + Math.round((i * 1e6) / f.site.sampleRate) });
  }
  trig.sort((a, b) => a.t - b.t);
  // Coincidence: 3 or more sites triggering within 15 s (the network's aperture over a slow P speed).
  const events: CandidateEvent[] = [];
  const picks: Pick[] = [];
  for (let a = 0; a < trig.length;) {
    const group = new Map<string, { f: FilteredSite; i: number; t: Micros }>();
    let b = a;
    while (b < trig.length && trig[b].t - trig[a].t <= 15e6) {
      if (!group.has(trig[b].f.site.code)) group.set(trig[b].f.site.code, trig[b]);
      b++;
    }
    if (group.size < 3) { a++; continue; }
    const members = [...group.values()];
    events.push({
      id: `floor-${events.length}`, time: trig[a].t, start: trig[a].t, end: trig[b - 1].t,
      sites: members.map((m) => m.f.site.code),
      triggers: members.map((m) => ({ id: m.f.site.vertical.id, on: m.t, off: m.t, peakRatio: 0, peakTime: m.t, start: m.t, end: m.t, endedBy: 'ratio' as const })),
      secondary: [],
    });
    for (const m of members) {
      const fs = m.f.site.sampleRate;
      const x = m.f.z;
      const k = fastAic(x, Math.max(0, m.i - Math.round(fs)), Math.min(x.length, m.i + Math.round(0.5 * fs)));
      const tP = m.f.site.start + Math.round((k * 1e6) / fs);
      const first = x[k + 1] - x[k - 1];
      picks.push(plainPick('P', m.f.site.vertical.id, tP, first > 0 ? 'positive' : first < 0 ? 'negative' : 'undecidable'));
      if (!m.f.n || !m.f.e || !m.f.site.horizontals) continue;
      const from = k + Math.round(0.3 * fs);
      const to = Math.min(x.length, k + Math.round(10 * fs));
      if (to - from < 16) continue;
      const energy = new Float64Array(to - from);
      for (let i = from; i < to; i++) energy[i - from] = m.f.n[i] * m.f.n[i] + m.f.e[i] * m.f.e[i];
      const ks = from + fastAic(energy, 0, energy.length);
      picks.push(plainPick('S', m.f.site.horizontals.north.id, m.f.site.start + Math.round((ks * 1e6) / fs), null));
    }
    a = b;
  }
  return { picks, events };
}

function plainPick(phase: 'P' | 'S', id: ChannelId, time: Micros, polarity: Pick['polarity']): Pick {
  return {
    phaseHint: phase, waveformId: id, time, lowerUncertainty: 0, upperUncertainty: 0, snr: 0, onset: 'questionable',
    polarity, evaluationMode: 'automatic', evaluationStatus: 'preliminary', questionableTiming: false,
  };
}

// ---------------------------------------------------------------------------------------------
// Scoring.

export type SnrClass = '>=10' | '4-10' | '<4';
export const SNR_CLASSES: readonly SnrClass[] = ['>=10', '4-10', '<4'];
export function snrClass(snr: number): SnrClass {
  return snr >= 10 ? '>=10' : snr >= 4 ? '4-10' : '<4';
}

/** Per phase and SNR class: arrivals, picks within each tolerance, signed errors of matched picks (s). */
export interface ClassScore {
  arrivals: number;
  within: [number, number];
  errors: number[];
}

export interface Score {
  readonly p: Record<SnrClass, ClassScore>;
  readonly s: Record<SnrClass, ClassScore>;
  /** P arrivals with SNR >= 10; of those, picks with a polarity given; of those given, right. */
  readonly polarity: { arrivals: number; given: number; right: number };
  readonly eventsToFind: number;
  readonly eventsFound: number;
  readonly falseEvents: number;
  readonly hours: number;
}

export const P_TOLERANCES: [number, number] = [0.05, 0.1];
export const S_TOLERANCES: [number, number] = [0.1, 0.2];

function emptyClasses(): Record<SnrClass, ClassScore> {
  return { '>=10': { arrivals: 0, within: [0, 0], errors: [] }, '4-10': { arrivals: 0, within: [0, 0], errors: [] }, '<4': { arrivals: 0, within: [0, 0], errors: [] } };
}

/**
 * The arrival's time in the samples the harness reads: the true time. (The rendered samples run on
 * true time; a clock fault lives only in the written files' time tags, which the harness does not read.)
 */
function recordedMicros(a: TruthArrival): Micros {
  return a.timeMicros;
}

/** The P polarity the vertical records: the ground's, reversed on a channel wired the wrong way round. */
function recordedPolarity(a: TruthArrival): 'positive' | 'negative' {
  const zReversed = a.reversedChannels.some((k) => /Z$/.test(k));
  return zReversed ? (a.polarity === 'positive' ? 'negative' : 'positive') : a.polarity;
}

/** Events whose epicentre lies over 100 km from every station of the night (regional, not local). */
export function regionalEvents(night: RenderedNight): Set<string> {
  const near = new Set<string>();
  night.truth.forEach((a, i) => {
    if (a.epicentralKm <= 100) near.add(night.truthEvent[i]);
  });
  return new Set(night.truthEvent.filter((e) => !near.has(e)));
}

/** Scores a chain's picks; arrivals of the events in `leaveOut` are not scored. */
export function scoreChain(night: RenderedNight, result: ChainResult, leaveOut: ReadonlySet<string> = new Set()): Score {
  const p = emptyClasses(), s = emptyClasses();
  const polarity = { arrivals: 0, given: 0, right: 0 };
  const picksAt = new Map<string, Pick[]>();
  for (const pk of result.picks) {
    const key = `${pk.waveformId.station}.${pk.phaseHint}`;
    const l = picksAt.get(key) ?? [];
    l.push(pk);
    picksAt.set(key, l);
  }
  for (const [i, a] of night.truth.entries()) {
    if (a.snr === null || leaveOut.has(night.truthEvent[i])) continue;
    const at = recordedMicros(a);
    const cls = snrClass(a.snr);
    const target = a.wave === 'P' ? p[cls] : s[cls];
    const tol = a.wave === 'P' ? P_TOLERANCES : S_TOLERANCES;
    target.arrivals++;
    let best: Pick | null = null;
    for (const pk of picksAt.get(`${a.station}.${a.wave}`) ?? []) {
      if (!best || Math.abs(pk.time - at) < Math.abs(best.time - at)) best = pk;
    }
    const err = best ? (best.time - at) / 1e6 : Infinity;
    const matched = Math.abs(err) <= MATCH_SECONDS;
    if (matched) {
      target.errors.push(err);
      if (Math.abs(err) <= tol[0] + 1e-9) target.within[0]++;
      if (Math.abs(err) <= tol[1] + 1e-9) target.within[1]++;
    }
    if (a.wave === 'P' && a.snr >= 10) {
      polarity.arrivals++;
      if (matched && best && best.polarity && best.polarity !== 'undecidable') {
        polarity.given++;
        if (best.polarity === recordedPolarity(a)) polarity.right++;
      }
    }
  }
  // Events to find and found.
  const byEvent = new Map<string, TruthArrival[]>();
  night.truth.forEach((a, i) => {
    const l = byEvent.get(night.truthEvent[i]) ?? [];
    l.push(a);
    byEvent.set(night.truthEvent[i], l);
  });
  let eventsToFind = 0, eventsFound = 0;
  for (const [id, arr] of byEvent) {
    if (leaveOut.has(id)) continue;
    const strong = arr.filter((a) => a.wave === 'P' && a.snr !== null && a.snr > 5);
    if (strong.length < 4) continue;
    eventsToFind++;
    const found = result.events.some((ev) => ev.triggers.some((t) => strong.some((a) => a.station === t.id.station && Math.abs(t.on - recordedMicros(a)) <= 3e6)));
    if (found) eventsFound++;
  }
  let falseEvents = 0;
  for (const ev of result.events) {
    const real = [...ev.triggers, ...ev.secondary].some((t) => night.truth.some((a) => a.station === t.id.station && Math.abs(t.on - recordedMicros(a)) <= 3e6));
    if (!real) falseEvents++;
  }
  return { p, s, polarity, eventsToFind, eventsFound, falseEvents, hours: night.hours };
}

/** Sums scores of several nights. */
export function mergeScores(list: readonly Score[]): Score {
  const p = emptyClasses(), s = emptyClasses();
  const polarity = { arrivals: 0, given: 0, right: 0 };
  let eventsToFind = 0, eventsFound = 0, falseEvents = 0, hours = 0;
  for (const sc of list) {
    for (const c of SNR_CLASSES) {
      for (const [dst, src] of [[p[c], sc.p[c]], [s[c], sc.s[c]]] as const) {
        dst.arrivals += src.arrivals;
        dst.within[0] += src.within[0];
        dst.within[1] += src.within[1];
        dst.errors.push(...src.errors);
      }
    }
    polarity.arrivals += sc.polarity.arrivals;
    polarity.given += sc.polarity.given;
    polarity.right += sc.polarity.right;
    eventsToFind += sc.eventsToFind;
    eventsFound += sc.eventsFound;
    falseEvents += sc.falseEvents;
    hours += sc.hours;
  }
  return { p, s, polarity, eventsToFind, eventsFound, falseEvents, hours };
}

export function share(n: number, of: number): number {
  return of > 0 ? n / of : NaN;
}

export function median(x: readonly number[]): number {
  if (x.length === 0) return NaN;
  const s = [...x].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

const pct = (x: number) => (Number.isNaN(x) ? '-' : `${(100 * x).toFixed(0)} %`);
const ms = (x: number) => (Number.isNaN(x) ? '-' : `${(1000 * x).toFixed(0)} ms`);

/** A Markdown table of one or more chains' scores. */
export function scoreTable(rows: readonly { name: string; score: Score }[]): string {
  const head = '| chain | SNR | P n | P <=0.05 s | P <=0.10 s | P median bias | S n | S <=0.10 s | S <=0.20 s | S median bias |';
  const out = [head, '|---|---|---|---|---|---|---|---|---|---|'];
  for (const { name, score } of rows) {
    for (const c of SNR_CLASSES) {
      const p = score.p[c], s = score.s[c];
      out.push(`| ${name} | ${c} | ${p.arrivals} | ${pct(share(p.within[0], p.arrivals))} | ${pct(share(p.within[1], p.arrivals))} | ${ms(median(p.errors))} | ${s.arrivals} | ${pct(share(s.within[0], s.arrivals))} | ${pct(share(s.within[1], s.arrivals))} | ${ms(median(s.errors))} |`);
    }
  }
  out.push('', '| chain | polarity given (P, SNR >= 10) | right (of given) | events found (P SNR > 5 at >= 4 sites) | false candidate events per hour |', '|---|---|---|---|---|');
  for (const { name, score } of rows) {
    const po = score.polarity;
    out.push(`| ${name} | ${pct(share(po.given, po.arrivals))} (${po.given}/${po.arrivals}) | ${pct(share(po.right, po.given))} (${po.right}/${po.given}) | ${score.eventsFound}/${score.eventsToFind} | ${(score.falseEvents / score.hours).toFixed(2)} (${score.falseEvents} in ${score.hours.toFixed(1)} h) |`);
  }
  return out.join('\n');
}
