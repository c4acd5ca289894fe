/**
 * Polarity of a vertical channel. Daybreak's traces are "up positive": a positive sample is ground
 * moving up. In SEED and StationXML the dip is measured down from horizontal, so an up-positive
 * vertical has dip −90 and one installed (or described) with dip +90 is down-positive; a negative
 * sensitivity (counts per unit of ground motion) also means the counts run against the motion.
 */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';

/** Smallest |dip| (degrees) of a channel treated as a vertical. */
export const MIN_VERTICAL_DIP = 60;

/**
 * +1 when the vertical's counts are up-positive, −1 when they must be flipped: −1 for dip +90
 * (down-positive), another −1 for a negative sensitivity (the two cancel). `dip` in degrees (−90
 * to 90, |dip| at least 60 for a vertical), `sensitivity` in counts per unit of ground motion
 * (non-zero).
 */
export function verticalPolarity(dip: number, sensitivity: number): 1 | -1 {
  if (typeof dip !== 'number' || !(dip >= -90 && dip <= 90)) throw new RangeError(`dip must be from -90 to 90 degrees, got ${dip}`);
  if (Math.abs(dip) < MIN_VERTICAL_DIP) {
    throw new RangeError(`a vertical channel's dip must be within ${90 - MIN_VERTICAL_DIP} degrees of ±90, got ${dip}`);
  }
  if (typeof sensitivity !== 'number' || !Number.isFinite(sensitivity) || sensitivity === 0) {
    throw new RangeError(`sensitivity must be a finite non-zero number, got ${sensitivity}`);
  }
  return (dip > 0 ? -1 : 1) * (sensitivity < 0 ? -1 : 1) as 1 | -1;
}

/** x multiplied by `factor` (from {@link verticalPolarity}); `out` may be x itself when x is a Float64Array. */
export function applyPolarity(x: SampleArray, factor: 1 | -1, out?: Float64Array): Float64Array {
  checkSamples(x);
  if (factor !== 1 && factor !== -1) throw new RangeError(`polarity factor must be 1 or -1, got ${factor}`);
  const y = outputArray(x.length, out);
  for (let i = 0; i < x.length; i++) y[i] = factor * x[i];
  return y;
}
