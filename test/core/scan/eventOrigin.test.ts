import { describe, expect, it } from 'vitest';
import { DEFAULT_MODEL, firstArrival, locate, MEAN_EARTH_RADIUS_KM } from '../../../core/location';
import type { Pick } from '../../../core/pick';
import { eventOrigin, type SiteCoordinates } from '../../../core/scan/eventOrigin';

// Picks timed from the model's first arrivals (core/location firstArrival, itself checked against
// textbook formulas and a ray shoot in test/core/location) for a known hypocentre; the origin must
// come back at that hypocentre, and its numbers must be locate()'s own converted to QuakeML units
// (QuakeML 1.2 BED: depth and uncertainties in metres, distance in degrees, confidenceLevel 68).

const T0 = 1_772_409_600_000_000;
const SRC = { lat: 43.38, lon: 2.66, depthKm: 9 };
const rad = Math.PI / 180;

function haversineKm(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const h = Math.sin(((lat2 - lat1) * rad) / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(((lon2 - lon1) * rad) / 2) ** 2;
  return 2 * MEAN_EARTH_RADIUS_KM * Math.asin(Math.sqrt(h));
}

const sites = new Map<string, SiteCoordinates>();
const picks: Pick[] = [];
for (let k = 0; k < 6; k++) {
  const a = (2 * Math.PI * k) / 6 + 0.3;
  const lat = SRC.lat + (12 * Math.cos(a)) / 111.2;
  const lon = SRC.lon + (12 * Math.sin(a)) / (111.2 * Math.cos(SRC.lat * rad));
  const key = `XX.S${k}`;
  sites.set(key, { latitude: lat, longitude: lon, elevationM: 0 });
  const d = haversineKm(SRC.lat, SRC.lon, lat, lon);
  for (const wave of ['P', 'S'] as const) {
    const tt = firstArrival(DEFAULT_MODEL, wave, d, SRC.depthKm, 0).time;
    picks.push({
      phaseHint: wave, waveformId: { network: 'XX', station: `S${k}`, location: '00', channel: wave === 'P' ? 'HHZ' : 'HHN' },
      time: T0 + Math.round(tt * 1e6), lowerUncertainty: 0.02, upperUncertainty: 0.04, snr: 20, onset: 'impulsive',
      polarity: wave === 'P' ? 'positive' : null, evaluationMode: 'automatic', evaluationStatus: 'preliminary', questionableTiming: false,
    });
  }
}
const ids = picks.map((_p, i) => `ev.${i}`);

describe('eventOrigin', () => {
  it('locates exact first-arrival times at the true hypocentre (within 50 m and 5 ms)', () => {
    const r = eventOrigin('ev', picks, ids, sites, DEFAULT_MODEL, 'default');
    if (!r.ok) throw new Error(r.message);
    const o = r.origin;
    expect(haversineKm(SRC.lat, SRC.lon, o.latitude, o.longitude)).toBeLessThan(0.05);
    expect(Math.abs(o.depthM - SRC.depthKm * 1000)).toBeLessThan(50);
    expect(Math.abs(o.time - T0)).toBeLessThan(5000);
    expect(o.id).toBe('ev.origin');
    expect(o.depthType).toBe('from location');
    expect(o.evaluationMode).toBe('automatic');
    expect(o.evaluationStatus).toBe('preliminary');
    expect(o.earthModelId).toBe('default');
  });

  it('writes locate()\'s numbers in QuakeML units: metres, the mean of lower and upper uncertainty as sigma, arrivals naming the pick ids', () => {
    const r = eventOrigin('ev', picks, ids, sites, DEFAULT_MODEL, 'default');
    if (!r.ok) throw new Error(r.message);
    const direct = locate(
      [...sites].map(([key, s]) => ({ key, latDeg: s.latitude, lonDeg: s.longitude, elevKm: 0 })),
      picks.map((p) => ({ stationKey: `XX.${p.waveformId.station}`, wave: p.phaseHint, time: p.time, uncertaintyS: 0.03, timingQuestionable: false })),
      { model: DEFAULT_MODEL },
    );
    if (!direct.ok) throw new Error(direct.message);
    const h = direct.value;
    const o = r.origin;
    expect(o.latitude).toBe(h.latDeg);
    expect(o.depthM).toBeCloseTo(h.depthKm * 1000, 9);
    expect(o.depthUncertaintyM).toBeCloseTo(h.depthErrorKm * 1000, 9);
    expect(o.ellipse?.semiMajorM).toBeCloseTo(h.ellipse.semiMajorKm * 1000, 9);
    expect(o.ellipse?.azimuthMajor).toBe(h.ellipse.majorAzimuthDeg);
    expect(o.quality).toEqual({ usedPhaseCount: 12, usedStationCount: 6, standardError: h.rmsS, azimuthalGap: h.gapDeg });
    expect(o.arrivals.map((a) => a.pickId)).toEqual(ids);
    expect(o.arrivals.map((a) => a.distanceDeg)).toEqual(h.arrivals.map((a) => a.distanceDeg));
    expect(o.arrivals.every((a) => a.phase === 'Pg' || a.phase === 'Sg')).toBe(true);
  });

  it('reports why when there are too few phases, and refuses ids that do not match the picks', () => {
    const r = eventOrigin('ev', picks.slice(0, 3), ids.slice(0, 3), sites, DEFAULT_MODEL, 'default');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message.length).toBeGreaterThan(0);
    expect(() => eventOrigin('ev', picks, ids.slice(1), sites, DEFAULT_MODEL, 'default')).toThrow(/pickIds must match picks one to one \(12\), got 11/);
  });
});
