import { beforeAll, describe, expect, it } from 'vitest';
import type { ChannelId, Segment } from '../../../core/model';
import { butterworth } from '../../../core/dsp';
import type { CandidateEvent, OriginPick, StationTrigger } from '../../../core/pick';
import { eventPicks, horizontalTraces, pickId, type PickSite } from '../../../core/scan/eventPicks';
import { earliestOriginFromP, type SiteCoordinates } from '../../../core/scan/eventOrigin';
import { DEMO_MODEL } from '../../../core/synth/demo';
import { renderStation } from '../../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../../core/synth/truth';
import type { Pick } from '../../../core/pick';
import { offsetPoint } from '../../../core/synth/geometry';
import { quake, ringStations, tinyScenario } from '../synth/scenarioFixtures';
import { LOCAL_SCAN_SETTINGS } from '../../../core/scan/settings';
import { Rng } from '../../../core/synth/random';
import { candidateAfterP, regionalErrors, renderedSites, renderRegional } from './regionalEvents';

// The traces are built here so the onset samples are known by construction: noise, then at sample
// iP a wave packet whose first swing is up on the vertical (ground up), and at iS a stronger
// horizontal packet polarised along azimuth 30 degrees. The horizontals are recorded as channels
// 1/2 at azimuths 20 and 110 degrees (h = N cos(az) + E sin(az), SEED manual v2.4 / StationXML
// azimuth convention), so the scan must rotate them back.

const FS = 100;
const T0 = 1_772_409_600_000_000;
const SOS = butterworth(4, [2, 15], 'bandpass', FS);
const N = 60 * FS;
const iP = 30 * FS + 37;
const iS = iP + 250;

const cid = (channel: string, station = 'AB'): ChannelId => ({ network: 'XX', station, location: '00', channel });

function segment(id: ChannelId, samples: Float64Array, questionable = 0): Segment {
  return {
    id, sampleRate: FS, start: T0, end: T0 + ((samples.length - 1) * 1e6) / FS, samples,
    recordStarts: Float64Array.of(T0), recordFirstSample: Int32Array.of(0), encoding: 5, recordLength: 4096, quality: 'D',
    timing: { qualityMin: null, qualityMax: null, clockLockedRecords: 1, questionableTimeRecords: questionable, leapSecondRecords: 0, steimMismatchRecords: 0, records: 1 },
  };
}

function packet(x: Float64Array, i0: number, amp: number): void {
  for (let i = i0; i < Math.min(x.length, i0 + 3 * FS); i++) {
    const s = (i - i0) / FS;
    x[i] += amp * Math.exp(-s / 0.5) * Math.sin(2 * Math.PI * 8 * s);
  }
}

function site(polarityFactor: 1 | -1, withHorizontals: boolean, questionable = 0): PickSite {
  const rng = new Rng(42);
  const z = new Float64Array(N), nn = new Float64Array(N), ee = new Float64Array(N);
  for (let i = 0; i < N; i++) { z[i] = rng.normal(); nn[i] = rng.normal(); ee[i] = rng.normal(); }
  packet(z, iP, 60);
  const sNorth = new Float64Array(N), sEast = new Float64Array(N);
  packet(sNorth, iS, 200 * Math.cos(Math.PI / 6));
  packet(sEast, iS, 200 * Math.sin(Math.PI / 6));
  const rad = Math.PI / 180;
  const h1 = new Float64Array(N), h2 = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    const n = nn[i] + sNorth[i], e = ee[i] + sEast[i];
    h1[i] = n * Math.cos(20 * rad) + e * Math.sin(20 * rad);
    h2[i] = n * Math.cos(110 * rad) + e * Math.sin(110 * rad);
  }
  // A down-positive vertical records -z.
  const zRec = polarityFactor === 1 ? z : z.map((v) => -v);
  return {
    vertical: { id: cid('HHZ'), segments: [segment(cid('HHZ'), zRec, questionable)], azimuth: 0 },
    polarity: polarityFactor,
    position: { x: 0, y: 0 },
    horizontals: withHorizontals ? [
      { id: cid('HH1'), segments: [segment(cid('HH1'), h1)], azimuth: 20 },
      { id: cid('HH2'), segments: [segment(cid('HH2'), h2)], azimuth: 110 },
    ] : null,
  };
}

function event(onSample: number): CandidateEvent {
  const on = T0 + (onSample * 1e6) / FS;
  const trig: StationTrigger = { id: cid('HHZ'), on, off: on + 2e6, peakRatio: 20, peakTime: on, start: on - 10e6, end: on + 22e6, endedBy: 'ratio' };
  return { id: 'XX.20260302T000030', time: on, start: trig.start, end: trig.end, sites: ['XX.AB'], triggers: [trig], secondary: [] };
}

describe('eventPicks', () => {
  const sosFor = () => SOS;

  it('picks P on the vertical within 2 samples of the onset with an upward first motion, and S on the horizontals within 5 samples', () => {
    const picks = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, true)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(picks.map((p) => p.phaseHint)).toEqual(['P', 'S']);
    const [p, s] = picks;
    expect(Math.abs((p.time - T0) / 1e4 - iP)).toBeLessThanOrEqual(2);
    expect(p.polarity).toBe('positive');
    expect(p.waveformId.channel).toBe('HHZ');
    expect(Math.abs((s.time - T0) / 1e4 - iS)).toBeLessThanOrEqual(5);
    expect(['HH1', 'HH2']).toContain(s.waveformId.channel);
    expect(s.polarity).toBeNull();
    expect(p.evaluationMode).toBe('automatic');
    expect(pickId('XX.20260302T000030', p)).toBe('XX.20260302T000030.XX.AB.00.HHZ.P');
  });

  it('corrects a down-positive vertical: the same ground motion recorded with reversed counts gives the same P and polarity', () => {
    const up = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, false)]]), sosFor, LOCAL_SCAN_SETTINGS);
    const down = eventPicks(event(iP + 8), new Map([['XX.AB', site(-1, false)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(down[0].time).toBe(up[0].time);
    expect(down[0].polarity).toBe('positive');
  });

  it('gives P only at a vertical-only site, and carries the questionable-timing flag of the records', () => {
    const picks = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, false, 1)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(picks.map((p) => p.phaseHint)).toEqual(['P']);
    expect(picks[0].questionableTiming).toBe(true);
  });

  it('rotates horizontals 1/2 at 20 and 110 degrees back to north and east (the S packet polarised at 30 degrees: east/north = tan 30)', () => {
    const h = horizontalTraces(site(1, true), new Float64Array([1, 0, 0, 1, 0, 0]), T0 + 40e6);
    expect(h).not.toBeNull();
    const [n, e] = h!;
    let ratio = 0;
    for (let i = iS + 5; i < iS + 20; i++) ratio = Math.max(ratio, Math.abs(e.samples[i] / n.samples[i]));
    // Noise of RMS 1 against a packet of 200: the ratio is tan 30 = 0.577 within a few per cent.
    expect(ratio).toBeGreaterThan(0.577 * 0.9);
    expect(ratio).toBeLessThan(0.577 * 1.15);
  });

  it('gives no pick for a site whose data does not cover the trigger', () => {
    const ev = event(N + 500);
    expect(eventPicks(ev, new Map([['XX.AB', site(1, true)]]), sosFor, LOCAL_SCAN_SETTINGS)).toEqual([]);
  });
});

// A distant event rendered by the generator (core/synth): six stations on a 15 km ring, the event
// 170 km north of the centre, so P arrives as Pn and S some 20 s after it at every site, more than
// the local window (P travel time at most firstTravelMax = 10 s after the first P) allows. The truth
// arrivals come from the generator's ray geometry (checked in test/core/synth).
describe('eventPicks on a distant event (S more than 10 s of P travel after the first P)', () => {
  let sites: Map<string, PickSite>;
  let coords: Map<string, SiteCoordinates>;
  let truth: Map<string, TruthArrival[]>;
  let ev: CandidateEvent;
  beforeAll(() => {
    const sc = tinyScenario(ringStations(6, 15), [quake('far', 10, 3.6, 10, { strike: 40, dip: 70, rake: 10 }, 170, 0)], 100);
    ({ sites, coords, truth } = renderedSites(sc, 'far'));
    ev = candidateAfterP(truth, 'XX.far');
  }, 60_000);

  const sosAt = (rate: number) => butterworth(4, [2, 15], 'bandpass', rate);
  const sErrors = (picks: Pick[]) => [...truth].filter(([key]) => sites.get(key)!.horizontals).map(([key, arr]) => {
    const s = arr.find((a) => a.wave === 'S')!;
    const p = picks.find((k) => `XX.${k.waveformId.station}` === key && k.phaseHint === 'S');
    return p ? Math.abs(p.time - s.timeMicros) / 1e6 : Infinity;
  });

  const sSignedErrors = (picks: Pick[]) => [...truth].filter(([key]) => sites.get(key)!.horizontals).map(([key, arr]) => {
    const s = arr.find((a) => a.wave === 'S')!;
    const p = picks.find((k) => `XX.${k.waveformId.station}` === key && k.phaseHint === 'S');
    return p ? Math.round((p.time - s.timeMicros) / 1e3) / 1e3 : NaN;
  });

  it('has S more than 15 s after P at every site (what makes the local window too short)', () => {
    for (const arr of truth.values()) {
      const p = arr.find((a) => a.wave === 'P')!, s = arr.find((a) => a.wave === 'S')!;
      expect((s.timeMicros - p.timeMicros) / 1e6).toBeGreaterThan(15);
    }
  });

  it('picks S within 0.2 s at every three-component site when a P-only location widens the S window', () => {
    const picks = eventPicks(ev, sites, sosAt, LOCAL_SCAN_SETTINGS,
      (pp) => earliestOriginFromP(pp, coords, DEMO_MODEL, LOCAL_SCAN_SETTINGS.maxPTravelTime));
    const errs = sErrors(picks);
    expect(errs).toHaveLength(5);
    for (const e of errs) expect(e).toBeLessThanOrEqual(0.2);
    // P still within 0.1 s at all six sites (Pn, emergent after 170 km of attenuation).
    for (const [key, arr] of truth) {
      const p = picks.find((k) => `XX.${k.waveformId.station}` === key && k.phaseHint === 'P');
      expect(Math.abs(p!.time - arr[0].timeMicros) / 1e6).toBeLessThanOrEqual(0.1);
    }
  });

  // Step 4 of core/pick/eventSites.ts. The generator's S pulse after 170 km (t* about 0.17 s with
  // Q = 250 and kappa 0.02 s; Q constant up to 100 Hz, core/synth/pulse.ts) leaves its front at the
  // arrival time with its highest frequencies, far below the noise, and reaches a few per cent of its
  // peak only about 0.1-0.15 s later, alike at 100 and 200 Hz. Values measured with the seed of
  // tinyScenario (1234) and the sample-rate-free attenuation of 2026-12-02.
  it('re-reads those S on horizontals high-passed at 1 Hz: 0.02-0.06 s late at all five sites (the 200 Hz one alike), 0.05-0.10 s earlier than on the 2-15 Hz band', () => {
    const origin = (pp: readonly OriginPick[]) => earliestOriginFromP(pp, coords, DEMO_MODEL, LOCAL_SCAN_SETTINGS.maxPTravelTime);
    const wide = sSignedErrors(eventPicks(ev, sites, sosAt, LOCAL_SCAN_SETTINGS, origin));
    const band = sSignedErrors(eventPicks(ev, sites, sosAt, { ...LOCAL_SCAN_SETTINGS, distantFilter: null }, origin));
    // Sites with horizontals in station order: T00, T01 (1/2 at 20 degrees), T02 (200 Hz), T03, T05.
    expect(wide).toHaveLength(5);
    // Measured: 0.041, 0.05, 0.058, 0.045, 0.025 (0.12-0.16 before the lead of slow onsets, onset.ts);
    // on the band 0.101-0.145.
    wide.forEach((e, k) => {
      expect(e).toBeGreaterThanOrEqual(0.02);
      expect(e).toBeLessThanOrEqual(0.06);
      expect(band[k] - e).toBeGreaterThanOrEqual(0.05);
      expect(band[k] - e).toBeLessThanOrEqual(0.1);
    });
    expect(band.filter((e) => e > 0.1)).toHaveLength(5);
  });

  it('misses those S with the local window alone (no location given)', () => {
    const errs = sErrors(eventPicks(ev, sites, sosAt, LOCAL_SCAN_SETTINGS));
    expect(errs.filter((e) => e <= 0.2)).toHaveLength(0);
  });
});

// A regional event on the demo network (test/core/scan/regionalEvents.ts, seed 43, one of the seeds
// held out when the re-read was chosen): ML 4.0 at 13.3 km depth, 158-219 km from the 13 sites with
// horizontals (ELRO records at 200 Hz, HOLT at 40 Hz, the others at 100 Hz). Its S front comes some
// 0.1 s before the first per cent of the pulse (Q constant up to 100 Hz, core/synth/pulse.ts): the AIC
// alone picked every S 0.12-0.17 s late; the lead of slow onsets (core/pick/onset.ts) moves the picks
// ahead by the time their rise keeps steepening. Values measured once, with the attenuation of
// 2026-12-02 and the lead.
describe('eventPicks on a generated regional event of the demo network (seed 43)', () => {
  it('picks S within 0.08 s at all 13 sites, the 200 Hz one alike, and 0.045-0.18 s earlier than without the re-read at each', () => {
    const r = renderRegional(43);
    const keys = [...r.truth.keys()].filter((k) => r.sites.get(k)!.horizontals);
    expect(keys).toHaveLength(13);
    const wide = regionalErrors(r, LOCAL_SCAN_SETTINGS).s;
    const band = regionalErrors(r, { ...LOCAL_SCAN_SETTINGS, distantFilter: null }).s;
    // Measured: -0.074 to 0.037 s; without the re-read 0.049-0.101 s.
    wide.forEach((e, k) => {
      expect(Math.abs(e)).toBeLessThanOrEqual(0.08);
      expect(band[k] - e).toBeGreaterThanOrEqual(0.045);
      expect(band[k] - e).toBeLessThanOrEqual(0.18);
    });
  }, 30_000);
});

// Two more generated regional events (seeds 31 and 44) where S was once picked about 26 s early, on
// P: at KIRN (seed 31) the onset found near P was taken as S and no P was found before it, and S was
// picked beside that onset; at NETH (seed 44) P was picked well, but the S window began 0.1 s after it
// and the P on the horizontals was as strong as S. Values measured once with the fix, the
// attenuation of 2026-12-02 and the lead of slow onsets (errors in s; OSKE's P, SNR 1.3, is not
// picked now, so it gets no S).
describe('eventPicks never puts the S of a generated regional event on P (seeds 31 and 44)', () => {
  it('leaves KIRN and OSKE (seed 31, no P pick) without S, picks NETH (seed 44) S 0.15 s late (0.26 s without the re-read), and every S pick 0-0.45 s late', () => {
    for (const [seed, noS, key, late] of [[31, ['XX.KIRN', 'XX.OSKE'], null, null], [44, [], 'XX.NETH', [0.146, 0.261]]] as const) {
      const r = renderRegional(seed);
      const keys = [...r.truth.keys()].filter((k) => r.sites.get(k)!.horizontals);
      const runs = [regionalErrors(r, LOCAL_SCAN_SETTINGS).s, regionalErrors(r, { ...LOCAL_SCAN_SETTINGS, distantFilter: null }).s];
      runs.forEach((s, k) => {
        if (key !== null && late !== null) expect(s[keys.indexOf(key)]).toBeCloseTo(late[k], 2);
        s.forEach((e, i) => {
          if ((noS as readonly string[]).includes(keys[i])) {
            expect(e).toBeNaN();
            return;
          }
          expect(e).toBeGreaterThanOrEqual(0);
          expect(e).toBeLessThanOrEqual(0.45);
        });
      });
      for (const k of noS) expect(keys).toContain(k);
    }
  }, 30_000);
});

// A local event inside the 15 km ring and one more site 110 km away that did not trigger: its P is
// found by the re-trigger from the network's first P, and its S, some 13 s after that P, lies in the
// window the network's first P allows (P travel time up to tP - tP_first + firstTravelMax).
describe('eventPicks at a distant site of a local event (no trigger there)', () => {
  it('picks P within 0.1 s and the late S within 0.2 s at the distant site', () => {
    const ring = ringStations(6, 15);
    const p = offsetPoint(ring[0].latitude, ring[0].longitude, 95, 0);
    const far = { ...ring[0], code: 'T99', latitude: p.latitude, longitude: p.longitude };
    const stations = [...ring, far];
    const sc = tinyScenario(stations, [quake('near', 10, 2.8, 8, { strike: 120, dip: 50, rake: -60 }, 3, -2)], 70);
    const sites = new Map<string, PickSite>();
    const truth = new Map<string, TruthArrival[]>();
    for (const st of stations) {
      const rs = renderStation(sc, st.code);
      truth.set(st.code, stationTruth(sc, rs).get('near')!);
      const chans = rs.channels.filter((c) => c.id.location === rs.channels[0].id.location);
      const pc = (c: (typeof chans)[number]) => ({
        id: c.id, azimuth: c.spec.azimuth,
        segments: [{ ...segment(c.id, Float64Array.from(c.samples)), sampleRate: c.sampleRate, start: c.start, end: c.start + ((c.samples.length - 1) * 1e6) / c.sampleRate }],
      });
      const hs = chans.filter((c) => Math.abs(c.spec.dip) <= 45);
      sites.set(`XX.${st.code}`, {
        vertical: pc(chans.find((c) => Math.abs(c.spec.dip) > 45)!), polarity: 1, position: { latitude: st.latitude, longitude: st.longitude },
        horizontals: hs.length === 2 ? [pc(hs[0]), pc(hs[1])] : null,
      });
    }
    const trig = ring.map((st) => {
      const on = truth.get(st.code)![0].timeMicros + 300_000;
      return { id: { network: 'XX', station: st.code, location: '', channel: 'HHZ' }, on, off: on + 5e6, peakRatio: 10, peakTime: on, start: on - 10e6, end: on + 30e6, endedBy: 'ratio' as const };
    }).sort((a, b) => a.on - b.on);
    const ev: CandidateEvent = { id: 'XX.near', time: trig[0].on, start: trig[0].start, end: trig[5].end, sites: trig.map((t) => `XX.${t.id.station}`), triggers: trig, secondary: [] };
    const picks = eventPicks(ev, sites, (rate) => butterworth(4, [2, 15], 'bandpass', rate), LOCAL_SCAN_SETTINGS);
    const [tp, ts] = truth.get('T99')!;
    expect((ts.timeMicros - tp.timeMicros) / 1e6).toBeGreaterThan(10);
    const at = (phase: 'P' | 'S') => picks.find((k) => k.waveformId.station === 'T99' && k.phaseHint === phase);
    expect(Math.abs(at('P')!.time - tp.timeMicros) / 1e6).toBeLessThanOrEqual(0.1);
    expect(Math.abs(at('S')!.time - ts.timeMicros) / 1e6).toBeLessThanOrEqual(0.2);
  });
});
