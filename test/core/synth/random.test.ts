import { describe, expect, it } from 'vitest';
import { Rng } from '../../../core/synth/random';

describe('Rng (sfc32)', () => {
  it('gives the same sequence for the same seed and stream, and different ones otherwise', () => {
    const a = new Rng(42), b = new Rng(42), c = new Rng(43), d = new Rng(42, 1);
    const sa = Array.from({ length: 20 }, () => a.nextUint32());
    expect(Array.from({ length: 20 }, () => b.nextUint32())).toEqual(sa);
    expect(Array.from({ length: 20 }, () => c.nextUint32())).not.toEqual(sa);
    expect(Array.from({ length: 20 }, () => d.nextUint32())).not.toEqual(sa);
  });

  it('uniform deviates have the moments of U(0,1): mean 1/2, variance 1/12 (to 4 standard errors)', () => {
    const r = new Rng(7);
    const n = 200_000;
    let s = 0, s2 = 0, outside = 0;
    for (let i = 0; i < n; i++) {
      const u = r.next();
      if (!(u >= 0 && u < 1)) outside++;
      s += u;
      s2 += u * u;
    }
    const mean = s / n, v = s2 / n - mean * mean;
    expect(outside).toBe(0);
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(v - 1 / 12)).toBeLessThan(4 * Math.sqrt(1 / 180 / n));
  });

  it('normal deviates have mean 0 and variance 1 (to 4 standard errors)', () => {
    const r = new Rng(9);
    const n = 100_000;
    let s = 0, s2 = 0;
    for (let i = 0; i < n; i++) {
      const x = r.normal();
      s += x;
      s2 += x * x;
    }
    expect(Math.abs(s / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
  });

  it('rejects a seed that is not finite', () => {
    expect(() => new Rng(Number.NaN)).toThrow(RangeError);
  });
});
