import { describe, expect, it } from 'vitest';
import { autocorrelationTime, jointAic, maedaAic, meanRms } from '../../../core/pick/aic';
import { numpy, numpyVersions } from './numpy';

const versions = numpyVersions();

// Maeda (1985): AIC(k) = k log(var(x[1..k])) + (N - k - 1) log(var(x[k+1..N])), computed in numpy
// directly from the formula (np.var of each part, one k at a time: O(N^2), independent of our prefix sums).
const MAEDA = `
outputs = []
for x in inputs:
    N = len(x); a = np.full(N, np.inf)
    for k in range(2, N - 1):
        a[k] = k * np.log(np.var(x[:k])) + (N - k - 1) * np.log(np.var(x[k:]))
    outputs.append(a)
`;

// Test records from numpy's default_rng: noise, then from a known sample noise of larger variance,
// or a decaying 10 Hz wavelet, at 100 Hz; an AR(1) series for the autocorrelation time.
const [stepNoise, wavelet, offset, white, ar1] = numpy(`
from scipy import signal
rng = np.random.default_rng(5)
step = rng.standard_normal(600); step[250:] *= 4.0
t = np.arange(400) / 100.0
w = 0.3 * rng.standard_normal(400); w[180:] += 5 * np.sin(2 * np.pi * 10 * (t[180:] - 1.8)) * np.exp(-(t[180:] - 1.8) / 0.5)
off = 1e4 + rng.standard_normal(500); off[300:] += 3 * rng.standard_normal(200)
white = rng.standard_normal(20000)
ar = signal.lfilter([1.0], [1.0, -0.5], rng.standard_normal(20000))
outputs = [step, w, off, white, ar]
`);
const refs = numpy(MAEDA, [stepNoise, wavelet, offset]);

describe('Maeda AIC', () => {
  const cases: [string, Float64Array, Float64Array, number][] = [
    ['a variance step at sample 250', stepNoise, refs[0], 250],
    ['a wavelet in noise at sample 180', wavelet, refs[1], 180],
    ['a variance step on a large offset (1e4) at sample 300', offset, refs[2], 300],
  ];
  for (const [name, x, want, onset] of cases) {
    it(`maedaAic equals the formula computed by numpy with np.var for ${name} (1e-9 relative; ${versions})`, () => {
      const r = maedaAic(x, 0, x.length);
      for (let k = 2; k <= x.length - 2; k++) {
        expect(Math.abs(r.aic[k] - want[k])).toBeLessThanOrEqual(1e-9 * Math.abs(want[k]) + 1e-9);
      }
      expect(r.aic[0]).toBe(Infinity);
      expect(r.aic[1]).toBe(Infinity);
      // The minimum is numpy's argmin and lies at the onset (within 3 samples).
      let best = 2;
      for (let k = 2; k <= x.length - 2; k++) if (want[k] < want[best]) best = k;
      expect(r.k).toBe(best);
      expect(Math.abs(r.k - onset)).toBeLessThanOrEqual(3);
      expect(r.minimum).toBe(r.aic[r.k]);
    });
  }

  it('a window inside the array gives the same curve as the same samples copied out', () => {
    const a = maedaAic(stepNoise, 100, 400);
    const b = maedaAic(stepNoise.slice(100, 400), 0, 300);
    expect(Array.from(a.aic)).toEqual(Array.from(b.aic));
    expect(a.k).toBe(150);
  });

  it('a noise-free lead-in (exact zeros) puts the minimum at the first non-zero sample', () => {
    const x = new Float64Array(200);
    for (let i = 120; i < 200; i++) x[i] = Math.sin(0.7 * (i - 120) + 0.3);
    expect(maedaAic(x, 0, 200).k).toBe(120);
  });

  it('jointAic is the sum of the channels\' curves (log-likelihoods of independent channels add)', () => {
    const j = jointAic([stepNoise.subarray(0, 400), wavelet], 0, 400);
    const a = maedaAic(stepNoise, 0, 400);
    const b = maedaAic(wavelet, 0, 400);
    for (let k = 2; k <= 398; k++) expect(j.aic[k]).toBeCloseTo(a.aic[k] + b.aic[k], 9);
  });

  it('rejects a window outside the array or too short, naming the window', () => {
    expect(() => maedaAic(stepNoise, -1, 10)).toThrow(/AIC window \[-1, 10\) must lie within 0\.\.600/);
    expect(() => maedaAic(stepNoise, 0, 4)).toThrow(RangeError);
    expect(() => jointAic([], 0, 10)).toThrow(/at least one channel/);
  });
});

describe('autocorrelation time', () => {
  it('is about 1 for white noise (numpy default_rng normal deviates)', () => {
    expect(autocorrelationTime(white, 0, white.length)).toBeGreaterThan(0.9);
    expect(autocorrelationTime(white, 0, white.length)).toBeLessThan(1.1);
  });

  it('is about (1 + phi)/(1 - phi) = 3 for an AR(1) series with phi = 0.5 (rho(k) = phi^k; series from scipy.signal.lfilter)', () => {
    // The estimate stops at the first non-positive coefficient, which drops the small tail: within 10 %.
    const tau = autocorrelationTime(ar1, 0, ar1.length);
    expect(tau).toBeGreaterThan(2.7);
    expect(tau).toBeLessThan(3.3);
  });

  it('is 1 for a constant or very short record', () => {
    expect(autocorrelationTime(new Float64Array(50).fill(2), 0, 50)).toBe(1);
    expect(autocorrelationTime(white, 0, 3)).toBe(1);
  });

  it('meanRms gives the mean and the RMS about it', () => {
    const [m, r] = meanRms(new Float64Array([1, 2, 3, 4]), 0, 4);
    expect(m).toBe(2.5);
    expect(r).toBeCloseTo(Math.sqrt(1.25), 15);
  });
});
