/**
 * Far-field radiation patterns of a double-couple point source, Aki & Richards (2002),
 * Quantitative Seismology, 2nd ed., eq. 4.89 (p. 108-109), with their conventions:
 * strike φs clockwise from north, dip δ, rake λ (slip direction of the hanging wall, from strike),
 * take-off angle i from the downward vertical, station azimuth φ clockwise from north.
 *
 * Signs: F_P > 0 means motion away from the source along the ray (compression, first motion up at the
 * surface); F_SV is along p̂ = ∂l̂/∂i = (cos i cos φ, cos i sin φ, -sin i) in (north, east, down);
 * F_SH is along φ̂ = (-sin φ, cos φ, 0).
 */

const D2R = Math.PI / 180;

export interface Mechanism {
  /** Strike, degrees clockwise from north. */
  readonly strike: number;
  /** Dip, degrees from horizontal, 0-90. */
  readonly dip: number;
  /** Rake, degrees, -180 to 180. */
  readonly rake: number;
}

export interface Radiation {
  readonly p: number;
  readonly sv: number;
  readonly sh: number;
}

function checkMechanism(m: Mechanism): void {
  if (!Number.isFinite(m.strike)) throw new RangeError(`strike must be finite degrees, got ${m.strike}`);
  if (!(m.dip >= 0 && m.dip <= 90)) throw new RangeError(`dip must be in [0, 90] degrees, got ${m.dip}`);
  if (!(m.rake >= -180 && m.rake <= 180)) throw new RangeError(`rake must be in [-180, 180] degrees, got ${m.rake}`);
}

/**
 * P, SV and SH radiation coefficients (Aki & Richards 2002, eq. 4.89).
 * @param takeoffDeg take-off angle from the downward vertical, degrees (0-180)
 * @param azimuthDeg azimuth from source to station, degrees clockwise from north
 */
export function doubleCoupleRadiation(m: Mechanism, takeoffDeg: number, azimuthDeg: number): Radiation {
  checkMechanism(m);
  if (!(takeoffDeg >= 0 && takeoffDeg <= 180)) throw new RangeError(`take-off angle must be in [0, 180] degrees, got ${takeoffDeg}`);
  if (!Number.isFinite(azimuthDeg)) throw new RangeError(`azimuth must be finite degrees, got ${azimuthDeg}`);
  const d = m.dip * D2R;
  const l = m.rake * D2R;
  const i = takeoffDeg * D2R;
  const a = (azimuthDeg - m.strike) * D2R;
  const sd = Math.sin(d), cd = Math.cos(d), s2d = Math.sin(2 * d), c2d = Math.cos(2 * d);
  const sl = Math.sin(l), cl = Math.cos(l);
  const si = Math.sin(i), ci = Math.cos(i), s2i = Math.sin(2 * i), c2i = Math.cos(2 * i);
  const sa = Math.sin(a), ca = Math.cos(a), s2a = Math.sin(2 * a), c2a = Math.cos(2 * a);
  const p = cl * sd * si * si * s2a - cl * cd * s2i * ca + sl * s2d * (ci * ci - si * si * sa * sa) + sl * c2d * s2i * sa;
  const sv = sl * c2d * c2i * sa - cl * cd * c2i * ca + 0.5 * cl * sd * s2i * s2a - 0.5 * sl * s2d * s2i * (1 + sa * sa);
  const sh = cl * cd * ci * sa + cl * sd * si * c2a + sl * c2d * ci * ca - 0.5 * sl * s2d * si * s2a;
  return { p, sv, sh };
}
