import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { sosMagnitude } from '../../../core/dsp/sosMagnitude';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff } from './signals';

// Reference: |scipy.signal.freqz_sos(sos, worN=freqs, fs=fs)| (scipy 1.17.1) in python3.
const designs = [
  { sos: butterworth(4, [1, 20], 'bandpass', 100), fs: 100 },
  { sos: butterworth(7, 15, 'lowpass', 40), fs: 40 },
  { sos: butterworth(3, 2, 'highpass', 200), fs: 200 },
];
const freqs = designs.map(({ fs }) => Array.from({ length: 101 }, (_, i) => (i / 100) * (fs / 2)));
const ref = scipyReference(designs.map(({ sos, fs }, i) => ({ op: 'freqz', sos, freqs: freqs[i], fs }))) as number[][];

describe('sosMagnitude', () => {
  it('agrees with scipy freqz_sos magnitudes from 0 Hz to Nyquist to 1e-12 of the peak', () => {
    designs.forEach(({ sos, fs }, i) => expect(relDiff(sosMagnitude(sos, freqs[i], fs), ref[i]), `design ${i}`).toBeLessThan(1e-12));
  });

  it('refuses malformed sections and sample rates', () => {
    expect(() => sosMagnitude(new Float64Array(7), [1], 100)).toThrow(/multiple of 6/);
    expect(() => sosMagnitude(designs[0].sos, [1], 0)).toThrow(/sample rate/);
  });
});
