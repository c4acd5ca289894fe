import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseVelocityModel } from '../../../core/location/velocityModel';
import { firstArrival } from '../../../core/location/travelTime';
import { DEMO_END, DEMO_MODEL, DEMO_START, demoScenario } from '../../../core/synth/demo';
import { distanceAzimuth } from '../../../core/synth/geometry';

// What issue 3 asks of the scenario, checked on the definition itself.
describe('demoScenario', () => {
  const sc = demoScenario();
  const hour = (t: number) => new Date(t / 1000).toISOString().slice(11, 16);
  const centre = {
    lat: sc.stations.reduce((s, x) => s + x.latitude, 0) / sc.stations.length,
    lon: sc.stations.reduce((s, x) => s + x.longitude, 0) / sc.stations.length,
  };

  it('is deterministic for its seed', () => {
    expect(JSON.stringify(demoScenario())).toBe(JSON.stringify(sc));
    expect(JSON.stringify(demoScenario(1))).not.toBe(JSON.stringify(sc));
  });

  it('covers 20:00 to 06:00 UTC with the network code XX reserved by FDSN for examples', () => {
    expect(hour(DEMO_START)).toBe('20:00');
    expect(hour(DEMO_END)).toBe('06:00');
    expect(DEMO_END - DEMO_START).toBe(10 * 3600e6);
    expect(sc.network.code).toBe('XX');
  });

  it('has 12-16 stations within about 60 x 60 km, with the instrument mix of the issue', () => {
    expect(sc.stations.length).toBeGreaterThanOrEqual(12);
    expect(sc.stations.length).toBeLessThanOrEqual(16);
    for (const s of sc.stations) expect(distanceAzimuth(centre.lat, centre.lon, s.latitude, s.longitude).distanceKm).toBeLessThan(45);
    const chans = sc.stations.flatMap((s) => s.channels.map((c) => ({ s: s.code, ...c })));
    expect(chans.filter((c) => c.code.startsWith('HH') && c.sampleRate === 100).length).toBeGreaterThan(24);
    expect(chans.some((c) => c.sampleRate === 200)).toBe(true);
    expect(chans.some((c) => c.sampleRate === 40)).toBe(true);
    const ehz = sc.stations.filter((s) => s.channels.length === 1 && s.channels[0].code === 'EHZ');
    expect(ehz).toHaveLength(1);
    const rotated = chans.filter((c) => c.code.endsWith('1') || c.code.endsWith('2'));
    expect(rotated.map((c) => c.azimuth).sort((a, b) => a - b)).toEqual([20, 110]);
    const twoSensors = sc.stations.find((s) => new Set(s.channels.map((c) => c.location)).size === 2)!;
    expect(twoSensors.channels.map((c) => `${c.location}.${c.code}`)).toEqual(['00.HHZ', '00.HHN', '00.HHE', '10.HNZ', '10.HNN', '10.HNE']);
    expect(chans.length).toBeGreaterThanOrEqual(40);
  });

  it('has a layered model of 3-4 layers over a half-space in the crustal range with Vp/Vs 1.73, the same as samples/model.json', () => {
    const layers = DEMO_MODEL.layers;
    expect(layers.length - 1).toBeGreaterThanOrEqual(3);
    expect(layers.length - 1).toBeLessThanOrEqual(4);
    for (const l of layers) {
      expect(l.vp).toBeGreaterThanOrEqual(4.8);
      expect(l.vp).toBeLessThanOrEqual(8.2);
      expect(l.vp / l.vs).toBeCloseTo(1.73, 2);
    }
    const file = parseVelocityModel(readFileSync(join(import.meta.dirname, '..', '..', '..', 'samples', 'model.json'), 'utf8'), 'samples/model.json');
    expect(file).toEqual(DEMO_MODEL);
  });

  it('has 20-30 local earthquakes of M0.5-3.5 at 1-20 km, some outside the network, one regional event with head waves first, one explosion', () => {
    const local = sc.events.filter((e) => e.type === 'earthquake' && distanceAzimuth(centre.lat, centre.lon, e.latitude, e.longitude).distanceKm < 100);
    expect(local.length).toBeGreaterThanOrEqual(20);
    expect(local.length).toBeLessThanOrEqual(30);
    for (const e of local) {
      expect(e.magnitude).toBeGreaterThanOrEqual(0.5);
      expect(e.magnitude).toBeLessThanOrEqual(3.5);
      expect(e.depthKm).toBeGreaterThanOrEqual(1);
      expect(e.depthKm).toBeLessThanOrEqual(20);
      expect(e.origin).toBeGreaterThan(DEMO_START);
      expect(e.origin).toBeLessThan(DEMO_END - 120e6);
    }
    expect(local.filter((e) => distanceAzimuth(centre.lat, centre.lon, e.latitude, e.longitude).distanceKm > 35).length).toBeGreaterThanOrEqual(2);
    const regional = sc.events.filter((e) => distanceAzimuth(centre.lat, centre.lon, e.latitude, e.longitude).distanceKm > 150);
    expect(regional).toHaveLength(1);
    const st = sc.stations[0];
    const d = distanceAzimuth(regional[0].latitude, regional[0].longitude, st.latitude, st.longitude).distanceKm;
    expect(firstArrival(sc.model, 'P', d, regional[0].depthKm, st.elevationM / 1000).phase).toBe('Pn');
    const blasts = sc.events.filter((e) => e.type === 'explosion');
    expect(blasts).toHaveLength(1);
    expect(blasts[0].mechanism).toBeNull();
    expect(blasts[0].depthKm).toBeLessThan(0.5);
  });

  it('lists every fault kind of the issue, on channels and stations that exist', () => {
    const kinds = new Set(sc.faults.map((f) => f.kind));
    expect([...kinds].sort()).toEqual(['clockOffset', 'culturalBurst', 'deadChannel', 'duplicateRecords', 'gap', 'reversedPolarity', 'spike']);
    const keys = new Set(sc.stations.flatMap((s) => s.channels.map((c) => `XX.${s.code}.${c.location}.${c.code}`)));
    const codes = new Set(sc.stations.map((s) => s.code));
    for (const f of sc.faults) {
      if ('channel' in f) expect(keys.has(f.channel)).toBe(true);
      if ('station' in f) expect(codes.has(f.station)).toBe(true);
    }
    // Noise differs between stations and between evening and night.
    expect(new Set(sc.stations.map((s) => s.noise.siteMs)).size).toBeGreaterThan(5);
    expect(sc.noiseCurve[0].factor).toBeGreaterThan(2 * Math.min(...sc.noiseCurve.map((p) => p.factor)));
  });
});
