import { describe, expect, it } from 'vitest';
import {
  channelResponse, groundMotionOf, normalizationFactorOf, oscillatorPoles, responseAt, sensitivityCheck,
} from '../../../core/magnitude/response';
import type { ChannelMeta, ResponseStage } from '../../../core/stationxml/types';
import { magnitudeReference, pairsOf } from '../../ref/magnitude/reference';

type C = { re: number; im: number };

function meta(stages: ResponseStage[], sensitivity?: ChannelMeta['sensitivity']): ChannelMeta {
  return {
    id: { network: 'XX', station: 'TEST', location: '00', channel: 'HHZ' }, start: null, end: null,
    latitude: 0, longitude: 0, elevation: 0, depth: 0, azimuth: 0, dip: -90, sampleRate: 100, stages, sensitivity,
  };
}

function pzStage(poles: C[], zeros: C[], fn: number, gain: number, units = 'm/s', hertz = false): ResponseStage {
  const tf = hertz ? 'LAPLACE (HERTZ)' : 'LAPLACE (RADIANS/SECOND)';
  return {
    number: 1, inputUnits: units, outputUnits: 'V', decimation: null, gain: { value: gain, frequency: fn },
    filter: { kind: 'polesZeros', transferFunction: tf, normalizationFactor: normalizationFactorOf(poles, zeros, fn, tf), normalizationFrequency: fn, zeros, poles },
  };
}

function gainStage(n: number, gain: number): ResponseStage {
  return { number: n, inputUnits: 'V', outputUnits: 'count', decimation: null, gain: { value: gain, frequency: 1 }, filter: null };
}

const ZZ: C[] = [{ re: 0, im: 0 }, { re: 0, im: 0 }];

describe('oscillatorPoles', () => {
  it('gives -h·w0 ± i·w0·sqrt(1-h²) for a 1 Hz geophone with damping 0.7 (hand-computed)', () => {
    const [p1, p2] = oscillatorPoles(1, 0.7);
    const w0 = 2 * Math.PI;
    expect(p1.re).toBeCloseTo(-0.7 * w0, 14);
    expect(p1.im).toBeCloseTo(w0 * Math.sqrt(0.51), 14);
    expect(p2.im).toBeCloseTo(-w0 * Math.sqrt(0.51), 14);
    // |p| = w0: the poles lie on the circle of the natural frequency.
    expect(Math.hypot(p1.re, p1.im)).toBeCloseTo(w0, 13);
  });
  it('rejects damping outside (0, 1) and non-positive periods', () => {
    expect(() => oscillatorPoles(1, 1)).toThrow(/damping must be in \(0, 1\), got 1/);
    expect(() => oscillatorPoles(0, 0.7)).toThrow(RangeError);
  });
});

describe('channelResponse of a textbook velocity seismometer (1 Hz, h = 0.7, zeros at 0)', () => {
  // H(s) = s²/(s² + 2hω0 s + ω0²) for ground velocity in, output velocity-proportional (e.g. Aki &
  // Richards 2002, §10.2, from memory). Hand-computed values with r = f/f0:
  // H = −r² / ((1 − r²) + 2hr·i).
  const poles = oscillatorPoles(1, 0.7);
  it('normalization factor is exactly 1 at 5 Hz (|H| = 25/|−24 + 7i| = 25/25) and 1.4 (= 2h) at 1 Hz', () => {
    expect(normalizationFactorOf(poles, ZZ, 5)).toBeCloseTo(1, 14);
    expect(normalizationFactorOf(poles, ZZ, 1)).toBeCloseTo(1.4, 14);
  });
  it('response at the natural frequency is i·A0·G/(2h): modulus G, phase +90°', () => {
    const m = meta([pzStage(poles, ZZ, 1, 170), gainStage(2, 419430.4)]);
    const r = responseAt(m, 1);
    const g = 170 * 419430.4;
    expect(r.re / g).toBeCloseTo(0, 12);
    expect(r.im / g).toBeCloseTo(1, 12);
  });
  it('response at 2 Hz equals 4/(3 − 2.8i) times A0·G (hand-computed, A0 = 1 at 5 Hz)', () => {
    const m = meta([pzStage(poles, ZZ, 5, 170), gainStage(2, 1000)]);
    const r = responseAt(m, 2);
    const d = 9 + 2.8 * 2.8;
    expect(r.re / 170000).toBeCloseTo(12 / d, 12);
    expect(r.im / 170000).toBeCloseTo(11.2 / d, 12);
  });
  it('obeys the normalization-factor rule: |response| equals the product of stage gains at the normalization frequency (SEED manual v2.4 blockette 53; StationXML PolesZeros)', () => {
    for (const fn of [0.3, 1, 5, 12.5]) {
      const m = meta([pzStage(poles, ZZ, fn, 170), gainStage(2, 419430.4)], { value: 170 * 419430.4, frequency: fn, inputUnits: 'm/s', outputUnits: 'count', sign: 1 });
      const c = sensitivityCheck(m);
      expect(c?.evaluatedRatio).toBeCloseTo(1, 12);
      expect(c?.gainRatio).toBeCloseTo(1, 14);
    }
  });
});

describe('LAPLACE (HERTZ) stages', () => {
  it('give the same response as the rad/s description with poles and zeros divided by 2π (A0 scales by (2π)^(zeros − poles))', () => {
    const polesRad = [...oscillatorPoles(120, 0.707), ...oscillatorPoles(1 / 80, 0.707)];
    const polesHz = polesRad.map((p) => ({ re: p.re / (2 * Math.PI), im: p.im / (2 * Math.PI) }));
    const rad = pzStage(polesRad, ZZ, 1, 1500);
    const hz = pzStage(polesHz, ZZ, 1, 1500, 'm/s', true);
    if (rad.filter?.kind !== 'polesZeros' || hz.filter?.kind !== 'polesZeros') throw new Error('stage kind');
    expect(hz.filter.normalizationFactor / rad.filter.normalizationFactor).toBeCloseTo((2 * Math.PI) ** (2 - 4), 14);
    const a = channelResponse(meta([rad])), b = channelResponse(meta([hz]));
    const ra = new Float64Array(2), rb = new Float64Array(2);
    for (const f of [0.001, 0.01, 0.1, 1, 10, 40, 79]) {
      a.evaluate(f, ra);
      b.evaluate(f, rb);
      expect(Math.hypot(rb[0] - ra[0], rb[1] - ra[1]) / Math.hypot(ra[0], ra[1])).toBeLessThan(1e-12);
    }
  });
});

describe('channelResponse against scipy.signal.freqs_zpk', () => {
  const freqs = [0.001, 0.005, 0.02, 0.1, 0.5, 1, 2, 5, 10, 20, 45, 80];
  const cases: { name: string; poles: C[]; zeros: C[]; fn: number; units: string; hertz: boolean }[] = [
    { name: '1 Hz geophone h 0.7', poles: oscillatorPoles(1, 0.7), zeros: ZZ, fn: 5, units: 'm/s', hertz: false },
    { name: '120 s broadband with an 80 Hz pole pair', poles: [...oscillatorPoles(120, 0.707), ...oscillatorPoles(1 / 80, 0.707)], zeros: ZZ, fn: 1, units: 'm/s', hertz: false },
    { name: 'accelerometer, 150 Hz pole pair, no zeros', poles: oscillatorPoles(1 / 150, 0.707), zeros: [], fn: 1, units: 'm/s**2', hertz: false },
    { name: '4.5 Hz geophone in Hz with a real pole and a real zero', poles: [{ re: -3.15, im: 3.21 }, { re: -3.15, im: -3.21 }, { re: -120, im: 0 }], zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }, { re: -40, im: 0 }], fn: 10, units: 'm/s', hertz: true },
  ];
  const built = cases.map((c) => {
    const stage = pzStage(c.poles, c.zeros, c.fn, 800, c.units, c.hertz);
    const a0 = stage.filter?.kind === 'polesZeros' ? stage.filter.normalizationFactor : NaN;
    return { ...c, meta: meta([stage, gainStage(2, 5e5)]), k: a0 * 800 * 5e5 };
  });
  const ref = magnitudeReference(built.map((c) => ({ op: 'freqs_zpk', zeros: pairsOf(c.zeros), poles: pairsOf(c.poles), k: c.k, freqs, hertz: c.hertz }))) as [number, number][][];
  built.forEach((c, i) => {
    it(`matches scipy to 1e-12 relative for the ${c.name} (scipy.signal.freqs_zpk, scipy 1.17.1)`, () => {
      const r = channelResponse(c.meta);
      const out = new Float64Array(2);
      freqs.forEach((f, j) => {
        r.evaluate(f, out);
        const [re, im] = ref[i][j];
        expect(Math.hypot(out[0] - re, out[1] - im) / Math.hypot(re, im)).toBeLessThan(1e-12);
      });
    });
  });
});

describe('digital stages', () => {
  const h = [0.1, 0.25, 0.3];
  const fir: ResponseStage = {
    number: 3, inputUnits: 'count', outputUnits: 'count', gain: { value: 1, frequency: 1 },
    filter: { kind: 'fir', symmetry: 'EVEN', coefficients: h },
    decimation: { inputSampleRate: 200, factor: 2, offset: 0, delay: 0, correction: 0 },
  };
  const iir: ResponseStage = {
    number: 4, inputUnits: 'count', outputUnits: 'count', gain: { value: 2, frequency: 1 },
    filter: { kind: 'coefficients', transferFunction: 'DIGITAL', numerator: [0.2, 0.3], denominator: [1, -0.5] },
    decimation: { inputSampleRate: 100, factor: 1, offset: 0, delay: 0, correction: 0 },
  };
  const base = [pzStage(oscillatorPoles(1, 0.7), ZZ, 5, 170), gainStage(2, 1000)];
  const freqs = [0.5, 3, 17, 33, 49];
  const [firRef, iirRef] = magnitudeReference([
    { op: 'freqz_fir', b: [...h, ...[...h].reverse()], a: [1], freqs, fs: 200 },
    { op: 'freqz_fir', b: [0.2, 0.3], a: [1, -0.5], freqs, fs: 100 },
  ]) as [number, number][][];
  it('count by their gain only by default (the FIR shape and delay left out)', () => {
    const plain = channelResponse(meta(base)), withDigital = channelResponse(meta([...base, fir, iir]));
    const a = new Float64Array(2), b = new Float64Array(2);
    for (const f of freqs) {
      plain.evaluate(f, a);
      withDigital.evaluate(f, b);
      expect(b[0]).toBeCloseTo(2 * a[0], 6);
      expect(b[1]).toBeCloseTo(2 * a[1], 6);
    }
  });
  it("with digitalStages 'shape' multiply in the expanded symmetric FIR and the IIR ratio as scipy.signal.freqz gives them", () => {
    const plain = channelResponse(meta(base)), full = channelResponse(meta([...base, fir, iir]), { digitalStages: 'shape' });
    const a = new Float64Array(2), b = new Float64Array(2);
    freqs.forEach((f, j) => {
      plain.evaluate(f, a);
      full.evaluate(f, b);
      const [fr, fi] = firRef[j], [ir, ii] = iirRef[j];
      const dr = fr * ir - fi * ii, di = fr * ii + fi * ir;
      const er = 2 * (a[0] * dr - a[1] * di), ei = 2 * (a[0] * di + a[1] * dr);
      expect(Math.hypot(b[0] - er, b[1] - ei) / Math.hypot(er, ei)).toBeLessThan(1e-12);
    });
  });
});

describe('groundMotionOf and argument checks', () => {
  it('reads StationXML ground-motion units in either case', () => {
    expect(groundMotionOf('M/S')).toBe('velocity');
    expect(groundMotionOf('m/s**2')).toBe('acceleration');
    expect(groundMotionOf('M/S**2')).toBe('acceleration');
    expect(groundMotionOf('m')).toBe('displacement');
  });
  it('rejects units that are not ground motion in metres, naming them', () => {
    expect(() => groundMotionOf('V')).toThrow(/input units must be ground motion in metres .* got "V"/);
  });
  it('rejects channels without stages and unsupported stage kinds', () => {
    expect(() => channelResponse(meta([]))).toThrow(/XX.TEST.00.HHZ: the channel has no response stages/);
    const poly: ResponseStage = { number: 1, inputUnits: 'm/s', outputUnits: 'V', decimation: null, gain: { value: 1, frequency: 1 }, filter: { kind: 'polynomial', coefficients: [0, 1] } };
    expect(() => channelResponse(meta([poly]))).toThrow(/polynomial stages are not evaluated/);
  });
  it('rejects a normalization frequency on a pole', () => {
    expect(() => normalizationFactorOf([{ re: 0, im: 2 * Math.PI }], [], 1)).toThrow(/no finite non-zero response at 1 Hz/);
  });
});
