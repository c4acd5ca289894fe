import { describe, expect, it } from 'vitest';
import { stationDistance } from '../../../core/magnitude/distance';

describe('stationDistance', () => {
  it('gives 11.1133 km for 0.1° of latitude and 7.8847 km for 0.1° of longitude at 45° N (WGS84 degree lengths 111.132 and 78.847 km at 45°; values from memory)', () => {
    const ev = { latitude: 45, longitude: 10, depthKm: 0 };
    expect(stationDistance(ev, { latitude: 45.1, longitude: 10, elevationM: 0 }).epicentralKm).toBeCloseTo(11.1133, 2);
    expect(stationDistance(ev, { latitude: 45, longitude: 10.1, elevationM: 0 }).epicentralKm).toBeCloseTo(7.8847, 2);
  });
  it('adds the event depth below sea level and the station elevation above it: 3-4-5', () => {
    const ev = { latitude: 0, longitude: 0, depthKm: 3.5 };
    const st = { latitude: 0, longitude: 4 / 111.3195, elevationM: 500 };
    const d = stationDistance(ev, st);
    expect(d.epicentralKm).toBeCloseTo(4, 3);
    expect(d.hypocentralKm).toBeCloseTo(Math.hypot(d.epicentralKm, 4), 12);
  });
  it('rejects a non-finite depth', () => {
    expect(() => stationDistance({ latitude: 0, longitude: 0, depthKm: NaN }, { latitude: 0, longitude: 0, elevationM: 0 })).toThrow(/event depth must be finite km, got NaN/);
  });
});
