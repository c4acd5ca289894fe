/**
 * Geometry on the sphere and the projection of P and S motion onto a sensor's components.
 *
 * Distances and azimuths use a spherical Earth of radius 6371 km (the mean radius; adequate for a
 * local network, where the ellipsoid changes distances by well under 0.5 %).
 */

const D2R = Math.PI / 180;
const R2D = 180 / Math.PI;
/** Mean Earth radius, km. */
export const EARTH_RADIUS_KM = 6371;

export interface DistanceAzimuth {
  /** Great-circle distance, km. */
  readonly distanceKm: number;
  /** Azimuth at point 1 towards point 2, degrees clockwise from north, [0, 360). */
  readonly azimuthDeg: number;
  /** Azimuth at point 2 towards point 1 (the back-azimuth seen from point 2), degrees, [0, 360). */
  readonly backAzimuthDeg: number;
}

function azimuth(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const dl = lon2 - lon1;
  const y = Math.sin(dl) * Math.cos(lat2);
  const x = Math.cos(lat1) * Math.sin(lat2) - Math.sin(lat1) * Math.cos(lat2) * Math.cos(dl);
  const az = Math.atan2(y, x) * R2D;
  return az < 0 ? az + 360 : az;
}

/** Distance (haversine) and azimuths between two points given in degrees. */
export function distanceAzimuth(lat1: number, lon1: number, lat2: number, lon2: number): DistanceAzimuth {
  for (const [n, v, lim] of [['lat1', lat1, 90], ['lat2', lat2, 90], ['lon1', lon1, 360], ['lon2', lon2, 360]] as const) {
    if (!(Math.abs(v) <= lim)) throw new RangeError(`${n} must be in [-${lim}, ${lim}] degrees, got ${v}`);
  }
  const p1 = lat1 * D2R, p2 = lat2 * D2R, l1 = lon1 * D2R, l2 = lon2 * D2R;
  const h = Math.sin((p2 - p1) / 2) ** 2 + Math.cos(p1) * Math.cos(p2) * Math.sin((l2 - l1) / 2) ** 2;
  const distanceKm = 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(h)));
  return { distanceKm, azimuthDeg: azimuth(p1, l1, p2, l2), backAzimuthDeg: azimuth(p2, l2, p1, l1) };
}

/** The point `northKm` north and `eastKm` east of (lat0, lon0), degrees (local flat approximation, fine within ~100 km). */
export function offsetPoint(lat0: number, lon0: number, northKm: number, eastKm: number): { latitude: number; longitude: number } {
  const kmPerDeg = EARTH_RADIUS_KM * D2R;
  return {
    latitude: lat0 + northKm / kmPerDeg,
    longitude: lon0 + eastKm / (kmPerDeg * Math.cos(lat0 * D2R)),
  };
}

/** Ground motion as a vector: up, north, east (any unit). */
export interface Motion {
  up: number;
  north: number;
  east: number;
}

/**
 * Ground motion at a station of a P, SV and SH wave of the given amplitudes arriving with
 * incidence angle `incidenceDeg` (from the vertical) from an event seen at back-azimuth
 * `backAzimuthDeg`. Conventions as in radiation.ts (Aki & Richards 2002, §4.5):
 * P > 0 moves away from the source along the ray, i.e. up and away (radially outward);
 * SV > 0 is along p̂ = ∂l̂/∂θ, which for the up-going ray at the station is up and towards the source;
 * SH > 0 is along φ̂, 90° clockwise (seen from above) from the radial direction pointing away from the source.
 * Free-surface conversion and amplification are not modelled (the generator calibrates amplitudes
 * on the local-magnitude law instead).
 */
export function rayMotion(p: number, sv: number, sh: number, incidenceDeg: number, backAzimuthDeg: number): Motion {
  const j = incidenceDeg * D2R;
  const sj = Math.sin(j), cj = Math.cos(j);
  // Radial unit vector pointing away from the source: azimuth baz + 180.
  const az = (backAzimuthDeg + 180) * D2R;
  const rn = Math.cos(az), re = Math.sin(az);
  // Transverse: radial turned 90° clockwise.
  const tn = -re, te = rn;
  const radial = p * sj - sv * cj;
  const up = p * cj + sv * sj;
  return { up, north: radial * rn + sh * tn, east: radial * re + sh * te };
}

/**
 * What a sensor component with SEED orientation (azimuth clockwise from north, dip down from the
 * horizontal; dip -90 points up) records of a ground-motion vector.
 */
export function componentOf(m: Motion, azimuthDeg: number, dipDeg: number): number {
  const a = azimuthDeg * D2R, d = dipDeg * D2R;
  const h = Math.cos(d);
  return m.north * h * Math.cos(a) + m.east * h * Math.sin(a) - m.up * Math.sin(d);
}
