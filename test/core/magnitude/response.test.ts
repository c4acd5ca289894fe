import { describe, expect, it } from 'vitest';
import {
  channelResponse, groundMotionOf, normalizationFactorOf, parseGroundUnits, oscillatorPoles, responseAt, sensitivityCheck,
} from '../../../core/magnitude/response';
import { parseStationXml } from '../../../core/stationxml/parse';
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
const FIR_HALF = [0.1, 0.25, 0.3];
const DIGITAL_FREQS = [0.5, 3, 17, 33, 49];
/** scipy.signal.freqz of the FIR and IIR stages, filled by the scipy batch of the freqs_zpk tests. */
const DIGITAL_REF: [number, number][][] = [];

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
  const ref = magnitudeReference([
    ...built.map((c) => ({ op: 'freqs_zpk', zeros: pairsOf(c.zeros), poles: pairsOf(c.poles), k: c.k, freqs, hertz: c.hertz })),
    // For the digital-stage tests below: one python process per file.
    { op: 'freqz_fir', b: [...FIR_HALF, ...[...FIR_HALF].reverse()], a: [1], freqs: DIGITAL_FREQS, fs: 200 },
    { op: 'freqz_fir', b: [0.2, 0.3], a: [1, -0.5], freqs: DIGITAL_FREQS, fs: 100 },
  ]) as [number, number][][];
  DIGITAL_REF.push(ref[built.length], ref[built.length + 1]);
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
  const h = FIR_HALF;
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
  const freqs = DIGITAL_FREQS;
  const [firRef, iirRef] = DIGITAL_REF;
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
  it('rejects units that are not ground motion in a length unit, naming them', () => {
    expect(() => groundMotionOf('V')).toThrow(/input units must be ground motion in a length unit .* got "V"/);
    expect(() => groundMotionOf('m/s**3')).toThrow(RangeError);
  });
  it('reads nm/s and cm/s**2 and rescales the response to SI units: a channel in nm/s equals one in m/s with 1e-9 of the gain', () => {
    expect(parseGroundUnits('NM/S')).toEqual({ motion: 'velocity', metres: 1e-9 });
    expect(parseGroundUnits('cm/s**2')).toEqual({ motion: 'acceleration', metres: 1e-2 });
    const poles = oscillatorPoles(1, 0.7);
    const si = channelResponse(meta([pzStage(poles, ZZ, 5, 170), gainStage(2, 1000)]));
    const nm = channelResponse(meta([pzStage(poles, ZZ, 5, 170e-9, 'nm/s'), gainStage(2, 1000)], { value: 170e-6, frequency: 5, inputUnits: 'nm/s', outputUnits: 'count', sign: 1 }));
    const a = new Float64Array(2), b = new Float64Array(2);
    si.evaluate(3, a);
    nm.evaluate(3, b);
    expect(b[0] / a[0]).toBeCloseTo(1, 12);
    expect(b[1] / a[1]).toBeCloseTo(1, 12);
    expect(nm.metresPerUnit).toBe(1e-9);
    const nmMeta = meta([pzStage(poles, ZZ, 5, 170e-9, 'nm/s'), gainStage(2, 1000)], { value: 170e-6, frequency: 5, inputUnits: 'nm/s', outputUnits: 'count', sign: 1 });
    expect(sensitivityCheck(nmMeta)?.evaluatedRatio).toBeCloseTo(1, 12);
  });
  it('rejects channels without stages and unsupported stage kinds', () => {
    expect(() => channelResponse(meta([]))).toThrow(/XX.TEST.00.HHZ: the channel has no response stages/);
    const poly: ResponseStage = { number: 1, inputUnits: 'm/s', outputUnits: 'V', decimation: null, gain: { value: 1, frequency: 1 }, filter: { kind: 'polynomial', coefficients: [0, 1] } };
    expect(() => channelResponse(meta([poly]))).toThrow(/polynomial stages are not evaluated/);
  });
  it('with sensitivityOnly, a channel without stages is flat at its InstrumentSensitivity (sign kept)', () => {
    const m = meta([], { value: -6.3e8, frequency: 1, inputUnits: 'M/S', outputUnits: 'COUNTS', sign: -1 });
    expect(() => channelResponse(m)).toThrow(/no response stages \(need at least one, or sensitivityOnly\)/);
    const r = channelResponse(m, { sensitivityOnly: true });
    const out = new Float64Array(2);
    r.evaluate(7, out);
    expect([out[0], out[1], r.input]).toEqual([-6.3e8, 0, 'velocity']);
  });
  it('rejects a normalization frequency on a pole', () => {
    expect(() => normalizationFactorOf([{ re: 0, im: 2 * Math.PI }], [], 1)).toThrow(/no finite non-zero response at 1 Hz/);
  });
});

describe('channelResponse of a channel read from StationXML (core/stationxml parser)', () => {
  // A 1 Hz, h 0.7 geophone written as LAPLACE (HERTZ): poles −0.7 ± i·√0.51 Hz, zeros 0, 0. Its A0 at
  // 5 Hz is exactly 1 (|−25/(−24 + 7i)| = 1, hand-computed), then a digitizer and a symmetric FIR.
  const xml = `<?xml version="1.0" encoding="UTF-8"?>
<FDSNStationXML xmlns="http://www.fdsn.org/xml/station/1" schemaVersion="1.2">
 <Source>test</Source><Created>2026-01-01T00:00:00Z</Created>
 <Network code="XX"><Station code="GEO"><Latitude>0</Latitude><Longitude>0</Longitude><Elevation>0</Elevation>
  <Channel code="EHZ" locationCode=""><Latitude>0</Latitude><Longitude>0</Longitude><Elevation>0</Elevation><Depth>0</Depth>
   <Azimuth>0</Azimuth><Dip>-90</Dip><SampleRate>100</SampleRate>
   <Response>
    <InstrumentSensitivity><Value>71303168</Value><Frequency>5</Frequency><InputUnits><Name>M/S</Name></InputUnits><OutputUnits><Name>COUNTS</Name></OutputUnits></InstrumentSensitivity>
    <Stage number="1"><PolesZeros><InputUnits><Name>M/S</Name></InputUnits><OutputUnits><Name>V</Name></OutputUnits>
      <PzTransferFunctionType>LAPLACE (HERTZ)</PzTransferFunctionType><NormalizationFactor>1</NormalizationFactor><NormalizationFrequency>5</NormalizationFrequency>
      <Zero number="0"><Real>0</Real><Imaginary>0</Imaginary></Zero><Zero number="1"><Real>0</Real><Imaginary>0</Imaginary></Zero>
      <Pole number="0"><Real>-0.7</Real><Imaginary>${Math.sqrt(0.51)}</Imaginary></Pole><Pole number="1"><Real>-0.7</Real><Imaginary>${-Math.sqrt(0.51)}</Imaginary></Pole>
     </PolesZeros><StageGain><Value>170</Value><Frequency>5</Frequency></StageGain></Stage>
    <Stage number="2"><Coefficients><InputUnits><Name>V</Name></InputUnits><OutputUnits><Name>COUNTS</Name></OutputUnits>
      <CfTransferFunctionType>DIGITAL</CfTransferFunctionType><Numerator>1</Numerator></Coefficients>
      <Decimation><InputSampleRate>100</InputSampleRate><Factor>1</Factor><Offset>0</Offset><Delay>0</Delay><Correction>0</Correction></Decimation>
      <StageGain><Value>419430.4</Value><Frequency>5</Frequency></StageGain></Stage>
    <Stage number="3"><FIR><InputUnits><Name>COUNTS</Name></InputUnits><OutputUnits><Name>COUNTS</Name></OutputUnits>
      <Symmetry>EVEN</Symmetry><NumeratorCoefficient i="1">0.25</NumeratorCoefficient><NumeratorCoefficient i="2">0.25</NumeratorCoefficient></FIR>
      <Decimation><InputSampleRate>100</InputSampleRate><Factor>1</Factor><Offset>0</Offset><Delay>0</Delay><Correction>0</Correction></Decimation>
      <StageGain><Value>1</Value><Frequency>0</Frequency></StageGain></Stage>
   </Response></Channel></Station></Network></FDSNStationXML>`;
  const ch = parseStationXml(xml, 'geophone.xml').networks[0].stations[0].channels[0];
  it('is i·G/(2h) at the natural frequency, G = 170 × 419430.4 counts per m/s (hand-computed)', () => {
    const r = responseAt(ch, 1);
    expect(r.re / 71303168).toBeCloseTo(0, 12);
    expect(r.im / 71303168).toBeCloseTo(1 / 1.4, 12);
  });
  it('agrees with its InstrumentSensitivity at 5 Hz (normalization-factor rule) and reads M/S as velocity', () => {
    const c = sensitivityCheck(ch);
    expect(c?.evaluatedRatio).toBeCloseTo(1, 12);
    expect(c?.gainRatio).toBeCloseTo(1, 14);
    expect(channelResponse(ch).input).toBe('velocity');
  });
  it("with digitalStages 'shape' includes the 4-tap boxcar FIR: cos(πf/100)·cos(πf/50)·e^(−i3πf/100) times the analog part", () => {
    // h = [¼, ¼, ¼, ¼]: H = ¼(1 + z⁻¹ + z⁻² + z⁻³) = cos(ω/2)·cos(ω)·e^(−i3ω/2), ω = 2πf/100 (hand-computed).
    const f = 7;
    const a = responseAt(ch, f), b = responseAt(ch, f, { digitalStages: 'shape' });
    const w = (2 * Math.PI * f) / 100;
    const mag = Math.cos(w / 2) * Math.cos(w), ph = (-3 * w) / 2;
    const er = mag * (a.re * Math.cos(ph) - a.im * Math.sin(ph)), ei = mag * (a.re * Math.sin(ph) + a.im * Math.cos(ph));
    expect(Math.hypot(b.re - er, b.im - ei) / Math.hypot(er, ei)).toBeLessThan(1e-12);
  });
});
