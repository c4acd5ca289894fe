import { describe, expect, it } from 'vitest';
import { complex } from '../../../core/dsp/complex';
import { conjugatePairsThenReals, zpkToSos } from '../../../core/dsp/zpkToSos';
import { scipyReference } from '../../ref/scipy/dspReference';

// References: the worked example in scipy.signal.zpk2sos's documentation (scipy 1.17, "With
// pairing='nearest' (the default), we obtain ...") and scipy.signal.zpk2sos run in python3.

describe('zpkToSos', () => {
  it('reproduces scipy\'s documented example: zeros -1, -0.5±0.5i, poles 0.75, 0.8±0.1i', () => {
    const sos = zpkToSos({
      zeros: [complex(-1), complex(-0.5, -0.5), complex(-0.5, 0.5)],
      poles: [complex(0.75), complex(0.8, 0.1), complex(0.8, -0.1)],
      gain: 1,
    });
    const expected = [1, 1, 0.5, 1, -0.75, 0, 1, 1, 0, 1, -1.6, 0.65];
    expected.forEach((v, i) => expect(sos[i]).toBeCloseTo(v, 14));
  });

  it('agrees with scipy zpk2sos on mixed real and complex poles and zeros, gain in the first section', () => {
    const z = [[1, 0], [1, 0], [-1, 0], [0.3, 0.9], [0.3, -0.9]] as [number, number][];
    const p = [[0.5, 0], [0.9, 0.3], [0.9, -0.3], [-0.2, 0.6], [-0.2, -0.6], [0.1, 0]] as [number, number][];
    const [ref] = scipyReference([{ op: 'zpk2sos', z, p, k: 0.125 }]) as number[][];
    const sos = zpkToSos({ zeros: z.map(([re, im]) => complex(re, im)), poles: p.map(([re, im]) => complex(re, im)), gain: 0.125 });
    expect(sos.length).toBe(ref.length);
    ref.forEach((v, i) => expect(Math.abs(sos[i] - v)).toBeLessThan(1e-14));
  });

  it('a gain alone is one pass-through section scaled by the gain', () => {
    expect(Array.from(zpkToSos({ zeros: [], poles: [], gain: 3 }))).toEqual([3, 0, 0, 1, 0, 0]);
  });

  it('conjugatePairsThenReals keeps one of each pair (positive imaginary part) then the reals, and refuses an unpaired complex value', () => {
    const out = conjugatePairsThenReals([complex(2), complex(1, -1), complex(-3), complex(1, 1)]);
    expect(out).toEqual([{ re: 1, im: 1 }, { re: -3, im: 0 }, { re: 2, im: 0 }]);
    expect(() => conjugatePairsThenReals([complex(1, 1), complex(1, -2)])).toThrow(/no conjugate/);
  });
});
