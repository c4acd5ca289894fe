/**
 * The flat-earth local projection the location code works in: latitude/longitude <-> km east and
 * north of an origin near the network's centre.
 *
 * It is the azimuthal equidistant projection of the unit sphere centred on the origin (Snyder 1987,
 * Map Projections - A Working Manual, USGS Professional Paper 1395, chapter 25, spherical forward and
 * inverse formulas; from memory), stretched north-south by M and east-west by N, the WGS84
 * ellipsoid's meridional and prime-vertical radii of curvature at the origin (Snyder 1987, eqs. 4-18
 * and 4-20; from memory). Near the origin lengths are then those of the ellipsoid to first order;
 * the error grows as the radii change with latitude, about 1e-4 of the distance 50 km out (5 m),
 * as the test measures against Vincenty's geodesic. The travel-time model is flat anyway, so a
 * local network (a few hundred km) is the projection's range.
 */

/** WGS84 semi-major axis, km, and flattening (NIMA TR8350.2, 2000, table 3.1; from memory). */
export const WGS84_A_KM = 6378.137;
export const WGS84_F = 1 / 298.257223563;
const E2 = WGS84_F * (2 - WGS84_F);
const RAD = Math.PI / 180;

export interface LocalProjection {
  /** The origin, degrees. */
  readonly lat0: number;
  readonly lon0: number;
  /** Meridional (M) and prime-vertical (N) radii of curvature at the origin, km. */
  readonly mKm: number;
  readonly nKm: number;
}

/** Meridional radius of curvature M at a latitude, km. */
export function meridionalRadiusKm(latDeg: number): number {
  const s = Math.sin(latDeg * RAD);
  const w = 1 - E2 * s * s;
  return WGS84_A_KM * (1 - E2) / (w * Math.sqrt(w));
}

/** Prime-vertical radius of curvature N at a latitude, km. */
export function primeVerticalRadiusKm(latDeg: number): number {
  const s = Math.sin(latDeg * RAD);
  return WGS84_A_KM / Math.sqrt(1 - E2 * s * s);
}

function checkLatLon(latDeg: number, lonDeg: number): void {
  if (!(latDeg >= -90 && latDeg <= 90)) throw new RangeError(`latitude must be in [-90, 90] degrees, got ${latDeg}`);
  if (!(lonDeg >= -360 && lonDeg <= 360)) throw new RangeError(`longitude must be in [-360, 360] degrees, got ${lonDeg}`);
}

/** A projection centred on (lat0, lon0), degrees. The origin must not be a pole. */
export function localProjection(lat0: number, lon0: number): LocalProjection {
  checkLatLon(lat0, lon0);
  if (Math.abs(lat0) > 89.9) throw new RangeError(`projection origin latitude must be within 89.9 degrees of the equator, got ${lat0}`);
  return Object.freeze({ lat0, lon0, mKm: meridionalRadiusKm(lat0), nKm: primeVerticalRadiusKm(lat0) });
}

/** Projects (lat, lon) in degrees; writes [east, north] in km into `out` (length >= 2) and returns it. */
export function toLocalKm(proj: LocalProjection, latDeg: number, lonDeg: number, out: number[] | Float64Array = [0, 0]): number[] | Float64Array {
  checkLatLon(latDeg, lonDeg);
  const phi0 = proj.lat0 * RAD;
  const phi = latDeg * RAD;
  const dl = (lonDeg - proj.lon0) * RAD;
  const sp0 = Math.sin(phi0);
  const cp0 = Math.cos(phi0);
  const sp = Math.sin(phi);
  const cp = Math.cos(phi);
  const cdl = Math.cos(dl);
  const cosc = sp0 * sp + cp0 * cp * cdl;
  // sin c is the length of the direction vector; atan2 keeps c precise near the origin (acos would not).
  const ex = cp * Math.sin(dl);
  const ny = cp0 * sp - sp0 * cp * cdl;
  const sinc = Math.hypot(ex, ny);
  const c = Math.atan2(sinc, cosc);
  const k = sinc === 0 ? 1 : c / sinc;
  out[0] = proj.nKm * k * ex;
  out[1] = proj.mKm * k * ny;
  return out;
}

/** Inverse of toLocalKm: writes [lat, lon] in degrees into `out` and returns it (lon in (-180, 180]). */
export function fromLocalKm(proj: LocalProjection, eastKm: number, northKm: number, out: number[] | Float64Array = [0, 0]): number[] | Float64Array {
  if (!Number.isFinite(eastKm) || !Number.isFinite(northKm)) throw new RangeError(`local coordinates must be finite km, got (${eastKm}, ${northKm})`);
  const phi0 = proj.lat0 * RAD;
  // back to the unit sphere's projection plane, where the distance from the origin is the angle c
  const u = eastKm / proj.nKm;
  const v = northKm / proj.mKm;
  const c = Math.hypot(u, v);
  if (c === 0) {
    out[0] = proj.lat0;
    out[1] = proj.lon0;
    return out;
  }
  if (c >= Math.PI) throw new RangeError(`local coordinates (${eastKm}, ${northKm}) km are beyond the projection's antipode`);
  const sc = Math.sin(c);
  const cc = Math.cos(c);
  const sp0 = Math.sin(phi0);
  const cp0 = Math.cos(phi0);
  const lat = Math.asin(Math.min(1, Math.max(-1, cc * sp0 + v * sc * cp0 / c)));
  let lon = proj.lon0 + Math.atan2(u * sc, c * cp0 * cc - v * sp0 * sc) / RAD;
  if (lon > 180) lon -= 360;
  else if (lon <= -180) lon += 360;
  out[0] = lat / RAD;
  out[1] = lon;
  return out;
}

/** Mean earth radius for converting km to degrees of arc in reports (IUGG mean radius R1 of WGS84, km). */
export const MEAN_EARTH_RADIUS_KM = 6371.0088;

/** Epicentral distance in km as degrees of arc on the mean sphere (QuakeML arrival.distance). */
export function kmToDegrees(km: number): number {
  return km / (MEAN_EARTH_RADIUS_KM * RAD);
}
