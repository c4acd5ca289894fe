/** Cosine (Tukey) taper of a trace's ends, before filtering or a spectrum. */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';

/**
 * The taper's weights for n samples: a half cosine rising from 0 over `fraction` of the trace at
 * each end, 1 between; the same window as scipy.signal.windows.tukey(n, alpha = 2·fraction).
 * `fraction` (per end) is 0 to 0.5: 0 leaves the trace alone, 0.5 is a Hann window.
 */
export function cosineTaperWeights(n: number, fraction: number): Float64Array {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`sample count must be a non-negative integer, got ${n}`);
  if (!(fraction >= 0 && fraction <= 0.5)) throw new RangeError(`taper fraction per end must be from 0 to 0.5, got ${fraction}`);
  const w = new Float64Array(n).fill(1);
  if (n <= 1 || fraction === 0) return w;
  const alpha = 2 * fraction;
  if (alpha >= 1) {
    for (let i = 0; i < n; i++) w[i] = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n - 1));
    return w;
  }
  const width = Math.floor((alpha * (n - 1)) / 2);
  for (let i = 0; i <= width; i++) {
    w[i] = 0.5 * (1 + Math.cos(Math.PI * (-1 + (2 * i) / alpha / (n - 1))));
  }
  for (let i = n - width - 1; i < n; i++) {
    w[i] = 0.5 * (1 + Math.cos(Math.PI * (-2 / alpha + 1 + (2 * i) / alpha / (n - 1))));
  }
  return w;
}

/**
 * x times {@link cosineTaperWeights}(x.length, fraction): the ends go smoothly to zero (units of x).
 * Remove the mean first, or the taper turns an offset into a slow pulse. `out` may be x itself
 * when x is a Float64Array.
 */
export function cosineTaper(x: SampleArray, fraction: number, out?: Float64Array): Float64Array {
  checkSamples(x);
  const w = cosineTaperWeights(x.length, fraction);
  const y = outputArray(x.length, out);
  for (let i = 0; i < x.length; i++) y[i] = x[i] * w[i];
  return y;
}
