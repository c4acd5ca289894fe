/** Argument checks shared by the public entry points of core/dsp. */
import type { SampleArray } from '../model';

/** Throws a TypeError unless `x` is one of the sample array types (Float64Array, Float32Array, Int32Array). */
export function checkSamples(x: SampleArray, name = 'samples'): void {
  if (!(x instanceof Float64Array || x instanceof Float32Array || x instanceof Int32Array)) {
    throw new TypeError(`${name} must be a Float64Array, Float32Array or Int32Array`);
  }
}

/**
 * Returns `out`, or a new Float64Array of `length` when `out` is absent; throws a RangeError when
 * `out` is not a Float64Array of that length.
 */
export function outputArray(length: number, out?: Float64Array): Float64Array {
  if (out === undefined) return new Float64Array(length);
  if (!(out instanceof Float64Array) || out.length !== length) {
    throw new RangeError(`output must be a Float64Array of the input's length ${length}, got length ${(out as { length?: number }).length}`);
  }
  return out;
}
