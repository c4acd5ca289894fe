/**
 * Characteristic functions (CF) for STA/LTA: a non-negative sequence that grows when a seismic signal
 * arrives. The STA/LTA averages a CF, never the raw samples.
 *
 * - `energy`: x[i]^2 (squared amplitude).
 * - `absolute`: |x[i]|.
 * - `envelope`: x[i]^2 + K (x[i] - x[i-1])^2, the form of Allen (1978, "Automatic earthquake recognition
 *   and timing from single traces", BSSA 68(5), 1521-1532; the form from memory). Allen leaves the
 *   weight K to the station; Daybreak sets it so both terms weigh the same for a sine of a reference
 *   frequency f: the first difference of A sin(2 pi f t) sampled at fs has amplitude about
 *   A 2 pi f / fs, so K = (fs / (2 pi f))^2 makes the CF of that sine about A^2 everywhere: an envelope
 *   without the zero crossings of x^2.
 *
 * The input should be band-passed first (core/dsp): a DC offset would dominate every CF. Samples must
 * be finite: a NaN would stay in the recursive averages for good (the hot loops do not test for it).
 */
import type { SampleArray } from '../model';

export type CharacteristicFunction = 'energy' | 'absolute' | 'envelope';

export const CHARACTERISTIC_FUNCTIONS: readonly CharacteristicFunction[] = ['energy', 'absolute', 'envelope'];

/** The envelope CF's weight K for a sample rate (Hz) and a reference frequency (Hz). */
export function envelopeWeight(sampleRate: number, referenceFrequency: number): number {
  const r = sampleRate / (2 * Math.PI * referenceFrequency);
  return r * r;
}

/**
 * Writes the CF of x[from..to) into out[0..to-from). `previous` is the sample before x[from] (used by
 * the envelope CF only; pass x[from] at the start of data so the first difference is zero).
 * Inner loop: no checks.
 */
export function characteristicInto(
  kind: CharacteristicFunction, x: SampleArray, from: number, to: number, out: Float64Array,
  previous: number, weight: number,
): void {
  const n = to - from;
  if (kind === 'energy') {
    for (let i = 0; i < n; i++) {
      const v = x[from + i];
      out[i] = v * v;
    }
  } else if (kind === 'absolute') {
    for (let i = 0; i < n; i++) out[i] = Math.abs(x[from + i]);
  } else {
    let prev = previous;
    for (let i = 0; i < n; i++) {
      const v = x[from + i];
      const d = v - prev;
      out[i] = v * v + weight * d * d;
      prev = v;
    }
  }
}
