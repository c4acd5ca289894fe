import { describe, expect, it } from 'vitest';
import { MEAN_EARTH_RADIUS_KM, type VelocityModel } from '../../../core/location';
import type { Pick, Trace } from '../../../core/pick';
import type { QmlArrival, QmlOrigin } from '../../../core/quakeml';
import { rereadMisfits, type RereadSite } from '../../../core/scan/reread';
import { numpy } from '../pick/numpy';

// A homogeneous half-space (vp 6, vs 3.5 km/s), a source 5 km deep and one site 20 km north of the
// epicentre at the datum: the first arrivals travel the straight line, sqrt(20^2 + 5^2) = 20.6155 km
// (Pythagoras), so P arrives 3.4359 s and S 5.8902 s after the origin time, worked by hand. The
// traces are made by numpy: unit band-limited noise (scipy's Butterworth 1-20 Hz) with a decaying
// 6 Hz wavelet starting at a given time, or noise alone.

const MODEL: VelocityModel = { layers: [{ topKm: 0, vp: 6, vs: 3.5 }] };
const T0 = 1_772_409_600_000_000;
const EPI = { latitude: 43.38, longitude: 2.66 };
const SITE = { latitude: EPI.latitude + (20 / (MEAN_EARTH_RADIUS_KM * Math.PI)) * 180, longitude: EPI.longitude, elevation: 0 };
const HYPO_KM = Math.hypot(20, 5);
const TP = T0 + Math.round((HYPO_KM / 6) * 1e6);
const TS = T0 + Math.round((HYPO_KM / 3.5) * 1e6);
const RATE = 100;
/** The traces (20 s) start at the origin time. */
const START = T0;

/** [noise + wavelet at onsetS seconds (or none when < 0)] for each (onset, amplitude, seed). */
function traces(list: readonly [number, number, number][]): Float64Array[] {
  return numpy(`
from scipy import signal
sos = signal.butter(4, [1, 20], 'bandpass', fs=100, output='sos')
outputs = []
for onset_s, amplitude, seed in ${JSON.stringify(list)}:
    rng = np.random.default_rng(seed)
    n = signal.sosfilt(sos, rng.standard_normal(2500))[500:]
    n /= np.sqrt(np.mean(n * n))
    if onset_s >= 0:
        k = int(round(onset_s * 100))
        t = np.arange(2000 - k) / 100.0
        n[k:] += amplitude * np.sin(2 * np.pi * 6 * t) * np.exp(-t / 0.4)
    outputs.append(n)
`);
}

const id = (channel: string) => ({ network: 'XX', station: 'A', location: '00', channel });
const trace = (channel: string, samples: Float64Array): Trace => ({ id: id(channel), samples, sampleRate: RATE, start: START });

function pick(phase: 'P' | 'S', time: number, channel: string): Pick {
  return {
    phaseHint: phase, waveformId: id(channel), time, lowerUncertainty: 0.05, upperUncertainty: 0.02, snr: 5, onset: 'emergent',
    polarity: phase === 'P' ? 'undecidable' : null, evaluationMode: 'automatic', evaluationStatus: 'preliminary', questionableTiming: false,
  };
}

function origin(arrivals: QmlArrival[]): QmlOrigin {
  return {
    id: 'ev.origin', time: T0, timeUncertainty: 0.05, latitude: EPI.latitude, longitude: EPI.longitude, depthM: 5000,
    depthUncertaintyM: 300, depthType: 'from location', ellipse: null, horizontalUncertaintyM: 200, quality: null, arrivals,
    evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  };
}

// Every trace of the tests, made in one numpy run: [onset s after START or -1 for none, amplitude, seed].
const sAt = (TS - START) / 1e6;
const pAt = (TP - START) / 1e6;
const [Z11, Z12, Z13, N14, E15, Z16, Z17] = traces([[pAt, 20, 11], [-1, 0, 12], [pAt, 20, 13], [sAt, 25, 14], [sAt, 15, 15], [pAt, 20, 16], [pAt, 20, 17]]);

const arrival = (pickId: string, phase: string, residual: number, weight: number): QmlArrival => ({
  pickId, phase, distanceDeg: 0.18, azimuth: 0, timeResidual: residual, timeWeight: weight,
});
/** Other picks of the event that fit: 0.03 s RMS. */
const GOOD = [arrival('ev.B.P', 'P', 0.03, 1), arrival('ev.C.P', 'P', -0.03, 1), arrival('ev.D.S', 'S', 0.03, 0.5)];

function site(z: Float64Array, n: Float64Array | null, e: Float64Array | null): Map<string, RereadSite> {
  return new Map([['XX.A', {
    location: SITE,
    vertical: () => trace('HHZ', z),
    horizontals: n && e ? () => [trace('HHN', n), trace('HHE', e)] as const : null,
  }]]);
}

describe('rereadMisfits', () => {
  it('reads a P left out as an outlier again at the predicted time (hand-worked straight ray), within 0.02 s', () => {
    const z = Z11;
    const wrong = pick('P', TS, 'HHZ'); // the "P" read on S
    const r = rereadMisfits([wrong], ['ev.A.P'], origin([...GOOD, arrival('ev.A.P', 'P', 2.45, 0)]), site(z, null, null), MODEL);
    expect(r.changes).toHaveLength(1);
    expect(r.changes[0].residual).toBe(2.45);
    expect(r.picks).toHaveLength(1);
    expect(r.picks[0].phaseHint).toBe('P');
    expect(Math.abs(r.picks[0].time - TP) / 1e6).toBeLessThan(0.02);
    expect(r.changes[0].pick).toBe(r.picks[0]);
  });

  it('drops a misfit P when the vertical holds only noise around the predicted time', () => {
    const z = Z12;
    const r = rereadMisfits([pick('P', TS, 'HHZ')], ['ev.A.P'], origin([...GOOD, arrival('ev.A.P', 'P', 2.45, 0)]), site(z, null, null), MODEL);
    expect(r.picks).toEqual([]);
    expect(r.changes).toEqual([{ id: 'ev.A.P', phase: 'P', residual: 2.45, pick: null }]);
  });

  it('reads an S with a residual over 1 s again on the horizontals at the predicted S', () => {
    const [z, n, e] = [Z13, N14, E15];
    const p = pick('P', TP, 'HHZ');
    const late = pick('S', TS + 2_100_000, 'HHN');
    const r = rereadMisfits([p, late], ['ev.A.P', 'ev.A.S'], origin([...GOOD, arrival('ev.A.P', 'P', 0.01, 1), arrival('ev.A.S', 'S', 2.1, 0.001)]), site(z, n, e), MODEL);
    expect(r.picks[0]).toBe(p); // it fits: untouched
    expect(r.picks).toHaveLength(2);
    expect(r.picks[1].phaseHint).toBe('S');
    expect(['HHN', 'HHE']).toContain(r.picks[1].waveformId.channel);
    expect(Math.abs(r.picks[1].time - TS) / 1e6).toBeLessThan(0.03);
    expect(r.changes.map((c) => c.id)).toEqual(['ev.A.S']);
  });

  it('leaves picks alone that fit within 1 s, and everything when the used picks fit the origin worse than 0.5 s RMS', () => {
    const z = Z16;
    const near = pick('P', TP + 900_000, 'HHZ');
    const fits = rereadMisfits([near], ['ev.A.P'], origin([...GOOD, arrival('ev.A.P', 'P', 0.9, 1)]), site(z, null, null), MODEL);
    expect(fits.changes).toEqual([]);
    expect(fits.picks[0]).toBe(near);
    const poor = [arrival('ev.B.P', 'P', 0.6, 1), arrival('ev.C.P', 'P', -0.6, 1)];
    const wrong = pick('P', TS, 'HHZ');
    const r = rereadMisfits([wrong], ['ev.A.P'], origin([...poor, arrival('ev.A.P', 'P', 2.45, 0)]), site(z, null, null), MODEL);
    expect(r.changes).toEqual([]);
    expect(r.picks[0]).toBe(wrong);
  });

  it('weighs the fit by the arrivals\' weights: an S the location barely weighs does not block re-reading', () => {
    const z = Z17;
    // Unweighted RMS of the used picks: sqrt((0.03^2 * 3 + 3^2) / 4) = 1.5 s; weighted by 1, 1, 0.5, 0.001: 0.10 s.
    const arrivals = [...GOOD, arrival('ev.E.S', 'S', 3, 0.001), arrival('ev.A.P', 'P', 2.45, 0)];
    const r = rereadMisfits([pick('P', TS, 'HHZ')], ['ev.A.P'], origin(arrivals), site(z, null, null), MODEL);
    expect(r.changes).toHaveLength(1);
    expect(Math.abs(r.picks[0].time - TP) / 1e6).toBeLessThan(0.02);
  });

  it('leaves a site alone whose P and S are off by the same time (a clock), and picks whose records flag questionable timing', () => {
    const [z, n, e] = [Z13, N14, E15];
    const p = pick('P', TP + 750_000, 'HHZ');
    const sp = pick('S', TS + 760_000, 'HHN');
    const arrivals = [...GOOD, arrival('ev.A.P', 'P', 0.75, 0), arrival('ev.A.S', 'S', 0.76, 0)];
    const clock = rereadMisfits([p, sp], ['ev.A.P', 'ev.A.S'], origin(arrivals), site(z, n, e), MODEL);
    expect(clock.changes).toEqual([]);
    expect(clock.picks).toEqual([p, sp]);
    // The same P alone, its S 2 s off instead: not a clock, so both are read again.
    const sFar = pick('S', TS + 2_000_000, 'HHN');
    const wrong = rereadMisfits([p, sFar], ['ev.A.P', 'ev.A.S'], origin([...GOOD, arrival('ev.A.P', 'P', 0.75, 0), arrival('ev.A.S', 'S', 2, 0)]), site(z, n, e), MODEL);
    expect(wrong.changes.map((c) => c.id)).toEqual(['ev.A.P', 'ev.A.S']);
    expect(Math.abs(wrong.picks[0].time - TP) / 1e6).toBeLessThan(0.02);
    // P on S (within 0.5 s of the predicted S) and the S after it as far off: not a clock.
    const onS = pick('P', TS, 'HHZ');
    const sCoda = pick('S', TS + 2_460_000, 'HHN');
    const pair = rereadMisfits([onS, sCoda], ['ev.A.P', 'ev.A.S'], origin([...GOOD, arrival('ev.A.P', 'P', 2.45, 0), arrival('ev.A.S', 'S', 2.46, 0)]), site(z, n, e), MODEL);
    expect(pair.changes.map((c) => c.id)).toEqual(['ev.A.P', 'ev.A.S']);
    expect(Math.abs(pair.picks[0].time - TP) / 1e6).toBeLessThan(0.02);
    expect(Math.abs(pair.picks[1].time - TS) / 1e6).toBeLessThan(0.03);
    // A "P" 0.7 s into the S wave (a trigger late in S) and the S 2.46 s after it: the P lies within the
    // misfit bound (1 s) of the predicted S, so not a clock either, and both are read again.
    const late = rereadMisfits(
      [pick('P', TS + 700_000, 'HHZ'), pick('S', TS + 3_160_000, 'HHN')], ['ev.A.P', 'ev.A.S'],
      origin([...GOOD, arrival('ev.A.P', 'P', 3.15, 0), arrival('ev.A.S', 'S', 3.16, 0)]), site(z, n, e), MODEL,
    );
    expect(late.changes.map((c) => c.id)).toEqual(['ev.A.P', 'ev.A.S']);
    expect(Math.abs(late.picks[0].time - TP) / 1e6).toBeLessThan(0.02);
    expect(Math.abs(late.picks[1].time - TS) / 1e6).toBeLessThan(0.03);
    const flagged = { ...pick('P', TS, 'HHZ'), questionableTiming: true };
    const kept = rereadMisfits([flagged], ['ev.A.P'], origin([...GOOD, arrival('ev.A.P', 'P', 2.45, 0)]), site(z, null, null), MODEL);
    expect(kept.changes).toEqual([]);
    expect(kept.picks[0]).toBe(flagged);
  });

  it('keeps a misfit where the data do not cover the window around its predicted time', () => {
    const short = Z11.subarray(0, Math.round(((TP - START) / 1e6 - 1) * RATE)); // ends 1 s before the predicted P
    const wrong = pick('P', TS, 'HHZ');
    const r = rereadMisfits([wrong], ['ev.A.P'], origin([...GOOD, arrival('ev.A.P', 'P', 2.45, 0)]), site(short, null, null), MODEL);
    expect(r.changes).toEqual([]);
    expect(r.picks[0]).toBe(wrong);
  });

  it('refuses pick ids that do not match the picks', () => {
    expect(() => rereadMisfits([pick('P', TP, 'HHZ')], [], origin(GOOD), new Map(), MODEL)).toThrow(/one to one/);
  });
});
