import { describe, expect, it } from 'vitest';
import { firstArrival } from '../../../core/location/travelTime';
import { START_TABLE_GRID, TravelTimeTable, startTable, startTableGrid } from '../../../core/location/travelTimeTable';
import { DEFAULT_MODEL } from '../../../core/location/velocityModel';

describe('travelTimeTable', () => {
  it('holds firstArrival exactly at its nodes', () => {
    const t = new TravelTimeTable(DEFAULT_MODEL, 'S', { maxDistanceKm: 50, distanceStepKm: 2.5, depthsKm: [0, 7, 20], receiverElevKm: 0.4 });
    expect(t.nDistances).toBe(21);
    for (const z of [0, 7, 20]) {
      for (let x = 0; x <= 50; x += 2.5) expect(t.time(x, z)).toBe(firstArrival(DEFAULT_MODEL, 'S', x, z, 0.4).time);
    }
  });

  it('interpolates the start grid within 0.2 s of firstArrival inside its range', () => {
    // Bilinear error is largest where the first arrival changes from one phase to another between two
    // tabulated depths (measured: 0.16 s at 67 km, 33 km deep, between the 30 and 35 km rows around the
    // Moho); elsewhere it is hundredths of a second. That is ample for a start the iterations refine.
    const t = startTable(DEFAULT_MODEL, 'P');
    let worst = 0;
    for (let x = 0.3; x < 400; x += 3.7) {
      for (let z = -2; z <= 60; z += 1.3) worst = Math.max(worst, Math.abs(t.time(x, z) - firstArrival(DEFAULT_MODEL, 'P', x, z).time));
    }
    expect(worst).toBeLessThan(0.2);
    expect(worst).toBeGreaterThan(0); // really interpolating
  });

  it('extends the last slope beyond the largest distance and uses the nearest depth outside the depths', () => {
    const t = startTable(DEFAULT_MODEL, 'P');
    // beyond 400 km the first arrival is Pn with slope 1 / 8.04 s/km
    expect(t.time(500, 10) - t.time(400, 10)).toBeCloseTo(100 / 8.04, 9);
    expect(t.time(30, 100)).toBe(t.time(30, 60));
    expect(t.time(30, -5)).toBe(t.time(30, -4));
  });

  it('startTable builds each table once per model, wave and distance scale', () => {
    expect(startTable(DEFAULT_MODEL, 'S')).toBe(startTable(DEFAULT_MODEL, 'S'));
    expect(startTable(DEFAULT_MODEL, 'S')).not.toBe(startTable(DEFAULT_MODEL, 'P'));
    expect(startTable(DEFAULT_MODEL, 'P').depthsKm.length).toBe(START_TABLE_GRID.depthsKm.length);
    expect(startTable(DEFAULT_MODEL, 'P', 300)).toBe(startTable(DEFAULT_MODEL, 'P', 400));
    expect(startTable(DEFAULT_MODEL, 'P', 3).maxDistanceKm).toBe(4);
  });

  it('startTableGrid shrinks distance steps and depths below the datum with the scale, not those above it', () => {
    const g = startTableGrid(4);
    expect(g.distanceStepKm).toBeCloseTo(0.01, 15);
    expect(g.depthsKm.filter((z) => z < 0)).toEqual([-4, -3, -2, -1.5, -1, -0.75, -0.5, -0.25]);
    expect(g.depthsKm[g.depthsKm.length - 1]).toBeCloseTo(0.6, 12);
    // a start table for a mine-sized network agrees with firstArrival at metre scale
    const t = startTable(DEFAULT_MODEL, 'P', 1);
    expect(Math.abs(t.time(0.1234, 0.0777) - firstArrival(DEFAULT_MODEL, 'P', 0.1234, 0.0777).time)).toBeLessThan(2e-4);
  });

  it('rejects a bad grid', () => {
    expect(() => new TravelTimeTable(DEFAULT_MODEL, 'P', { maxDistanceKm: 10, distanceStepKm: 0, depthsKm: [0] })).toThrow('distanceStepKm must be in (0, maxDistanceKm = 10], got 0');
    expect(() => new TravelTimeTable(DEFAULT_MODEL, 'P', { maxDistanceKm: 10, distanceStepKm: 1, depthsKm: [5, 5] })).toThrow('depthsKm must be finite and increasing, got [5, 5]');
  });
});
