import { describe, expect, it } from 'vitest';
import { componentOf, distanceAzimuth, EARTH_RADIUS_KM, offsetPoint, rayMotion } from '../../../core/synth/geometry';
import { python } from './python';

const S30 = 0.5, C30 = Math.sqrt(3) / 2;

describe('geometry', () => {
  it('distanceAzimuth: a degree of latitude is 2πR/360 km; due east on the equator is azimuth 90, back-azimuth 270', () => {
    const d = distanceAzimuth(10, 5, 11, 5);
    expect(d.distanceKm).toBeCloseTo((2 * Math.PI * EARTH_RADIUS_KM) / 360, 9);
    expect(d.azimuthDeg).toBeCloseTo(0, 9);
    const e = distanceAzimuth(0, 0, 0, 1);
    expect(e.azimuthDeg).toBeCloseTo(90, 9);
    expect(e.backAzimuthDeg).toBeCloseTo(270, 9);
  });

  it('distanceAzimuth agrees with the spherical formulas evaluated by numpy (law of cosines, atan2 azimuth) to 1 m and 1e-6°', () => {
    const pts = [[43.38, 2.66, 41.5, 1.6], [43.1, 2.9, 43.6, 2.2], [-33.9, 151.2, -34.1, 150.9]];
    const ref = python<number[][]>(`
R = 6371.0
out = []
for la1, lo1, la2, lo2 in inp:
    p1, p2, l1, l2 = np.radians([la1, la2, lo1, lo2])
    c = np.sin(p1)*np.sin(p2) + np.cos(p1)*np.cos(p2)*np.cos(l2-l1)
    d = R*np.arccos(np.clip(c, -1, 1))
    az = np.degrees(np.arctan2(np.sin(l2-l1)*np.cos(p2), np.cos(p1)*np.sin(p2)-np.sin(p1)*np.cos(p2)*np.cos(l2-l1))) % 360
    out.append([float(d), float(az)])
print(json.dumps(out))`, pts);
    pts.forEach((p, k) => {
      const d = distanceAzimuth(p[0], p[1], p[2], p[3]);
      expect(Math.abs(d.distanceKm - ref[k][0])).toBeLessThan(1e-3);
      expect(Math.abs(d.azimuthDeg - ref[k][1])).toBeLessThan(1e-6);
    });
  });

  it('offsetPoint moves 10 km north and 10 km east to points 10 km away at azimuths 0 and ~90', () => {
    const n = offsetPoint(43.38, 2.66, 10, 0), e = offsetPoint(43.38, 2.66, 0, 10);
    expect(distanceAzimuth(43.38, 2.66, n.latitude, n.longitude).distanceKm).toBeCloseTo(10, 6);
    expect(distanceAzimuth(43.38, 2.66, e.latitude, e.longitude).distanceKm).toBeCloseTo(10, 3);
    expect(distanceAzimuth(43.38, 2.66, e.latitude, e.longitude).azimuthDeg).toBeCloseTo(90, 1);
  });

  it('a compressional P from an event due east, incidence 30°, moves the ground up cos 30° and west sin 30° (by hand)', () => {
    const m = rayMotion(1, 0, 0, 30, 90);
    expect(m.up).toBeCloseTo(C30, 12);
    expect(m.east).toBeCloseTo(-S30, 12);
    expect(m.north).toBeCloseTo(0, 12);
  });

  it('a positive SV from an event due north, incidence 30°, moves the ground up sin 30° and north (towards the source) cos 30°', () => {
    const m = rayMotion(0, 1, 0, 30, 0);
    expect(m.up).toBeCloseTo(S30, 12);
    expect(m.north).toBeCloseTo(C30, 12);
    expect(m.east).toBeCloseTo(0, 12);
  });

  it('a positive SH from an event due north moves the ground west (90° clockwise from south, the direction away from the source)', () => {
    const m = rayMotion(0, 0, 1, 10, 0);
    expect(m.east).toBeCloseTo(-1, 12);
    expect(m.north).toBeCloseTo(0, 12);
    expect(m.up).toBeCloseTo(0, 12);
  });

  it('componentOf projects onto SEED orientations: dip -90 is up, azimuth 20° and 110° horizontals by hand', () => {
    const m = { up: 2, north: 3, east: -1 };
    expect(componentOf(m, 0, -90)).toBeCloseTo(2, 12);
    expect(componentOf(m, 0, 90)).toBeCloseTo(-2, 12);
    const a = 20 * Math.PI / 180;
    expect(componentOf(m, 20, 0)).toBeCloseTo(3 * Math.cos(a) - Math.sin(a), 12);
    expect(componentOf(m, 110, 0)).toBeCloseTo(-3 * Math.sin(a) - Math.cos(a), 12);
    // The two rotated horizontals keep the horizontal energy.
    expect(componentOf(m, 20, 0) ** 2 + componentOf(m, 110, 0) ** 2).toBeCloseTo(10, 12);
  });

  it('rejects latitudes beyond ±90', () => {
    expect(() => distanceAzimuth(91, 0, 0, 0)).toThrow(/lat1 must be in \[-90, 90\]/);
  });
});
