import { describe, expect, it } from 'vitest';
import { cosineTaper, cosineTaperWeights } from '../../../core/dsp/taper';
import { scipyReference } from '../../ref/scipy/dspReference';

// Reference: scipy.signal.windows.tukey(n, alpha, sym=True) (scipy 1.17.1) in python3; the taper
// fraction per end f is tukey's alpha / 2.
const cases = [[100, 0.05], [101, 0.1], [7, 0.25], [1000, 0.5], [64, 0], [2, 0.3], [1, 0.2], [513, 0.013]] as const;
const ref = scipyReference(cases.map(([n, f]) => ({ op: 'tukey', n, alpha: 2 * f }))) as number[][];

describe('taper', () => {
  it('cosineTaperWeights(n, f) equals scipy tukey(n, 2f) to 1e-15, from no taper (f = 0) to a Hann window (f = 0.5)', () => {
    cases.forEach(([n, f], i) => {
      const w = cosineTaperWeights(n, f);
      expect(w.length).toBe(n);
      w.forEach((v, j) => expect(Math.abs(v - ref[i][j]), `n ${n} f ${f} sample ${j}`).toBeLessThan(1e-15));
    });
  });

  it('cosineTaper multiplies the samples by the weights and can work in place', () => {
    const x = Float64Array.from({ length: 100 }, (_, i) => 10 + i);
    const w = cosineTaperWeights(100, 0.05);
    const y = cosineTaper(x, 0.05);
    y.forEach((v, i) => expect(v).toBe(x[i] * w[i]));
    expect(y[0]).toBe(0);
    expect(y[50]).toBe(60);
    expect(cosineTaper(x, 0.05, x)).toBe(x);
  });

  it('refuses fractions outside 0-0.5 per end', () => {
    expect(() => cosineTaperWeights(10, 0.6)).toThrow(/from 0 to 0.5, got 0.6/);
    expect(() => cosineTaper(new Float64Array(10), -0.1)).toThrow(RangeError);
  });
});
