import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { sectionCount, sosfilt, sosfiltZi } from '../../../core/dsp/sosfilt';
import { scipyReference } from '../../ref/scipy/dspReference';
import { caseLabel, filterCases, relDiff, testSignal } from './signals';

// Reference: scipy.signal.sosfilt(sos, x, zi=zi) and sosfilt_zi(sos) (scipy 1.17.1, float64) in the
// machine's python3, one run for the file. Tolerance 1e-10 of the peak output amplitude.

const cases = filterCases();
const x = testSignal(4000);
const designs = cases.map((c) => butterworth(c.order, c.corners, c.kind, c.fs));
const zis = designs.map((sos) => sosfiltZi(sos));
// A chunked run: state carried over from the first 1500 samples, started from the steady state for x[0].
const bp = butterworth(4, [1, 20], 'bandpass', 100);
const bpZi = sosfiltZi(bp).map((v) => v * x[0]);

// Ill-conditioned designs (corners 1e-4 of the sample rate, poles within 3e-4 of z = 1) on data with
// a large offset: here round-off, not the method, sets the agreement, so both this code and scipy are
// compared with the same recurrence run in 80-bit extended precision (numpy.longdouble).
const hard = [
  butterworth(8, 0.02, 'highpass', 500),
  butterworth(8, [0.05, 0.2], 'bandpass', 500),
  butterworth(8, [0.01, 240], 'bandpass', 500),
];
const offsetSignal = testSignal(3000, 5, 5000);

const ref = scipyReference([
  ...hard.map((sos) => ({ op: 'sosfilt_extended', sos, x: offsetSignal })),
  ...hard.map((sos) => ({ op: 'sosfilt', sos, x: offsetSignal })),
  ...designs.map((sos) => ({ op: 'sosfilt', sos, x })),
  ...designs.map((sos) => ({ op: 'sosfilt_zi', sos })),
  { op: 'sosfilt', sos: bp, x, zi: bpZi },
]);
const refExtended = ref.splice(0, hard.length) as number[][];
const refHard = ref.splice(0, hard.length) as { y: number[] }[];
const refFilt = ref.slice(0, cases.length) as { y: number[]; zf: number[] }[];
const refZi = ref.slice(cases.length, 2 * cases.length) as number[][];
const refChunked = ref[2 * cases.length] as { y: number[]; zf: number[] };

const label = caseLabel;

describe('sosfilt', () => {
  it('agrees with scipy sosfilt to 1e-10 of the peak output, orders 1-8, three kinds, 40-500 Hz', () => {
    cases.forEach((c, i) => {
      const state = new Float64Array(2 * sectionCount(designs[i]));
      const y = sosfilt(designs[i], x, { state });
      expect(relDiff(y, refFilt[i].y), label(c)).toBeLessThan(1e-10);
      // The final state is scipy's zf (relative to the state's own size).
      expect(relDiff(state, refFilt[i].zf), label(c)).toBeLessThan(1e-10);
    });
  });

  it('is as close as scipy (within 3x, and to 2e-10 of the peak) to an extended-precision run on ill-conditioned designs', () => {
    hard.forEach((sos, i) => {
      const mine = relDiff(sosfilt(sos, offsetSignal), refExtended[i]);
      const theirs = relDiff(refHard[i].y, refExtended[i]);
      expect(mine, `design ${i}`).toBeLessThan(Math.max(3 * theirs, 1e-12));
      expect(mine, `design ${i}`).toBeLessThan(2e-10);
    });
  });

  it('continues seamlessly across chunks when given the same state array (same output as one run, and as scipy with zi)', () => {
    const state = Float64Array.from(bpZi);
    const whole = sosfilt(bp, x, { state: Float64Array.from(bpZi) });
    const parts = [x.subarray(0, 1500), x.subarray(1500, 1501), x.subarray(1501)].map((p) => sosfilt(bp, p, { state }));
    const joined = new Float64Array(x.length);
    joined.set(parts[0], 0);
    joined.set(parts[1], 1500);
    joined.set(parts[2], 1501);
    expect(Array.from(joined)).toEqual(Array.from(whole));
    expect(relDiff(joined, refChunked.y)).toBeLessThan(1e-10);
    expect(relDiff(state, refChunked.zf)).toBeLessThan(1e-10);
  });

  it('sosfiltZi gives scipy sosfilt_zi to 1e-12 (looser by the conditioning 1/(1 + a1 + a2) for corners far below fs)', () => {
    cases.forEach((c, i) => {
      const sos = designs[i];
      let worstDc = Infinity;
      for (let s = 0; s < sos.length / 6; s++) worstDc = Math.min(worstDc, Math.abs(1 + sos[6 * s + 4] + sos[6 * s + 5]));
      expect(relDiff(zis[i], refZi[i]), label(c)).toBeLessThan(Math.max(1e-12, 1e-15 / worstDc));
    });
  });

  it('starts a constant signal without a transient from sosfiltZi times the first sample (output equals DC gain times input)', () => {
    const lp = butterworth(6, 5, 'lowpass', 100);
    const c = new Float64Array(500).fill(1234.5);
    const y = sosfilt(lp, c, { state: sosfiltZi(lp).map((v) => v * 1234.5) });
    for (const v of y) expect(Math.abs(v - 1234.5)).toBeLessThan(1e-9);
  });

  it('accepts Int32Array and Float32Array input, as the same numbers in float64', () => {
    const ints = Int32Array.from(x, (v) => Math.round(v));
    const floats = Float32Array.from(x);
    expect(Array.from(sosfilt(bp, ints))).toEqual(Array.from(sosfilt(bp, Float64Array.from(ints))));
    expect(Array.from(sosfilt(bp, floats))).toEqual(Array.from(sosfilt(bp, Float64Array.from(floats))));
  });

  it('filters in place when out is the input array', () => {
    const y = Float64Array.from(x);
    const expected = sosfilt(bp, x);
    expect(sosfilt(bp, y, { out: y })).toBe(y);
    expect(Array.from(y)).toEqual(Array.from(expected));
  });

  it('refuses malformed sections, states and outputs, naming what was expected', () => {
    expect(() => sosfilt(new Float64Array(5), x)).toThrow(/multiple of 6\), got 5/);
    expect(() => sosfilt(Float64Array.of(1, 0, 0, 2, 0, 0), x)).toThrow(/a0 must be 1.*got 2/);
    expect(() => sosfilt(bp, x, { state: new Float64Array(3) })).toThrow(/2 per section \(8\), got length 3/);
    expect(() => sosfilt(bp, x, { out: new Float64Array(3) })).toThrow(/length 4000, got length 3/);
    expect(() => sosfilt(bp, [1, 2, 3] as unknown as Float64Array)).toThrow(TypeError);
  });
});
