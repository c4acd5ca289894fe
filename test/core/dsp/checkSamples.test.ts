import { describe, expect, it } from 'vitest';
import { checkSamples, outputArray } from '../../../core/dsp/checkSamples';

describe('checkSamples', () => {
  it('accepts the three sample array types and refuses anything else with a TypeError naming the argument', () => {
    for (const x of [new Float64Array(2), new Float32Array(2), new Int32Array(2)]) expect(() => checkSamples(x)).not.toThrow();
    expect(() => checkSamples(new Int16Array(2) as unknown as Int32Array, 'trace')).toThrow(/trace must be a Float64Array, Float32Array or Int32Array/);
    expect(() => checkSamples([1, 2] as unknown as Float64Array)).toThrow(TypeError);
  });

  it('outputArray returns a new zeroed array, or the given one when its length matches', () => {
    expect(Array.from(outputArray(3))).toEqual([0, 0, 0]);
    const out = new Float64Array(4);
    expect(outputArray(4, out)).toBe(out);
    expect(() => outputArray(4, new Float64Array(5))).toThrow(/length 4, got length 5/);
    expect(() => outputArray(2, new Float32Array(2) as unknown as Float64Array)).toThrow(RangeError);
  });
});
