/**
 * A small synthetic night for the scan command's tests, made with the generator (core/synth): five
 * stations on a 10 km ring (one with 1/2 horizontals at 20 degrees, one at 200 Hz, one with an
 * accelerometer beside its broadband, one vertical only), five minutes of data that cross midnight
 * (so every channel comes in two day files), and two earthquakes inside the ring, the first with its
 * arrivals straddling midnight. Written as miniSEED day files, StationXML and the generator's truth.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { velocityModelJson } from '../../../../core/location/velocityModel';
import { writeStationXml } from '../../../../core/stationxml/write';
import { channelFiles } from '../../../../core/synth/files';
import { scenarioInventory } from '../../../../core/synth/inventory';
import { renderStation } from '../../../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../../../core/synth/truth';
import type { Scenario } from '../../../../core/synth/types';
import { microsFromIso } from '../../../../core/time';
import { quake, ringStations, tinyScenario } from '../../../core/synth/scenarioFixtures';

export const NIGHT_START = microsFromIso('2026-03-01T23:58:00Z');
export const NIGHT_SECONDS = 300;

export function smallNight(): Scenario {
  const stations = ringStations(5, 10);
  const at = (id: string, s: number, ml: number, depth: number, n: number, e: number) => ({
    ...quake(id, 0, ml, depth, { strike: 30, dip: 60, rake: -80 }, n, e), origin: NIGHT_START + Math.round(s * 1e6),
  });
  const events = [at('eq-a', 117.6, 1.6, 8, 2, -1), at('eq-b', 247.3, 2.2, 6, -3, 2)];
  return { ...tinyScenario(stations, events, NIGHT_SECONDS), start: NIGHT_START, end: NIGHT_START + NIGHT_SECONDS * 1e6 };
}

/** Writes waveforms/*.mseed, stations.xml, model.json (the generator's) and a notes.txt into `dir`; returns the truth arrivals. */
export function writeSmallNight(dir: string, sc: Scenario = smallNight()): TruthArrival[] {
  mkdirSync(join(dir, 'waveforms'), { recursive: true });
  writeFileSync(join(dir, 'stations.xml'), writeStationXml(scenarioInventory(sc)));
  writeFileSync(join(dir, 'model.json'), velocityModelJson(sc.model));
  writeFileSync(join(dir, 'waveforms', 'notes.txt'), 'not a waveform file\n');
  const truth: TruthArrival[] = [];
  for (const st of sc.stations) {
    const rs = renderStation(sc, st.code);
    for (const list of stationTruth(sc, rs).values()) truth.push(...list);
    for (const rc of rs.channels) for (const f of channelFiles(sc, rc)) writeFileSync(join(dir, 'waveforms', f.name), f.bytes);
  }
  return truth;
}
