/**
 * Renders some of a scenario's stations and writes their miniSEED day files: the part of the demo
 * writer that runs in each worker thread (or in the calling thread when workers are not available).
 */
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { channelFiles } from '../../core/synth/files';
import { renderStation } from '../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../core/synth/truth';
import type { Scenario } from '../../core/synth/types';

export interface StationsDone {
  /** Per station: event id to its arrivals at that station. */
  truth: [string, TruthArrival[]][][];
  files: number;
  bytes: number;
}

/** Renders and writes `codes`, calling `onStation` after each with its share of the work. */
export async function writeStations(
  sc: Scenario, root: string, codes: readonly string[], onStation: (code: string) => void | Promise<void>,
): Promise<StationsDone> {
  const out: StationsDone = { truth: [], files: 0, bytes: 0 };
  for (const code of codes) {
    const rs = renderStation(sc, code);
    out.truth.push([...stationTruth(sc, rs).entries()]);
    for (const rc of rs.channels) {
      for (const f of channelFiles(sc, rc)) {
        await writeFile(join(root, 'waveforms', f.name), f.bytes);
        out.files++;
        out.bytes += f.bytes.length;
      }
    }
    await onStation(code);
  }
  return out;
}
