/**
 * Signal level per time bin, for the night overview: the root-mean-square of the demeaned samples in
 * each bin of a fixed length on a common time grid, and the share of each bin that holds data. One
 * pass over the samples, no allocation per sample.
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
  for (const seg of segments) {
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
          for (let k = i; k < iEnd; k++) {
            const v = x[k];
            s += v;
            s2 += v * v;
            if (v < mn) mn = v;
            if (v > mx) mx = v;
          }
          sum[b] += s;
          sum2[b] += s2;
          count[b] += iEnd - i;
          lo[b] = mn;
          hi[b] = mx;
          expected[b] = (binMicros * rate) / 1e6;
        }
        i = iEnd;
      }
    }
  }
  const rms = new Float64Array(bins);
  const coverage = new Float64Array(bins);
  const peak = new Float64Array(bins);
  for (let b = 0; b < bins; b++) {
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
  return { start, binMicros, rms, coverage, peak };
}
