import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { defaultPadLength, sosfiltfilt } from '../../../core/dsp/sosfiltfilt';
import { scipyReference } from '../../ref/scipy/dspReference';
import { caseLabel, filterCases, relDiff, testSignal } from './signals';

// Reference: scipy.signal.sosfiltfilt(sos, x, padtype='odd', padlen=None|n) (scipy 1.17.1, float64)
// in the machine's python3, one run for the file. Tolerance 1e-10 of the peak output amplitude.

const cases = filterCases();
const x = testSignal(3000, 7);
const short = testSignal(40, 3);
const designs = cases.map((c) => butterworth(c.order, c.corners, c.kind, c.fs));
const bp = butterworth(4, [1, 20], 'bandpass', 100);
const lp1 = butterworth(1, 10, 'lowpass', 100);

const ref = scipyReference([
  ...designs.map((sos) => ({ op: 'sosfiltfilt', sos, x })),
  { op: 'sosfiltfilt', sos: bp, x: short, padlen: 39 },
  { op: 'sosfiltfilt', sos: bp, x, padlen: 0 },
  { op: 'sosfiltfilt', sos: lp1, x: short },
]) as number[][];

const label = caseLabel;

describe('sosfiltfilt', () => {
  it('agrees with scipy sosfiltfilt (odd padding, steady-state starts) to 1e-10 of the peak output, orders 1-8, three kinds, 40-500 Hz', () => {
    cases.forEach((c, i) => expect(relDiff(sosfiltfilt(designs[i], x), ref[i]), label(c)).toBeLessThan(1e-10));
  });

  it('agrees with scipy for a given padding length, including none', () => {
    expect(relDiff(sosfiltfilt(bp, short, { padLength: 39 }), ref[cases.length])).toBeLessThan(1e-10);
    expect(relDiff(sosfiltfilt(bp, x, { padLength: 0 }), ref[cases.length + 1])).toBeLessThan(1e-10);
  });

  it('pads 3·(2·sections + 1) samples by default, less the first-order sections (scipy\'s rule), and agrees with scipy there', () => {
    expect(defaultPadLength(bp)).toBe(27);
    // Order 1 low-pass: one section with b2 = a2 = 0, so 3·(2 + 1 − 1) = 6.
    expect(defaultPadLength(lp1)).toBe(6);
    expect(relDiff(sosfiltfilt(lp1, short), ref[cases.length + 2])).toBeLessThan(1e-10);
  });

  it('has zero phase: a symmetric pulse stays symmetric about its centre', () => {
    const pulse = new Float64Array(4001);
    for (let i = 0; i < pulse.length; i++) pulse[i] = Math.exp(-(((i - 2000) / 15) ** 2));
    const y = sosfiltfilt(bp, pulse);
    const peak = Math.max(...y.map(Math.abs));
    // Not exact: the two ends of the record start the passes differently.
    for (let k = 1; k < 400; k++) expect(Math.abs(y[2000 - k] - y[2000 + k]) / peak).toBeLessThan(1e-10);
  });

  it('returns an empty output for an empty input, and filters a single sample with no padding', () => {
    expect(sosfiltfilt(bp, new Float64Array(0)).length).toBe(0);
    // One sample of value c: both passes start in the steady state for c, so a band-pass (zero gain at 0 Hz) gives 0.
    expect(Math.abs(sosfiltfilt(bp, Float64Array.of(123.5), { padLength: 0 })[0])).toBeLessThan(1e-12);
  });

  it('refuses a padding not below the input length, naming the allowed range', () => {
    expect(() => sosfiltfilt(bp, short.subarray(0, 27))).toThrow(/padding must be an integer from 0 to 26 samples \(below the input length 27\), got 27/);
    expect(() => sosfiltfilt(bp, short, { padLength: 40 })).toThrow(/from 0 to 39 samples \(below the input length 40\), got 40/);
  });
});
