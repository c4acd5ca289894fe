/**
 * First departure from noise: a change-point pick (Maeda's AIC, aic.ts) marks where the variance of a
 * trace changes most, which for an emergent onset lies inside the rise, after the first motion has
 * left the noise. Stepping back from such a pick to where the trace's envelope first leaves the noise
 * level, that level measured on a window before the pick, is a published refinement of detector picks
 * (e.g. Küperkoch et al., 2010, Geophys. J. Int. 181, 1159-1170, who refine a higher-order-statistics
 * pick back to where the signal leaves the noise; Diehl et al., 2009, Bull. Seismol. Soc. Am. 99(3),
 * 1906-1920, bound an S onset's earliest time by where the signal exceeds the noise; both from memory).
 *
 * Daybreak's rule (`stepBack`):
 * - Envelope: the energy summed over the channels given (e.g. the two horizontals for S), each less
 *   its noise mean, averaged over `smooth` seconds centred on each sample.
 * - Noise level: the mean of that envelope over `noise` seconds ending `maxBack` seconds before the
 *   pick (so the pre-window holds no part of the onset the step may reach); the threshold is `level`
 *   times it (an energy ratio: level 4 is twice the noise RMS in amplitude).
 * - From the pick, step back one sample at a time while the envelope of the sample before stays above
 *   the threshold, at most `maxBack` seconds. The envelope at the pick itself must be above the
 *   threshold (else the pick is kept).
 * Where it is used and with which values is the caller's: eventSites.ts, step 4, on the emergent
 * picks of distant events only.
 */
import type { SampleArray } from '../model';

export interface StepBackOptions {
  /** Noise window length, s. */
  readonly noise: number;
  /** Longest step back, s. */
  readonly maxBack: number;
  /** Envelope smoothing window, s (centred). */
  readonly smooth: number;
  /** Threshold over the noise envelope's mean (energy ratio, > 1). */
  readonly level: number;
}

function checkOptions(o: StepBackOptions): void {
  for (const k of ['noise', 'maxBack', 'smooth'] as const) {
    if (!(o[k] > 0 && Number.isFinite(o[k]))) throw new RangeError(`${k} must be a finite number of seconds > 0, got ${o[k]}`);
  }
  if (!(o.level > 1 && Number.isFinite(o.level))) throw new RangeError(`level must be a finite energy ratio > 1, got ${o.level}`);
}

/**
 * The sample index where the channels' envelope first leaves the noise, stepping back from the pick
 * at index k (see the module comment). All channels share sample rate `sampleRate` (Hz) and indexing.
 * Returns k when the step cannot be made (too little data before the pick for the noise window, no
 * noise energy, or an envelope at the pick within the noise level).
 */
export function stepBack(channels: readonly SampleArray[], k: number, sampleRate: number, options: StepBackOptions): number {
  if (channels.length === 0) throw new RangeError('stepBack needs at least one channel, got 0');
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  checkOptions(options);
  const len = Math.min(...channels.map((c) => c.length));
  if (!Number.isInteger(k) || k < 0 || k >= len) throw new RangeError(`pick index must be an integer in [0, ${len}), got ${k}`);
  const back = Math.max(1, Math.round(options.maxBack * sampleRate));
  const half = Math.max(0, Math.round((options.smooth * sampleRate - 1) / 2));
  const noiseEnd = k - back - half;
  const noiseStart = noiseEnd - Math.max(2, Math.round(options.noise * sampleRate));
  if (noiseStart - half < 0 || k + half >= len) return k;
  // Energy less each channel's noise mean, from the noise window's start to the pick's envelope end.
  const from = noiseStart - half;
  const to = k + half + 1;
  const e = new Float64Array(to - from);
  for (const x of channels) {
    let m = 0;
    for (let i = noiseStart; i < noiseEnd; i++) m += x[i];
    m /= noiseEnd - noiseStart;
    for (let i = from; i < to; i++) {
      const v = x[i] - m;
      e[i - from] += v * v;
    }
  }
  // Centred moving average by prefix sums: env(i) = mean of e over [i - half, i + half].
  const s = new Float64Array(e.length + 1);
  for (let i = 0; i < e.length; i++) s[i + 1] = s[i] + e[i];
  const w = 2 * half + 1;
  const env = (i: number): number => (s[i - from + half + 1] - s[i - from - half]) / w;
  let noise = 0;
  for (let i = noiseStart; i < noiseEnd; i++) noise += env(i);
  noise /= noiseEnd - noiseStart;
  if (!(noise > 0)) return k;
  const threshold = options.level * noise;
  if (!(env(k) > threshold)) return k;
  let j = k;
  while (j > k - back && env(j - 1) > threshold) j--;
  return j;
}
