/**
 * Removal of isolated single-sample spikes (telemetry bit errors, digitiser glitches) that would
 * otherwise trigger an STA/LTA and ring through every filter.
 *
 * The rule. Sample i (5 ≤ i ≤ n−6) is an isolated spike when all of these hold, with
 * u = x[i] − x[i−1] and v = x[i] − x[i+1] (the jumps into and out of it):
 *  1. It sticks out on one side: u and v have the same sign.
 *  2. It is large against the trace's own sample-to-sample scatter: min(|u|, |v|) > ratio · s, where s
 *     is the median of |x[j+1] − x[j]| over the block of `block` samples holding i (a robust noise
 *     level that a few spikes cannot move).
 *  3. The trace comes back: the two neighbours agree to within half the smaller jump,
 *     |x[i+1] − x[i−1]| ≤ min(|u|, |v|)/2. An onset changes the level and stays there, so it fails
 *     this test.
 *  4. Nothing else moves nearby: each of the ISOLATION = 4 steps on either side that do not touch
 *     x[i] (from x[i−5] to x[i−1] and from x[i+1] to x[i+5]) is at most min(|u|, |v|)/4. A signal,
 *     however impulsive, changes over several samples, and an oscillation near the Nyquist
 *     frequency repeats its large steps within a few samples (a sinusoid at a third of the sample
 *     rate has two equal samples between its peaks, but the next peak is three samples on), so
 *     its peaks fail this test.
 *  5. It does not stand between clipped stretches: neither neighbour is part of a run of two or
 *     more equal samples at the trace's own minimum or maximum. In a clipped record one sample that
 *     swings back from the clip level between two flat stretches looks isolated only because the
 *     clipping flattened the large steps around it.
 * A sample on a clipped plateau itself fails 1 or 2 (two equal neighbouring samples give a zero
 * jump), so plateaus are left alone. A spike is replaced by the mean of its two neighbours. The first and last five samples are
 * not examined, and spikes two or more samples wide are not touched.
 */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';

/** Steps on each side of a spike, beyond its own two, that must stay small (rule 4). */
const ISOLATION = 4;

export interface DespikeOptions {
  /** How many times the median sample-to-sample step a spike must exceed (rule 2). Default 10. */
  ratio?: number;
  /** Samples per block for the median step (rule 2). Default 200, at least 8. */
  block?: number;
  /** Where to write the cleaned samples; may be x itself when x is a Float64Array. */
  out?: Float64Array;
}

export interface DespikeResult {
  /** The trace with spikes replaced (units of x). */
  samples: Float64Array;
  /** Indices of the samples replaced, increasing. */
  spikes: number[];
}

/** Median |x[j+1] − x[j]| per block of `block` samples (steps that start in the block). */
function blockStepMedians(x: SampleArray, block: number): Float64Array {
  const n = x.length;
  const blocks = Math.ceil(n / block);
  const medians = new Float64Array(blocks);
  const scratch = new Float64Array(block);
  for (let b = 0; b < blocks; b++) {
    const from = b * block;
    const to = Math.min(from + block, n - 1);
    let m = 0;
    for (let j = from; j < to; j++) scratch[m++] = Math.abs(x[j + 1] - x[j]);
    if (m === 0) {
      medians[b] = b > 0 ? medians[b - 1] : 0;
      continue;
    }
    const part = scratch.subarray(0, m).sort();
    medians[b] = m % 2 === 1 ? part[m >> 1] : (part[m / 2 - 1] + part[m / 2]) / 2;
  }
  return medians;
}

/** Rule 4: every step from x[i−5] to x[i−1] and from x[i+1] to x[i+5] is at most `limit`. */
function quietAround(x: SampleArray, i: number, limit: number): boolean {
  for (let j = i - ISOLATION - 1; j < i - 1; j++) if (Math.abs(x[j + 1] - x[j]) > limit) return false;
  for (let j = i + 1; j < i + ISOLATION + 1; j++) if (Math.abs(x[j + 1] - x[j]) > limit) return false;
  return true;
}

/** Replaces isolated single-sample spikes by the mean of their neighbours (see the rule above). */
export function despike(x: SampleArray, options: DespikeOptions = {}): DespikeResult {
  checkSamples(x);
  const { ratio = 10, block = 200 } = options;
  if (!(ratio >= 1 && Number.isFinite(ratio))) throw new RangeError(`despike ratio must be a finite number of at least 1, got ${ratio}`);
  if (!Number.isInteger(block) || block < 8) throw new RangeError(`despike block must be an integer of at least 8 samples, got ${block}`);
  const n = x.length;
  const y = outputArray(n, options.out);
  // Read from a copy when writing in place, so one replacement never feeds the next decision.
  const src: SampleArray = y === x ? Float64Array.from(x) : x;
  if (y !== x) y.set(x);
  const spikes: number[] = [];
  const edge = ISOLATION + 1;
  if (n < 2 * edge + 1) return { samples: y, spikes };
  const scale = blockStepMedians(src, block);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = src[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  for (let i = edge; i < n - edge; i++) {
    const xi = src[i];
    const u = xi - src[i - 1];
    const v = xi - src[i + 1];
    if (u > 0 !== v > 0 || u === 0 || v === 0) continue;
    const jump = Math.min(Math.abs(u), Math.abs(v));
    if (!(jump > ratio * scale[Math.floor(i / block)])) continue;
    if (Math.abs(src[i + 1] - src[i - 1]) > jump / 2) continue;
    if (!quietAround(src, i, jump / 4)) continue;
    const before = src[i - 1];
    const after = src[i + 1];
    if ((before === lo || before === hi) && src[i - 2] === before) continue;
    if ((after === lo || after === hi) && src[i + 2] === after) continue;
    y[i] = (src[i - 1] + src[i + 1]) / 2;
    spikes.push(i);
  }
  return { samples: y, spikes };
}
