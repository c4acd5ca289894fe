/**
 * Body-wave pulses built in the frequency domain: Brune's omega-square source (source.ts) times a
 * causal attenuation operator times the recording instrument, delayed by a fraction of a sample,
 * then brought to the time domain. The sample before the onset is set to exactly zero, so nothing
 * arrives before the arrival time.
 *
 * Attenuation: the amplitude exp(-π f t*) (t* = travel time / Q, plus the site's κ0: Anderson &
 * Hough 1984, Bull. Seismol. Soc. Am. 74, 1969) with its minimum phase, which is the causal
 * (dispersive) constant-Q operator (Futterman 1962, J. Geophys. Res. 67, 5279; Aki & Richards 2002
 * §5.5.2; both from memory). A causal operator with a wave front needs a frequency above which Q is
 * no longer constant, else the dispersion (phase delay (t* / π) ln(f_top / f) relative to the front)
 * grows without bound. That band is fixed here in Hz, the same for every channel, so a ground
 * motion looks the same at 40, 100 and 200 Hz sampling: Q is constant from 0 to
 * CONSTANT_Q_TOP_HZ = 100 Hz and the loss stops growing above it:
 *   ln|A(f)| = -π t* min(|f|, f_top).
 * 100 Hz is the smallest top that keeps the amplitude exp(-π f t*) of t* and κ0 over the whole band
 * of every channel the generator writes (its fastest sample at 200 Hz); a higher top would only move
 * the front earlier against a pulse that no channel sees change (each doubling by (t* / π) ln 2).
 * The front is the arrival time of the truth file; the visible pulse comes after it: the S of a
 * regional event (t* = 0.25 s) reaches 1 % of its peak about 0.18 s after its front, a local P
 * (t* = 0.05 s) about 0.015 s after (Daybreak's measurements on a Brune pulse).
 * Its phase is the Hilbert transform of the log amplitude (the gain-phase relation of a
 * minimum-phase filter: Bode 1945; Papoulis, The Fourier Integral and its Applications, 1962 -
 * from memory), in closed form, with u = f / f_top (f >= 0; the phase is odd in f):
 *   φ(f) = -t* f_top [(u + 1) ln(u + 1) + (u - 1) ln|u - 1| - 2 u ln u],
 * the phase of exp(-i 2π f t) for a delay t. For f << f_top the phase delay -φ / (2π f) is
 * (t* / π) (ln(f_top / f) + 1): the constant-Q dispersion of Aki & Richards (2002, eq. 5.81) with the
 * front at the arrival time (the delay tends to 0 as f grows). Before 2026-12-02 the operator was the
 * discrete minimum phase of exp(-π |f| t*) up to each channel's Nyquist frequency, so the same wave
 * came (t* / π) ln 2 later after its front at 200 Hz than at 100 Hz (the S of a regional event,
 * t* = 0.25 s, reached 1 % of its peak 0.09 s after the arrival at 100 Hz and 0.14 s at 200 Hz).
 *
 * At a channel rate whose Nyquist frequency lies below f_top the spectrum is cut there, as the
 * source's is: the small precursor that cut makes wraps to the end of the pulse's transform, which
 * the renderer does not use, and a ripple of about 0.1 % of the peak stays at the front.
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
 * Fills bins n/2+1..n-1 of the interleaved spectrum `x` (length 2n) as the conjugates of bins
 * 1..n/2-1 and makes the Nyquist bin real, so that its inverse transform is real; returns `x`.
 */
function hermitian(x: Float64Array, n: number): Float64Array {
  x[n + 1] = 0;
  for (let k = 1; k < n / 2; k++) {
    x[2 * (n - k)] = x[2 * k];
    x[2 * (n - k) + 1] = -x[2 * k + 1];
  }
  return x;
}

/** Upper end of the constant-Q band, Hz (see the module comment). */
export const CONSTANT_Q_TOP_HZ = 100;

/** x ln|x|, 0 at x = 0. */
function xLogAbs(x: number): number {
  return x === 0 ? 0 : x * Math.log(Math.abs(x));
}

/**
 * The causal constant-Q operator at frequency f (Hz, either sign) for t* (s), with Q constant up to
 * topHz: amplitude exp(-π t* min(|f|, topHz)) and phase φ(f) of the module comment, odd in f
 * (radians, the phase of exp(-i 2π f t) for a delay t); the value at -f is the conjugate of that at
 * f. Written into `out`.
 */
export function attenuationAt(f: number, tStar: number, topHz: number, out: Cx): Cx {
  const u = f / topHz;
  const amp = Math.exp(-Math.PI * tStar * Math.min(Math.abs(f), topHz));
  const phase = -tStar * topHz * (xLogAbs(u + 1) + xLogAbs(u - 1) - 2 * xLogAbs(u));
  out.re = amp * Math.cos(phase);
  out.im = amp * Math.sin(phase);
  return out;
}

/**
 * The causal constant-Q attenuation operator (module comment) as an interleaved complex spectrum of
 * length 2n (bins k = 0..n-1, f = k fs / n, negative frequencies above n/2, the Nyquist bin real).
 * With t* = 0 it is 1 at every frequency. `topHz`: upper end of the constant-Q band, Hz.
 */
export function minimumPhaseAttenuation(n: number, sampleRate: number, tStar: number, topHz = CONSTANT_Q_TOP_HZ): Float64Array {
  if (!(n >= 64 && (n & (n - 1)) === 0)) throw new RangeError(`FFT length must be a power of two >= 64, got ${n}`);
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  if (!(tStar >= 0 && tStar < 10)) throw new RangeError(`t* must be in [0, 10) s, got ${tStar}`);
  if (!(topHz > 0 && Number.isFinite(topHz))) throw new RangeError(`top of the constant-Q band must be a finite frequency > 0 Hz, got ${topHz}`);
  const out = new Float64Array(2 * n);
  const c: Cx = { re: 0, im: 0 };
  for (let k = 0; k <= n / 2; k++) {
    attenuationAt((k * sampleRate) / n, tStar, topHz, c);
    out[2 * k] = c.re;
    out[2 * k + 1] = c.im;
  }
  return hermitian(out, n);
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
  return hermitian(spec2, n);
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
