/**
 * Choosing the scan's settings from the network itself, for callers that do not name a preset
 * (the review desk's background scan, `daybreak scan --preset auto`).
 *
 * The two presets serve networks of very different size. `local` (2-15 Hz, STA 0.5 s, S sought up
 * to 10 s of P travel time and beyond) is for networks that record local earthquakes tens of
 * kilometres away. `near` (5-150 Hz, STA 0.05 s, P travel times under 0.5 s) is for sensors within
 * a few kilometres of the sources: mines, dams, geothermal and injection sites. On such a network
 * the local settings look for S a second or more after P, where there is only coda, and the
 * location fails.
 *
 * The rule is the project's own: a network whose typical distance between two sites (the median over
 * all pairs) is at most {@link NEAR_SPREAD_KM} gets `near`, any wider one `local`. 3 km is about
 * 0.5 s of P travel at 6 km/s, the `near` preset's own bound on P travel time, so its sources must be
 * about that close. The median and not the largest distance, so that one outlying site (a reference
 * station away from the mine) does not decide for the whole network.
 */
import { siteDistanceKm } from '../pick/coincidence';
import type { ScanPreset } from './settings';

/** Median distance between two sites, km, up to which the network is scanned with the `near` preset. */
export const NEAR_SPREAD_KM = 3;

export interface PresetChoice {
  readonly preset: ScanPreset;
  /** Median great-circle distance over all pairs of sites, km. */
  readonly spreadKm: number;
  /** Largest great-circle distance between two of the sites, km. */
  readonly apertureKm: number;
  /** One line saying what was chosen and why, for the scan's summary and the desk. */
  readonly reason: string;
}

/** Great-circle distances between all pairs of the positions, km (haversine, mean Earth radius), ascending. */
export function pairDistancesKm(sites: readonly { latitude: number; longitude: number }[]): Float64Array {
  const out = new Float64Array((sites.length * (sites.length - 1)) / 2);
  let k = 0;
  for (let i = 0; i < sites.length; i++) {
    for (let j = i + 1; j < sites.length; j++) out[k++] = siteDistanceKm(sites[i], sites[j]);
  }
  return out.sort();
}

/** The preset for a network of these sites (at least two; latitude and longitude in degrees). */
export function choosePreset(sites: readonly { latitude: number; longitude: number }[]): PresetChoice {
  if (!Array.isArray(sites)) throw new TypeError(`choosing scan settings needs an array of sites, got ${String(sites)}`);
  if (sites.length < 2) throw new RangeError(`choosing scan settings needs at least two sites with coordinates, got ${sites.length}`);
  for (const s of sites) {
    if (!Number.isFinite(s?.latitude) || !Number.isFinite(s?.longitude) || Math.abs(s.latitude) > 90) {
      throw new RangeError(`site coordinates must be finite degrees (latitude within ±90), got ${JSON.stringify(s)}`);
    }
  }
  const d = pairDistancesKm(sites);
  const m = d.length >> 1;
  const spreadKm = d.length % 2 ? d[m] : (d[m - 1] + d[m]) / 2;
  const apertureKm = d[d.length - 1];
  const km = (x: number) => (x < 10 ? x.toFixed(2) : x.toFixed(0));
  const what = `the ${sites.length} sites are ${km(spreadKm)} km apart in the median (widest pair ${km(apertureKm)} km)`;
  return spreadKm <= NEAR_SPREAD_KM
    ? { preset: 'near', spreadKm, apertureKm, reason: `near-source settings: ${what}, within ${NEAR_SPREAD_KM} km` }
    : { preset: 'local', spreadKm, apertureKm, reason: `local-earthquake settings: ${what}, over ${NEAR_SPREAD_KM} km` };
}
