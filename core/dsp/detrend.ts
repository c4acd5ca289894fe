/** Removing the mean or the least-squares straight line from a trace (as scipy.signal.detrend). */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';

/**
 * Mean of x by the corrected two-pass algorithm (the plain mean, then the mean of the residuals
 * added back), so a large offset (counts of a few million) does not cost digits of the result.
 */
function accurateMean(x: SampleArray): number {
  const n = x.length;
  if (n === 0) return 0;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += x[i];
  const mean = sum / n;
  let residual = 0;
  for (let i = 0; i < n; i++) residual += x[i] - mean;
  return mean + residual / n;
}

/** x minus its mean (units of x). `out` may be x itself when x is a Float64Array. Empty input gives empty output. */
export function demean(x: SampleArray, out?: Float64Array): Float64Array {
  checkSamples(x);
  const n = x.length;
  const y = outputArray(n, out);
  const mean = accurateMean(x);
  for (let i = 0; i < n; i++) y[i] = x[i] - mean;
  return y;
}

/**
 * x minus the straight line a + b·i fitted to it by least squares over the sample index i (units of
 * x), as scipy.signal.detrend(x, type='linear'). `out` may be x itself when x is a Float64Array.
 */
export function detrend(x: SampleArray, out?: Float64Array): Float64Array {
  checkSamples(x);
  const n = x.length;
  const y = outputArray(n, out);
  if (n < 2) return demean(x, y);
  const tMean = (n - 1) / 2;
  const mean = accurateMean(x);
  // Centred sums: slope = Σ (t − t̄)(x − x̄) / Σ (t − t̄)², and Σ (t − t̄)² = n(n² − 1)/12.
  let sxy = 0;
  for (let i = 0; i < n; i++) sxy += (i - tMean) * (x[i] - mean);
  const slope = sxy / ((n * (n * n - 1)) / 12);
  for (let i = 0; i < n; i++) y[i] = x[i] - (mean + slope * (i - tMean));
  return y;
}
