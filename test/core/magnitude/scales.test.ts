import { describe, expect, it } from 'vitest';
import {
  amplitudeInScaleUnits, calibratedScale, distanceCorrection, HUTTON_BOORE_1987, IASPEI_2013, localMagnitudeOf, RICHTER_1935, RICHTER_TABLE, richterMinusLogA0,
} from '../../../core/magnitude/scales';
import { WOOD_ANDERSON_2080, WOOD_ANDERSON_2800 } from '../../../core/magnitude/woodAnderson';

describe('IASPEI (2013) ML, eq. (1): ML = log10 A + 1.11 log10 R + 0.00189 R - 2.09 (A nm at magnification 1, R hypocentral km)', () => {
  it('gives log10 A + 0.319 at 100 km (hand-computed: 2.22 + 0.189 - 2.09)', () => {
    expect(localMagnitudeOf(IASPEI_2013, 1e-9, 100)).toBeCloseTo(0.319, 12);
    expect(localMagnitudeOf(IASPEI_2013, 250e-9, 100)).toBeCloseTo(Math.log10(250) + 0.319, 12);
  });
  it("gives ML 3.00 for a 1 mm trace on the V = 2080 instrument at 100 km: Richter's definition of ML 3 (to 0.002)", () => {
    expect(Math.abs(localMagnitudeOf(IASPEI_2013, 1e-3 / 2080, 100) - 3)).toBeLessThan(0.002);
  });
  it('is paired with the V = 2080 Wood-Anderson and takes hypocentral distance', () => {
    expect(IASPEI_2013.standard).toBe(WOOD_ANDERSON_2080);
    expect(IASPEI_2013.distance).toBe('hypocentral');
  });
});

describe('Hutton & Boore (1987): -log A0 = 1.110 log10(r/100) + 0.00189 (r - 100) + 3.0 (A mm, V = 2080)', () => {
  it('is 3.0 at 100 km and 1.11·log10(0.1) - 0.1701 + 3 = 1.7199 at 10 km (hand-computed)', () => {
    expect(distanceCorrection(HUTTON_BOORE_1987, 100)).toBe(3);
    expect(distanceCorrection(HUTTON_BOORE_1987, 10)).toBeCloseTo(-1.11 - 0.1701 + 3, 12);
  });
  it('agrees with the IASPEI form to 0.002 from 1 to 1000 km when A is simulated at V = 2080 (the -2.09 constant carries 2080)', () => {
    for (let r = 1; r <= 1000; r *= 1.5) {
      const a = 3e-7;
      expect(Math.abs(localMagnitudeOf(HUTTON_BOORE_1987, a, r) - localMagnitudeOf(IASPEI_2013, a, r))).toBeLessThan(0.002);
    }
  });
});

describe("Richter (1935) -log A0 table (Richter 1958, Table 22-1; values from memory), paired with V = 2800", () => {
  it('gives ML 3 for 1 mm on the V = 2800 instrument at 100 km epicentral (the definition)', () => {
    expect(RICHTER_1935.standard).toBe(WOOD_ANDERSON_2800);
    expect(localMagnitudeOf(RICHTER_1935, 1e-3 / 2800, 100)).toBeCloseTo(3, 12);
  });
  it('interpolates linearly between entries and is non-decreasing over 0-600 km', () => {
    expect(richterMinusLogA0(215)).toBeCloseTo(3.625, 12);
    expect(richterMinusLogA0(0)).toBe(1.4);
    expect(richterMinusLogA0(600)).toBe(4.9);
    for (let i = 1; i < RICHTER_TABLE.length; i++) expect(RICHTER_TABLE[i][1]).toBeGreaterThanOrEqual(RICHTER_TABLE[i - 1][1]);
  });
  it('stays within 0.15 of the Hutton & Boore curve from 50 to 250 km (the table is rounded to 0.1; both rest on Californian records)', () => {
    for (let km = 50; km <= 250; km += 5) {
      expect(Math.abs(richterMinusLogA0(km) - distanceCorrection(HUTTON_BOORE_1987, km))).toBeLessThan(0.15);
    }
  });
  it('rejects distances beyond 600 km, naming the range', () => {
    expect(() => distanceCorrection(RICHTER_1935, 650)).toThrow(/Richter1935: epicentral distance must be in \[0, 600\] km, got 650/);
  });
});

describe('amplitude units and local calibrations', () => {
  it('converts ground-equivalent metres to nm, or to mm of trace at the paired magnification', () => {
    expect(amplitudeInScaleUnits(IASPEI_2013, 1e-9)).toBeCloseTo(1, 12);
    expect(amplitudeInScaleUnits(RICHTER_1935, 1e-6)).toBeCloseTo(2.8, 12);
    expect(amplitudeInScaleUnits(HUTTON_BOORE_1987, 1e-6)).toBeCloseTo(2.08, 12);
  });
  it('a calibration with the IASPEI coefficients (a 1.11, b 0.00189, c -2.09) reproduces the IASPEI scale', () => {
    const cal = calibratedScale({ name: 'local', a: 1.11, b: 0.00189, c: -2.09 });
    for (const r of [3, 30, 300]) expect(localMagnitudeOf(cal, 4e-8, r)).toBeCloseTo(localMagnitudeOf(IASPEI_2013, 4e-8, r), 12);
  });
  it('station corrections add to the magnitude', () => {
    expect(localMagnitudeOf(IASPEI_2013, 4e-8, 30, -0.15)).toBeCloseTo(localMagnitudeOf(IASPEI_2013, 4e-8, 30) - 0.15, 12);
  });
  it('rejects non-finite coefficients and non-positive amplitudes', () => {
    expect(() => calibratedScale({ name: 'x', a: NaN, b: 0, c: 0 })).toThrow(/coefficient a must be finite, got NaN/);
    expect(() => localMagnitudeOf(IASPEI_2013, 0, 10)).toThrow(/amplitude must be > 0 m, got 0/);
  });
});
