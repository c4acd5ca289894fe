/**
 * Maeda's AIC picker, computed directly from the trace (Maeda, N., 1985, "A method for reading and
 * checking phase times in autoprocessing system of seismic wave data", Zisin (J. Seismol. Soc. Japan)
 * 38, 365-379):
 *
 *   AIC(k) = k log(var(x[1..k])) + (N - k - 1) log(var(x[k+1..N])),   k = 1..N-1 (1-based),
 *
 * over a window of N samples; the onset is the first sample after the minimum's split (1-based k+1,
 * 0-based index `from + k`). Variances are population variances (divide by the count) taken from
 * prefix sums of the window's samples less the window's mean, so the whole curve costs O(N).
 *
 * Where a part has (numerically) zero variance - a noise-free lead-in, a flat clipped run - its variance
 * is floored at 1e-12 of the whole window's variance so log stays finite; the floor only matters where
 * the data are exactly constant.
 */
import type { SampleArray } from '../model';

/** The AIC curve of a window and where its minimum lies. */
export interface AicResult {
  /** AIC values: aic[k] splits the window after its first k samples; aic[0] and aic[N-1..] are +Infinity. */
  readonly aic: Float64Array;
  /** Split of the minimum (first sample of the second part, relative to the window's start). */
  readonly k: number;
  /** AIC at the minimum. */
  readonly minimum: number;
}

/**
 * Maeda's AIC over x[from..to). Splits with fewer than `minPart` samples on either side (default 2:
 * a variance needs two) are +Infinity. Throws RangeError on a window outside the array or too short.
 */
export function maedaAic(x: SampleArray, from: number, to: number, minPart = 2): AicResult {
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > x.length || to - from < 2 * minPart + 1) {
    throw new RangeError(`AIC window [${from}, ${to}) must lie within 0..${x.length} and hold at least ${2 * minPart + 1} samples`);
  }
  if (!Number.isInteger(minPart) || minPart < 1) throw new RangeError(`minPart must be an integer >= 1, got ${minPart}`);
  const n = to - from;
  let mean = 0;
  for (let i = from; i < to; i++) mean += x[i];
  mean /= n;
  // Prefix sums of the demeaned samples and their squares.
  const s1 = new Float64Array(n + 1);
  const s2 = new Float64Array(n + 1);
  let a = 0;
  let b = 0;
  for (let i = 0; i < n; i++) {
    const v = x[from + i] - mean;
    a += v;
    b += v * v;
    s1[i + 1] = a;
    s2[i + 1] = b;
  }
  const total1 = a;
  const total2 = b;
  const floor = Math.max((total2 / n - (total1 / n) * (total1 / n)) * 1e-12, Number.MIN_VALUE);
  const aic = new Float64Array(n).fill(Infinity);
  let best = Infinity;
  let bestK = minPart;
  for (let k = minPart; k <= n - minPart; k++) {
    const m1 = s1[k] / k;
    let v1 = s2[k] / k - m1 * m1;
    const r = n - k;
    const m2 = (total1 - s1[k]) / r;
    let v2 = (total2 - s2[k]) / r - m2 * m2;
    if (v1 < floor) v1 = floor;
    if (v2 < floor) v2 = floor;
    const value = k * Math.log(v1) + (n - k - 1) * Math.log(v2);
    aic[k] = value;
    if (value < best) {
      best = value;
      bestK = k;
    }
  }
  return { aic, k: bestK, minimum: best };
}

/**
 * Several channels read together (e.g. the two horizontals for S): the sum of their AIC curves over
 * the same window. Each AIC is, up to constants, minus twice the log-likelihood of a two-part
 * Gaussian model, so for channels taken as independent the joint AIC is the sum.
 */
export function jointAic(channels: readonly SampleArray[], from: number, to: number, minPart = 2): AicResult {
  if (channels.length === 0) throw new RangeError('jointAic needs at least one channel, got 0');
  const sum = new Float64Array(to - from);
  for (const x of channels) {
    const r = maedaAic(x, from, to, minPart);
    for (let k = 0; k < sum.length; k++) sum[k] += r.aic[k];
  }
  let best = Infinity;
  let bestK = minPart;
  for (let k = 0; k < sum.length; k++) {
    if (sum[k] < best) {
      best = sum[k];
      bestK = k;
    }
  }
  return { aic: sum, k: bestK, minimum: best };
}

/**
 * Integrated autocorrelation time of x[from..to) in samples: 1 + 2 sum of the autocorrelation
 * coefficients rho(1), rho(2), ... up to the lag before the first that is not positive (at most
 * `maxLag`). It counts how many samples carry one sample's worth of independent information
 * (the effective sample size of a correlated series is N / tau; Geyer, 1992, Statistical Science 7(4),
 * 473-483, gives the truncation at the first non-positive term as the simplest initial-sequence rule -
 * from memory). White noise gives about 1; noise band-limited well below Nyquist gives more.
 */
export function autocorrelationTime(x: SampleArray, from: number, to: number, maxLag = 64): number {
  const n = to - from;
  if (n < 4) return 1;
  const [mean, rms] = meanRms(x, from, to);
  const c0 = rms * rms * n;
  if (!(c0 > 0)) return 1;
  let tau = 1;
  const lim = Math.min(maxLag, n >> 1);
  for (let lag = 1; lag <= lim; lag++) {
    let c = 0;
    for (let i = from; i + lag < to; i++) c += (x[i] - mean) * (x[i + lag] - mean);
    const rho = c / c0;
    if (!(rho > 0)) break;
    tau += 2 * rho;
  }
  return tau;
}

/** Mean and RMS about that mean of x[from..to); [0, 0] when empty. */
export function meanRms(x: SampleArray, from: number, to: number): [number, number] {
  const n = to - from;
  if (n <= 0) return [0, 0];
  let m = 0;
  for (let i = from; i < to; i++) m += x[i];
  m /= n;
  let s = 0;
  for (let i = from; i < to; i++) {
    const v = x[i] - m;
    s += v * v;
  }
  return [m, Math.sqrt(s / n)];
}
