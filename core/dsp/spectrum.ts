/**
 * Amplitude spectrum of a window of samples, on fft.js.
 *
 * Scaling: the window's samples (mean removed unless asked otherwise) are multiplied by the window
 * function w, zero-padded to the next power of two N (fftLength), transformed, and the one-sided
 * amplitudes are A[k] = c·|X[k]| / Σw with c = 2 for 0 < k < N/2 and c = 1 at k = 0 and k = N/2.
 * So a sinusoid of amplitude a (units of the samples) at a bin frequency reads a when the window
 * fills N; with zero padding the grid is finer than the window's resolution and the peak reads a
 * only where a bin falls on the sinusoid's frequency. Frequencies are k·fs/N Hz, k = 0 to N/2.
 */
import FFT from 'fft.js';
import type { SampleArray } from '../model';
import { checkSampleRate } from './butterworth';
import { checkSamples } from './checkSamples';

/** Window functions, periodic (DFT-even) forms as scipy.signal.get_window(name, n) gives them. */
export type WindowName = 'hann' | 'hamming' | 'rectangular';

export interface SpectrumOptions {
  /** Window function; default 'hann'. */
  window?: WindowName;
  /** Subtract the window's mean before windowing (keeps an offset out of the low bins). Default true. */
  removeMean?: boolean;
  /** First sample of the window in x; default 0. */
  from?: number;
  /** Samples in the window; default to the end of x. At least 2. */
  count?: number;
}

export interface AmplitudeSpectrum {
  /** Hz, k·sampleRate/fftLength for k = 0 to fftLength/2. */
  frequencies: Float64Array;
  /** Units of the samples (see the module's scaling note). */
  amplitudes: Float64Array;
  window: WindowName;
  /** Power of two the window was zero-padded to. */
  fftLength: number;
  /** Samples in the window. */
  count: number;
}

/** The window function's n weights (periodic form: w[i] for i = 0..n−1 of a period of n). */
export function windowWeights(name: WindowName, n: number): Float64Array {
  const w = new Float64Array(n);
  if (name === 'rectangular') return w.fill(1);
  const a0 = name === 'hann' ? 0.5 : 0.54;
  if (name !== 'hann' && name !== 'hamming') throw new TypeError(`window must be hann, hamming or rectangular, got ${String(name)}`);
  for (let i = 0; i < n; i++) w[i] = a0 - (1 - a0) * Math.cos((2 * Math.PI * i) / n);
  return w;
}

const transforms = new Map<number, FFT>();

/** Amplitude spectrum of x[from .. from+count) at `sampleRate` (Hz); see the module note for scaling. */
export function amplitudeSpectrum(x: SampleArray, sampleRate: number, options: SpectrumOptions = {}): AmplitudeSpectrum {
  checkSamples(x);
  checkSampleRate(sampleRate);
  const { window = 'hann', removeMean = true, from = 0 } = options;
  const count = options.count ?? x.length - from;
  if (!Number.isInteger(from) || from < 0 || from > x.length) throw new RangeError(`from must be an integer sample index from 0 to ${x.length}, got ${from}`);
  if (!Number.isInteger(count) || count < 2 || from + count > x.length) {
    throw new RangeError(`count must be an integer from 2 to ${x.length - from} samples, got ${count}`);
  }
  const w = windowWeights(window, count);
  let fftLength = 2;
  while (fftLength < count) fftLength *= 2;
  let mean = 0;
  if (removeMean) {
    for (let i = 0; i < count; i++) mean += x[from + i];
    mean /= count;
  }
  const input = new Float64Array(fftLength);
  let wsum = 0;
  for (let i = 0; i < count; i++) {
    input[i] = (x[from + i] - mean) * w[i];
    wsum += w[i];
  }
  let fft = transforms.get(fftLength);
  if (!fft) {
    fft = new FFT(fftLength);
    transforms.set(fftLength, fft);
  }
  const spectrum = new Float64Array(2 * fftLength);
  fft.realTransform(spectrum, input);
  const half = fftLength / 2;
  const frequencies = new Float64Array(half + 1);
  const amplitudes = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    frequencies[k] = (k * sampleRate) / fftLength;
    const c = k === 0 || k === half ? 1 : 2;
    amplitudes[k] = (c * Math.hypot(spectrum[2 * k], spectrum[2 * k + 1])) / wsum;
  }
  return { frequencies, amplitudes, window, fftLength, count };
}
