import { describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { FILTER_PRESETS, LOCAL_FILTER_INDEX, NEAR_FILTER_INDEX, defaultFilterIndex } from '../../renderer/filterPresets';
import { NEAR_SCAN_SETTINGS } from '../../core/scan/settings';
import { channelsOf, parseStationXml } from '../../core/stationxml';

const REAL = resolve(__dirname, '..', '..', '..', 'shared', 'data', 'real-microseismic');

describe('the filter a dataset opens with', () => {
  it('is 5-150 Hz, the scan\'s near-source band, for the real mine network (12 nodes within a few hundred metres)', () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    const inv = join(REAL, 'stations', 'inv.xml');
    const sites = new Map(channelsOf(parseStationXml(readFileSync(inv, 'utf8'), inv)).map((m) => [m.id.station, { latitude: m.latitude, longitude: m.longitude }]));
    expect(sites.size).toBe(12);
    expect(defaultFilterIndex([...sites.values()])).toBe(NEAR_FILTER_INDEX);
    expect(FILTER_PRESETS[NEAR_FILTER_INDEX]).toEqual({ label: '5\u2013150 Hz', filter: { kind: 'bandpass', order: 4, corners: [5, 150] } });
    expect(FILTER_PRESETS[NEAR_FILTER_INDEX].filter).toBe(NEAR_SCAN_SETTINGS.filter);
  });

  it('is 1-20 Hz for a network of local earthquakes, for a single site and for coordinates out of range', () => {
    // Sites 0.1 degree of latitude apart: 11.1 km (one degree of latitude is about 111 km, from memory),
    // over the 3 km median the near-source choice allows.
    const wide = [0, 1, 2, 3].map((k) => ({ latitude: 45 + 0.1 * k, longitude: 7 }));
    expect(defaultFilterIndex(wide)).toBe(LOCAL_FILTER_INDEX);
    expect(FILTER_PRESETS[LOCAL_FILTER_INDEX].label).toBe('1\u201320 Hz');
    // 0.01 degree apart: 1.1 km, within 3 km.
    expect(defaultFilterIndex(wide.map((s, k) => ({ ...s, latitude: 45 + 0.01 * k })))).toBe(NEAR_FILTER_INDEX);
    expect(defaultFilterIndex([{ latitude: 45, longitude: 7 }])).toBe(LOCAL_FILTER_INDEX);
    expect(defaultFilterIndex([{ latitude: 95, longitude: 7 }, { latitude: 45, longitude: 7 }])).toBe(LOCAL_FILTER_INDEX);
  });
});
