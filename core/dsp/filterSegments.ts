/**
 * Filtering a channel that has gaps: each continuous segment is filtered on its own and starts
 * clean, instead of filtering a zero-filled series whose steps at the gap edges ring through the
 * filter (a band-pass turns a step of an offset into a pulse many times the signal's size).
 */
import type { SampleArray } from '../model';
import { checkSamples } from './checkSamples';
import { cosineTaper } from './taper';
import { demean } from './detrend';
import { sectionCount, sosfilt, sosfiltZi } from './sosfilt';
import { defaultPadLength, sosfiltfilt } from './sosfiltfilt';

export interface SegmentFilterOptions {
  /** Forward and backward (zero phase, for display) instead of causal. Default false. */
  zeroPhase?: boolean;
  /**
   * Cosine taper per end as a fraction of each segment (0 to 0.5), applied after removing the
   * segment's mean; 0 (default) filters the samples as they are.
   */
  taperFraction?: number;
}

/**
 * Filters each segment separately with `sos` and returns one Float64Array per segment (units of the
 * samples). Causal: each segment starts from the steady state for its first sample (the filter
 * behaves as if the segment had always been at that value, so an offset causes no start-up pulse).
 * Zero phase: `sosfiltfilt` per segment, with its padding shortened for segments shorter than the
 * default padding.
 */
export function filterSegments(sos: Float64Array, segments: readonly SampleArray[], options: SegmentFilterOptions = {}): Float64Array[] {
  const sections = sectionCount(sos);
  if (!Array.isArray(segments)) throw new TypeError('segments must be an array of sample arrays');
  segments.forEach((s, i) => checkSamples(s, `segment ${i}`));
  const { zeroPhase = false, taperFraction = 0 } = options;
  if (!(taperFraction >= 0 && taperFraction <= 0.5)) {
    throw new RangeError(`taper fraction per end must be from 0 to 0.5, got ${taperFraction}`);
  }
  const zi = zeroPhase ? null : sosfiltZi(sos);
  const pad = defaultPadLength(sos);
  return segments.map((samples) => {
    let x: SampleArray = samples;
    if (taperFraction > 0) {
      const y = demean(samples);
      x = cosineTaper(y, taperFraction, y);
    }
    if (x.length === 0) return new Float64Array(0);
    if (zeroPhase) return sosfiltfilt(sos, x, { padLength: Math.min(pad, x.length - 1) });
    const state = new Float64Array(2 * sections);
    for (let i = 0; i < state.length; i++) state[i] = (zi as Float64Array)[i] * x[0];
    return sosfilt(sos, x, { state });
  });
}
