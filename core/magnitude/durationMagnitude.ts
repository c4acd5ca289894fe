/**
 * Duration (coda-length) magnitude.
 *
 * Lee, Bennett & Meagher (1972), "A method of estimating magnitude of local earthquakes from signal
 * duration", U.S. Geological Survey Open-File Report 72-223 (from memory):
 *   MD = −0.87 + 2.00·log10(τ) + 0.0035·Δ
 * τ the signal duration in seconds from the P onset to the end of the coda, Δ the epicentral
 * distance in km. Their coda end was read on 1 Hz vertical short-period records viewed at a fixed
 * gain; the end picked here (the smoothed envelope back down to a multiple of the pre-event noise)
 * is a practical substitute, so a network should check MD against its ML (common practice) and set
 * its own coefficients in the same form.
 */
import type { Micros } from '../time';

export interface DurationCoefficients {
  readonly name: string;
  /** MD = a + b·log10(τ) + c·Δ. */
  readonly a: number;
  readonly b: number;
  readonly c: number;
}

/** Lee, Bennett & Meagher (1972): a −0.87, b 2.00, c 0.0035 (from memory). */
export const LEE_BENNETT_MEAGHER_1972: DurationCoefficients = { name: 'LBM1972', a: -0.87, b: 2.0, c: 0.0035 };

/** MD from a coda duration `tauS` (s, > 0) at epicentral distance `epicentralKm` (km, ≥ 0). */
export function durationMagnitude(tauS: number, epicentralKm: number, coef: DurationCoefficients = LEE_BENNETT_MEAGHER_1972): number {
  if (!(tauS > 0) || !Number.isFinite(tauS)) throw new RangeError(`duration must be > 0 s, got ${tauS}`);
  if (!(epicentralKm >= 0) || !Number.isFinite(epicentralKm)) throw new RangeError(`epicentral distance must be >= 0 km, got ${epicentralKm}`);
  return coef.a + coef.b * Math.log10(tauS) + coef.c * epicentralKm;
}

export interface CodaOptions {
  /** Seconds of noise before P used for the noise level; default 5. */
  noiseSeconds?: number;
  /** Seconds between P and the noise window's end (keeps the onset out); default 0.5. */
  noiseGapSeconds?: number;
  /** Length of the moving RMS window, s; default 2. */
  smoothingSeconds?: number;
  /** The coda ends where the moving RMS falls to this multiple of the noise RMS; default 2. */
  noiseFactor?: number;
}

export interface CodaDuration {
  /** End of the coda, µs (centre of the first RMS window at or below the threshold after the peak). */
  end: Micros;
  /** Duration from P, s. */
  durationS: number;
  /** RMS of the noise window, trace units. */
  noiseRms: number;
}

/**
 * Coda end and duration on `x` (mean-free trace, any units; velocity or counts of a vertical
 * short-period channel as Lee et al. used) starting at `start` µs. The envelope is the RMS over a
 * moving window; the search starts at the envelope's maximum after P. Null when the trace ends
 * before the envelope falls to the threshold, or the noise window lies outside the trace.
 */
export function codaDuration(x: Float64Array, sampleRate: number, start: Micros, p: Micros, opts: CodaOptions = {}): CodaDuration | null {
  if (!(x instanceof Float64Array)) throw new TypeError('trace must be a Float64Array');
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  const noiseS = opts.noiseSeconds ?? 5, gapS = opts.noiseGapSeconds ?? 0.5, smoothS = opts.smoothingSeconds ?? 2, factor = opts.noiseFactor ?? 2;
  if (!(noiseS > 0 && gapS >= 0 && smoothS > 0 && factor > 1)) {
    throw new RangeError(`coda options need noiseSeconds > 0, noiseGapSeconds >= 0, smoothingSeconds > 0, noiseFactor > 1; got ${noiseS}, ${gapS}, ${smoothS}, ${factor}`);
  }
  const iP = Math.round(((p - start) * sampleRate) / 1e6);
  const n1 = iP - Math.round(gapS * sampleRate), n0 = n1 - Math.round(noiseS * sampleRate);
  if (n0 < 0 || iP >= x.length) return null;
  let ss = 0;
  for (let i = n0; i < n1; i++) ss += x[i] * x[i];
  const noiseRms = Math.sqrt(ss / (n1 - n0));
  const w = Math.max(1, Math.round(smoothS * sampleRate));
  if (iP + w > x.length) return null;
  // Moving mean square over [i, i + w), running sum.
  let sum = 0;
  for (let i = iP; i < iP + w; i++) sum += x[i] * x[i];
  let best = sum, bestAt = iP;
  const sums = new Float64Array(x.length - w - iP + 1);
  sums[0] = sum;
  for (let i = iP + 1; i + w <= x.length; i++) {
    sum += x[i + w - 1] * x[i + w - 1] - x[i - 1] * x[i - 1];
    sums[i - iP] = sum;
    if (sum > best) { best = sum; bestAt = i; }
  }
  const threshold = (factor * noiseRms) ** 2 * w;
  for (let i = bestAt; i + w <= x.length; i++) {
    if (sums[i - iP] <= threshold) {
      const centre = i + w / 2;
      const end = start + Math.round((centre * 1e6) / sampleRate);
      return { end, durationS: (end - p) / 1e6, noiseRms };
    }
  }
  return null;
}
