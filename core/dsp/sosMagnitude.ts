/** Magnitude response of second-order sections, for showing a filter and for checking designs. */
import { checkSampleRate } from './butterworth';
import { sectionCount } from './sosfilt';

/**
 * |H(f)| of the cascade `sos` at each frequency in `frequencies` (Hz) for `sampleRate` (Hz):
 * the product over sections of |b0 + b1·e^(−iω) + b2·e^(−2iω)| / |1 + a1·e^(−iω) + a2·e^(−2iω)|,
 * ω = 2π·f/fs. Dimensionless (1 = unchanged amplitude).
 */
export function sosMagnitude(sos: Float64Array, frequencies: ArrayLike<number>, sampleRate: number): Float64Array {
  const sections = sectionCount(sos);
  checkSampleRate(sampleRate);
  const out = new Float64Array(frequencies.length);
  for (let j = 0; j < frequencies.length; j++) {
    const w = (2 * Math.PI * frequencies[j]) / sampleRate;
    const c1 = Math.cos(w), s1 = -Math.sin(w), c2 = Math.cos(2 * w), s2 = -Math.sin(2 * w);
    let mag = 1;
    for (let s = 0; s < sections; s++) {
      const k = 6 * s;
      const nr = sos[k] + sos[k + 1] * c1 + sos[k + 2] * c2;
      const ni = sos[k + 1] * s1 + sos[k + 2] * s2;
      const dr = sos[k + 3] + sos[k + 4] * c1 + sos[k + 5] * c2;
      const di = sos[k + 4] * s1 + sos[k + 5] * s2;
      mag *= Math.hypot(nr, ni) / Math.hypot(dr, di);
    }
    out[j] = mag;
  }
  return out;
}
