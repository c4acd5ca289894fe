import { describe, expect, it } from 'vitest';
import { type Corners, type FilterKind, butterworth, butterworthZpk, checkFilterSpec } from '../../../core/dsp/butterworth';
import { cabs } from '../../../core/dsp/complex';
import { sosMagnitude } from '../../../core/dsp/sosMagnitude';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff } from './signals';

// Reference: scipy.signal.butter(N, Wn, btype, fs=fs, output='sos'|'zpk') in the machine's python3
// (scipy 1.17.1 and numpy 2.4.6 when written; the versions in use are asserted below). One python run
// for the whole file.

interface Design { order: number; corners: Corners; kind: FilterKind; fs: number }

const designs: Design[] = [];
for (const fs of [40, 100, 200, 500]) {
  const ny = fs / 2;
  for (let order = 1; order <= 8; order++) {
    designs.push({ order, corners: 0.2 * ny, kind: 'lowpass', fs });
    designs.push({ order, corners: 0.95 * ny, kind: 'lowpass', fs });
    designs.push({ order, corners: 1, kind: 'highpass', fs });
    designs.push({ order, corners: 0.02, kind: 'highpass', fs });
    designs.push({ order, corners: [1, 0.45 * ny], kind: 'bandpass', fs });
    designs.push({ order, corners: [0.05, 0.9 * ny], kind: 'bandpass', fs });
    designs.push({ order, corners: [0.4 * ny, 0.5 * ny], kind: 'bandpass', fs });
  }
}

const ref = scipyReference([
  { op: 'versions' },
  ...designs.map((d) => ({ op: 'butter', ...d })),
  ...designs.map((d) => ({ op: 'butter_zpk', ...d })),
]);
const versions = ref[0] as { scipy: string; numpy: string };
const refSos = ref.slice(1, 1 + designs.length) as number[][];
const refZpk = ref.slice(1 + designs.length) as { z: number[][]; p: number[][]; k: number }[];

function label(d: Design): string {
  return `${d.kind} order ${d.order} ${JSON.stringify(d.corners)} Hz at ${d.fs} Hz`;
}

/** The bilinear-transformed Butterworth low-pass magnitude: 1/sqrt(1 + (tan(πf/fs)/tan(πfc/fs))^(2n)). */
function textbookLowpass(f: number, fc: number, fs: number, n: number): number {
  return 1 / Math.sqrt(1 + (Math.tan((Math.PI * f) / fs) / Math.tan((Math.PI * fc) / fs)) ** (2 * n));
}

describe('butterworth', () => {
  it('is checked against scipy 1.17 / numpy 2.4 (the reference the tolerances were set with)', () => {
    expect(versions.scipy.split('.').slice(0, 2).join('.')).toBe('1.17');
    expect(versions.numpy.split('.')[0]).toBe('2');
  });

  it('gives scipy\'s sections one by one (same pairing, same gain placement) to 1e-12, orders 1-8, three kinds, 40-500 Hz', () => {
    designs.forEach((d, i) => {
      const sos = butterworth(d.order, d.corners, d.kind, d.fs);
      expect(sos.length, label(d)).toBe(refSos[i].length);
      for (let s = 0; s < sos.length / 6; s++) {
        // Numerator (holds the gain in section 0) and denominator each relative to its own size.
        const b = relDiff(sos, refSos[i], 6 * s, 6 * s + 3);
        const a = relDiff(sos, refSos[i], 6 * s + 3, 6 * s + 6);
        expect(Math.max(a, b), `${label(d)} section ${s}`).toBeLessThan(1e-12);
      }
    });
  });

  it('has the number of sections scipy gives: ceil(N/2) for low/high-pass, N for band-pass', () => {
    expect(butterworth(5, 10, 'lowpass', 100).length / 6).toBe(3);
    expect(butterworth(8, 1, 'highpass', 100).length / 6).toBe(4);
    expect(butterworth(4, [1, 20], 'bandpass', 100).length / 6).toBe(4);
    expect(butterworth(1, [1, 20], 'bandpass', 100).length / 6).toBe(1);
  });

  it('puts its poles where scipy does and all strictly inside the unit circle', () => {
    designs.forEach((d, i) => {
      const zpk = butterworthZpk(d.order, d.corners, d.kind, d.fs);
      const mine = zpk.poles.map((p) => cabs(p)).sort((x, y) => x - y);
      const theirs = refZpk[i].p.map(([re, im]) => Math.hypot(re, im)).sort((x, y) => x - y);
      expect(mine.length).toBe(theirs.length);
      mine.forEach((r, j) => expect(Math.abs(r - theirs[j]), label(d)).toBeLessThan(1e-13));
      for (const r of mine) expect(r, label(d)).toBeLessThan(1);
      expect(Math.abs(zpk.gain - refZpk[i].k) / refZpk[i].k, label(d)).toBeLessThan(1e-12);
    });
  });

  it('has unit gain in the passband and 1/sqrt(2) at each corner (-3 dB), to 1e-12 (looser as poles near z = 1 make the evaluation ill-conditioned)', () => {
    for (const d of designs) {
      const sos = butterworth(d.order, d.corners, d.kind, d.fs);
      // Evaluating |A(e^iω)| near a pole at distance δ from the unit circle loses about eps/δ² relative.
      const delta = 1 - Math.max(...butterworthZpk(d.order, d.corners, d.kind, d.fs).poles.map(cabs));
      const tol = Math.max(1e-12, 1e-16 / delta ** 2);
      const c = checkFilterSpec(d.order, d.corners, d.kind, d.fs);
      let pass: number;
      if (d.kind === 'lowpass') pass = 0;
      else if (d.kind === 'highpass') pass = d.fs / 2;
      else {
        // The analog centre sqrt(w1·w2) of the pre-warped corners, mapped back: the frequency of unit gain.
        const w = c.map((f) => Math.tan((Math.PI * f) / d.fs));
        pass = (d.fs / Math.PI) * Math.atan(Math.sqrt(w[0] * w[1]));
      }
      const [gPass, ...gCorners] = sosMagnitude(sos, [pass, ...c], d.fs);
      expect(Math.abs(gPass - 1), label(d)).toBeLessThan(tol);
      for (const g of gCorners) expect(Math.abs(g - Math.SQRT1_2), label(d)).toBeLessThan(tol);
    }
  });

  // Textbook form: the Butterworth squared magnitude 1/(1 + (Ω/Ωc)^(2N)) under the bilinear map
  // Ω = (2/T)·tan(ω/2) — Oppenheim & Schafer, Discrete-Time Signal Processing (3rd ed.), section 7.3,
  // bilinear transformation, with its Butterworth design example (cited from memory, page not checked).
  it('has the low-pass magnitude 1/sqrt(1 + (tan(pi f/fs)/tan(pi fc/fs))^(2n)) of the bilinear-transformed Butterworth form, to 1e-12', () => {
    for (const d of designs.filter((x) => x.kind === 'lowpass')) {
      const fc = d.corners as number;
      const sos = butterworth(d.order, fc, d.kind, d.fs);
      const freqs = Array.from({ length: 64 }, (_, i) => (i / 64) * (d.fs / 2));
      const mag = sosMagnitude(sos, freqs, d.fs);
      freqs.forEach((f, i) => expect(Math.abs(mag[i] - textbookLowpass(f, fc, d.fs, d.order)), `${label(d)} at ${f} Hz`).toBeLessThan(1e-12));
    }
  });

  it('refuses a corner at or above the Nyquist frequency, naming the value and the allowed range', () => {
    expect(() => butterworth(4, 20, 'lowpass', 40)).toThrow(RangeError);
    expect(() => butterworth(4, 20, 'lowpass', 40)).toThrow(/20 Hz .*0 < f < 20 Hz/);
    expect(() => butterworth(4, [1, 45], 'bandpass', 40)).toThrow(/45 Hz .*0 < f < 20 Hz/);
    expect(() => butterworth(4, 0, 'highpass', 40)).toThrow(/0 Hz .*0 < f < 20 Hz/);
  });

  it('refuses orders outside 1-8, decreasing band corners, bad kinds and bad sample rates', () => {
    expect(() => butterworth(0, 1, 'lowpass', 100)).toThrow(/order .*1 to 8, got 0/);
    expect(() => butterworth(9, 1, 'lowpass', 100)).toThrow(/1 to 8, got 9/);
    expect(() => butterworth(2.5, 1, 'lowpass', 100)).toThrow(RangeError);
    expect(() => butterworth(2, [5, 1], 'bandpass', 100)).toThrow(/increasing/);
    expect(() => butterworth(2, 5, 'bandpass', 100)).toThrow(TypeError);
    expect(() => butterworth(2, [1, 5], 'lowpass', 100)).toThrow(TypeError);
    expect(() => butterworth(2, 5, 'notch' as FilterKind, 100)).toThrow(TypeError);
    expect(() => butterworth(2, 5, 'lowpass', -100)).toThrow(/sample rate .*above 0, got -100/);
  });
});
