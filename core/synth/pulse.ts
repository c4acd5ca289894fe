/**
 * Body-wave pulses built in the frequency domain: Brune's omega-square source (source.ts) times a
 * causal attenuation operator times the recording instrument, delayed by a fraction of a sample,
 * then brought to the time domain. Every factor is causal, and the sample before the onset is set to
 * exactly zero, so nothing arrives before the arrival time.
 *
 * Attenuation: the amplitude exp(-π f t*) (t* = travel time / Q, plus the site's κ0: Anderson &
 * Hough 1984, Bull. Seismol. Soc. Am. 74, 1969) is given its minimum phase, which is the causal
 * (dispersive) constant-Q operator (Futterman 1962; Aki & Richards 2002 §5.5.2). The minimum phase is
 * computed by the folded real cepstrum (Oppenheim & Schafer, Discrete-Time Signal Processing, 1989,
 * §12.6: a sequence whose complex cepstrum is zero for n < 0 is minimum-phase and causal).
 */
import FFT from 'fft.js';
import { instrumentResponse, responseScale, type Cx, type Instrument } from './response';
import { woodAndersonResponse } from './mlLaw';

/** What the pulse is expressed in. */
export type PulseOutput =
  | { readonly kind: 'displacement' }
  | { readonly kind: 'woodAnderson' }
  | { readonly kind: 'instrument'; readonly instrument: Instrument };

const ffts = new Map<number, FFT>();
function fftOf(n: number): FFT {
  let f = ffts.get(n);
  if (!f) {
    f = new FFT(n);
    ffts.set(n, f);
  }
  return f;
}

/** Smallest power of two >= n (and >= 64). */
export function nextPow2(n: number): number {
  let p = 64;
  while (p < n) p *= 2;
  return p;
}

/**
 * The minimum-phase operator whose amplitude is exp(-π |f| t*), as an interleaved complex
 * spectrum of length 2n (bins k = 0..n-1, f = k fs / n, negative frequencies above n/2).
 * With t* = 0 it is 1 at every frequency.
 */
export function minimumPhaseAttenuation(n: number, sampleRate: number, tStar: number): Float64Array {
  if (!(n >= 64 && (n & (n - 1)) === 0)) throw new RangeError(`FFT length must be a power of two >= 64, got ${n}`);
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  if (!(tStar >= 0 && tStar < 10)) throw new RangeError(`t* must be in [0, 10) s, got ${tStar}`);
  const fft = fftOf(n);
  const logAmp = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const kk = k <= n / 2 ? k : n - k;
    logAmp[2 * k] = -Math.PI * ((kk * sampleRate) / n) * tStar;
  }
  const cep = new Float64Array(2 * n);
  fft.inverseTransform(cep, logAmp);
  // Fold: keep n = 0 and n = N/2, double 0 < n < N/2, drop the rest (the anticausal half).
  const folded = new Float64Array(2 * n);
  folded[0] = cep[0];
  for (let i = 1; i < n / 2; i++) folded[2 * i] = 2 * cep[2 * i];
  folded[n] = cep[n];
  const logH = new Float64Array(2 * n);
  fft.transform(logH, folded);
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const m = Math.exp(logH[2 * k]);
    out[2 * k] = m * Math.cos(logH[2 * k + 1]);
    out[2 * k + 1] = m * Math.sin(logH[2 * k + 1]);
  }
  return out;
}

export interface PulseSpec {
  /** Samples per second. */
  readonly sampleRate: number;
  /** FFT length (power of two); the pulse must have died out well within it. */
  readonly n: number;
  /** Source corner frequency, Hz. */
  readonly cornerHz: number;
  /** Attenuation t*, s. */
  readonly tStar: number;
  /** Onset after sample 0, in samples, in [0, 1). */
  readonly delaySamples: number;
  readonly output: PulseOutput;
}

/**
 * The pulse's spectrum (interleaved complex, length 2n) for a far-field displacement pulse of unit
 * area (1 m·s): Brune source × attenuation × output response × delay.
 */
export function pulseSpectrum(spec: PulseSpec): Float64Array {
  const { sampleRate: fs, n, cornerHz, tStar, delaySamples, output } = spec;
  if (!(cornerHz > 0)) throw new RangeError(`corner frequency must be > 0 Hz, got ${cornerHz}`);
  if (!(delaySamples >= 0 && delaySamples < 1)) throw new RangeError(`delay must be in [0, 1) samples, got ${delaySamples}`);
  const spec2 = minimumPhaseAttenuation(n, fs, tStar);
  const tmp: Cx = { re: 0, im: 0 };
  const scale = output.kind === 'instrument' ? responseScale(output.instrument) : 1;
  for (let k = 0; k <= n / 2; k++) {
    const f = (k * fs) / n;
    // Brune: 1 / (1 + i f/fc)^2
    const a = 1, b = f / cornerHz;
    const d = (a * a + b * b) ** 2;
    let re = (a * a - b * b) / d, im = (-2 * a * b) / d;
    // Output response.
    let r: Cx;
    if (output.kind === 'displacement') r = { re: 1, im: 0 };
    else if (output.kind === 'woodAnderson') r = woodAndersonResponse(f);
    else {
      r = instrumentResponse(output.instrument, f, scale);
      // Displacement to the sensor's input units: multiply by (i ω) once (m/s) or twice (m/s²).
      const w = 2 * Math.PI * f;
      const times = output.instrument.inputUnits === 'm/s' ? 1 : 2;
      for (let t = 0; t < times; t++) {
        const rr = -r.im * w;
        r = { re: rr, im: r.re * w };
      }
    }
    tmp.re = re * r.re - im * r.im;
    tmp.im = re * r.im + im * r.re;
    re = tmp.re;
    im = tmp.im;
    // Delay: exp(-i ω delay).
    const ph = (-2 * Math.PI * k * delaySamples) / n;
    const c = Math.cos(ph), s = Math.sin(ph);
    tmp.re = re * c - im * s;
    tmp.im = re * s + im * c;
    // Attenuation.
    const ar = spec2[2 * k], ai = spec2[2 * k + 1];
    spec2[2 * k] = tmp.re * ar - tmp.im * ai;
    spec2[2 * k + 1] = tmp.re * ai + tmp.im * ar;
  }
  // Hermitian symmetry for a real signal; the Nyquist bin must be real.
  spec2[n + 1] = 0;
  for (let k = 1; k < n / 2; k++) {
    spec2[2 * (n - k)] = spec2[2 * k];
    spec2[2 * (n - k) + 1] = -spec2[2 * k + 1];
  }
  return spec2;
}

/** Real time series of an interleaved complex spectrum (length n), scaled so sample values are per second of time (divided by 1/fs). */
export function timeSeries(spectrum: Float64Array, sampleRate: number): Float64Array {
  const n = spectrum.length / 2;
  const fft = fftOf(n);
  const cx = new Float64Array(2 * n);
  fft.inverseTransform(cx, spectrum);
  const out = new Float64Array(n);
  // The DFT of a sampled continuous signal x(t) is fs times its Fourier transform: divide back.
  for (let i = 0; i < n; i++) out[i] = cx[2 * i] * sampleRate;
  return out;
}

/**
 * The pulse in the time domain: sample i is at (i - delaySamples) / fs seconds after the onset.
 * Sample 0 is set to 0 when it lies before the onset (delay > 0), so nothing precedes the arrival.
 */
export function synthesizePulse(spec: PulseSpec): Float64Array {
  const out = timeSeries(pulseSpectrum(spec), spec.sampleRate);
  if (spec.delaySamples > 0) out[0] = 0;
  return out;
}

/**
 * Scattered waves with a pulse's spectrum: white noise filtered by `kernel` (a short time series,
 * e.g. a pulse from synthesizePulse, zero-padded to the noise length), each output normalized to unit
 * RMS. Noise series are filtered two at a time in one complex transform (the kernel is real, so the
 * real and imaginary parts stay apart). All `noises` must have the same power-of-two length.
 */
export function filteredNoise(kernel: Float64Array, kernelLength: number, noises: Float64Array[]): Float64Array[] {
  if (noises.length === 0) return [];
  const n = noises[0].length;
  if (!(n >= 64 && (n & (n - 1)) === 0)) throw new RangeError(`noise length must be a power of two >= 64, got ${n}`);
  const fft = fftOf(n);
  const cx = new Float64Array(2 * n);
  const m = Math.min(kernelLength, n, kernel.length);
  for (let i = 0; i < m; i++) cx[2 * i] = kernel[i];
  const ks = new Float64Array(2 * n);
  fft.transform(ks, cx);
  const out: Float64Array[] = [];
  const sp = new Float64Array(2 * n);
  for (let q = 0; q < noises.length; q += 2) {
    const a = noises[q], b = noises[q + 1];
    for (let i = 0; i < n; i++) {
      cx[2 * i] = a[i];
      cx[2 * i + 1] = b ? b[i] : 0;
    }
    fft.transform(sp, cx);
    for (let k = 0; k < n; k++) {
      const ar = sp[2 * k], ai = sp[2 * k + 1], br = ks[2 * k], bi = ks[2 * k + 1];
      sp[2 * k] = ar * br - ai * bi;
      sp[2 * k + 1] = ar * bi + ai * br;
    }
    fft.inverseTransform(cx, sp);
    for (let part = 0; part < (b ? 2 : 1); part++) {
      const o = new Float64Array(n);
      let ss = 0;
      for (let i = 0; i < n; i++) {
        const v = cx[2 * i + part];
        o[i] = v;
        ss += v * v;
      }
      const r = Math.sqrt(ss / n) || 1;
      for (let i = 0; i < n; i++) o[i] /= r;
      out.push(o);
    }
  }
  return out;
}
