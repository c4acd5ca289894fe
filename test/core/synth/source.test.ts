import { describe, expect, it } from 'vitest';
import { bruneCornerFrequency, brunePulse, bruneSpectrum, momentFromMagnitude } from '../../../core/synth/source';
import { synthesizePulse } from '../../../core/synth/pulse';
import { python } from './python';

describe('source', () => {
  it('momentFromMagnitude follows IASPEI (2013) / Hanks & Kanamori (1979): Mw 6 is 10^18.1 N·m, one unit is 10^1.5', () => {
    expect(momentFromMagnitude(6)).toBeCloseTo(10 ** 18.1, -14);
    expect(momentFromMagnitude(3) / momentFromMagnitude(2)).toBeCloseTo(10 ** 1.5, 9);
    expect(() => momentFromMagnitude(12)).toThrow(RangeError);
  });

  it("bruneCornerFrequency (SI) equals Brune's form as usually quoted in CGS units, fc = 4.906e6 β (Δσ/M0)^(1/3) with β km/s, Δσ bar, M0 dyne·cm", () => {
    // Brune (1970), J. Geophys. Res. 75, 4997; the CGS constant as quoted in e.g. Boore (1983), BSSA 73, 1865 (from memory).
    for (const [m0, dsPa, beta] of [[1e13, 3e6, 3500], [4e10, 1e6, 3200], [1e17, 10e6, 3700]]) {
      const cgs = 4.906e6 * (beta / 1000) * ((dsPa / 1e5) / (m0 * 1e7)) ** (1 / 3);
      expect(bruneCornerFrequency(m0, dsPa, beta) / cgs).toBeCloseTo(1, 3);
    }
  });

  it('bruneCornerFrequency scales as M0^(-1/3): a thousand times the moment lowers fc tenfold', () => {
    expect(bruneCornerFrequency(1e12, 3e6, 3500) / bruneCornerFrequency(1e15, 3e6, 3500)).toBeCloseTo(10, 9);
  });

  it('bruneSpectrum is 1 at f=0, 1/2 at the corner and falls as f^-2 far above it', () => {
    expect(bruneSpectrum(0, 5)).toBe(1);
    expect(bruneSpectrum(5, 5)).toBe(0.5);
    expect(bruneSpectrum(500, 5) / bruneSpectrum(1000, 5)).toBeCloseTo(4, 2);
  });

  it('the synthesized displacement pulse (no attenuation) has, by numpy.fft, half its low-frequency level at fc and an f^-2 fall-off', () => {
    const fs = 100, n = 8192, fc = 2;
    const x = synthesizePulse({ sampleRate: fs, n, cornerHz: fc, tStar: 0, delaySamples: 0, output: { kind: 'displacement' } });
    const r = python<{ dc: number; atFc: number; at8: number; at16: number }>(`
x = np.array(inp['x']); fs = inp['fs']
X = np.abs(np.fft.rfft(x)) / fs
f = np.fft.rfftfreq(len(x), 1/fs)
at = lambda q: float(np.interp(q, f, X))
print(json.dumps({'dc': float(X[0]), 'atFc': at(inp['fc']), 'at8': at(8*inp['fc']), 'at16': at(16*inp['fc'])}))`, { x, fs, fc });
    expect(r.dc).toBeCloseTo(1, 3); // unit area
    expect(r.atFc / r.dc).toBeCloseTo(0.5, 2);
    expect(r.at8 / r.at16).toBeCloseTo(bruneSpectrum(8 * fc, fc) / bruneSpectrum(16 * fc, fc), 1);
  });

  it('the synthesized pulse matches the causal time function (2π fc)² t exp(-2π fc t) to 0.5 % of its peak', () => {
    const fs = 200, n = 8192, fc = 1.5, delay = 0.37;
    const x = synthesizePulse({ sampleRate: fs, n, cornerHz: fc, tStar: 0, delaySamples: delay, output: { kind: 'displacement' } });
    const peak = brunePulse(1 / (2 * Math.PI * fc), fc);
    for (let i = 0; i < 2000; i++) expect(Math.abs(x[i] - brunePulse((i - delay) / fs, fc))).toBeLessThan(0.005 * peak);
  });
});
