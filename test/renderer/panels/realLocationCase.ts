/**
 * One event of the real records (../shared/data/real-microseismic) with the analyst's manual P and S
 * picks, the network's sites from its StationXML, and a half-space at 4.2 km/s with Vp/Vs 1.73 (as
 * test/e2e/panels.test.ts uses for these records), for the location worker's tests.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { siteLocations } from '../../../core/location/fromReview';
import { checkVelocityModel } from '../../../core/location/velocityModel';
import { channelsOf, parseStationXml } from '../../../core/stationxml';
import { realEvent } from '../../support/realPicks';

const REAL = resolve(__dirname, '..', '..', '..', '..', 'shared', 'data', 'real-microseismic');

/** Fails loudly when the real records are missing. */
export function realLocationCase() {
  if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
  const file = join(REAL, 'stations', 'inv.xml');
  const sites = siteLocations(channelsOf(parseStationXml(readFileSync(file, 'utf8'), file)));
  const event = realEvent(REAL, '2019-01-21T11-50-32-914c4.xml', 8_000_000);
  const model = checkVelocityModel([{ topKm: 0, vp: 4.2, vs: 4.2 / 1.73 }], 'mine half-space');
  return { sites, event, model };
}
