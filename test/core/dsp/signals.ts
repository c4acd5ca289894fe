/**
 * Inputs and comparisons for the core/dsp tests. The inputs are only something to filter; every
 * expected value comes from the reference (scipy) or a formula, never from these.
 */
import type { Corners, FilterKind } from '../../../core/dsp/butterworth';

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

/** A filter to check: order, corners (Hz), kind, sample rate (Hz). */
export interface FilterCase { order: number; corners: Corners; kind: FilterKind; fs: number }

/** Orders 1-8 of a low-pass, a high-pass and a band-pass at each of the network's rates and 500 Hz. */
export function filterCases(): FilterCase[] {
  const cases: FilterCase[] = [];
  for (const fs of [40, 100, 200, 500]) {
    for (let order = 1; order <= 8; order++) {
      cases.push({ order, corners: 0.3 * (fs / 2), kind: 'lowpass', fs });
      cases.push({ order, corners: 0.5, kind: 'highpass', fs });
      cases.push({ order, corners: [1, 0.4 * (fs / 2)], kind: 'bandpass', fs });
    }
  }
  return cases;
}

export const caseLabel = (c: FilterCase) => `${c.kind} order ${c.order} ${JSON.stringify(c.corners)} Hz at ${c.fs} Hz`;
