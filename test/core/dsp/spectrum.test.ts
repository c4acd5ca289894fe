import { describe, expect, it } from 'vitest';
import { amplitudeSpectrum, windowWeights } from '../../../core/dsp/spectrum';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff, testSignal } from './signals';

// References: a direct DFT, X[k] = Σ x[n]·w[n]·exp(−2πi·kn/N), summed in this file; numpy.fft.rfft
// with scipy.signal.windows.get_window(name, n) (periodic) (numpy 2.4, scipy 1.17.1) in python3.

/** One-sided amplitudes by the direct DFT with the module's documented scaling. */
function directAmplitudes(x: ArrayLike<number>, w: ArrayLike<number>, nfft: number): number[] {
  let mean = 0;
  for (let i = 0; i < x.length; i++) mean += x[i];
  mean /= x.length;
  let wsum = 0;
  for (let i = 0; i < w.length; i++) wsum += w[i];
  const out: number[] = [];
  for (let k = 0; k <= nfft / 2; k++) {
    let re = 0;
    let im = 0;
    for (let n = 0; n < x.length; n++) {
      const v = (x[n] - mean) * w[n];
      re += v * Math.cos((2 * Math.PI * k * n) / nfft);
      im -= v * Math.sin((2 * Math.PI * k * n) / nfft);
    }
    out.push(((k === 0 || k === nfft / 2 ? 1 : 2) * Math.hypot(re, im)) / wsum);
  }
  return out;
}

const x = testSignal(700, 41, 500);
const x512 = testSignal(512, 42, 0);
const ref = scipyReference([
  { op: 'window', name: 'hann', n: 300, sym: false },
  { op: 'window', name: 'hamming', n: 300, sym: false },
  { op: 'rfft_amplitude', x: x512, window: 'hann' },
]) as [number[], number[], { amplitude: number[]; wsum: number }];

describe('spectrum', () => {
  it('windowWeights gives scipy get_window\'s periodic Hann and Hamming windows to 1e-15', () => {
    expect(relDiff(windowWeights('hann', 300), ref[0])).toBeLessThan(1e-15);
    expect(relDiff(windowWeights('hamming', 300), ref[1])).toBeLessThan(1e-15);
    expect(Array.from(windowWeights('rectangular', 3))).toEqual([1, 1, 1]);
  });

  it('agrees with a direct DFT of the windowed, zero-padded window to 1e-12 of the peak (700 samples padded to 1024)', () => {
    for (const window of ['hann', 'hamming', 'rectangular'] as const) {
      const s = amplitudeSpectrum(x, 100, { window });
      expect(s.fftLength).toBe(1024);
      expect(s.count).toBe(700);
      expect(relDiff(s.amplitudes, directAmplitudes(x, windowWeights(window, 700), 1024)), window).toBeLessThan(1e-12);
    }
  });

  it('agrees with numpy.fft.rfft of the scipy-windowed samples (scaled by 2/Σw) for a power-of-two window', () => {
    const s = amplitudeSpectrum(x512, 200, { removeMean: false });
    const { amplitude, wsum } = ref[2];
    const expected = amplitude.map((a, k) => ((k === 0 || k === 256 ? 1 : 2) * a) / wsum);
    expect(relDiff(s.amplitudes, expected)).toBeLessThan(1e-12);
  });

  it('reads a sinusoid\'s amplitude at its bin: 3 counts at 12.5 Hz, 1024 samples at 100 Hz, Hann window', () => {
    const sine = Float64Array.from({ length: 1024 }, (_, i) => 1000 + 3 * Math.sin((2 * Math.PI * 12.5 * i) / 100));
    const s = amplitudeSpectrum(sine, 100);
    const k = s.frequencies.indexOf(12.5);
    expect(k).toBe(128);
    expect(s.amplitudes[k]).toBeCloseTo(3, 10);
    expect(s.frequencies[s.frequencies.length - 1]).toBe(50);
    expect(s.amplitudes[0]).toBeLessThan(1e-9);
  });

  it('takes a window of the samples by from and count, and refuses bad windows', () => {
    const part = amplitudeSpectrum(x, 100, { from: 100, count: 256 });
    expect(relDiff(part.amplitudes, amplitudeSpectrum(x.slice(100, 356), 100).amplitudes)).toBe(0);
    expect(() => amplitudeSpectrum(x, 100, { from: 600, count: 200 })).toThrow(/count must be an integer from 2 to 100 samples, got 200/);
    expect(() => amplitudeSpectrum(x, 100, { window: 'blackman' as 'hann' })).toThrow(/hann, hamming or rectangular, got blackman/);
    expect(() => amplitudeSpectrum(x, 0)).toThrow(/sample rate/);
  });
});
