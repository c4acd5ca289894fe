/**
 * Digital zeros/poles/gain to second-order sections, with scipy.signal's "nearest" pairing
 * (`zpk2sos` and `_cplxreal` in scipy/signal/_filter_design.py): the pole closest to the unit circle
 * is paired with the zero closest to it, and such sections go last; the gain goes into the first
 * section's numerator. Following that order gives the same sections, one by one, as scipy's
 * `butter(..., output='sos')`.
 */
import { type Complex, cabs, cconj, complex, csub, isReal } from './complex';
import type { Zpk } from './zpk';

const EPS = 2.220446049250313e-16;

/**
 * Complex-conjugate pairs collapsed to their member with positive imaginary part (averaged), sorted
 * by real part and then |imaginary part|, followed by the real values sorted. Throws when a complex
 * value has no conjugate.
 */
export function conjugatePairsThenReals(values: readonly Complex[]): Complex[] {
  const tol = 100 * EPS;
  const sorted = [...values].sort((a, b) => a.re - b.re || Math.abs(a.im) - Math.abs(b.im));
  const reals: Complex[] = [];
  const pos: Complex[] = [];
  const neg: Complex[] = [];
  for (const v of sorted) {
    if (Math.abs(v.im) <= tol * cabs(v)) reals.push(complex(v.re));
    else if (v.im > 0) pos.push(v);
    else neg.push(v);
  }
  if (pos.length !== neg.length) throw new RangeError('a complex pole or zero has no conjugate');
  // Within runs of (nearly) equal real part, order by |imaginary part| (the sort above did, but
  // "nearly equal" real parts may not be in that order yet).
  const byImag = (a: Complex, b: Complex) => Math.abs(a.im) - Math.abs(b.im);
  let start = 0;
  for (let i = 1; i <= pos.length; i++) {
    if (i === pos.length || !(pos[i].re - pos[i - 1].re <= tol * cabs(pos[i - 1]))) {
      if (i - start > 1) {
        pos.splice(start, i - start, ...pos.slice(start, i).sort(byImag));
        neg.splice(start, i - start, ...neg.slice(start, i).sort(byImag));
      }
      start = i;
    }
  }
  const pairs = pos.map((p, i) => {
    const n = cconj(neg[i]);
    if (cabs(csub(p, n)) > tol * cabs(neg[i])) throw new RangeError('a complex pole or zero has no conjugate');
    return complex((p.re + n.re) / 2, (p.im + n.im) / 2);
  });
  return [...pairs, ...reals];
}

/** Index of the value closest to the unit circle (the first of equals). */
function worstIndex(values: readonly Complex[], candidates?: readonly number[]): number {
  const list = candidates ?? values.map((_, i) => i);
  let best = list[0];
  let bestDist = Infinity;
  for (const i of list) {
    const d = Math.abs(1 - cabs(values[i]));
    if (d < bestDist) {
      bestDist = d;
      best = i;
    }
  }
  return best;
}

/** Index of the value in `from` closest to `to`, among real, complex or any values. */
function nearestIndex(from: readonly Complex[], to: Complex, which: 'real' | 'complex' | 'any'): number {
  let best = -1;
  let bestDist = Infinity;
  for (let i = 0; i < from.length; i++) {
    if (which === 'real' && !isReal(from[i])) continue;
    if (which === 'complex' && isReal(from[i])) continue;
    const d = cabs(csub(from[i], to));
    if (d < bestDist) {
      bestDist = d;
      best = i;
    }
  }
  if (best < 0) throw new RangeError(`no ${which} zero left to pair with a pole`);
  return best;
}

function take(list: Complex[], i: number): Complex {
  return list.splice(i, 1)[0];
}

/** Coefficients of ∏(x − r) for up to two roots, highest power first, real parts. */
function poly(roots: readonly Complex[]): number[] {
  if (roots.length === 0) return [1];
  if (roots.length === 1) return [1, -roots[0].re];
  const [a, b] = roots;
  return [1, -a.re - b.re, a.re * b.re - a.im * b.im];
}

function writeSection(sos: Float64Array, s: number, zeros: readonly Complex[], poles: readonly Complex[]): void {
  const b = poly(zeros);
  const a = poly(poles);
  for (let i = 0; i < b.length; i++) sos[6 * s + 3 - b.length + i] = b[i];
  for (let i = 0; i < a.length; i++) sos[6 * s + 6 - a.length + i] = a[i];
}

/**
 * Second-order sections of a digital filter: a Float64Array of 6 numbers per section,
 * b0 b1 b2 a0 a1 a2 (a0 = 1), as scipy's `zpk2sos(z, p, k, pairing='nearest')`.
 */
export function zpkToSos(zpk: Zpk): Float64Array {
  let zs: Complex[] = [...zpk.zeros];
  let ps: Complex[] = [...zpk.poles];
  if (zs.length === 0 && ps.length === 0) return Float64Array.of(zpk.gain, 0, 0, 1, 0, 0);
  while (ps.length < zs.length) ps.push(complex(0));
  while (zs.length < ps.length) zs.push(complex(0));
  const nSections = (ps.length + 1) >> 1;
  if (ps.length % 2 === 1) {
    ps.push(complex(0));
    zs.push(complex(0));
  }
  zs = conjugatePairsThenReals(zs);
  ps = conjugatePairsThenReals(ps);
  const realCount = (list: readonly Complex[]) => list.filter(isReal).length;
  const sos = new Float64Array(6 * nSections);
  for (let s = nSections - 1; s >= 0; s--) {
    const p1 = take(ps, worstIndex(ps));
    if (isReal(p1) && realCount(ps) === 0) {
      const z1 = take(zs, nearestIndex(zs, p1, 'real'));
      writeSection(sos, s, [z1, complex(0)], [p1, complex(0)]);
    } else if (ps.length + 1 === zs.length && !isReal(p1) && realCount(ps) === 1 && realCount(zs) === 1) {
      // One real pole and one real zero are left: this pole must take a complex zero pair.
      const z1 = take(zs, nearestIndex(zs, p1, 'complex'));
      writeSection(sos, s, [z1, cconj(z1)], [p1, cconj(p1)]);
    } else {
      let p2: Complex;
      if (isReal(p1)) {
        const realIdx = ps.map((p, i) => (isReal(p) ? i : -1)).filter((i) => i >= 0);
        p2 = take(ps, worstIndex(ps, realIdx));
      } else {
        p2 = cconj(p1);
      }
      if (zs.length > 0) {
        const z1 = take(zs, nearestIndex(zs, p1, 'any'));
        if (!isReal(z1)) writeSection(sos, s, [z1, cconj(z1)], [p1, p2]);
        else if (zs.length > 0) writeSection(sos, s, [z1, take(zs, nearestIndex(zs, p1, 'real'))], [p1, p2]);
        else writeSection(sos, s, [z1], [p1, p2]);
      } else {
        writeSection(sos, s, [], [p1, p2]);
      }
    }
  }
  for (let i = 0; i < 3; i++) sos[i] *= zpk.gain;
  return sos;
}
