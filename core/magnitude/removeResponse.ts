/**
 * Instrument correction in the frequency domain (fft.js): counts to ground displacement, velocity or
 * acceleration, optionally through a simulated instrument (Wood-Anderson).
 *
 * Steps, in this order (the usual sequence; each is common practice):
 * 1. Remove the mean (or, with detrend 'linear', the least-squares straight line).
 * 2. Cosine (Tukey) taper of `taperFraction` of the trace at each end (core/dsp cosineTaperWeights).
 * 3. Zero-pad to N = the power of two ≥ 2n (so the circular convolution does not wrap onto the
 *    trace) and transform (real FFT).
 * 4. Response in output units: R(f) = instrument(f) · (i2πf)^(kᵢₙ − kₒᵤₜ), k the derivative order
 *    (displacement 0, velocity 1, acceleration 2), counts per output unit.
 * 5. Water level: where |R| < max|R| · 10^(−dB/20) (maximum over the bins 0..N/2), R is raised to
 *    that level keeping its phase (phase 0 where R = 0).
 * 6. Spectrum · prefilter(f) · simulate(f) / R(f), where prefilter is the cosine band of four
 *    corners f1 < f2 < f3 < f4 (0 below f1 and above f4, 1 from f2 to f3, half-cosine flanks).
 *    A bin where R is exactly 0 (possible only without a water level) is set to 0.
 * 7. The imaginary parts of the bins 0 and N/2 are set to 0, the spectrum completed by conjugate
 *    symmetry and inverse transformed; the first n samples are the result.
 */
import FFT from 'fft.js';
import type { SampleArray } from '../model';
import { demean, detrend } from '../dsp/detrend';
import { cosineTaperWeights } from '../dsp/taper';
import { MOTION_ORDER, type ChannelResponse, type GroundMotion } from './response';

/** A complex frequency response to multiply in (e.g. a simulated instrument): writes re, im at f Hz. */
export interface FrequencyResponse {
  evaluate(frequencyHz: number, out: Float64Array | number[]): void;
}

export interface RemovalOptions {
  /** Output ground motion; units m, m/s or m/s². */
  output: GroundMotion;
  /** Cosine band-pass corners f1 < f2 < f3 < f4, Hz (f4 at most the Nyquist frequency), or null for none. */
  preFilter: readonly [number, number, number, number] | null;
  /** Water level in dB below the response's maximum, > 0; null for none. Default 60 (common practice). */
  waterLevelDb?: number | null;
  /** Taper per end, fraction of the trace (0 to 0.5). Default 0.05. */
  taperFraction?: number;
  /** 'mean' (default) removes the mean; 'linear' the least-squares line (core/dsp detrend, as scipy.signal.detrend). */
  detrend?: 'mean' | 'linear';
  /** A response to apply after the correction (output units in, any units out), e.g. Wood-Anderson. */
  simulate?: FrequencyResponse;
}

function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * The cosine prefilter's value at `f` Hz for corners [f1, f2, f3, f4]: 0 outside [f1, f4], 1 in
 * [f2, f3], ½(1 − cos(π(f − f1)/(f2 − f1))) rising and ½(1 + cos(π(f − f3)/(f4 − f3))) falling.
 */
export function cosinePreFilter(f: number, corners: readonly [number, number, number, number]): number {
  const [f1, f2, f3, f4] = corners;
  if (f <= f1 || f >= f4) return 0;
  if (f < f2) return 0.5 * (1 - Math.cos((Math.PI * (f - f1)) / (f2 - f1)));
  if (f <= f3) return 1;
  return 0.5 * (1 + Math.cos((Math.PI * (f - f3)) / (f4 - f3)));
}

/** Checks prefilter corners against the sample rate; throws RangeError naming the bad corners. */
export function checkPreFilter(corners: readonly number[], sampleRate: number): void {
  if (corners.length !== 4 || !corners.every((c) => Number.isFinite(c))) {
    throw new RangeError(`prefilter must be four finite corner frequencies in Hz, got [${corners.join(', ')}]`);
  }
  const [f1, f2, f3, f4] = corners;
  if (!(f1 >= 0 && f1 < f2 && f2 < f3 && f3 < f4 && f4 <= sampleRate / 2)) {
    throw new RangeError(`prefilter corners must satisfy 0 <= f1 < f2 < f3 < f4 <= ${sampleRate / 2} Hz (Nyquist), got [${corners.join(', ')}]`);
  }
}

/**
 * `samples` (counts) corrected for `response` to `opts.output` ground motion (m, m/s or m/s²), or
 * to the simulated instrument's output when `opts.simulate` is given. Returns a new Float64Array of
 * the same length.
 */
export function removeResponse(samples: SampleArray, sampleRate: number, response: ChannelResponse, opts: RemovalOptions): Float64Array {
  if (!(samples instanceof Int32Array || samples instanceof Float32Array || samples instanceof Float64Array)) {
    throw new TypeError('samples must be an Int32Array, Float32Array or Float64Array');
  }
  const n = samples.length;
  if (n < 2) throw new RangeError(`need at least 2 samples, got ${n}`);
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  if (!(opts.output in MOTION_ORDER)) throw new RangeError(`output must be displacement, velocity or acceleration, got ${String(opts.output)}`);
  if (opts.preFilter !== null) checkPreFilter(opts.preFilter, sampleRate);
  const wlDb = opts.waterLevelDb === undefined ? 60 : opts.waterLevelDb;
  if (wlDb !== null && !(wlDb > 0 && Number.isFinite(wlDb))) throw new RangeError(`water level must be > 0 dB or null, got ${wlDb}`);
  const taper = opts.taperFraction ?? 0.05;
  if (!(taper >= 0 && taper <= 0.5)) throw new RangeError(`taper fraction per end must be from 0 to 0.5, got ${taper}`);

  const trend = opts.detrend ?? 'mean';
  if (trend !== 'mean' && trend !== 'linear') throw new RangeError(`detrend must be 'mean' or 'linear', got ${String(trend)}`);

  // 1-2: demean or detrend, then taper, into the zero-padded input.
  const nfft = nextPow2(2 * n);
  const x = new Float64Array(nfft);
  const flat = x.subarray(0, n);
  if (trend === 'mean') demean(samples, flat); else detrend(samples, flat);
  const w = cosineTaperWeights(n, taper);
  for (let i = 0; i < n; i++) x[i] *= w[i];

  // 3: transform.
  const fft = new FFT(nfft);
  const spec = fft.createComplexArray() as number[];
  fft.realTransform(spec, x);

  // 4: response in output units, per bin 0..N/2.
  const half = nfft / 2;
  const rRe = new Float64Array(half + 1), rIm = new Float64Array(half + 1);
  const power = MOTION_ORDER[response.input] - MOTION_ORDER[opts.output];
  const tmp = new Float64Array(2);
  let maxAbs = 0;
  for (let k = 0; k <= half; k++) {
    const f = (k * sampleRate) / nfft;
    response.evaluate(f, tmp);
    let re = tmp[0], im = tmp[1];
    // Multiply by (iω)^power (power may be negative: divide).
    const om = 2 * Math.PI * f;
    for (let p = 0; p < power; p++) {
      const r = -im * om;
      im = re * om;
      re = r;
    }
    for (let p = 0; p > power; p--) {
      if (om === 0) { re = 0; im = 0; break; }
      const r = im / om;
      im = -re / om;
      re = r;
    }
    rRe[k] = re;
    rIm[k] = im;
    const a = Math.hypot(re, im);
    if (a > maxAbs) maxAbs = a;
  }
  if (!(maxAbs > 0) || !Number.isFinite(maxAbs)) throw new RangeError(`${response.label}: the response is zero or not finite over 0-${sampleRate / 2} Hz`);

  // 5-6: water level, prefilter, simulation, division.
  const level = wlDb === null ? 0 : maxAbs * 10 ** (-wlDb / 20);
  const pre = opts.preFilter;
  const sim = opts.simulate;
  for (let k = 0; k <= half; k++) {
    const f = (k * sampleRate) / nfft;
    let re = rRe[k], im = rIm[k];
    const a = Math.hypot(re, im);
    if (a < level) {
      if (a === 0) { re = level; im = 0; } else { re *= level / a; im *= level / a; }
    }
    let gRe = pre === null ? 1 : cosinePreFilter(f, pre), gIm = 0;
    if (sim) {
      sim.evaluate(f, tmp);
      gIm = gRe * tmp[1];
      gRe *= tmp[0];
    }
    // g / R
    const d = re * re + im * im;
    let qRe = 0, qIm = 0;
    if (d > 0) {
      qRe = (gRe * re + gIm * im) / d;
      qIm = (gIm * re - gRe * im) / d;
    }
    const xr = spec[2 * k], xi = spec[2 * k + 1];
    spec[2 * k] = xr * qRe - xi * qIm;
    spec[2 * k + 1] = xr * qIm + xi * qRe;
  }
  // 7: real DC and Nyquist bins, conjugate symmetry, inverse.
  spec[1] = 0;
  spec[2 * half + 1] = 0;
  for (let k = 1; k < half; k++) {
    spec[2 * (nfft - k)] = spec[2 * k];
    spec[2 * (nfft - k) + 1] = -spec[2 * k + 1];
  }
  const back = fft.createComplexArray() as number[];
  fft.inverseTransform(back, spec);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = back[2 * i];
  return y;
}
