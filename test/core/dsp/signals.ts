/**
 * Inputs and comparisons for the core/dsp tests. The inputs are only something to filter; every
 * expected value comes from the reference (scipy) or a formula, never from these.
 */

/** Deterministic test input of n samples: an offset, a step, two sinusoids and pseudo-random noise (Park-Miller LCG). */
export function testSignal(n: number, seed = 1, offset = 250): Float64Array {
  const x = new Float64Array(n);
  let s = seed;
  for (let i = 0; i < n; i++) {
    s = (s * 16807) % 2147483647;
    const noise = s / 2147483647 - 0.5;
    x[i] = offset + (i > n / 2 ? 400 : 0) + 100 * Math.sin(i * 0.37) + 30 * Math.sin(i * 0.021) + 80 * noise;
  }
  return x;
}

/** Largest |a[i] − b[i]| over [from, to), relative to the largest |b[i]| there (absolute when b is all zero). */
export function relDiff(a: ArrayLike<number>, b: ArrayLike<number>, from = 0, to = b.length): number {
  if (a.length !== b.length) return Infinity;
  let peak = 0;
  let d = 0;
  for (let i = from; i < to; i++) {
    peak = Math.max(peak, Math.abs(b[i]));
    d = Math.max(d, Math.abs(a[i] - b[i]));
  }
  return peak === 0 ? d : d / peak;
}
