/**
 * Coloured background noise for one channel, in counts: white noise shaped by Butterworth band-passes
 * (core/dsp) into a site band (cultural and wind noise, about 0.5-15 Hz) and the secondary microseism
 * (0.12-0.35 Hz), their levels set in ground velocity, the site band's level following the hour
 * (louder in the evening than at night), then passed through the channel's instrument (its poles and
 * zeros by the bilinear transform) to counts.
 *
 * The white noise is uniform with unit variance: after the band-pass it is close to Gaussian (each
 * output sample sums many inputs), and uniform deviates cost a fraction of Gaussian ones.
 */
import { butterworth } from '../dsp/butterworth';
import { sosfilt } from '../dsp/sosfilt';
import { bilinear } from '../dsp/zpk';
import { zpkToSos } from '../dsp/zpkToSos';
import { normalizationFactor, polesZerosRatio, sensitivity, type Instrument } from './response';

export interface NoiseSpec {
  /** Seed of this channel's noise. */
  readonly seed: number;
  /** Samples per second. */
  readonly sampleRate: number;
  /** RMS ground velocity of the site band at level factor 1, m/s. */
  readonly siteMs: number;
  /** Site band corners, Hz. */
  readonly siteBandHz: readonly [number, number];
  /** RMS ground velocity of the microseism, m/s. */
  readonly microseismMs: number;
  /** Level factor of the site band, one value per second from the first sample (held for that second). */
  readonly levelPerSecond: Float64Array;
  readonly instrument: Instrument;
  /** RMS of the sensor and digitizer's own white noise, counts (added after the instrument). */
  readonly selfNoiseCounts: number;
}

/** Fills `out` with unit-variance uniform white noise from a 32-bit xorshift generator seeded by `seed`. */
export function whiteNoise(out: Float64Array, seed: number): void {
  let x = (seed | 0) || 0x6d2b79f5;
  const n = out.length;
  // x is a signed 32-bit integer, uniform over [-2^31, 2^31): scale to variance 1.
  const scale = Math.sqrt(12) / 4294967296;
  for (let i = 0; i < n; i++) {
    x ^= x << 13;
    x ^= x >> 17;
    x ^= x << 5;
    out[i] = x * scale;
  }
}

/** Second-order sections (counts per m/s of ground velocity) of `inst`, by the bilinear transform at `sampleRate`. */
export function instrumentSectionsForVelocity(inst: Instrument, sampleRate: number): Float64Array {
  const zeros = inst.zeros.map((z) => ({ re: z.re, im: z.im }));
  // An accelerometer sees the derivative of velocity: one more zero at s = 0.
  if (inst.inputUnits === 'm/s**2') zeros.push({ re: 0, im: 0 });
  const gain = normalizationFactor(inst.poles, inst.zeros, inst.normalizationHz) * sensitivity(inst);
  return zpkToSos(bilinear({ zeros, poles: inst.poles.map((p) => ({ re: p.re, im: p.im })), gain }, sampleRate));
}

function rms(x: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += x[i] * x[i];
  return Math.sqrt(s / Math.max(1, n));
}

/**
 * The instrument's gain (counts per m/s) when it is flat within 1 % from `lo` to `hi` Hz, else null.
 * Seismometer inputs only (an accelerometer sees the derivative of velocity).
 */
export function flatGain(inst: Instrument, lo: number, hi: number): number | null {
  if (inst.inputUnits !== 'm/s') return null;
  const scale = normalizationFactor(inst.poles, inst.zeros, inst.normalizationHz) * sensitivity(inst);
  const ref = sensitivity(inst);
  for (let f = lo; f <= hi * 1.0001; f *= 1.25) {
    const r = polesZerosRatio(inst.poles, inst.zeros, f);
    if (Math.abs((Math.hypot(r.re, r.im) * scale) / ref - 1) > 0.01) return null;
  }
  const r = polesZerosRatio(inst.poles, inst.zeros, hi);
  if (Math.abs((Math.hypot(r.re, r.im) * scale) / ref - 1) > 0.01) return null;
  return ref;
}

/** Rate at which the microseism is generated before linear interpolation to the channel's rate, Hz. */
const MICROSEISM_RATE = 5;
/** Samples used to measure the site band's RMS before scaling it. */
const RMS_PREFIX = 200_000;

/**
 * `length` samples of the channel's noise, counts (floating point).
 *
 * For speed the site band and the instrument run as one cascade of sections over one white series
 * (an instrument flat over the band, such as a broadband seismometer, as its gain alone), and the level factor is applied after the instrument (it changes over minutes, far slower than any
 * instrument time constant that matters at these frequencies). The microseism is generated at 5 Hz,
 * scaled by the instrument's gain at 0.2 Hz and interpolated linearly.
 */
export function channelNoise(spec: NoiseSpec, length: number): Float64Array {
  const fs = spec.sampleRate;
  if (!(length >= 0 && Number.isInteger(length))) throw new RangeError(`length must be a whole number of samples, got ${length}`);
  if (!(fs > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${fs}`);
  const [lo, hi] = spec.siteBandHz;
  const band = butterworth(2, [lo, Math.min(hi, 0.45 * fs)], 'bandpass', fs);
  const inst = instrumentSectionsForVelocity(spec.instrument, fs);
  const out = new Float64Array(length);
  whiteNoise(out, spec.seed);
  // The site band's RMS for unit white noise, measured on a prefix (deterministic).
  const m = Math.min(length, RMS_PREFIX);
  const probe = sosfilt(band, out.subarray(0, m));
  const siteScale = spec.siteMs / (rms(probe, m) || 1);
  // An instrument flat (within 1 %) over the site band is applied as its gain alone.
  const flat = flatGain(spec.instrument, lo, Math.min(hi, 0.45 * fs));
  let cascade = band;
  if (flat === null) {
    cascade = new Float64Array(band.length + inst.length);
    cascade.set(band);
    cascade.set(inst, band.length);
  }
  sosfilt(cascade, out, { out });
  const siteGain = flat ?? 1;
  // Microseism at a low rate, in counts via the instrument's gain at 0.2 Hz.
  const dec = fs / MICROSEISM_RATE;
  const nLow = Math.ceil(length / dec) + 2;
  const low = new Float64Array(nLow);
  whiteNoise(low, spec.seed ^ 0x5bd1e995);
  sosfilt(butterworth(2, [0.12, 0.35], 'bandpass', MICROSEISM_RATE), low, { out: low });
  const r = polesZerosRatio(spec.instrument.poles, spec.instrument.zeros, 0.2);
  let microGain = Math.hypot(r.re, r.im) * normalizationFactor(spec.instrument.poles, spec.instrument.zeros, spec.instrument.normalizationHz) * sensitivity(spec.instrument);
  if (spec.instrument.inputUnits === 'm/s**2') microGain *= 2 * Math.PI * 0.2;
  const microScale = (spec.microseismMs * microGain) / (rms(low, nLow) || 1);
  const perSec = Math.round(fs);
  const levels = spec.levelPerSecond;
  const lastLevel = levels.length - 1;
  const step = 1 / dec;
  for (let s = 0, i = 0; i < length; s++) {
    const g = siteScale * siteGain * levels[s < lastLevel ? s : lastLevel];
    const stop = Math.min(length, i + perSec);
    // Linear interpolation of the microseism, walking its samples rather than dividing per sample.
    let k = Math.floor(i / dec);
    let f = i / dec - k;
    let a = low[k] * microScale, d = (low[k + 1] - low[k]) * microScale;
    for (; i < stop; i++) {
      out[i] = out[i] * g + a + f * d;
      f += step;
      if (f >= 1 - 1e-9) {
        f -= 1;
        if (f < 0) f = 0;
        k++;
        a = low[k] * microScale;
        d = (low[k + 1] - low[k]) * microScale;
      }
    }
  }
  if (spec.selfNoiseCounts > 0) {
    const work = new Float64Array(length);
    whiteNoise(work, spec.seed ^ 0x27d4eb2f);
    const g = spec.selfNoiseCounts;
    for (let i = 0; i < length; i++) out[i] += work[i] * g;
  }
  return out;
}
