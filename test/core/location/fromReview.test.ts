import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { channelsOf, parseStationXml } from '../../../core/stationxml';
import {
  locateReviewEvent, predictedArrivals, siteLocations, siteOfChannel, spCircles, spPairs, verticalAverageSpeeds, wadatiOfEvent,
  type SiteLocation,
} from '../../../core/location/fromReview';
import { QUESTIONABLE_FACTOR } from '../../../core/location/geiger';
import { firstArrival, type Wave } from '../../../core/location/travelTime';
import { DEFAULT_MODEL, checkVelocityModel } from '../../../core/location/velocityModel';
import type { ReviewEvent, ReviewPick } from '../../../core/review/types';
import { vincentyKm } from './reference';

const T0 = 1_764_633_600_000_000; // 2025-12-02T00:00:00Z, µs

// An invented network of 10 sites (about 50 x 50 km around 46.0 N 8.0 E); invented only as geometry,
// the reference times come from the textbook-checked travel times (travelTime.test.ts) and Vincenty distances.
const SITES = new Map<string, SiteLocation>();
for (let i = 0; i < 10; i++) {
  const ring = i === 0 ? 0 : i <= 4 ? 0.1 : 0.22;
  const ang = i * 2.5;
  SITES.set(`XX.S${i}`, { latitude: 46 + ring * Math.cos(ang), longitude: 8 + 1.4 * ring * Math.sin(ang), elevation: 150 + 90 * (i % 5) });
}

interface Truth { lat: number; lon: number; depth: number }
const TRUTH: Truth = { lat: 46.03, lon: 7.95, depth: 8 };

let serial = 0;
function pick(site: string, phase: Wave, time: number, extra: Partial<ReviewPick> = {}): ReviewPick {
  return {
    id: `p${++serial}`, phase, channel: `${site}.00.${phase === 'P' ? 'HHZ' : 'HHN'}`, time, lower: 0.02, upper: 0.02,
    onset: 'impulsive', polarity: null, mode: 'manual', status: 'confirmed', snr: null, questionableTiming: false, ...extra,
  };
}

/** Exact times: Vincenty distance on WGS84, first arrival of the layered model, rounded to the µs. */
function exactTime(model = DEFAULT_MODEL, truth: Truth, site: string, w: Wave): number {
  const s = SITES.get(site)!;
  const d = vincentyKm(truth.lat, truth.lon, s.latitude, s.longitude);
  return T0 + Math.round(firstArrival(model, w, d, truth.depth, s.elevation / 1000).time * 1e6);
}

function event(picks: ReviewPick[]): ReviewEvent {
  return { id: 'ev1', source: 'analyst', start: T0, end: T0 + 60e6, state: 'started', type: null, typeCertainty: null, note: '', picks };
}

function exactEvent(truth = TRUTH, model = DEFAULT_MODEL): ReviewEvent {
  const picks: ReviewPick[] = [];
  for (const site of SITES.keys()) for (const w of ['P', 'S'] as Wave[]) picks.push(pick(site, w, exactTime(model, truth, site, w)));
  return event(picks);
}

describe('locateReviewEvent', () => {
  it('holds the depth the analyst fixed on the event (fixedDepthKm), and solves for it again when the option says null', () => {
    const ev = { ...exactEvent(), fixedDepthKm: 8 };
    const r = locateReviewEvent(ev, SITES, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    expect(r.value.hypocentre.depthFixed).toBe(true);
    expect(r.value.hypocentre.depthKm).toBe(8);
    expect(r.value.hypocentre.depthErrorKm).toBeNaN();
    // at the true depth the epicentre is exact (Vincenty distances, textbook-checked travel times)
    expect(vincentyKm(r.value.hypocentre.latDeg, r.value.hypocentre.lonDeg, TRUTH.lat, TRUTH.lon) * 1000).toBeLessThan(10);
    const wrong = locateReviewEvent({ ...ev, fixedDepthKm: 2 }, SITES, DEFAULT_MODEL);
    if (!wrong.ok) throw new Error(wrong.message);
    expect(wrong.value.hypocentre.depthKm).toBe(2);
    expect(wrong.value.hypocentre.rmsS).toBeGreaterThan(0.02);
    const free = locateReviewEvent({ ...ev, fixedDepthKm: 2 }, SITES, DEFAULT_MODEL, { fixedDepthKm: null });
    if (!free.ok) throw new Error(free.message);
    expect(free.value.hypocentre.depthFixed).toBe(false);
    expect(Math.abs(free.value.hypocentre.depthKm - TRUTH.depth) * 1000).toBeLessThan(10);
  });

  it('exact synthetic pick times give the true hypocentre within 10 m and the origin time within 1 ms', () => {
    const ev = exactEvent();
    const r = locateReviewEvent(ev, SITES, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    const h = r.value.hypocentre;
    expect(vincentyKm(h.latDeg, h.lonDeg, TRUTH.lat, TRUTH.lon) * 1000).toBeLessThan(10);
    expect(Math.abs(h.depthKm - TRUTH.depth) * 1000).toBeLessThan(10);
    expect(Math.abs(h.originTime - T0)).toBeLessThan(1000);
    expect(h.phaseCount).toBe(20);
    expect(h.stationCount).toBe(10);
    expect(r.value.skipped).toEqual([]);
    // every pick comes back under its own id, with its site, a tiny residual and its distance
    expect(r.value.arrivals.map((a) => a.pickId)).toEqual(ev.picks.map((p) => p.id));
    for (const a of r.value.arrivals) {
      const s = SITES.get(a.site)!;
      expect(a.site).toBe(siteOfChannel(ev.picks.find((p) => p.id === a.pickId)!.channel));
      expect(Math.abs(a.residualS)).toBeLessThan(0.002);
      expect(Math.abs(a.distanceKm - vincentyKm(TRUTH.lat, TRUTH.lon, s.latitude, s.longitude))).toBeLessThan(0.02);
      expect(a.used).toBe(true);
    }
  });

  it('weights each pick by its interval: sigma is (lower + upper) / 2, questionable timing x QUESTIONABLE_FACTOR', () => {
    const ev = exactEvent();
    const picks = ev.picks.map((p, i) => (i === 0 ? { ...p, lower: 0.04, upper: 0.12 } : i === 1 ? { ...p, questionableTiming: true } : p));
    const r = locateReviewEvent(event(picks), SITES, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    // weight = (sigma_min / sigma)^2 with sigma_min 0.02 s: (0.02 / 0.08)^2 and (1 / 3)^2
    expect(r.value.arrivals[0].weight).toBeCloseTo((0.02 / 0.08) ** 2, 12);
    expect(r.value.arrivals[1].weight).toBeCloseTo(1 / QUESTIONABLE_FACTOR ** 2, 12);
    expect(r.value.arrivals[2].weight).toBeCloseTo(1, 12);
  });

  it('a wrong pick moves the solution less when its timing is questionable, and not at all when excluded', () => {
    const ev = exactEvent();
    const wrong = (q: boolean) => event(ev.picks.map((p, i) => (i === 4 ? { ...p, time: p.time + 400_000, questionableTiming: q } : p)));
    const missKm = (r: ReturnType<typeof locateReviewEvent>): number => {
      if (!r.ok) throw new Error(r.message);
      return vincentyKm(r.value.hypocentre.latDeg, r.value.hypocentre.lonDeg, TRUTH.lat, TRUTH.lon);
    };
    const plain = missKm(locateReviewEvent(wrong(false), SITES, DEFAULT_MODEL));
    const down = missKm(locateReviewEvent(wrong(true), SITES, DEFAULT_MODEL));
    const excluded = locateReviewEvent(wrong(true), SITES, DEFAULT_MODEL, { questionableTiming: 'exclude' });
    expect(plain).toBeGreaterThan(0.1);
    expect(down).toBeLessThan(plain / 2);
    expect(missKm(excluded) * 1000).toBeLessThan(10);
    if (!excluded.ok) throw new Error('unreachable');
    expect(excluded.value.arrivals[4].used).toBe(false);
    expect(excluded.value.arrivals[4].residualS).toBeCloseTo(0.4, 2);
  });

  it('rejected picks are left out of the solution but get a residual', () => {
    const ev = exactEvent();
    const picks = ev.picks.map((p, i) => (i === 3 ? { ...p, time: p.time + 1_000_000, status: 'rejected' as const } : p));
    const r = locateReviewEvent(event(picks), SITES, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    expect(r.value.hypocentre.phaseCount).toBe(19);
    expect(r.value.arrivals[3]).toMatchObject({ used: false, weight: 0 });
    expect(r.value.arrivals[3].residualS).toBeCloseTo(1, 2);
    expect(vincentyKm(r.value.hypocentre.latDeg, r.value.hypocentre.lonDeg, TRUTH.lat, TRUTH.lon) * 1000).toBeLessThan(10);
  });

  it('picks the analyst left out (excluded) get a residual but no weight, whatever their status', () => {
    const ev = exactEvent();
    // S at the 3rd site 1.5 s late and P at the 6th 0.7 s early: both left out, so the solution is
    // the exact one (within 10 m) and each residual is its own shift.
    const picks = ev.picks.map((p, i) => (i === 5 ? { ...p, time: p.time + 1_500_000, excluded: true }
      : i === 10 ? { ...p, time: p.time - 700_000, excluded: true, status: 'preliminary' as const, mode: 'automatic' as const } : p));
    const r = locateReviewEvent(event(picks), SITES, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    expect(r.value.hypocentre.phaseCount).toBe(18);
    expect(r.value.arrivals[5]).toMatchObject({ used: false, weight: 0 });
    expect(r.value.arrivals[10]).toMatchObject({ used: false, weight: 0 });
    expect(r.value.arrivals[5].residualS).toBeCloseTo(1.5, 2);
    expect(r.value.arrivals[10].residualS).toBeCloseTo(-0.7, 2);
    expect(vincentyKm(r.value.hypocentre.latDeg, r.value.hypocentre.lonDeg, TRUTH.lat, TRUTH.lon) * 1000).toBeLessThan(10);
    // used again (excluded false), the late S pulls the solution away
    const back = locateReviewEvent(event(picks.map((p, i) => (i === 5 ? { ...p, excluded: false } : p))), SITES, DEFAULT_MODEL);
    if (!back.ok) throw new Error(back.message);
    expect(back.value.hypocentre.phaseCount).toBe(19);
    expect(vincentyKm(back.value.hypocentre.latDeg, back.value.hypocentre.lonDeg, TRUTH.lat, TRUTH.lon) * 1000).toBeGreaterThan(50);
  });

  it('under four phases gives a message instead of a location', () => {
    const r = locateReviewEvent(event(exactEvent().picks.slice(0, 3)), SITES, DEFAULT_MODEL);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.code).toBe('too-few-phases');
    expect(r.message).toMatch(/3 usable phases; at least 4/);
  });

  it('picks at sites without coordinates are skipped and named; too few left says so', () => {
    const ev = exactEvent();
    const some = new Map([...SITES].filter(([k]) => k !== 'XX.S3'));
    const r = locateReviewEvent(ev, some, DEFAULT_MODEL);
    if (!r.ok) throw new Error(r.message);
    expect(r.value.skipped.map((s) => s.site)).toEqual(['XX.S3', 'XX.S3']);
    expect(r.value.hypocentre.phaseCount).toBe(18);
    const few = new Map([...SITES].filter(([k]) => k === 'XX.S0'));
    const f = locateReviewEvent(ev, few, DEFAULT_MODEL);
    expect(f.ok).toBe(false);
    if (f.ok) return;
    expect(f.code).toBe('unknown-stations');
    expect(f.message).toContain('XX.S9');
    expect(f.skipped).toHaveLength(18);
  });

  it('picks that no travel time explains give a clear did-not-converge message, not a number', () => {
    // P times that decrease with distance faster than any speed allows, and S before P
    const picks = [...SITES.keys()].slice(0, 6).flatMap((site, i) => [
      pick(site, 'P', T0 + (60 - 10 * i) * 1_000_000), pick(site, 'S', T0 + (20 + 30 * (i % 2)) * 1_000_000),
    ]);
    const r = locateReviewEvent(event(picks), SITES, DEFAULT_MODEL, { maxIterations: 5 });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.code).toBe('did-not-converge');
    expect(r.message).toMatch(/no convergence in 5 iterations .*RMS \d+\.\d{3} s/);
    expect(r.skipped).toEqual([]);
  });

  it('throws on malformed channels and on coordinates out of range, naming the value', () => {
    expect(() => locateReviewEvent(event([{ ...pick('XX.S0', 'P', T0), channel: 'XX-S0' }]), SITES, DEFAULT_MODEL)).toThrow(/"XX-S0"/);
    const bad = new Map([['XX.S0', { latitude: 95, longitude: 8, elevation: 0 }]]);
    expect(() => locateReviewEvent(event([pick('XX.S0', 'P', T0)]), bad, DEFAULT_MODEL)).toThrow(RangeError);
    expect(() => locateReviewEvent(exactEvent(), SITES, DEFAULT_MODEL, { minUncertaintyS: 0 })).toThrow(/minUncertaintyS/);
  });
});

describe('predictedArrivals', () => {
  it('in a half-space gives t0 + sqrt(x^2 + h^2) / v at every site (straight rays)', () => {
    // Direct wave in a homogeneous half-space: T = sqrt(x^2 + z^2) / v (e.g. Stein & Wysession 2003,
    // section 3.2, the direct wave; from memory). Sites at the datum so the path is the straight line.
    const half = checkVelocityModel([{ topKm: 0, vp: 6, vs: 3.5 }], 'half-space');
    const flat = new Map([...SITES].map(([k, s]) => [k, { ...s, elevation: 0 }]));
    const o = { originTime: T0, latDeg: 46.02, lonDeg: 8.03, depthKm: 7 };
    const pred = predictedArrivals(o, flat, half);
    expect(pred.size).toBe(10);
    for (const [site, s] of flat) {
      const x = vincentyKm(o.latDeg, o.lonDeg, s.latitude, s.longitude);
      const a = pred.get(site)!;
      expect(Math.abs(a.distanceKm - x)).toBeLessThan(0.005);
      // 5 m of projection error is under 1 ms at 6 km/s
      expect(Math.abs(a.p - (T0 + Math.hypot(x, 7) / 6 * 1e6))).toBeLessThan(1000);
      expect(Math.abs(a.s - (T0 + Math.hypot(x, 7) / 3.5 * 1e6))).toBeLessThan(1500);
      expect(a.pPhase).toBe('Pg');
      expect(a.sPhase).toBe('Sg');
    }
  });

  it('agrees with the pick times of the exact event, so guides fall on the true arrivals', () => {
    const pred = predictedArrivals({ originTime: T0, latDeg: TRUTH.lat, lonDeg: TRUTH.lon, depthKm: TRUTH.depth }, SITES, DEFAULT_MODEL);
    for (const site of SITES.keys()) {
      expect(Math.abs(pred.get(site)!.p - exactTime(DEFAULT_MODEL, TRUTH, site, 'P'))).toBeLessThan(1000);
      expect(Math.abs(pred.get(site)!.s - exactTime(DEFAULT_MODEL, TRUTH, site, 'S'))).toBeLessThan(1500);
    }
  });

  it('refuses an origin time that is not integer microseconds', () => {
    expect(() => predictedArrivals({ originTime: 1.5, latDeg: 46, lonDeg: 8, depthKm: 5 }, SITES, DEFAULT_MODEL)).toThrow(/originTime/);
  });
});

describe('wadatiOfEvent and spPairs', () => {
  it('recovers Vp/Vs and the origin time when Vp/Vs is the same in every layer (Wadati 1933)', () => {
    // One Vp/Vs everywhere: S follows P's path and tS - tP = (k - 1)(tP - t0) exactly.
    const k = 1.78;
    const model = checkVelocityModel([[0, 5.1], [4, 6.0], [20, 6.7], [33, 8.0]].map(([topKm, vp]) => ({ topKm, vp, vs: vp / k })), 'constant ratio');
    const r = wadatiOfEvent(exactEvent(TRUTH, model));
    if (!r.ok) throw new Error(r.message);
    expect(r.value.vpVs).toBeCloseTo(k, 4);
    expect(Math.abs(r.value.originTime - T0)).toBeLessThan(20);
    expect(r.value.count).toBe(10);
  });

  it('pairs P and S picks read on different channels of one site, skipping rejected and excluded picks and sites without S', () => {
    const picks = [
      pick('XX.S1', 'P', T0 + 2_000_000), pick('XX.S1', 'S', T0 + 3_500_000),
      pick('XX.S1', 'P', T0 + 2_100_000, { lower: 0.1, upper: 0.1 }), // wider: not the one paired
      pick('XX.S2', 'P', T0 + 1_000_000), pick('XX.S2', 'S', T0 + 9_000_000, { status: 'rejected' }),
      pick('XX.S3', 'P', T0 + 1_500_000),
      pick('XX.S4', 'P', T0 + 1_600_000, { excluded: true }), pick('XX.S4', 'S', T0 + 2_900_000),
      pick('XX.S0', 'P', T0 + 500_000), pick('XX.S0', 'S', T0 + 1_200_000),
    ];
    expect(spPairs(event(picks))).toEqual([
      { stationKey: 'XX.S0', pTime: T0 + 500_000, sTime: T0 + 1_200_000 },
      { stationKey: 'XX.S1', pTime: T0 + 2_000_000, sTime: T0 + 3_500_000 },
    ]);
    const w = wadatiOfEvent(event(picks));
    expect(w.ok).toBe(false);
    if (!w.ok) expect(w.code).toBe('too-few-stations');
  });
});

describe('spCircles and verticalAverageSpeeds', () => {
  it('in a half-space the S-P circles pass through the true epicentre (straight rays are exact there)', () => {
    const half = checkVelocityModel([{ topKm: 0, vp: 6, vs: 6 / 1.73 }], 'half-space');
    const flat = new Map([...SITES].map(([k, s]) => [k, { ...s, elevation: 0 }]));
    const picks: ReviewPick[] = [];
    for (const [site, s] of flat) {
      const x = vincentyKm(TRUTH.lat, TRUTH.lon, s.latitude, s.longitude);
      for (const w of ['P', 'S'] as Wave[]) picks.push(pick(site, w, T0 + Math.round(firstArrival(half, w, x, TRUTH.depth, 0).time * 1e6)));
    }
    const sp = verticalAverageSpeeds(half, TRUTH.depth);
    const circles = spCircles(event(picks), flat, { vp: sp.vp, vpVs: sp.vp / sp.vs, depthKm: TRUTH.depth });
    expect(circles).toHaveLength(10);
    for (const c of circles) {
      const s = flat.get(c.site)!;
      expect(Math.abs(c.epicentralKm - vincentyKm(TRUTH.lat, TRUTH.lon, s.latitude, s.longitude))).toBeLessThan(0.01);
    }
  });

  it('gives about 8 km of hypocentral distance per second of S-P for Vp 6 km/s and Vp/Vs 1.73 (common practice)', () => {
    const picks = [pick('XX.S0', 'P', T0), pick('XX.S0', 'S', T0 + 1_000_000)];
    const [c] = spCircles(event(picks), new Map([['XX.S0', { latitude: 46, longitude: 8, elevation: 500 }]]), { vp: 6, vpVs: 1.73, depthKm: 3.5 });
    expect(c.hypocentralKm).toBeCloseTo(6 / 0.73, 12);
    expect(c.hypocentralKm).toBeGreaterThan(8);
    expect(c.hypocentralKm).toBeLessThan(8.5);
    // epicentral sqrt(D^2 - h^2) with h = 3.5 km + 0.5 km of site elevation, as numpy computes it
    const py = execFileSync('python3', ['-c', 'import numpy as np; print(repr(float(np.sqrt((6/0.73)**2 - 4.0**2))))']).toString();
    expect(c.epicentralKm).toBeCloseTo(Number(py), 12);
  });

  it('averages speeds over the vertical path: total depth over total time', () => {
    const m = checkVelocityModel([{ topKm: 0, vp: 4, vs: 2 }, { topKm: 2, vp: 6, vs: 3.5 }], 'two layers');
    // 2 km at 4 km/s and 4 km at 6 km/s: 6 / (0.5 + 0.6667) km/s (hand arithmetic)
    expect(verticalAverageSpeeds(m, 6).vp).toBeCloseTo(6 / (2 / 4 + 4 / 6), 12);
    expect(verticalAverageSpeeds(m, 6).vs).toBeCloseTo(6 / (2 / 2 + 4 / 3.5), 12);
    expect(verticalAverageSpeeds(m, -1)).toEqual({ vp: 4, vs: 2 });
    expect(() => verticalAverageSpeeds(m, NaN)).toThrow(/depthKm/);
  });
});

describe('siteLocations', () => {
  it('takes each site\'s coordinates from the real StationXML (12 nodes, elevations in metres)', () => {
    // ../shared/data/real-microseismic/stations/inv.xml (FDSN StationXML, see its README); values read off the file.
    const file = join(__dirname, '..', '..', '..', '..', 'shared', 'data', 'real-microseismic', 'stations', 'inv.xml');
    if (!existsSync(file)) throw new Error(`real data missing: ${file}`);
    const sites = siteLocations([undefined, ...channelsOf(parseStationXml(readFileSync(file, 'utf8'), file))]);
    expect(sites.size).toBe(12);
    expect(sites.get('1.10')).toEqual({ latitude: 47.68296693415016, longitude: -117.40686942299459, elevation: 543.5833333333335 });
  });
});
