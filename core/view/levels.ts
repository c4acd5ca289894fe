/**
 * Signal level per time bin, for the night overview: the root-mean-square of the demeaned samples in
 * each bin of a fixed length on a common time grid, the share of each bin that holds data, and
 * whether the bin looks clipped. One pass over the samples, no allocation per sample.
 *
 * Clipping as it shows in the data, where the digitiser's full scale is not known (common practice;
 * the event sheet's rows use the same rule, {@link looksClipped}): at least {@link CLIP_RUN}
 * consecutive raw samples sitting at the stretch's highest or at its lowest value, with the stretch
 * spanning more than {@link CLIP_MIN_RANGE} counts from lowest to highest (so a quiet trace a few
 * counts above quantisation, or a constant offset, is not taken for clipped).
 */
import type { Segment } from '../model';
import type { Micros } from '../time';

export interface LevelBins {
  /** Start of bin 0 (µs) and bin length (µs). */
  start: Micros;
  binMicros: number;
  /** RMS per bin in the data's units (counts), NaN where the bin holds no data. */
  rms: Float64Array;
  /** Fraction 0-1 of each bin's expected samples present. */
  coverage: Float64Array;
  /** Largest absolute demeaned sample per bin (NaN where empty). */
  peak: Float64Array;
  /** 1 where the bin looks clipped (see the module comment), else 0. */
  clipped: Uint8Array;
}

/** Consecutive samples at the highest or lowest value that make a stretch clipped. */
export const CLIP_RUN = 4;
/** Range from lowest to highest raw value (counts) a stretch must exceed to be called clipped. */
export const CLIP_MIN_RANGE = 2000;

/** Whether samples i0 to i1 - 1 of x look clipped (the rule of the module comment); 0 <= i0 <= i1 <= x.length. */
export function looksClipped(x: ArrayLike<number>, i0: number, i1: number): boolean {
  if (!Number.isInteger(i0) || !Number.isInteger(i1) || i0 < 0 || i1 < i0 || i1 > x.length) {
    throw new RangeError(`sample range must be integers with 0 <= i0 <= i1 <= ${x.length} (the samples' length), got i0 = ${i0}, i1 = ${i1}`);
  }
  let hi = -Infinity, lo = Infinity, runHi = 0, runLo = 0, bestHi = 0, bestLo = 0;
  for (let i = i0; i < i1; i++) {
    const v = x[i];
    // A new extreme restarts its run and forgets runs at the old one.
    if (v > hi) { hi = v; runHi = 1; bestHi = 1; } else if (v === hi) { if (++runHi > bestHi) bestHi = runHi; } else runHi = 0;
    if (v < lo) { lo = v; runLo = 1; bestLo = 1; } else if (v === lo) { if (++runLo > bestLo) bestLo = runLo; } else runLo = 0;
  }
  return Math.max(bestHi, bestLo) >= CLIP_RUN && hi - lo > CLIP_MIN_RANGE;
}

/**
 * Levels of a channel's segments on the grid [start, start + bins * binMicros). Each bin is demeaned
 * with its own mean (so a DC offset does not count as signal). Sample times come from their record.
 */
export function levelBins(segments: readonly Segment[], start: Micros, binMicros: number, bins: number): LevelBins {
  if (!Number.isInteger(binMicros) || binMicros <= 0) throw new RangeError(`binMicros must be a positive integer, got ${binMicros}`);
  if (!Number.isInteger(bins) || bins < 0) throw new RangeError(`bins must be a non-negative integer, got ${bins}`);
  const sum = new Float64Array(bins);
  const sum2 = new Float64Array(bins);
  const count = new Float64Array(bins);
  const lo = new Float64Array(bins).fill(Infinity);
  const hi = new Float64Array(bins).fill(-Infinity);
  const expected = new Float64Array(bins);
  // Per bin, as looksClipped: the current run of samples at the highest and at the lowest value so
  // far, and the longest such runs.
  const runHi = new Float64Array(bins);
  const runLo = new Float64Array(bins);
  const bestHi = new Float64Array(bins);
  const bestLo = new Float64Array(bins);
  for (const seg of segments) {
    runHi.fill(0); // a run does not continue across a gap
    runLo.fill(0);
    const x = seg.samples;
    const rate = seg.sampleRate;
    const nRec = seg.recordStarts.length;
    for (let r = 0; r < nRec; r++) {
      const i0 = seg.recordFirstSample[r];
      const i1 = r + 1 < nRec ? seg.recordFirstSample[r + 1] : x.length;
      const t0 = seg.recordStarts[r];
      // Bin index of each sample: advance by whole bins as time passes, no division per sample.
      let i = i0;
      while (i < i1) {
        const t = t0 + ((i - i0) * 1e6) / rate;
        const b = Math.floor((t - start) / binMicros);
        // Last sample index of this record inside bin b.
        const binEndT = start + (b + 1) * binMicros;
        let iEnd = i0 + Math.ceil(((binEndT - t0) * rate) / 1e6);
        if (iEnd > i1) iEnd = i1;
        if (iEnd <= i) iEnd = i + 1;
        if (b >= 0 && b < bins) {
          let s = 0;
          let s2 = 0;
          let mn = lo[b];
          let mx = hi[b];
          let rHi = runHi[b], rLo = runLo[b], bHi = bestHi[b], bLo = bestLo[b];
          for (let k = i; k < iEnd; k++) {
            const v = x[k];
            s += v;
            s2 += v * v;
            if (v > mx) { mx = v; rHi = 1; bHi = 1; } else if (v === mx) { if (++rHi > bHi) bHi = rHi; } else rHi = 0;
            if (v < mn) { mn = v; rLo = 1; bLo = 1; } else if (v === mn) { if (++rLo > bLo) bLo = rLo; } else rLo = 0;
          }
          sum[b] += s;
          sum2[b] += s2;
          count[b] += iEnd - i;
          lo[b] = mn;
          hi[b] = mx;
          runHi[b] = rHi; runLo[b] = rLo; bestHi[b] = bHi; bestLo[b] = bLo;
          expected[b] = (binMicros * rate) / 1e6;
        }
        i = iEnd;
      }
    }
  }
  const rms = new Float64Array(bins);
  const coverage = new Float64Array(bins);
  const peak = new Float64Array(bins);
  const clipped = new Uint8Array(bins);
  for (let b = 0; b < bins; b++) {
    clipped[b] = Math.max(bestHi[b], bestLo[b]) >= CLIP_RUN && hi[b] - lo[b] > CLIP_MIN_RANGE ? 1 : 0;
    const n = count[b];
    if (n === 0) {
      rms[b] = NaN;
      peak[b] = NaN;
      continue;
    }
    const mean = sum[b] / n;
    rms[b] = Math.sqrt(Math.max(0, sum2[b] / n - mean * mean));
    peak[b] = Math.max(hi[b] - mean, mean - lo[b]);
    coverage[b] = Math.min(1, n / expected[b]);
  }
  return { start, binMicros, rms, coverage, peak, clipped };
}
