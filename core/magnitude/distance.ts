/**
 * Epicentral and hypocentral distances of a station from an event, for the magnitude scales.
 *
 * Epicentral: the length of the station's position in the location code's local projection
 * centred on the epicentre (core/location/projection: azimuthal equidistant, WGS84 radii of
 * curvature at the origin; within about 1e-4 of the geodesic 50 km out, as its test measures).
 * Hypocentral: √(epicentral² + (depth + elevation)²), with the event depth below sea level and the
 * station elevation above it (the velocity model's datum), both in km.
 */
import { localProjection, toLocalKm } from '../location/projection';
import type { StationDistance } from './localMagnitude';

export interface EventPosition {
  /** Degrees north and east. */
  readonly latitude: number;
  readonly longitude: number;
  /** Km below sea level (negative above). */
  readonly depthKm: number;
}

export interface StationPosition {
  readonly latitude: number;
  readonly longitude: number;
  /** Metres above sea level. */
  readonly elevationM: number;
}

/** Distances of `station` from `event`, km. */
export function stationDistance(event: EventPosition, station: StationPosition): StationDistance {
  if (!Number.isFinite(event.depthKm)) throw new RangeError(`event depth must be finite km, got ${event.depthKm}`);
  if (!Number.isFinite(station.elevationM)) throw new RangeError(`station elevation must be finite m, got ${station.elevationM}`);
  const p = localProjection(event.latitude, event.longitude);
  const xy = toLocalKm(p, station.latitude, station.longitude);
  const epicentralKm = Math.hypot(xy[0], xy[1]);
  return { epicentralKm, hypocentralKm: Math.hypot(epicentralKm, event.depthKm + station.elevationM / 1000) };
}
