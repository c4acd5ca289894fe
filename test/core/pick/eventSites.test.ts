import { beforeAll, describe, expect, it } from 'vitest';
import { designForChannel } from '../../../core/dsp/designForChannel';
import { rotateToNorthEast } from '../../../core/dsp/rotate';
import { sosfilt } from '../../../core/dsp/sosfilt';
import { horizontalShare, LOCAL_EVENT_PICKING, pickEventSites, type EventSite, type Pick, type Trace } from '../../../core/pick';
import { networkFirst, tooLateForP } from '../../../core/pick/eventSites';
import { renderStation } from '../../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../../core/synth/truth';
import { quake, ringStations, tinyScenario } from '../synth/scenarioFixtures';

const id = (channel: string) => ({ network: 'XX', station: 'T', location: '', channel });
const tr = (channel: string, samples: Float64Array): Trace => ({ id: id(channel), samples, sampleRate: 100, start: 0 });

/** A 5 Hz burst from sample 300 on, along the unit vector (up, north, east), silent before. */
function burst(up: number, north: number, east: number): [Trace, Trace, Trace] {
  const z = new Float64Array(600), n = new Float64Array(600), e = new Float64Array(600);
  for (let i = 300; i < 600; i++) {
    const v = Math.sin((2 * Math.PI * 5 * (i - 300)) / 100);
    z[i] = up * v;
    n[i] = north * v;
    e[i] = east * v;
  }
  return [tr('HHZ', z), tr('HHN', n), tr('HHE', e)];
}

// Worked by hand: sites on a line (x in km); two P onsets agree when |dt| <= distance / 5 km/s + 1 s
// (firstPSpeed 5, slack 1). A's onset 5.58 s before B's, 13.4 km away, is the demo night's case of a
// P read on a sawmill's noise (3.68 s allowed); B agrees with C, D and E.
describe('networkFirst (the network first P that bounds every S window)', () => {
  const at = (x: number, t: number, snr = 10) => ({ time: Math.round(t * 1e6), position: { x, y: 0 }, snr });
  const rest = [at(13.4, 5.58), at(22.2, 7.5), at(33.4, 9.6), at(27.8, 8.7)];
  it('skips a lone early onset that no other site agrees with', () => {
    expect(networkFirst([at(0, 0, 3.1), ...rest], LOCAL_EVENT_PICKING)).toBe(5_580_000);
  });
  it('takes the earliest onset when the others agree with it (A 3 s: 2.58 <= 3.68, 4.5 <= 5.44, 6.6 <= 7.68, 5.7 <= 6.56)', () => {
    expect(networkFirst([at(0, 3, 3.1), ...rest], LOCAL_EVENT_PICKING)).toBe(3_000_000);
  });
  it('skips an onset below minSnr (2) however well it agrees, and falls back to the earliest when none qualifies', () => {
    expect(networkFirst([at(0, 3, 1.5), ...rest], LOCAL_EVENT_PICKING)).toBe(5_580_000);
    expect(networkFirst([at(0, 0), at(100, 60)], LOCAL_EVENT_PICKING)).toBe(0);
  });
});

// Worked by hand: a homogeneous half-space (vp 6, vs 3.5 km/s), the source 5 km deep under x = 0,
// sites on a line at the surface; straight rays, so an arrival at x comes sqrt(x^2 + 25) / v after
// the origin (Pythagoras). P at x = 2, 10, 20 km: 0.898, 1.863, 3.436 s. At x = 48 km, P 8.043 s and
// S 13.789 s. Bounds for a P at 48 km (distance / 5 km/s + 1 s): 11.098, 10.463, 10.036 s.
describe('tooLateForP (an onset at a vertical-only site that is S, by moveout)', () => {
  const at = (x: number, t: number) => ({ time: Math.round(t * 1e6), position: { x, y: 0 } });
  const ps = [at(2, Math.sqrt(4 + 25) / 6), at(10, Math.sqrt(100 + 25) / 6), at(20, Math.sqrt(400 + 25) / 6)];
  it('takes the S at 48 km (13.789 s) as too late for a P, and the P there (8.043 s) as not', () => {
    expect(tooLateForP(at(48, Math.sqrt(2304 + 25) / 3.5), ps, LOCAL_EVENT_PICKING)).toBe(true);
    expect(tooLateForP(at(48, Math.sqrt(2304 + 25) / 6), ps, LOCAL_EVENT_PICKING)).toBe(false);
  });
  it('needs more than half of the others to say so (10.5 s: later than two bounds of three; 10.3 s: one)', () => {
    expect(tooLateForP(at(48, 10.5), ps, LOCAL_EVENT_PICKING)).toBe(true);
    expect(tooLateForP(at(48, 10.3), ps, LOCAL_EVENT_PICKING)).toBe(false);
  });
});

describe('horizontalShare', () => {
  it('is sin^2 of the incidence for a P wave whose motion lies along its ray (ray theory, e.g. Aki and Richards 2002, Quantitative Seismology, ch. 4 - from memory; free-surface effects left out)', () => {
    for (const incidenceDeg of [10, 25, 40]) {
      const i = (incidenceDeg * Math.PI) / 180;
      const baz = (70 * Math.PI) / 180;
      const [z, n, e] = burst(Math.cos(i), Math.sin(i) * Math.cos(baz), Math.sin(i) * Math.sin(baz));
      expect(horizontalShare(z, n, e, 3_000_000, 0.5)).toBeCloseTo(Math.sin(i) ** 2, 12);
    }
  });

  it('is 1 for SH motion (transverse, no vertical part) and NaN where nothing rises', () => {
    const [z, n, e] = burst(0, 0.6, -0.8);
    expect(horizontalShare(z, n, e, 3_000_000)).toBe(1);
    expect(horizontalShare(z, n, e, 1_000_000)).toBeNaN();
  });

  it('removes the noise energy of the 2 s before the onset from each channel', () => {
    const [z, , e] = burst(1, 0, 0);
    const hn = new Float64Array(600);
    for (let i = 0; i < 600; i++) hn[i] = i % 2 ? 0.5 : -0.5; // steady "noise" on the north channel
    expect(horizontalShare(z, tr('HHN', hn), e, 3_000_000, 0.5)).toBeCloseTo(0, 12);
  });

  it('refuses a window that is not positive, naming it', () => {
    const [z, n, e] = burst(1, 0, 0);
    expect(() => horizontalShare(z, n, e, 3_000_000, 0)).toThrow(/seconds must be > 0, got 0/);
  });
});

describe('pickEventSites on a rendered event (core/synth truth arrivals)', () => {
  let sites: EventSite[];
  let truth: Map<string, TruthArrival[]>;
  beforeAll(() => {
    const stations = ringStations(4, 15).map((s, k) => (k === 3 ? { ...s, channels: s.channels.slice(0, 3) } : s));
    const sc = tinyScenario(stations, [quake('a', 30, 1.8, 6, { strike: 100, dip: 60, rake: 20 }, 4, -3)], 80);
    truth = new Map();
    sites = stations.map((st) => {
      const rs = renderStation(sc, st.code);
      truth.set(st.code, stationTruth(sc, rs).get('a')!);
      const fs = rs.channels[0].sampleRate;
      const sos = designForChannel({ kind: 'bandpass', order: 4, corners: [2, 15] }, fs).sos;
      const f = (x: ArrayLike<number>) => sosfilt(sos, Float64Array.from(x));
      const [zc, h1, h2] = rs.channels.filter((c) => c.id.location === rs.channels[0].id.location);
      const ne = rotateToNorthEast(h1.samples, h2.samples, h1.spec.azimuth, h2.spec.azimuth);
      const t = (c: typeof zc, x: Float64Array): Trace => ({ id: c.id, samples: x, sampleRate: fs, start: c.start });
      return { vertical: t(zc, f(zc.samples)), horizontals: [t(h1, f(ne.north)), t(h2, f(ne.east))], position: { latitude: st.latitude, longitude: st.longitude }, trigger: null };
    });
  }, 60_000);

  const at = (picks: Pick[], station: string, phase: 'P' | 'S') => picks.find((p) => p.waveformId.station === station && p.phaseHint === phase);
  const err = (p: Pick | undefined, a: TruthArrival) => (p ? Math.abs(p.time - a.timeMicros) / 1e6 : Infinity);

  it('takes an onset whose energy is mostly horizontal as S, picks S there and finds P before it', () => {
    const s0 = truth.get('T00')!, s1 = truth.get('T01')!, s2 = truth.get('T02')!;
    const input = sites.map((s, k) => ({ ...s, trigger: k === 0 ? s0[1].timeMicros : k < 3 ? [s0, s1, s2][k][0].timeMicros : null }));
    const picks = pickEventSites(input);
    expect(err(at(picks, 'T00', 'P'), s0[0])).toBeLessThan(0.05);
    expect(err(at(picks, 'T00', 'S'), s0[1])).toBeLessThan(0.1);
  });

  it('finds P at a site without a trigger from the network\'s first P (a lower re-trigger)', () => {
    const tr3 = truth.get('T03')!;
    const input = sites.map((s, k) => ({ ...s, trigger: k < 3 ? truth.get(`T0${k}`)![0].timeMicros : null }));
    const picks = pickEventSites(input);
    expect(err(at(picks, 'T03', 'P'), tr3[0])).toBeLessThan(0.05);
    expect(err(at(picks, 'T03', 'S'), tr3[1])).toBeLessThan(0.1);
  });

  it('asks for the wide-band traces of step 4 only when earliestOrigin widens the S window (a distant event), once per P and S pick', () => {
    let vertical = 0;
    let horizontal = 0;
    const input = sites.map((s, k) => ({
      ...s, trigger: k < 3 ? truth.get(`T0${k}`)![0].timeMicros : null,
      distantVertical: () => {
        vertical++;
        return s.vertical;
      },
      distantHorizontals: () => {
        horizontal++;
        return s.horizontals;
      },
    }));
    const local = pickEventSites(input);
    const refused = pickEventSites(input, { earliestOrigin: () => null });
    expect(vertical + horizontal).toBe(0);
    expect(refused).toEqual(local);
    const first = Math.min(...local.filter((p) => p.phaseHint === 'P').map((p) => p.time));
    const widened = pickEventSites(input, { earliestOrigin: () => first - 30_000_000 });
    expect(vertical).toBe(widened.filter((p) => p.phaseHint === 'P').length);
    expect(horizontal).toBe(widened.filter((p) => p.phaseHint === 'S').length);
    expect([vertical, horizontal]).toEqual([4, 4]);
  });

  it('refuses a distantP or distantS window that is not positive, naming it', () => {
    expect(() => pickEventSites(sites, { distantS: { before: 0, after: 0.2 } })).toThrow(/distantS.before and distantS.after must be finite numbers > 0 \(s\), got 0, 0.2/);
    expect(() => pickEventSites(sites, { distantP: { before: 0.5, after: NaN } })).toThrow(/distantP.before and distantP.after must be finite numbers > 0 \(s\), got 0.5, NaN/);
    expect(LOCAL_EVENT_PICKING.distantP).toEqual({ before: 0.5, after: 0.2 });
    expect(LOCAL_EVENT_PICKING.distantS).toEqual({ before: 1, after: 0.2 });
  });

  it('refuses an sShare outside (0, 1], naming it', () => {
    expect(() => pickEventSites(sites, { sShare: 1.5 })).toThrow(/sShare must be in \(0, 1\], got 1.5/);
    expect(LOCAL_EVENT_PICKING.sShare).toBe(0.6);
  });
});

