import { describe, expect, it } from 'vitest';
import { type Complex, complex } from '../../../core/dsp/complex';
import { type Zpk, bilinear, butterworthPrototype, lowpassToBandpass, lowpassToHighpass, lowpassToLowpass, prewarp } from '../../../core/dsp/zpk';
import { scipyReference } from '../../ref/scipy/dspReference';

// Reference: scipy.signal.buttap, lp2lp_zpk, lp2hp_zpk, lp2bp_zpk and bilinear_zpk (scipy 1.17.1)
// in the machine's python3, one run for the file.

type Pairs = [number, number][];
const asPairs = (list: readonly Complex[]): Pairs => list.map((c) => [c.re, c.im]);
const fromPairs = (p: Pairs): Complex[] => p.map(([re, im]) => complex(re, im));

/** Multisets of complex numbers equal to `tol` (relative to the largest magnitude): sorted by real, then imaginary part. */
function expectSameRoots(mine: readonly Complex[], theirs: Pairs, tol: number): void {
  const key = (a: [number, number], b: [number, number]) => a[0] - b[0] || a[1] - b[1];
  const m = asPairs(mine).sort(key);
  const t = [...theirs].sort(key);
  expect(m.length).toBe(t.length);
  const scale = Math.max(1, ...t.map(([re, im]) => Math.hypot(re, im)));
  m.forEach(([re, im], i) => {
    expect(Math.abs(re - t[i][0]) / scale).toBeLessThan(tol);
    expect(Math.abs(im - t[i][1]) / scale).toBeLessThan(tol);
  });
}

const orders = [1, 2, 3, 4, 5, 6, 7, 8];
const protos = orders.map(butterworthPrototype);
const wo = prewarp(7, 100);
const bw = prewarp(20, 100) - prewarp(1, 100);
const lp = lowpassToLowpass(protos[3], wo);
const hp = lowpassToHighpass(protos[4], wo);
const bp = lowpassToBandpass(protos[2], Math.sqrt(prewarp(1, 100) * prewarp(20, 100)), bw);
const zpkArgs = (z: Zpk) => ({ z: asPairs(z.zeros), p: asPairs(z.poles), k: z.gain });

const ref = scipyReference([
  ...orders.map((order) => ({ op: 'buttap', order })),
  { op: 'lp2lp', ...zpkArgs(protos[3]), wo },
  { op: 'lp2hp', ...zpkArgs(protos[4]), wo },
  { op: 'lp2bp', ...zpkArgs(protos[2]), wo: Math.sqrt(prewarp(1, 100) * prewarp(20, 100)), bw },
  { op: 'bilinear_zpk', ...zpkArgs(bp), fs: 100 },
  { op: 'bilinear_zpk', ...zpkArgs(hp), fs: 100 },
]);
const refProto = ref.slice(0, orders.length) as Pairs[];
const [refLp, refHp, refBp, refBpZ, refHpZ] = ref.slice(orders.length) as { z: Pairs; p: Pairs; k: number }[];

describe('zpk', () => {
  it('butterworthPrototype puts scipy buttap\'s poles on the left unit half-circle, the middle one of an odd order exactly -1', () => {
    protos.forEach((p, i) => {
      expectSameRoots(p.poles, refProto[i], 1e-15);
      expect(p.zeros).toEqual([]);
      expect(p.gain).toBe(1);
    });
    expect(butterworthPrototype(5).poles[2]).toEqual({ re: -1, im: 0 });
  });

  it('prewarp maps a digital frequency to 2·fs·tan(π·f/fs) rad/s (bilinear transform pre-warping)', () => {
    expect(prewarp(25, 100)).toBeCloseTo(200, 12); // tan(π/4) = 1
    expect(prewarp(1e-6, 100) / (2 * Math.PI * 1e-6)).toBeCloseTo(1, 10); // small f: Ω ≈ 2πf
  });

  it('the low-, high- and band-pass transforms agree with scipy lp2lp_zpk, lp2hp_zpk, lp2bp_zpk to 1e-14', () => {
    for (const [mine, theirs] of [[lp, refLp], [hp, refHp], [bp, refBp]] as const) {
      expectSameRoots(mine.zeros, theirs.z, 1e-14);
      expectSameRoots(mine.poles, theirs.p, 1e-14);
      expect(Math.abs(mine.gain - theirs.k) / Math.abs(theirs.k)).toBeLessThan(1e-14);
    }
  });

  it('bilinear agrees with scipy bilinear_zpk to 1e-14: zeros at infinity land on z = -1, the gain is compensated', () => {
    for (const [mine, theirs] of [[bilinear(bp, 100), refBpZ], [bilinear(hp, 100), refHpZ]] as const) {
      expectSameRoots(mine.zeros, theirs.z, 1e-14);
      expectSameRoots(mine.poles, theirs.p, 1e-14);
      expect(Math.abs(mine.gain - theirs.k) / Math.abs(theirs.k)).toBeLessThan(1e-14);
    }
    expect(bilinear(lp, 100).zeros.filter((z) => z.re === -1 && z.im === 0).length).toBe(4);
  });

  it('refuses a transfer function with more zeros than poles', () => {
    const bad: Zpk = { zeros: fromPairs([[0, 0], [1, 0]]), poles: fromPairs([[-1, 0]]), gain: 1 };
    expect(() => bilinear(bad, 100)).toThrow(/at least as many poles as zeros, got 1 poles and 2 zeros/);
  });
});
