import { describe, expect, it } from 'vitest';
import { type Complex, cdiv, cmul, complex, cprod, csqrt, isReal } from '../../../core/dsp/complex';
import { scipyReference } from '../../ref/scipy/dspReference';

// Reference: numpy 2.4 complex128 sqrt (C99 csqrt semantics, including the sign of zero on the
// branch cut), in the machine's python3.
const values: [number, number][] = [[-4, 0], [-4, -0], [3, 4], [0, 0], [-1e-3, 2], [2.5, -1e-8], [-7, 1e-300], [0, -9]];
const wire = values.map((pair) => pair.map((v) => (Object.is(v, -0) ? '-0' : v)));
const [sqrtRef] = scipyReference([{ op: 'csqrt', values: wire }]) as [number, number][][];

describe('complex', () => {
  it('csqrt gives numpy\'s principal square root, the side of the branch cut chosen by the sign of a zero imaginary part', () => {
    values.forEach(([re, im], i) => {
      const r = csqrt(complex(re, im));
      expect(r.re).toBeCloseTo(sqrtRef[i][0], 14);
      expect(r.im).toBeCloseTo(sqrtRef[i][1], 14);
      expect(Math.sign(r.im) || (Object.is(r.im, -0) ? -1 : 1)).toBe(Math.sign(sqrtRef[i][1]) || (Object.is(sqrtRef[i][1], -0) ? -1 : 1));
    });
  });

  it('cdiv inverts cmul (a·b/b = a) to rounding, also for large and small parts', () => {
    const pairs: [Complex, Complex][] = [[complex(3, -2), complex(1e-200, 5e-201)], [complex(1e150, 1), complex(3e150, -4e150)], [complex(0.5, 0.25), complex(-2, 7)]];
    for (const [a, b] of pairs) {
      const r = cdiv(cmul(a, b), b);
      expect(Math.abs(r.re - a.re)).toBeLessThanOrEqual(1e-15 * Math.hypot(a.re, a.im));
      expect(Math.abs(r.im - a.im)).toBeLessThanOrEqual(1e-15 * Math.hypot(a.re, a.im));
    }
  });

  it('cprod of conjugate pairs is real and |z|² (i·(−i) = 1)', () => {
    const p = cprod([complex(0, 1), complex(0, -1), complex(3, 4), complex(3, -4)]);
    expect(p).toEqual({ re: 25, im: 0 });
    expect(isReal(p)).toBe(true);
    expect(isReal(complex(1, 1e-300))).toBe(false);
  });
});
