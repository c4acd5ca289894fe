/**
 * Generated regional events for the S re-read of distant events (core/pick/eventSites.ts, step 4):
 * the demo network (stations, noise and site terms of demoScenario(seed), no faults) and one
 * earthquake 150-300 km from its centre, ML 3.3-4.2, depth 5-20 km, drawn from the seed; 150 s of
 * records. Picked with core/scan's eventPicks as the scan does (2-15 Hz band, the P-only origin test
 * that widens the S window), with triggers 0.3 s after each true P (about where an STA of 0.5 s
 * reaches its on-ratio) in place of the trigger pass. Seeds 31-33 were used to choose the re-read's
 * filter and window, 41-44 were fixed before and held out (test/bench/accuracy.bench.ts regional).
 */
import type { ChannelId, Segment } from '../../../core/model';
import { designForChannel } from '../../../core/dsp/designForChannel';
import type { CandidateEvent, Pick } from '../../../core/pick';
import { eventPicks, type PickChannel, type PickSite } from '../../../core/scan/eventPicks';
import { earliestOriginFromP, type SiteCoordinates } from '../../../core/scan/eventOrigin';
import type { ScanSettings } from '../../../core/scan/settings';
import { DEMO_CENTRE, DEMO_MODEL, demoScenario } from '../../../core/synth/demo';
import { offsetPoint } from '../../../core/synth/geometry';
import { Rng } from '../../../core/synth/random';
import { renderStation, type RenderedChannel } from '../../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../../core/synth/truth';
import type { Scenario } from '../../../core/synth/types';

export const REGIONAL_TUNING_SEEDS = [31, 32, 33];
export const REGIONAL_HELD_OUT_SEEDS = [41, 42, 43, 44];

/** The scenario of `seed` (see the module comment); its one event is 'reg'. */
export function regionalScenario(seed: number): Scenario {
  const base = demoScenario(seed);
  const rng = new Rng(seed, 777);
  const a = rng.uniform(0, 2 * Math.PI), r = rng.uniform(150, 300);
  const p = offsetPoint(DEMO_CENTRE.latitude, DEMO_CENTRE.longitude, r * Math.cos(a), r * Math.sin(a));
  const magnitude = Math.round(rng.uniform(3.3, 4.2) * 10) / 10;
  const depthKm = Math.round(rng.uniform(5, 20) * 10) / 10;
  const mechanism = { strike: Math.round(rng.uniform(0, 360)) % 360, dip: Math.round(rng.uniform(35, 89)), rake: Math.round(rng.uniform(-120, 120)) };
  return {
    ...base, end: base.start + 150e6, faults: [], noiseCurve: [{ time: base.start, factor: 1 }],
    events: [{ id: 'reg', type: 'earthquake', origin: base.start + 20e6, latitude: p.latitude, longitude: p.longitude, depthKm, magnitude, mechanism }],
  };
}

function segmentOf(c: RenderedChannel): Segment {
  const id: ChannelId = c.id;
  return {
    id, sampleRate: c.sampleRate, start: c.start, end: c.start + ((c.samples.length - 1) * 1e6) / c.sampleRate, samples: Float64Array.from(c.samples),
    recordStarts: Float64Array.of(c.start), recordFirstSample: Int32Array.of(0), encoding: 5, recordLength: 4096, quality: 'D',
    timing: { qualityMin: null, qualityMax: null, clockLockedRecords: 1, questionableTimeRecords: 0, leapSecondRecords: 0, steimMismatchRecords: 0, records: 1 },
  };
}

/** A rendered scenario's sites: data for eventPicks, coordinates and one event's truth arrivals, by "NET.STA". */
export interface RenderedSites {
  readonly sites: Map<string, PickSite>;
  readonly coords: Map<string, SiteCoordinates>;
  readonly truth: Map<string, TruthArrival[]>;
}

/** The rendered regional event: its scenario, sites and the candidate event for eventPicks. */
export interface RegionalEvent extends RenderedSites {
  readonly scenario: Scenario;
  readonly event: CandidateEvent;
}

/** Each station of `sc` rendered for eventPicks (first sensor), with coordinates and event `eventId`'s truth arrivals. */
export function renderedSites(sc: Scenario, eventId: string): RenderedSites {
  const sites = new Map<string, PickSite>();
  const coords = new Map<string, SiteCoordinates>();
  const truth = new Map<string, TruthArrival[]>();
  for (const st of sc.stations) {
    const rs = renderStation(sc, st.code);
    const key = `${sc.network.code}.${st.code}`;
    truth.set(key, stationTruth(sc, rs).get(eventId)!);
    const chans = rs.channels.filter((c) => c.id.location === rs.channels[0].id.location);
    const pc = (c: RenderedChannel): PickChannel => ({ id: c.id, azimuth: c.spec.azimuth, segments: [segmentOf(c)] });
    const z = chans.find((c) => Math.abs(c.spec.dip) > 45)!;
    const hs = chans.filter((c) => Math.abs(c.spec.dip) <= 45);
    sites.set(key, {
      vertical: pc(z), polarity: z.spec.dip < 0 ? 1 : -1, position: { latitude: st.latitude, longitude: st.longitude },
      horizontals: hs.length === 2 ? [pc(hs[0]), pc(hs[1])] : null,
    });
    coords.set(key, { latitude: st.latitude, longitude: st.longitude, elevationM: st.elevationM });
  }
  return { sites, coords, truth };
}

/**
 * A candidate event `id` whose sites triggered 0.3 s after each true P in `truth` ("NET.STA" to
 * arrivals): about where an STA of 0.5 s reaches its on-ratio.
 */
export function candidateAfterP(truth: ReadonlyMap<string, readonly TruthArrival[]>, id: string): CandidateEvent {
  const triggers = [...truth].map(([key, arr]) => {
    const on = arr.find((a) => a.wave === 'P')!.timeMicros + 300_000;
    const [network, station] = key.split('.');
    return { id: { network, station, location: '', channel: 'HHZ' }, on, off: on + 5e6, peakRatio: 10, peakTime: on, start: on - 10e6, end: on + 30e6, endedBy: 'ratio' as const };
  }).sort((a, b) => a.on - b.on);
  return {
    id, time: triggers[0].on, start: triggers[0].start, end: triggers[triggers.length - 1].end,
    sites: triggers.map((t) => `${t.id.network}.${t.id.station}`), triggers, secondary: [],
  };
}

export function renderRegional(seed: number): RegionalEvent {
  const scenario = regionalScenario(seed);
  const r = renderedSites(scenario, 'reg');
  return { scenario, ...r, event: candidateAfterP(r.truth, 'XX.reg') };
}

/**
 * Pick minus true arrival (s), NaN where none was picked: P at every site, S at each site with
 * horizontals, picked by eventPicks with `settings` as the scan does.
 */
export function regionalErrors(r: RegionalEvent, settings: ScanSettings): { p: number[]; s: number[] } {
  const sosFor = (rate: number) => designForChannel(settings.filter, rate).sos;
  const picks: Pick[] = eventPicks(r.event, r.sites, sosFor, settings,
    (pp) => earliestOriginFromP(pp, r.coords, r.scenario.model ?? DEMO_MODEL, settings.maxPTravelTime));
  const error = (key: string, arr: readonly TruthArrival[], wave: 'P' | 'S') => {
    const a = arr.find((x) => x.wave === wave)!;
    const p = picks.find((k) => `${k.waveformId.network}.${k.waveformId.station}` === key && k.phaseHint === wave);
    return p ? (p.time - a.timeMicros) / 1e6 : NaN;
  };
  return {
    p: [...r.truth].map(([key, arr]) => error(key, arr, 'P')),
    s: [...r.truth].filter(([key]) => r.sites.get(key)!.horizontals).map(([key, arr]) => error(key, arr, 'S')),
  };
}
