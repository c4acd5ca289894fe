import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { locate, type LocationPick, type LocationStation } from '../../../core/location/geiger';
import { firstArrival } from '../../../core/location/travelTime';
import { checkVelocityModel } from '../../../core/location/velocityModel';
import { originComment, originFromHypocentre } from '../../../core/quakeml/fromHypocentre';
import { writeQuakeMl } from '../../../core/quakeml/write';
import { vincentyKm } from '../location/reference';

// An invented network of 9 sites at the datum and a half-space (Vp 6, Vs 3.47 km/s); the pick times
// come from the textbook-checked travel times (test/core/location/travelTime.test.ts).
const T0 = 1_764_633_600_000_000; // 2025-12-02T00:00:00Z, µs
const HALF = checkVelocityModel([{ topKm: 0, vp: 6, vs: 3.47 }], 'half-space');
const STATIONS: LocationStation[] = Array.from({ length: 9 }, (_, i) => {
  const r = i === 0 ? 0 : 0.15;
  return { key: `XX.S${i}`, latDeg: 46 + r * Math.cos(i * 0.8), lonDeg: 8 + 1.4 * r * Math.sin(i * 0.8), elevKm: 0 };
});
const TRUTH = { lat: 46.02, lon: 8.03, depth: 6 };
function picks(lateS = 0): LocationPick[] {
  return STATIONS.flatMap((s) => (['P', 'S'] as const).map((w) => ({
    stationKey: s.key, wave: w, uncertaintyS: w === 'P' ? 0.05 : 0.1,
    time: T0 + Math.round(firstArrival(HALF, w, vincentyKm(TRUTH.lat, TRUTH.lon, s.latDeg, s.lonDeg), TRUTH.depth, 0).time * 1e6),
  }))).map((p, i) => (i === 4 ? { ...p, time: p.time + Math.round(lateS * 1e6) } : p));
}
const labels = { id: 'o1', pickIdOf: (i: number) => `p${i}`, evaluationMode: 'manual' as const, evaluationStatus: 'reviewed' as const };
const opts = { authority: 'daybreak.test', agencyId: 'XX', author: 'tester', creationTime: T0 };

/** The origin as CPython's xml.etree.ElementTree reads it from the written QuakeML (the reference parser). */
function pyOrigin(xml: string): Record<string, string | null> {
  const script = `
import sys, json, xml.etree.ElementTree as ET
b = '{http://quakeml.org/xmlns/bed/1.2}'
o = ET.fromstring(sys.stdin.read()).find(b + 'eventParameters/' + b + 'event/' + b + 'origin')
t = lambda p: (lambda e: None if e is None else e.text)(o.find('/'.join(b + x for x in p.split('/'))))
print(json.dumps({k: t(p) for k, p in {
  'depth': 'depth/value', 'depthUncertainty': 'depth/uncertainty', 'depthType': 'depthType',
  'max': 'originUncertainty/maxHorizontalUncertainty', 'min': 'originUncertainty/minHorizontalUncertainty',
  'confidence': 'originUncertainty/confidenceLevel', 'comment': 'comment/text', 'rms': 'quality/standardError'}.items()}))
`;
  return JSON.parse(execFileSync('python3', ['-c', script], { input: xml }).toString());
}
const xmlOf = (origin: ReturnType<typeof originFromHypocentre>) =>
  writeQuakeMl({ events: [{ id: 'e1', type: 'earthquake', typeCertainty: 'known', picks: [], origins: origin ? [origin] : [], preferredOriginId: 'o1' }] }, opts);

describe('originFromHypocentre', () => {
  it('a depth held fixed is written as depthType "operator assigned" with no depth uncertainty, and said so in the comment', () => {
    const r = locate(STATIONS, picks(), { model: HALF, fixedDepthKm: 6 });
    if (!r.ok) throw new Error(r.message);
    const o = pyOrigin(xmlOf(originFromHypocentre(r.value, labels)));
    expect(o.depthType).toBe('operator assigned');
    expect(Number(o.depth)).toBe(6000);
    expect(o.depthUncertainty).toBeNull();
    expect(o.comment).toMatch(/; depth held fixed at 6000 m, not solved for$/);
  });

  it('a solved depth is "from location" with its uncertainty in metres', () => {
    const r = locate(STATIONS, picks(), { model: HALF });
    if (!r.ok) throw new Error(r.message);
    const o = pyOrigin(xmlOf(originFromHypocentre(r.value, labels)));
    expect(o.depthType).toBe('from location');
    expect(Number(o.depthUncertainty)).toBeCloseTo(r.value.depthErrorKm * 1000, 3);
    expect(o.comment).toMatch(/^uncertainties from the pick uncertainties as stated \(a-posteriori variance factor 0\.00 over 14 degrees of freedom, not above 1\)$/);
  });

  it('widened uncertainties: the ellipse written is the widened one (68 %), and the comment gives the factor and the a-priori axis', () => {
    const r = locate(STATIONS, picks(1), { model: HALF });
    const p = locate(STATIONS, picks(1), { model: HALF, errors: 'a-priori' });
    if (!r.ok || !p.ok) throw new Error('not located');
    expect(r.value.errorsScaled).toBe(true);
    const o = pyOrigin(xmlOf(originFromHypocentre(r.value, labels)));
    expect(Number(o.max)).toBeCloseTo(r.value.ellipse.semiMajorKm * 1000, 3);
    expect(Number(o.min)).toBeCloseTo(r.value.ellipse.semiMinorKm * 1000, 3);
    expect(Number(o.confidence)).toBe(68);
    expect(Number(o.rms)).toBeCloseTo(r.value.rmsS, 9);
    const apriori = Math.round(p.value.ellipse.semiMajorKm * 1000);
    expect(o.comment).toBe(`uncertainties widened by ${r.value.errorScale.toFixed(2)}, the square root of the a-posteriori variance factor `
      + `${r.value.varianceFactor.toFixed(2)} (chi-square of the weighted residuals over 14 degrees of freedom); the pick uncertainties alone give a ${apriori} m semi-major axis`);
    expect(originComment(r.value)).toBe(o.comment);
  });
});
