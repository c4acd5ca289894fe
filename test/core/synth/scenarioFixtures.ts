/**
 * Small scenarios for the synthetic-seismogram tests: a minute or two of records at a few stations
 * around one event, so that the arrivals are known and the tests run in seconds.
 */
import { DEMO_MODEL } from '../../../core/synth/demo';
import { offsetPoint } from '../../../core/synth/geometry';
import type { Mechanism } from '../../../core/synth/radiation';
import { accelerometerSensor, broadbandSensor, shortPeriodSensor } from '../../../core/synth/response';
import type { ChannelSpec, EventSpec, FaultSpec, Scenario, StationSpec } from '../../../core/synth/types';
import { microsFromIso } from '../../../core/time';

export const T0 = microsFromIso('2026-03-01T10:00:00Z');
const LAT = 43.38, LON = 2.66;

function three(band: string, loc: string, rate: number, inst = broadbandSensor(), az1 = 0, h: 'NE' | '12' = 'NE'): ChannelSpec[] {
  const c = h === 'NE' ? ['N', 'E'] : ['1', '2'];
  return [
    { location: loc, code: `${band}Z`, azimuth: 0, dip: -90, sampleRate: rate, instrument: inst },
    { location: loc, code: `${band}${c[0]}`, azimuth: az1, dip: 0, sampleRate: rate, instrument: inst },
    { location: loc, code: `${band}${c[1]}`, azimuth: (az1 + 90) % 360, dip: 0, sampleRate: rate, instrument: inst },
  ];
}

/** Stations on a ring of `radiusKm` around the centre, every 360/n degrees (first one due north). */
export function ringStations(n: number, radiusKm: number): StationSpec[] {
  return Array.from({ length: n }, (_, k) => {
    const a = (2 * Math.PI * k) / n;
    const p = offsetPoint(LAT, LON, radiusKm * Math.cos(a), radiusKm * Math.sin(a));
    let channels = three('HH', '00', 100);
    if (k === 1) channels = three('HH', '00', 100, broadbandSensor(), 20, '12');
    if (k === 2) channels = [...three('HH', '00', 200)];
    if (k === 3) channels = [...three('HH', '00', 100), ...three('HN', '10', 100, accelerometerSensor())];
    if (k === 4) channels = [{ location: '', code: 'EHZ', azimuth: 0, dip: -90, sampleRate: 100, instrument: shortPeriodSensor() }];
    return {
      code: `T${String(k).padStart(2, '0')}`, site: 'test', latitude: p.latitude, longitude: p.longitude, elevationM: 0, channels,
      noise: { siteMs: 5e-9, eveningWeight: 0, microseismMs: 3e-8, siteTopHz: 15 }, kappaS: 0.02, amplitudeTermLog10: 0,
    };
  });
}

export function quake(id: string, secondsAfterStart: number, magnitude: number, depthKm: number, mechanism: Mechanism | null, northKm = 0, eastKm = 0): EventSpec {
  const p = offsetPoint(LAT, LON, northKm, eastKm);
  return {
    id, type: mechanism ? 'earthquake' : 'explosion', origin: T0 + Math.round(secondsAfterStart * 1e6),
    latitude: p.latitude, longitude: p.longitude, depthKm, magnitude, mechanism,
  };
}

export function tinyScenario(stations: StationSpec[], events: EventSpec[], seconds = 60, faults: FaultSpec[] = []): Scenario {
  return {
    name: 'test', seed: 1234, network: { code: 'XX', description: 'test' }, start: T0, end: T0 + seconds * 1e6,
    model: DEMO_MODEL, stations, events, faults, noiseCurve: [],
    attenuation: { qP: 400, qS: 250, codaQ0: 100, codaEta: 0.8 }, stressDropPa: 3e6,
  };
}
