/**
 * The earthquake source: seismic moment from magnitude, Brune's corner frequency and the
 * omega-square far-field displacement pulse.
 *
 * References:
 * - Moment magnitude: IASPEI (2013) standard, Mw = (log10 M0 - 9.1) / 1.5 with M0 in N·m
 *   (Hanks & Kanamori 1979, J. Geophys. Res. 84, 2348, in SI units).
 * - Corner frequency: Brune (1970), J. Geophys. Res. 75, 4997: fc = 2.34 β / (2π r) with source
 *   radius r = (7 M0 / (16 Δσ))^(1/3), i.e. fc = 0.4906 β (Δσ / M0)^(1/3) in SI units.
 * - Spectrum: |Ω(f)| = Ω0 / (1 + (f/fc)²) (the omega-square model). Its causal time function is
 *   u(t) = (2π fc)² t exp(-2π fc t) for t ≥ 0 (unit area), whose Fourier transform is
 *   1 / (1 + i f/fc)²: a double real pole, so the pulse starts at t = 0 and has no precursor.
 *
 * In the scenario ML is taken equal to Mw for the corner frequency only (common practice for
 * small events as an approximation); amplitudes follow the stated local-magnitude law (mlLaw.ts).
 */

/** Stress drop used by the scenario, Pa (3 MPa: a typical value for crustal earthquakes, common practice). */
export const SCENARIO_STRESS_DROP_PA = 3e6;

/** Seismic moment for a moment magnitude, N·m (IASPEI 2013: log10 M0 = 1.5 Mw + 9.1). */
export function momentFromMagnitude(mw: number): number {
  if (!Number.isFinite(mw) || mw < -3 || mw > 10) throw new RangeError(`magnitude must be in [-3, 10], got ${mw}`);
  return 10 ** (1.5 * mw + 9.1);
}

/**
 * Brune (1970) corner frequency, Hz.
 * @param momentNm seismic moment, N·m
 * @param stressDropPa stress drop, Pa
 * @param shearSpeedMs shear-wave speed at the source, m/s
 */
export function bruneCornerFrequency(momentNm: number, stressDropPa: number, shearSpeedMs: number): number {
  if (!(momentNm > 0)) throw new RangeError(`moment must be > 0 N·m, got ${momentNm}`);
  if (!(stressDropPa > 0)) throw new RangeError(`stress drop must be > 0 Pa, got ${stressDropPa}`);
  if (!(shearSpeedMs > 0)) throw new RangeError(`shear speed must be > 0 m/s, got ${shearSpeedMs}`);
  const radius = Math.cbrt((7 * momentNm) / (16 * stressDropPa));
  return (2.34 * shearSpeedMs) / (2 * Math.PI * radius);
}

/** Omega-square amplitude spectrum relative to its low-frequency level: 1 / (1 + (f/fc)²). */
export function bruneSpectrum(frequencyHz: number, cornerHz: number): number {
  const r = frequencyHz / cornerHz;
  return 1 / (1 + r * r);
}

/** Brune's far-field displacement pulse with unit area, at `t` seconds after its onset (0 before). */
export function brunePulse(t: number, cornerHz: number): number {
  if (t <= 0) return 0;
  const w = 2 * Math.PI * cornerHz;
  return w * w * t * Math.exp(-w * t);
}

/**
 * Ratio of P to S corner frequency used by the generator: 1.5 (Madariaga 1976, Bull. Seismol. Soc.
 * Am. 66, 639, found P corners about 1.5 times the S corners for a circular crack; from memory).
 */
export const P_TO_S_CORNER_RATIO = 1.5;
