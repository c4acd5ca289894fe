/**
 * Min/max pyramid for drawing long traces. Level 0 holds the minimum and maximum of every `base`
 * samples, each next level of every `factor` buckets of the level below. To draw samples [i0, i1) in
 * a number of pixel columns, the finest level whose bucket is at most half a column is merged into
 * columns, so every sample counts in exactly one column: no spike is ever lost (taking every Nth
 * sample would hide them). Zoomed in to a few samples per column, the raw samples are returned.
 */
import type { SampleArray } from '../model';

export interface EnvelopeLevel {
  /** Samples per bucket. */
  readonly bucket: number;
  readonly min: Float32Array;
  readonly max: Float32Array;
}

export interface Envelope {
  readonly length: number;
  readonly levels: readonly EnvelopeLevel[];
}

/** Builds the pyramid once per trace: O(n) time, about n / base * 8 * 4/3 bytes. */
export function buildEnvelope(samples: SampleArray, base = 16, factor = 4): Envelope {
  if (!Number.isInteger(base) || base < 2) throw new RangeError(`base must be an integer >= 2, got ${base}`);
  if (!Number.isInteger(factor) || factor < 2) throw new RangeError(`factor must be an integer >= 2, got ${factor}`);
  const n = samples.length;
  const levels: EnvelopeLevel[] = [];
  let count = Math.ceil(n / base);
  if (count === 0) return { length: 0, levels };
  let min = new Float32Array(count);
  let max = new Float32Array(count);
  for (let b = 0, i = 0; b < count; b++) {
    const end = Math.min(n, i + base);
    let lo = samples[i];
    let hi = lo;
    for (i++; i < end; i++) {
      const v = samples[i];
      if (v < lo) lo = v;
      else if (v > hi) hi = v;
    }
    min[b] = lo;
    max[b] = hi;
  }
  let bucket = base;
  levels.push({ bucket, min, max });
  while (count > 1) {
    const next = Math.ceil(count / factor);
    const nmin = new Float32Array(next);
    const nmax = new Float32Array(next);
    for (let b = 0, j = 0; b < next; b++) {
      const end = Math.min(count, j + factor);
      let lo = min[j];
      let hi = max[j];
      for (j++; j < end; j++) {
        if (min[j] < lo) lo = min[j];
        if (max[j] > hi) hi = max[j];
      }
      nmin[b] = lo;
      nmax[b] = hi;
    }
    bucket *= factor;
    min = nmin;
    max = nmax;
    count = next;
    levels.push({ bucket, min, max });
  }
  return { length: n, levels };
}

/** Points to draw: x as a sample index (fractional allowed), y the value. */
export interface PlotColumns {
  readonly index: Float64Array;
  readonly value: Float64Array;
  /** Points used (the arrays may be longer). */
  readonly count: number;
  /** True when the points are the raw samples (zoomed in). */
  readonly raw: boolean;
}

/** Raw samples are returned when there are at most this many samples per column. */
export const RAW_SAMPLES_PER_COLUMN = 4;

/**
 * Points for drawing samples [i0, i1) into `columns` pixel columns: the raw samples when zoomed in,
 * else per column its minimum then its maximum (two points at the column's centre index).
 */
export function plotColumns(samples: SampleArray, env: Envelope, i0: number, i1: number, columns: number): PlotColumns {
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`columns must be a positive integer, got ${columns}`);
  const n = samples.length;
  const a = Math.max(0, Math.floor(i0));
  const b = Math.min(n, Math.ceil(i1));
  if (b <= a) return { index: new Float64Array(0), value: new Float64Array(0), count: 0, raw: true };
  const perColumn = (b - a) / columns;
  if (perColumn <= RAW_SAMPLES_PER_COLUMN || env.levels.length === 0 || env.levels[0].bucket * 2 > perColumn) {
    const len = b - a;
    const index = new Float64Array(len);
    const value = new Float64Array(len);
    for (let k = 0; k < len; k++) {
      index[k] = a + k;
      value[k] = samples[a + k];
    }
    return { index, value, count: len, raw: true };
  }
  // Finest level whose bucket is at most half a column.
  let li = 0;
  while (li + 1 < env.levels.length && env.levels[li + 1].bucket * 2 <= perColumn) li++;
  const { bucket, min, max } = env.levels[li];
  const firstBucket = Math.floor(a / bucket);
  const lastBucket = Math.ceil(b / bucket); // exclusive
  const bucketsPerColumn = (lastBucket - firstBucket) / columns;
  const index = new Float64Array(columns * 2);
  const value = new Float64Array(columns * 2);
  let out = 0;
  let start = firstBucket;
  for (let c = 0; c < columns; c++) {
    const end = c === columns - 1 ? lastBucket : firstBucket + Math.round((c + 1) * bucketsPerColumn);
    if (end <= start) continue;
    let lo = min[start];
    let hi = max[start];
    for (let j = start + 1; j < end; j++) {
      if (min[j] < lo) lo = min[j];
      if (max[j] > hi) hi = max[j];
    }
    const centre = Math.min(n - 1, ((start + end) * bucket) / 2);
    index[out] = centre;
    value[out++] = lo;
    index[out] = centre;
    value[out++] = hi;
    start = end;
  }
  return { index, value, count: out, raw: false };
}
