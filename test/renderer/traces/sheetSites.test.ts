import { describe, expect, it } from 'vitest';
import { sheetSites } from '../../../renderer/traces/sheetSites';
import { siteStreams } from '../../../renderer/data/sites';
import type { SiteLocation } from '../../../core/location/fromReview';

/**
 * Great-circle distance on a sphere of the IUGG mean radius 6371.0088 km (haversine formula; Sinnott,
 * "Virtues of the haversine", Sky and Telescope 68(2), 1984, p. 159; from memory). The app measures on
 * the WGS84 ellipsoid (location code's projection); the two differ by well under 0.5 % here.
 */
function haversineKm(a: SiteLocation, b: { latitude: number; longitude: number }): number {
  const r = Math.PI / 180;
  const h = Math.sin(((b.latitude - a.latitude) * r) / 2) ** 2 + Math.cos(a.latitude * r) * Math.cos(b.latitude * r) * Math.sin(((b.longitude - a.longitude) * r) / 2) ** 2;
  return 2 * 6371.0088 * Math.asin(Math.sqrt(h));
}

const at = (latitude: number, longitude: number): SiteLocation => ({ latitude, longitude, elevation: 0 });
// Sites east of (45 N, 7 E) at about 0, 8, 16, ... 72 km, named so that name order is not distance order.
const names = ['K', 'B', 'H', 'A', 'J', 'C', 'G', 'D', 'F', 'E'];
const coords = new Map(names.map((n, i) => [`XX.${n}`, at(45, 7 + (i * 8) / 78.85)]));
const sites = siteStreams(names.map((n) => `XX.${n}.00.HHZ`));
const pick = (site: string, t: number) => ({ channel: `XX.${site}.00.HHZ`, time: t });

describe('sheetSites', () => {
  it('puts sites with picks first in pick order, then the rest nearest first from the epicentre', () => {
    const r = sheetSites(sites, [pick('E', 5e6), pick('J', 3e6), pick('E', 2e6)], coords, { latitude: 45, longitude: 7 }, { count: 0, km: 0 });
    expect(r.reference?.kind).toBe('epicentre');
    expect(r.shown.map((s) => s.streams.site)).toEqual(['XX.E', 'XX.J', 'XX.K', 'XX.B', 'XX.H', 'XX.A', 'XX.C', 'XX.G', 'XX.D', 'XX.F']);
    expect(r.shown[0].firstPick).toBe(2e6);
    expect(r.hidden).toEqual([]);
  });

  it('measures distances as the haversine does, to 0.5 %', () => {
    const epi = { latitude: 45.1, longitude: 7.2 };
    const r = sheetSites(sites, [], coords, epi, { count: 0, km: 0 });
    for (const s of r.shown) {
      const d = haversineKm(coords.get(s.streams.site)!, epi);
      expect(Math.abs(s.distanceKm! - d) / d).toBeLessThan(0.005);
    }
  });

  it('keeps exactly the sites within the distance limit and hides the rest, unknown distances included', () => {
    const withLost = siteStreams([...names.map((n) => `XX.${n}.00.HHZ`), 'XX.Z.00.HHZ']);
    const epi = { latitude: 45, longitude: 7 + 20 / 78.85 }; // 20 km east of K: sites at 0..52 km
    const r = sheetSites(withLost, [], coords, epi, { count: 0, km: 30 });
    const within = names.filter((n) => haversineKm(coords.get(`XX.${n}`)!, epi) <= 30).map((n) => `XX.${n}`).sort();
    expect(within).toHaveLength(7); // 4, 4, 12, 12, 20, 20, 28 km (none within 0.5 % of 30 km)
    expect(r.shown.map((s) => s.streams.site).sort()).toEqual(within);
    expect(r.hidden.map((s) => s.streams.site)).toContain('XX.Z');
    expect(r.hidden.find((s) => s.streams.site === 'XX.Z')!.distanceKm).toBeNull();
    expect(r.shown.length + r.hidden.length).toBe(11);
  });

  it('measures from the first-arriving site when the event is not located, and applies the count limit after the distance', () => {
    const r = sheetSites(sites, [pick('D', 9e6), pick('H', 4e6), pick('A', 6e6)], coords, null, { count: 3, km: 20 });
    expect(r.reference).toMatchObject({ kind: 'first-arrival', site: 'XX.H' });
    const d = r.shown.map((s) => s.distanceKm!);
    expect(r.shown.map((s) => s.streams.site)).toEqual(['XX.H', 'XX.A', 'XX.B']);
    expect(d[0]).toBe(0);
    expect(d[1]).toBeCloseTo(8, 1);
    expect(r.hidden.map((s) => s.streams.site)).toContain('XX.D'); // picked, but 40 km away
  });

  it('has no reference point and orders by name without picks or location; a distance limit then hides everything', () => {
    const r = sheetSites(sites, [], coords, null, { count: 0, km: 0 });
    expect(r.reference).toBeNull();
    expect(r.shown.map((s) => s.streams.site)).toEqual(['A', 'B', 'C', 'D', 'E', 'F', 'G', 'H', 'J', 'K'].map((n) => `XX.${n}`));
    expect(sheetSites(sites, [], coords, null, { count: 0, km: 50 }).shown).toEqual([]);
  });

  it('rejects a negative or fractional count and a negative or infinite distance', () => {
    expect(() => sheetSites(sites, [], coords, null, { count: -1, km: 0 })).toThrow(RangeError);
    expect(() => sheetSites(sites, [], coords, null, { count: 1.5, km: 0 })).toThrow(/count limit/);
    expect(() => sheetSites(sites, [], coords, null, { count: 0, km: -3 })).toThrow(/distance limit/);
    expect(() => sheetSites(sites, [], coords, null, { count: 0, km: Infinity })).toThrow(RangeError);
  });
});
