/**
 * Filter design in zeros, poles and gain, as small pure steps: the Butterworth analog prototype, the
 * pre-warp of a corner frequency, the low-pass to low-/high-/band-pass transforms and the bilinear
 * transform. The steps and their gain bookkeeping follow scipy.signal (`buttap`, `lp2lp_zpk`,
 * `lp2hp_zpk`, `lp2bp_zpk`, `bilinear_zpk` in `_filter_design.py`), so that the sections built from
 * them match scipy's.
 */
import {
  type Complex, cadd, cdiv, cmul, complex, cprod, cscale, csqrt, csub,
} from './complex';

/** Zeros, poles and gain of a transfer function (analog: s-plane in rad/s; digital: z-plane). */
export interface Zpk {
  readonly zeros: readonly Complex[];
  readonly poles: readonly Complex[];
  readonly gain: number;
}

/**
 * Analog Butterworth low-pass prototype of order `order`, corner 1 rad/s: no zeros, poles
 * -exp(iπm/(2N)) for m = -N+1, -N+3, ..., N-1 (evenly spaced on the left unit half-circle), gain 1.
 * The middle pole of an odd order is exactly -1.
 */
export function butterworthPrototype(order: number): Zpk {
  const poles: Complex[] = [];
  for (let m = -order + 1; m < order; m += 2) {
    const theta = (Math.PI * m) / (2 * order);
    poles.push(m === 0 ? complex(-1, 0) : complex(-Math.cos(theta), -Math.sin(theta)));
  }
  return { zeros: [], poles, gain: 1 };
}

/**
 * The analog angular frequency (rad/s) that the bilinear transform at `sampleRate` (Hz) maps onto the
 * digital frequency `frequency` (Hz): 2·fs·tan(π·f/fs).
 */
export function prewarp(frequency: number, sampleRate: number): number {
  return 2 * sampleRate * Math.tan((Math.PI * frequency) / sampleRate);
}

function relativeDegree(zpk: Zpk): number {
  const d = zpk.poles.length - zpk.zeros.length;
  if (d < 0) throw new RangeError(`a transfer function needs at least as many poles as zeros, got ${zpk.poles.length} poles and ${zpk.zeros.length} zeros`);
  return d;
}

/** Low-pass prototype (corner 1 rad/s) to low-pass with corner `wo` (rad/s): s → s/wo. */
export function lowpassToLowpass(zpk: Zpk, wo: number): Zpk {
  const degree = relativeDegree(zpk);
  return {
    zeros: zpk.zeros.map((z) => cscale(z, wo)),
    poles: zpk.poles.map((p) => cscale(p, wo)),
    gain: zpk.gain * wo ** degree,
  };
}

/** Low-pass prototype to high-pass with corner `wo` (rad/s): s → wo/s; zeros at infinity move to 0. */
export function lowpassToHighpass(zpk: Zpk, wo: number): Zpk {
  const degree = relativeDegree(zpk);
  const w = complex(wo);
  const zeros = zpk.zeros.map((z) => cdiv(w, z));
  for (let i = 0; i < degree; i++) zeros.push(complex(0));
  const negZ = cprod(zpk.zeros.map((z) => cscale(z, -1)));
  const negP = cprod(zpk.poles.map((p) => cscale(p, -1)));
  return { zeros, poles: zpk.poles.map((p) => cdiv(w, p)), gain: zpk.gain * cdiv(negZ, negP).re };
}

/**
 * Low-pass prototype to band-pass centred on `wo` with width `bw` (both rad/s):
 * s → (s² + wo²)/(s·bw). Each pole splits in two; `degree` zeros go to 0, as many stay at infinity.
 */
export function lowpassToBandpass(zpk: Zpk, wo: number, bw: number): Zpk {
  const degree = relativeDegree(zpk);
  const wo2 = complex(wo * wo);
  const split = (list: readonly Complex[]): Complex[] => {
    const scaled = list.map((v) => cscale(v, bw / 2));
    const roots = scaled.map((v) => csqrt(csub(cmul(v, v), wo2)));
    return [...scaled.map((v, i) => cadd(v, roots[i])), ...scaled.map((v, i) => csub(v, roots[i]))];
  };
  const zeros = split(zpk.zeros);
  for (let i = 0; i < degree; i++) zeros.push(complex(0));
  return { zeros, poles: split(zpk.poles), gain: zpk.gain * bw ** degree };
}

/**
 * Analog (s-plane, rad/s) to digital (z-plane) by the bilinear transform at `sampleRate` (Hz):
 * z = (2fs + s)/(2fs − s). Zeros at infinity land on z = −1 (the Nyquist frequency); the gain is
 * corrected so the response is the analog one at the pre-warped frequencies.
 */
export function bilinear(zpk: Zpk, sampleRate: number): Zpk {
  const degree = relativeDegree(zpk);
  const fs2 = complex(2 * sampleRate);
  const map = (s: Complex) => cdiv(cadd(fs2, s), csub(fs2, s));
  const zeros = zpk.zeros.map(map);
  for (let i = 0; i < degree; i++) zeros.push(complex(-1));
  const num = cprod(zpk.zeros.map((z) => csub(fs2, z)));
  const den = cprod(zpk.poles.map((p) => csub(fs2, p)));
  return { zeros, poles: zpk.poles.map(map), gain: zpk.gain * cdiv(num, den).re };
}
