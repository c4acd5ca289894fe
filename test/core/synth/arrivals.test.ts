import { describe, expect, it } from 'vitest';
import { firstArrival } from '../../../core/location/travelTime';
import { eventAtStation, NEAR_SURFACE_VP, S_RADIATION_FLOOR, speedsAt, surfaceIncidence } from '../../../core/synth/arrivals';
import { DEMO_MODEL } from '../../../core/synth/demo';
import { distanceAzimuth } from '../../../core/synth/geometry';
import { rgWoodAndersonPeak } from '../../../core/synth/render';
import { quake, ringStations, tinyScenario } from './scenarioFixtures';

describe('arrivals', () => {
  it("surfaceIncidence is Snell's law sin j = p v: p = 0.2 s/km at 2.5 km/s arrives 30° from the vertical", () => {
    expect(surfaceIncidence(0.2, 2.5)).toBeCloseTo(30, 12);
    expect(surfaceIncidence(1, 2.5)).toBe(90);
  });

  it('speedsAt picks the layer holding the depth, the upper one on an interface', () => {
    expect(speedsAt(DEMO_MODEL, 2).vp).toBe(5.0);
    expect(speedsAt(DEMO_MODEL, 3).vp).toBe(5.0);
    expect(speedsAt(DEMO_MODEL, 3.01).vp).toBe(5.9);
    expect(speedsAt(DEMO_MODEL, 100).vp).toBe(8.05);
  });

  it('times P and S with the shared first-arrival code and projects them with the weathered-layer incidence', () => {
    const [st] = ringStations(1, 30);
    const ev = quake('a', 5, 2, 10, { strike: 0, dip: 60, rake: 45 });
    const sc = tinyScenario([st], [ev]);
    const ea = eventAtStation(sc, ev, st, rgWoodAndersonPeak);
    const d = distanceAzimuth(ev.latitude, ev.longitude, st.latitude, st.longitude).distanceKm;
    const tp = firstArrival(DEMO_MODEL, 'P', d, 10, 0);
    expect(ea.p.time).toBe(ev.origin + Math.round(tp.time * 1e6));
    expect(ea.p.phase).toBe(tp.phase);
    expect(ea.p.incidenceDeg).toBeCloseTo(Math.asin(tp.slownessH * NEAR_SURFACE_VP) * 180 / Math.PI, 9);
    expect(ea.hypocentralKm).toBeCloseTo(Math.hypot(d, 10), 9);
  });

  it('keeps the S radiation at least the floor (a crust scatters S into its nodes) and leaves P as radiated', () => {
    const stations = ringStations(12, 25);
    const ev = quake('a', 5, 2, 10, { strike: 0, dip: 90, rake: 0 });
    const sc = tinyScenario(stations, [ev]);
    for (const st of stations) {
      const ea = eventAtStation(sc, ev, st, rgWoodAndersonPeak);
      expect(Math.hypot(ea.radiation.sv, ea.radiation.sh)).toBeGreaterThanOrEqual(S_RADIATION_FLOOR - 1e-12);
    }
  });

  it('explosions radiate P = 1 (compression) everywhere', () => {
    const stations = ringStations(6, 15);
    const ev = quake('x', 5, 1.5, 0.1, null);
    const sc = tinyScenario(stations, [ev]);
    for (const st of stations) {
      const ea = eventAtStation(sc, ev, st, rgWoodAndersonPeak);
      expect(ea.radiation.p).toBe(1);
      expect(ea.p.motion.up).toBeGreaterThan(0);
    }
  });
});
