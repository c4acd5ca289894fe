import { describe, expect, it } from 'vitest';
import { demean, detrend } from '../../../core/dsp/detrend';
import { scipyReference } from '../../ref/scipy/dspReference';
import { testSignal } from './signals';

// Reference: scipy.signal.detrend(x, type='constant' | 'linear') (scipy 1.17.1) in python3.
// Round-off in removing an offset scales with the input, not the output: tolerances are 1e-14 of the
// largest |x| (about 45 units in the last place of the input).
const x = testSignal(5000, 11, 3e6);
for (let i = 0; i < x.length; i++) x[i] += 0.37 * i; // a drift, so the linear fit has something to remove
const counts = Int32Array.from(x, Math.round);
const TOL = 1e-14 * Math.max(...x.map(Math.abs));

/** Largest |a[i] − b[i]|. */
function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let d = 0;
  for (let i = 0; i < b.length; i++) d = Math.max(d, Math.abs(a[i] - b[i]));
  return d;
}
const [refConst, refLinear, refCounts] = scipyReference([
  { op: 'detrend', x, type: 'constant' },
  { op: 'detrend', x, type: 'linear' },
  { op: 'detrend', x: counts, type: 'linear' },
]) as number[][];

describe('detrend', () => {
  it('demean agrees with scipy detrend(type="constant") to 1e-14 of the largest input value, on data with a 3e6 offset', () => {
    expect(maxDiff(demean(x), refConst)).toBeLessThan(TOL);
  });

  it('detrend agrees with scipy detrend(type="linear") to 1e-14 of the largest input value, for float64 and Int32 counts', () => {
    expect(maxDiff(detrend(x), refLinear)).toBeLessThan(TOL);
    expect(maxDiff(detrend(counts), refCounts)).toBeLessThan(TOL);
  });

  it('works in place and leaves a one-sample trace at zero', () => {
    const y = Float64Array.from(x);
    expect(detrend(y, y)).toBe(y);
    expect(maxDiff(y, refLinear)).toBeLessThan(TOL);
    expect(Array.from(detrend(Float64Array.of(42)))).toEqual([0]);
    expect(detrend(new Float64Array(0)).length).toBe(0);
  });

  it('refuses an output of the wrong length and input that is not a sample array', () => {
    expect(() => demean(x, new Float64Array(3))).toThrow(/length 5000, got length 3/);
    expect(() => detrend([1, 2, 3] as unknown as Float64Array)).toThrow(TypeError);
  });
});
