/**
 * Zero-phase filtering: the cascade forward, then backward, as scipy's
 * `sosfiltfilt(sos, x, padtype='odd', padlen=None)` (scipy/signal/_signaltools.py): the signal is
 * extended at each end by an odd reflection about its end sample, each pass starts from the
 * steady-state conditions (`sosfiltZi`) scaled by the sample it starts on, and the extension is cut
 * off again. The magnitude response is the filter's squared; the phase is zero, so energy moves
 * ahead of an onset: for display, not for picking onsets.
 */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';
import { runCascade, sectionCount, sosfiltZi } from './sosfilt';

/**
 * scipy's default extension length: 3 × (2·sections + 1), less one per section pair that is first
 * order (b2 = 0 and a2 = 0), in samples.
 */
export function defaultPadLength(sos: Float64Array): number {
  const sections = sectionCount(sos);
  let b2zero = 0;
  let a2zero = 0;
  for (let s = 0; s < sections; s++) {
    if (sos[6 * s + 2] === 0) b2zero++;
    if (sos[6 * s + 5] === 0) a2zero++;
  }
  return 3 * (2 * sections + 1 - Math.min(b2zero, a2zero));
}

export interface SosfiltfiltOptions {
  /** Samples of odd extension at each end; default {@link defaultPadLength}. Must be below x.length. */
  padLength?: number;
  /** Where to write the output (length of x); may be x itself when x is a Float64Array. */
  out?: Float64Array;
}

/**
 * The two odd extensions of the call in progress, kept between calls (a desk re-filters hundreds of
 * traces at a time; no call can run inside another, so one scratch serves them all).
 */
let padScratch = new Float64Array(64);

/** Forward-backward (zero-phase) filtering of `x` by `sos`; output float64 in the units of x. */
export function sosfiltfilt(sos: Float64Array, x: SampleArray, options: SosfiltfiltOptions = {}): Float64Array {
  const sections = sectionCount(sos);
  checkSamples(x);
  const n = x.length;
  if (n === 0) return outputArray(0, options.out);
  const edge = options.padLength ?? defaultPadLength(sos);
  if (!Number.isInteger(edge) || edge < 0 || edge >= n) {
    throw new RangeError(`padding must be an integer from 0 to ${n - 1} samples (below the input length ${n}), got ${edge}`);
  }
  const out = outputArray(n, options.out);
  // The odd extension, ext = [left, x, right] with left[t] = 2·x[0] − x[edge − t] and
  // right[t] = 2·x[n−1] − x[n−2−t], is filtered piece by piece with the state carried across
  // (so the whole length never needs a second copy): forward over left, x (into out) and right,
  // then backward over right and out. The backward pass over left is not needed.
  if (padScratch.length < 2 * edge) padScratch = new Float64Array(2 * edge);
  const left = padScratch.subarray(0, edge);
  const right = padScratch.subarray(edge, 2 * edge);
  const x0 = x[0];
  const xn = x[n - 1];
  for (let t = 0; t < edge; t++) {
    left[t] = 2 * x0 - x[edge - t];
    right[t] = 2 * xn - x[n - 2 - t];
  }
  const zi = sosfiltZi(sos);
  const state = new Float64Array(2 * sections);
  const first = edge > 0 ? left[0] : x0;
  for (let i = 0; i < state.length; i++) state[i] = zi[i] * first;
  runCascade(sos, state, left, left, false);
  if (x instanceof Float64Array) {
    runCascade(sos, state, x, out, false);
  } else {
    out.set(x);
    runCascade(sos, state, out, out, false);
  }
  runCascade(sos, state, right, right, false);
  const last = edge > 0 ? right[edge - 1] : out[n - 1];
  for (let i = 0; i < state.length; i++) state[i] = zi[i] * last;
  runCascade(sos, state, right, right, true);
  runCascade(sos, state, out, out, true);
  return out;
}
