import { describe, expect, it } from 'vitest';
import {
  fromLocalKm, kmToDegrees, localProjection, meridionalRadiusKm, primeVerticalRadiusKm, toLocalKm,
} from '../../../core/location/projection';
import { rng, vincentyKm } from './reference';

const dms = (d: number, m: number, s: number): number => Math.sign(d) * (Math.abs(d) + m / 60 + s / 3600);

describe('projection', () => {
  it('the test\'s Vincenty reproduces the Flinders Peak - Buninyong geodesic, 54 972.271 m', () => {
    // Geoscience Australia's worked example of Vincenty's inverse formula (values from memory):
    // Flinders Peak 37 57 03.72030 S, 144 25 29.52440 E; Buninyong 37 39 10.15610 S, 143 55 35.38390 E.
    const s = vincentyKm(-dms(37, 57, 3.7203), dms(144, 25, 29.5244), -dms(37, 39, 10.1561), dms(143, 55, 35.3839));
    expect(Math.abs(s - 54.972271)).toBeLessThan(1e-6);
  });

  it('radii of curvature give the published lengths of a degree of latitude and longitude', () => {
    // Series for WGS84 (m per degree; e.g. the common "length of a degree" formulas, from memory):
    // latitude 111132.954 - 559.822 cos 2phi + 1.175 cos 4phi; longitude 111412.84 cos phi - 93.5 cos 3phi + 0.118 cos 5phi.
    for (const lat of [0, 15, 30, 45, 46.5, 60, 75]) {
      const p = lat * Math.PI / 180;
      const latM = 111132.954 - 559.822 * Math.cos(2 * p) + 1.175 * Math.cos(4 * p);
      const lonM = 111412.84 * Math.cos(p) - 93.5 * Math.cos(3 * p) + 0.118 * Math.cos(5 * p);
      // The series' coefficients are rounded: they agree with the exact radii to a few cm (3e-7).
      expect(Math.abs(meridionalRadiusKm(lat) * Math.PI / 180 * 1000 - latM)).toBeLessThan(0.05);
      expect(Math.abs(primeVerticalRadiusKm(lat) * Math.cos(p) * Math.PI / 180 * 1000 - lonM)).toBeLessThan(0.05);
    }
  });

  it('distances between points within 60 km of the origin agree with Vincenty to 1.5e-4 (under 9 m)', () => {
    const r = rng(5);
    let worst = 0;
    for (const [lat0, lon0] of [[46.2, 7.6], [-37.8, 144.2], [0.3, -78.5], [64.1, -21.9], [35.7, 139.7]]) {
      const proj = localProjection(lat0, lon0);
      for (let i = 0; i < 200; i++) {
        const pts = [0, 1].map(() => {
          const ang = 2 * Math.PI * r();
          const d = 60 * Math.sqrt(r());
          return [d * Math.sin(ang), d * Math.cos(ang)];
        });
        const g = pts.map(([e, n]) => fromLocalKm(proj, e, n, [0, 0]));
        const flat = Math.hypot(pts[0][0] - pts[1][0], pts[0][1] - pts[1][1]);
        const geo = vincentyKm(g[0][0], g[0][1], g[1][0], g[1][1]);
        if (geo > 1) worst = Math.max(worst, Math.abs(flat - geo) / geo);
        expect(Math.abs(flat - geo)).toBeLessThan(0.009);
      }
      // distances from the origin are much closer still
      for (const [e, n] of [[30, 40], [-50, 10], [0, -55]]) {
        const g = fromLocalKm(proj, e, n, [0, 0]);
        expect(Math.abs(vincentyKm(lat0, lon0, g[0], g[1]) - Math.hypot(e, n))).toBeLessThan(0.006);
      }
    }
    expect(worst).toBeLessThan(1.5e-4);
  });

  it('fromLocalKm inverts toLocalKm, across the antimeridian too', () => {
    const r = rng(9);
    for (const [lat0, lon0] of [[46.2, 7.6], [-17.5, 179.9], [70, -179.8]]) {
      const proj = localProjection(lat0, lon0);
      for (let i = 0; i < 100; i++) {
        const e = 400 * (r() - 0.5);
        const n = 400 * (r() - 0.5);
        const [lat, lon] = fromLocalKm(proj, e, n, [0, 0]);
        expect(lon).toBeGreaterThan(-180);
        expect(lon).toBeLessThanOrEqual(180);
        const back = toLocalKm(proj, lat, lon, [0, 0]);
        expect(Math.abs(back[0] - e) + Math.abs(back[1] - n)).toBeLessThan(1e-8);
      }
    }
    expect(Array.from(toLocalKm(localProjection(10, 20), 10, 20))).toEqual([0, 0]);
  });

  it('kmToDegrees uses the mean earth radius 6371.0088 km: 111.195 km is 1 degree', () => {
    expect(kmToDegrees(6371.0088 * Math.PI / 180)).toBeCloseTo(1, 12);
    expect(kmToDegrees(100)).toBeCloseTo(0.8993, 4);
  });

  it('rejects latitudes outside [-90, 90] and poles as origins', () => {
    expect(() => localProjection(95, 0)).toThrow(new RangeError('latitude must be in [-90, 90] degrees, got 95'));
    expect(() => localProjection(90, 0)).toThrow('projection origin latitude must be within 89.9 degrees of the equator, got 90');
    expect(() => toLocalKm(localProjection(0, 0), NaN, 0)).toThrow('latitude must be in [-90, 90] degrees, got NaN');
  });
});
