import { describe, expect, it } from 'vitest';
import { applyPolarity, verticalPolarity } from '../../../core/dsp/polarity';

// Reference: SEED Reference Manual v2.4, blockette 52 field 15 (dip, degrees down from horizontal:
// a vertical with positive output for upward motion has dip -90) and FDSN StationXML 1.2
// (Channel Dip, and InstrumentSensitivity Value, whose sign says whether counts follow the motion) —
// cited from memory.

describe('polarity', () => {
  it('a vertical with dip -90 and positive sensitivity is up-positive already (factor +1)', () => {
    expect(verticalPolarity(-90, 6.3e8)).toBe(1);
  });

  it('dip +90 (down-positive) or a negative sensitivity flips the polarity; both together cancel', () => {
    expect(verticalPolarity(90, 6.3e8)).toBe(-1);
    expect(verticalPolarity(-90, -6.3e8)).toBe(-1);
    expect(verticalPolarity(90, -6.3e8)).toBe(1);
  });

  it('applyPolarity multiplies the samples by the factor', () => {
    expect(Array.from(applyPolarity(Int32Array.of(3, -7, 0), -1))).toEqual([-3, 7, -0]);
    const x = Float64Array.of(1.5, -2);
    expect(applyPolarity(x, 1, x)).toBe(x);
  });

  it('refuses a channel that is not vertical, a zero sensitivity and a factor other than ±1', () => {
    expect(() => verticalPolarity(0, 1)).toThrow(/within 30 degrees of ±90, got 0/);
    expect(() => verticalPolarity(120, 1)).toThrow(/from -90 to 90 degrees, got 120/);
    expect(() => verticalPolarity(-90, 0)).toThrow(/non-zero number, got 0/);
    expect(() => applyPolarity(Float64Array.of(1), 2 as 1)).toThrow(/1 or -1, got 2/);
  });
});
