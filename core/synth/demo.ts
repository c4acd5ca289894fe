/**
 * The demo scenario: an invented local network in an invented area and one invented night.
 *
 * Everything here is made up. The network code is XX, the code FDSN reserves for test data and
 * examples ("This code is not real", FDSN Source Identifiers v1.0, Network codes, Special network
 * codes), so it cannot be mistaken for a real network; the station codes and site names are
 * invented. The area, about 60 x 60 km, is placed at 43.38 N 2.66 E only to give it plausible
 * coordinates; nothing about the real ground there is modelled.
 */
import { checkVelocityModel } from '../location/velocityModel';
import { microsFromIso, type Micros } from '../time';
import { offsetPoint } from './geometry';
import type { Mechanism } from './radiation';
import { Rng } from './random';
import {
  accelerometerSensor, broadbandSensor, DIGITIZER_GAIN_40VPP, FULL_SCALE_24BIT, shortPeriodSensor, type Instrument,
} from './response';
import { SCENARIO_STRESS_DROP_PA } from './source';
import type { ChannelSpec, EventSpec, FaultSpec, Scenario, StationSpec } from './types';

export const DEMO_SEED = 20261114;
/**
 * Version of the generator's output: raised whenever the same seed would give other samples, so a
 * demo folder written by an earlier version is written again (electron/host/service.ts). 2: Q held
 * constant up to 100 Hz on every channel (2 December 2026; 1 before).
 */
export const GENERATOR_VERSION = 2;
export const DEMO_NETWORK = 'XX';
/** Centre of the invented area, degrees. */
export const DEMO_CENTRE = { latitude: 43.38, longitude: 2.66 };
export const DEMO_START = microsFromIso('2026-11-14T20:00:00Z');
export const DEMO_END = microsFromIso('2026-11-15T06:00:00Z');

/**
 * The scenario's 1-D model: four layers over a half-space, Vp/Vs = 1.73 (common practice for the
 * crust), depths below sea level. Invented values inside the usual crustal range.
 */
export const DEMO_MODEL = checkVelocityModel([
  { topKm: 0, vp: 5.0, vs: 2.89 },
  { topKm: 3, vp: 5.9, vs: 3.41 },
  { topKm: 12, vp: 6.3, vs: 3.64 },
  { topKm: 24, vp: 6.8, vs: 3.93 },
  { topKm: 32, vp: 8.05, vs: 4.65 },
], 'demo model');

function threeComponent(band: string, location: string, rate: number, inst: Instrument, h: 'NE' | '12' = 'NE', az1 = 0): ChannelSpec[] {
  const z: ChannelSpec = { location, code: `${band}Z`, azimuth: 0, dip: -90, sampleRate: rate, instrument: inst };
  if (h === 'NE') {
    return [z,
      { location, code: `${band}N`, azimuth: 0, dip: 0, sampleRate: rate, instrument: inst },
      { location, code: `${band}E`, azimuth: 90, dip: 0, sampleRate: rate, instrument: inst }];
  }
  return [z,
    { location, code: `${band}1`, azimuth: az1, dip: 0, sampleRate: rate, instrument: inst },
    { location, code: `${band}2`, azimuth: (az1 + 90) % 360, dip: 0, sampleRate: rate, instrument: inst }];
}

interface StationPlan {
  code: string; site: string; north: number; east: number; elevationM: number;
  channels: ChannelSpec[]; siteMs: number; eveningWeight: number; siteTopHz: number;
}

const BB = broadbandSensor();
/** KIRN's digitizer runs at 32 times the usual gain (a 1.25 V peak-to-peak range): it clips first, and the largest local event holds it at full scale for many samples. */
const BB_HIGH_GAIN = broadbandSensor(DIGITIZER_GAIN_40VPP * 32, FULL_SCALE_24BIT);

const STATIONS: StationPlan[] = [
  { code: 'BRAE', site: 'Braemor ridge', north: 22, east: -18, elevationM: 640, channels: threeComponent('HH', '00', 100, BB), siteMs: 4e-9, eveningWeight: 0.3, siteTopHz: 15 },
  { code: 'CALD', site: 'Caldwick farm', north: 25, east: 8, elevationM: 420, channels: threeComponent('HH', '00', 100, BB), siteMs: 1.2e-8, eveningWeight: 0.8, siteTopHz: 18 },
  {
    code: 'DUNM', site: 'Dunmarr vault', north: 2, east: 1, elevationM: 510,
    channels: [...threeComponent('HH', '00', 100, BB), ...threeComponent('HN', '10', 100, accelerometerSensor())],
    siteMs: 6e-9, eveningWeight: 0.5, siteTopHz: 15,
  },
  { code: 'ELRO', site: 'Elrow quarry road', north: -5, east: 24, elevationM: 380, channels: threeComponent('HH', '00', 200, BB), siteMs: 1.5e-8, eveningWeight: 0.9, siteTopHz: 20 },
  { code: 'FENW', site: 'Fenwold', north: -24, east: 20, elevationM: 300, channels: [{ location: '', code: 'EHZ', azimuth: 0, dip: -90, sampleRate: 100, instrument: shortPeriodSensor() }], siteMs: 8e-9, eveningWeight: 0.6, siteTopHz: 15 },
  { code: 'GARS', site: 'Garsett borehole', north: -26, east: -6, elevationM: 720, channels: threeComponent('HH', '00', 100, BB, '12', 20), siteMs: 3e-9, eveningWeight: 0.2, siteTopHz: 12 },
  { code: 'HOLT', site: 'Holtby hill', north: -8, east: -25, elevationM: 880, channels: threeComponent('BH', '00', 40, BB), siteMs: 5e-9, eveningWeight: 0.3, siteTopHz: 12 },
  { code: 'KIRN', site: 'Kirnan', north: 10, east: 20, elevationM: 460, channels: threeComponent('HH', '00', 100, BB_HIGH_GAIN), siteMs: 7e-9, eveningWeight: 0.5, siteTopHz: 15 },
  { code: 'LUNE', site: 'Lunefell sawmill', north: 12, east: -8, elevationM: 590, channels: threeComponent('HH', '00', 100, BB), siteMs: 2e-8, eveningWeight: 1, siteTopHz: 20 },
  { code: 'MARW', site: 'Marwick school', north: -14, east: 6, elevationM: 350, channels: threeComponent('HH', '00', 100, BB), siteMs: 2.5e-8, eveningWeight: 1, siteTopHz: 20 },
  { code: 'NETH', site: 'Netherby', north: 30, east: -3, elevationM: 690, channels: threeComponent('HH', '00', 100, BB), siteMs: 6e-9, eveningWeight: 0.4, siteTopHz: 15 },
  { code: 'OSKE', site: 'Oskerby', north: -28, east: 29, elevationM: 260, channels: threeComponent('HH', '00', 100, BB), siteMs: 1e-8, eveningWeight: 0.7, siteTopHz: 18 },
  { code: 'PERR', site: 'Perrick', north: 27, east: 27, elevationM: 350, channels: threeComponent('HH', '00', 100, BB), siteMs: 9e-9, eveningWeight: 0.6, siteTopHz: 15 },
  { code: 'RAVN', site: 'Ravensgill', north: -3, east: -12, elevationM: 800, channels: threeComponent('HH', '00', 100, BB), siteMs: 4e-9, eveningWeight: 0.3, siteTopHz: 12 },
];

const t = (iso: string): Micros => microsFromIso(iso);

function at(north: number, east: number): { latitude: number; longitude: number } {
  const p = offsetPoint(DEMO_CENTRE.latitude, DEMO_CENTRE.longitude, north, east);
  return { latitude: Math.round(p.latitude * 1e5) / 1e5, longitude: Math.round(p.longitude * 1e5) / 1e5 };
}

function randomMechanism(rng: Rng): Mechanism {
  const strike = Math.round(rng.uniform(0, 360)) % 360;
  const dip = Math.round(rng.uniform(35, 89));
  const u = rng.next();
  const rake = Math.round(u < 0.4 ? rng.uniform(-30, 30) : u < 0.6 ? rng.uniform(60, 120) : rng.uniform(-120, -60));
  return { strike, dip, rake };
}

/** The hand-placed events (the awkward cases) of the night. */
function specialEvents(): EventSpec[] {
  const kirn = STATIONS.find((s) => s.code === 'KIRN')!;
  return [
    { id: 'blast-2041', type: 'explosion', origin: t('2026-11-14T20:41:12.350Z'), ...at(-18, 12), depthKm: -0.3, magnitude: 1.9, mechanism: null, note: 'quarry-blast-like explosion at the surface' },
    { id: 'eq-2113', type: 'earthquake', origin: t('2026-11-14T21:13:31.800Z'), ...at(8, -3), depthKm: 7.5, magnitude: 1.3, mechanism: { strike: 130, dip: 70, rake: -10 }, note: 'during the cultural noise at LUNE' },
    { id: 'eq-2317a', type: 'earthquake', origin: t('2026-11-14T23:17:48.600Z'), ...at(kirn.north + 0.8, kirn.east - 0.9), depthKm: 4.5, magnitude: 3.4, mechanism: { strike: 305, dip: 62, rake: -95 }, note: 'largest local event, clips KIRN' },
    { id: 'eq-2318b', type: 'earthquake', origin: t('2026-11-14T23:18:21.950Z'), ...at(kirn.north + 1.3, kirn.east - 0.4), depthKm: 5.2, magnitude: 2.2, mechanism: { strike: 300, dip: 58, rake: -80 }, note: 'aftershock 33 s later, in the coda of the first' },
    { id: 'eq-0015', type: 'earthquake', origin: t('2026-11-15T00:15:40.200Z'), ...at(20, 16), depthKm: 9.0, magnitude: 1.8, mechanism: { strike: 40, dip: 80, rake: 170 }, note: 'during the telemetry gap at PERR' },
    { id: 'reg-0233', type: 'earthquake', origin: t('2026-11-15T02:33:05.000Z'), ...at(-205, -105), depthKm: 12, magnitude: 3.8, mechanism: { strike: 95, dip: 45, rake: 90 }, note: 'regional event beyond the network (head waves first)' },
  ];
}

/** Background local earthquakes drawn from the seed: Gutenberg-Richter b = 1 between M0.5 and M3.0. */
function randomEvents(rng: Rng, taken: Micros[], count: number): EventSpec[] {
  const out: EventSpec[] = [];
  const span = DEMO_END - DEMO_START;
  while (out.length < count) {
    const origin = DEMO_START + 120e6 + Math.round(rng.next() * (span - 420e6) / 1e4) * 1e4;
    if (taken.some((x) => Math.abs(x - origin) < 150e6)) continue;
    taken.push(origin);
    const u = rng.next();
    const magnitude = Math.round((0.5 - Math.log10(1 - u * (1 - 10 ** -2.5))) * 10) / 10;
    const inside = rng.next() < 0.8;
    let north: number, east: number;
    if (inside) {
      north = rng.uniform(-30, 30);
      east = rng.uniform(-30, 30);
    } else {
      const a = rng.uniform(0, 2 * Math.PI), r = rng.uniform(36, 55);
      north = r * Math.cos(a);
      east = r * Math.sin(a);
    }
    const depthKm = Math.round(rng.uniform(1, 20) * 10) / 10;
    out.push({
      id: '', type: 'earthquake', origin, ...at(north, east), depthKm, magnitude, mechanism: randomMechanism(rng),
      note: inside ? undefined : 'outside the network',
    });
  }
  return out;
}

function faults(): FaultSpec[] {
  return [
    { kind: 'culturalBurst', station: 'LUNE', start: t('2026-11-14T21:05:00Z'), end: t('2026-11-14T21:21:00Z'), velocityMs: 4e-7, toneHz: 7.3 },
    { kind: 'spike', channel: 'XX.BRAE.00.HHZ', time: t('2026-11-14T20:52:17.43Z'), counts: 182_000 },
    { kind: 'spike', channel: 'XX.CALD.00.HHN', time: t('2026-11-14T22:40:05.11Z'), counts: -95_000 },
    { kind: 'spike', channel: 'XX.HOLT.00.BHZ', time: t('2026-11-15T01:22:44.975Z'), counts: 310_000 },
    { kind: 'spike', channel: 'XX.OSKE.00.HHE', time: t('2026-11-15T03:03:03.03Z'), counts: 77_000 },
    { kind: 'spike', channel: 'XX.NETH.00.HHZ', time: t('2026-11-15T04:44:10.5Z'), counts: -240_000 },
    { kind: 'spike', channel: 'XX.ELRO.00.HHZ', time: t('2026-11-15T05:12:30.005Z'), counts: 150_000 },
    { kind: 'gap', station: 'PERR', start: t('2026-11-15T00:12:00Z'), end: t('2026-11-15T00:19:30Z') },
    { kind: 'duplicateRecords', station: 'NETH', start: t('2026-11-15T03:50:00Z'), end: t('2026-11-15T04:20:00Z') },
    { kind: 'deadChannel', channel: 'XX.RAVN.00.HHE', value: -211 },
    { kind: 'reversedPolarity', channel: 'XX.OSKE.00.HHZ' },
    { kind: 'clockOffset', station: 'MARW', start: t('2026-11-15T01:05:00Z'), end: t('2026-11-15T03:40:00Z'), offsetMicros: 750_000, timingQuality: 10 },
  ];
}

/** The demo scenario for `seed` (the shipped demo uses DEMO_SEED). */
export function demoScenario(seed = DEMO_SEED): Scenario {
  const rng = new Rng(seed);
  const stations: StationSpec[] = STATIONS.map((s) => ({
    code: s.code, site: s.site, ...at(s.north, s.east), elevationM: s.elevationM, channels: s.channels,
    noise: { siteMs: s.siteMs, eveningWeight: s.eveningWeight, microseismMs: 6e-8 * rng.uniform(0.7, 1.4), siteTopHz: s.siteTopHz },
    kappaS: Math.round(rng.uniform(0.015, 0.04) * 1000) / 1000,
    amplitudeTermLog10: Math.round(rng.uniform(-0.1, 0.1) * 100) / 100,
  }));
  const special = specialEvents();
  const background = randomEvents(rng, special.map((e) => e.origin), 21);
  const events = [...special, ...background]
    .sort((a, b) => a.origin - b.origin)
    .map((e, i) => (e.id ? e : { ...e, id: `eq-${String(i + 1).padStart(2, '0')}` }));
  return {
    name: 'Corran Hills demo night (invented)',
    seed,
    network: { code: DEMO_NETWORK, description: 'Corran Hills local network (invented demo network)' },
    start: DEMO_START,
    end: DEMO_END,
    model: DEMO_MODEL,
    stations,
    events,
    faults: faults(),
    noiseCurve: [
      { time: t('2026-11-14T20:00:00Z'), factor: 2.5 },
      { time: t('2026-11-14T22:00:00Z'), factor: 1.8 },
      { time: t('2026-11-14T23:30:00Z'), factor: 1.2 },
      { time: t('2026-11-15T01:00:00Z'), factor: 1.0 },
      { time: t('2026-11-15T04:30:00Z'), factor: 1.0 },
      { time: t('2026-11-15T05:30:00Z'), factor: 1.6 },
      { time: t('2026-11-15T06:00:00Z'), factor: 2.0 },
    ],
    attenuation: { qP: 400, qS: 250, codaQ0: 100, codaEta: 0.8 },
    stressDropPa: SCENARIO_STRESS_DROP_PA,
  };
}
