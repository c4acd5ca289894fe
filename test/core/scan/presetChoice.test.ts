import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { channelsOf, parseStationXml } from '../../../core/stationxml';
import { choosePreset, NEAR_SPREAD_KM, pairDistancesKm } from '../../../core/scan/presetChoice';

const here = dirname(fileURLToPath(import.meta.url));
const REAL = resolve(here, '..', '..', '..', '..', 'shared', 'data', 'real-microseismic');

/** One position per station of a StationXML file (the first channel's). */
function stationPositions(path: string): { latitude: number; longitude: number }[] {
  const byStation = new Map<string, { latitude: number; longitude: number }>();
  for (const c of channelsOf(parseStationXml(readFileSync(path, 'utf8'), path))) {
    const key = `${c.id.network}.${c.id.station}`;
    if (!byStation.has(key)) byStation.set(key, { latitude: c.latitude, longitude: c.longitude });
  }
  return [...byStation.values()];
}

/**
 * Reference: the pairwise haversine distances computed by numpy 2.4 from the same positions
 * (haversine formula, Sinnott 1984, Sky & Telescope 68(2):159; Earth radius 6371.0 km, the IUGG
 * mean radius), written here independently of core/pick/coincidence.
 */
function numpyPairs(sites: { latitude: number; longitude: number }[]): { median: number; max: number } {
  const script = [
    'import json, sys, numpy as np',
    's = json.load(sys.stdin)',
    'lat = np.radians([p["latitude"] for p in s]); lon = np.radians([p["longitude"] for p in s])',
    'dlat = lat[:, None] - lat[None, :]; dlon = lon[:, None] - lon[None, :]',
    'h = np.sin(dlat / 2) ** 2 + np.cos(lat)[:, None] * np.cos(lat)[None, :] * np.sin(dlon / 2) ** 2',
    'd = 2 * 6371.0 * np.arcsin(np.sqrt(np.minimum(1, h)))[np.triu_indices(len(s), 1)]',
    'print(json.dumps({"median": float(np.median(d)), "max": float(np.max(d))}))',
  ].join('\n');
  return JSON.parse(execFileSync('python3', ['-c', script], { input: JSON.stringify(sites) }).toString()) as { median: number; max: number };
}

describe('choosing the scan settings from the network', () => {
  it('measures the distances between all pairs of sites as numpy computes them by the haversine formula', () => {
    const sites = [
      { latitude: 43.40, longitude: 2.30 }, { latitude: 43.55, longitude: 2.62 },
      { latitude: 43.21, longitude: 2.51 }, { latitude: 43.47, longitude: 2.05 }, { latitude: 43.33, longitude: 2.80 },
    ];
    const ref = numpyPairs(sites);
    const choice = choosePreset(sites);
    expect(pairDistancesKm(sites).length).toBe(10);
    expect(choice.spreadKm).toBeCloseTo(ref.median, 9);
    expect(choice.apertureKm).toBeCloseTo(ref.max, 9);
    // One degree of latitude on a sphere of radius 6371.0 km is 2π·6371/360 = 111.195 km (arithmetic).
    expect(pairDistancesKm([{ latitude: 10, longitude: 20 }, { latitude: 11, longitude: 20 }])[0]).toBeCloseTo(111.195, 3);
  });

  it('gives the real mine network (11 sites within about 0.6 km, one 3.4 km away) the near-source settings', () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL} (see DEVELOPERS.md)`);
    const sites = stationPositions(join(REAL, 'stations', 'inv.xml'));
    expect(sites.length).toBe(12);
    const choice = choosePreset(sites);
    const ref = numpyPairs(sites);
    expect(choice.spreadKm).toBeCloseTo(ref.median, 9);
    expect(choice.apertureKm).toBeCloseTo(ref.max, 9);
    // The data's README: sources 50-250 m from the stations. Station 1 lies 3.4 km from the rest, so
    // the widest pair alone would call this network wide; the median does not.
    expect(choice.apertureKm).toBeGreaterThan(NEAR_SPREAD_KM);
    expect(choice.spreadKm).toBeLessThan(1);
    expect(choice.preset).toBe('near');
    expect(choice.reason).toContain('12 sites');
  });

  it('gives a network tens of kilometres across the local-earthquake settings, and decides at a median of 3 km', () => {
    const wide = [{ latitude: 43.0, longitude: 2.0 }, { latitude: 43.3, longitude: 2.4 }, { latitude: 43.1, longitude: 2.6 }];
    expect(choosePreset(wide).preset).toBe('local');
    // Two sites 2.9 and 3.1 km apart along a meridian (0.0261 and 0.0279 degrees at 111.195 km per degree).
    const pair = (km: number) => [{ latitude: 45, longitude: 7 }, { latitude: 45 + km / 111.195, longitude: 7 }];
    expect(choosePreset(pair(2.9)).preset).toBe('near');
    expect(choosePreset(pair(3.1)).preset).toBe('local');
  });

  it('refuses fewer than two sites, anything but an array, and coordinates that are not degrees', () => {
    expect(() => choosePreset([{ latitude: 1, longitude: 2 }])).toThrow(/at least two sites .*got 1/);
    expect(() => choosePreset(null as never)).toThrow(TypeError);
    expect(() => choosePreset([{ latitude: 1, longitude: 2 }, { latitude: 95, longitude: 2 }])).toThrow(/latitude within/);
    expect(() => choosePreset([{ latitude: 1, longitude: 2 }, { latitude: NaN, longitude: 2 }])).toThrow(/finite degrees/);
  });
});
