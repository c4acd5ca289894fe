import { describe, expect, it } from 'vitest';
import { codaDuration, durationMagnitude, LEE_BENNETT_MEAGHER_1972 } from '../../../core/magnitude/durationMagnitude';

const T = 1_700_000_000_000_000;

describe('durationMagnitude, Lee, Bennett & Meagher (1972): MD = -0.87 + 2.00 log10 τ + 0.0035 Δ (from memory)', () => {
  it('gives 3.305 for τ 100 s at 50 km and 1.13 + 0.0035 for τ 10 s at 1 km (hand-computed)', () => {
    expect(durationMagnitude(100, 50)).toBeCloseTo(-0.87 + 4 + 0.175, 12);
    expect(durationMagnitude(10, 1)).toBeCloseTo(-0.87 + 2 + 0.0035, 12);
    expect(LEE_BENNETT_MEAGHER_1972).toMatchObject({ a: -0.87, b: 2, c: 0.0035 });
  });
  it('takes local coefficients in the same form', () => {
    expect(durationMagnitude(30, 20, { name: 'local', a: -1, b: 2.2, c: 0.001 })).toBeCloseTo(-1 + 2.2 * Math.log10(30) + 0.02, 12);
  });
  it('rejects non-positive durations and negative distances', () => {
    expect(() => durationMagnitude(0, 10)).toThrow(/duration must be > 0 s, got 0/);
    expect(() => durationMagnitude(10, -1)).toThrow(/epicentral distance must be >= 0 km, got -1/);
  });
});

describe('codaDuration', () => {
  it('ends an exponential coda where its RMS reaches twice the noise RMS: t = P + T·ln(A/(√6 σ)) in closed form (within 0.15 s)', () => {
    // Noise: a 7.5 Hz sinusoid of RMS σ = 1; coda: A·exp(−(t − P)/T)·sin(2π·5t), A 1000, T 10 s.
    // (2 s windows hold whole cycles of both and of their 2.5 Hz beat, so the cross term averages out.)
    // RMS² = σ² + E²/2 = (2σ)² gives E = √6·σ, so the end lies T·ln(1000/√6) = 60.12 s after P.
    const fs = 50, n = 100 * fs, pS = 10, tau = 10, a = 1000;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = i / fs;
      x[i] = Math.SQRT2 * Math.sin(2 * Math.PI * 7.5 * t) + (t >= pS ? a * Math.exp(-(t - pS) / tau) * Math.sin(2 * Math.PI * 5 * t) : 0);
    }
    const c = codaDuration(x, fs, T, T + pS * 1e6);
    expect(c).not.toBeNull();
    expect(c?.noiseRms).toBeCloseTo(1, 2);
    expect(Math.abs((c?.durationS ?? 0) - tau * Math.log(a / Math.sqrt(6)))).toBeLessThan(0.15);
  });
  it('returns null when the coda outlasts the trace or the noise window starts before it', () => {
    const x = new Float64Array(1000).fill(0).map((_, i) => (i > 500 ? 100 : 1) * Math.sin(i));
    expect(codaDuration(x, 50, T, T + 10e6)).toBeNull();
    expect(codaDuration(x, 50, T, T + 2e6)).toBeNull();
  });
});
