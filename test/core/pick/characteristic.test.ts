import { describe, expect, it } from 'vitest';
import { characteristicInto, envelopeWeight } from '../../../core/pick/characteristic';

describe('characteristic functions', () => {
  it('energy is x^2 and absolute is |x| (worked by hand)', () => {
    const x = new Float64Array([-2, 0.5, 3]);
    const out = new Float64Array(3);
    characteristicInto('energy', x, 0, 3, out, x[0], 0);
    expect(Array.from(out)).toEqual([4, 0.25, 9]);
    characteristicInto('absolute', x, 0, 3, out, x[0], 0);
    expect(Array.from(out)).toEqual([2, 0.5, 3]);
  });

  it('envelope is x^2 + K (x - previous)^2 (Allen 1978 form), the first difference taken from the given previous sample', () => {
    const x = new Float64Array([1, 3, 2]);
    const out = new Float64Array(3);
    characteristicInto('envelope', x, 0, 3, out, 0.5, 2);
    expect(Array.from(out)).toEqual([1 + 2 * 0.25, 9 + 2 * 4, 4 + 2 * 1]);
  });

  it('with K = (fs / (2 pi f))^2 the envelope of a sine of frequency f stays within 3 % of A^2 (no zero crossings), where x^2 swings from 0 to A^2', () => {
    const fs = 100;
    const f = 2;
    const a = 3;
    const n = 500;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = a * Math.sin((2 * Math.PI * f * i) / fs);
    const out = new Float64Array(n);
    characteristicInto('envelope', x, 1, n, out, x[0], envelopeWeight(fs, f));
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < n - 1; i++) {
      lo = Math.min(lo, out[i]);
      hi = Math.max(hi, out[i]);
    }
    // The first difference of a sampled sine lags half a sample and has amplitude 2A sin(pi f / fs),
    // so the envelope stays within about (pi f / fs) of A^2: 6 % here at most, 3 % typical.
    expect(lo).toBeGreaterThan(a * a * 0.9);
    expect(hi).toBeLessThan(a * a * 1.1);
    expect(envelopeWeight(100, 2)).toBeCloseTo((100 / (4 * Math.PI)) ** 2, 12);
  });
});
