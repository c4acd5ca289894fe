import { describe, expect, it } from 'vitest';
import { distanceTerm, localMagnitude, WOOD_ANDERSON_GAIN, woodAndersonAmplitudeNm, woodAndersonResponse } from '../../../core/synth/mlLaw';

describe('mlLaw (IASPEI 2013 standard form, Hutton & Boore 1987 coefficients)', () => {
  it('ML 3 at 100 km is about 1 mm on a Wood-Anderson of magnification 2080 (Richter 1935 anchor)', () => {
    const mm = woodAndersonAmplitudeNm(3, 100) * 1e-6 * WOOD_ANDERSON_GAIN;
    expect(Math.abs(mm - 1)).toBeLessThan(0.01);
  });

  it('equals Hutton & Boore (1987): ML = log10 A_mm + 1.11 log10(r/100) + 0.00189 (r - 100) + 3.0, with A_mm = A_nm · 2080e-6', () => {
    for (const r of [5, 12.3, 40, 100, 250, 600]) {
      for (const a of [3, 250, 1.2e5]) {
        const hb = Math.log10(a * 2080e-6) + 1.11 * Math.log10(r / 100) + 0.00189 * (r - 100) + 3.0;
        expect(Math.abs(localMagnitude(a, r) - hb)).toBeLessThan(0.002);
      }
    }
  });

  it('has the IASPEI numbers: -log A0 at 10 km = 1.11 + 0.0189 - 2.09', () => {
    expect(distanceTerm(10)).toBeCloseTo(1.11 + 0.0189 - 2.09, 12);
  });

  it('woodAndersonAmplitudeNm inverts localMagnitude', () => {
    expect(localMagnitude(woodAndersonAmplitudeNm(1.7, 33), 33)).toBeCloseTo(1.7, 12);
  });

  it('the simulated Wood-Anderson has gain 1 at high frequency and 1/(2h) = 1/1.4 at its 1.25 Hz natural frequency', () => {
    const hi = woodAndersonResponse(200);
    expect(Math.hypot(hi.re, hi.im)).toBeCloseTo(1, 3);
    const at = woodAndersonResponse(1.25);
    expect(Math.hypot(at.re, at.im)).toBeCloseTo(1 / 1.4, 9);
  });

  it('rejects a distance outside (0, 1000] km and a non-positive amplitude', () => {
    expect(() => distanceTerm(0)).toThrow(/hypocentral distance must be in \(0, 1000\] km/);
    expect(() => localMagnitude(0, 10)).toThrow(RangeError);
  });
});
