/**
 * Writes the demo scenario (core/synth) to a folder: the miniSEED day files of every channel under
 * waveforms/, the StationXML (stations.xml), the velocity model (model.json), the truth file
 * (truth.json, for tests and the compare-with-truth report only) and, last, the marker file that
 * tells the host the scenario is complete. Progress is reported per station. The work yields to the
 * event loop between stations so a host serving requests stays responsive.
 */
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { velocityModelJson } from '../../core/location/velocityModel';
import { writeStationXml } from '../../core/stationxml/write';
import { demoScenario, DEMO_SEED } from '../../core/synth/demo';
import { channelFiles } from '../../core/synth/files';
import { scenarioInventory } from '../../core/synth/inventory';
import { renderStation } from '../../core/synth/render';
import { scenarioTruth, stationTruth, type TruthArrival } from '../../core/synth/truth';
import { DEMO_COMPLETE_MARKER } from './service';

export interface WriteScenarioOptions {
  /** Called with the fraction done (0-1) and what is being done. */
  onProgress?: (fraction: number, message: string) => void;
  /** Scenario seed (default: the shipped demo's). */
  seed?: number;
}

export interface WriteScenarioResult {
  /** Files written (waveform files, metadata, model, truth, marker). */
  files: number;
  /** Bytes of miniSEED written. */
  waveformBytes: number;
  /** Wall-clock time taken, s. */
  seconds: number;
}

const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));

/** Generates the demo scenario into `root` (created if needed; earlier scenario files there are replaced). */
export async function writeScenario(root: string, opts: WriteScenarioOptions = {}): Promise<WriteScenarioResult> {
  const t0 = performance.now();
  const progress = opts.onProgress ?? (() => {});
  const sc = demoScenario(opts.seed ?? DEMO_SEED);
  progress(0, 'preparing');
  await rm(join(root, DEMO_COMPLETE_MARKER), { force: true });
  await rm(join(root, 'waveforms'), { recursive: true, force: true });
  await mkdir(join(root, 'waveforms'), { recursive: true });
  await writeFile(join(root, 'model.json'), velocityModelJson(sc.model) + '\n');
  await writeFile(join(root, 'stations.xml'), writeStationXml(scenarioInventory(sc)));
  let files = 2;
  let waveformBytes = 0;
  const perStation: Map<string, TruthArrival[]>[] = [];
  const total = sc.stations.reduce((s, st) => s + st.channels.length * st.channels[0].sampleRate, 0);
  let done = 0;
  for (const st of sc.stations) {
    progress(done / total, `station ${st.code}`);
    await yieldToLoop();
    const rs = renderStation(sc, st.code);
    perStation.push(stationTruth(sc, rs));
    for (const rc of rs.channels) {
      for (const f of channelFiles(sc, rc)) {
        await writeFile(join(root, 'waveforms', f.name), f.bytes);
        waveformBytes += f.bytes.length;
        files++;
      }
    }
    done += st.channels.length * st.channels[0].sampleRate;
  }
  progress(0.99, 'truth file');
  await writeFile(join(root, 'truth.json'), JSON.stringify(scenarioTruth(sc, perStation), null, 1) + '\n');
  const seconds = (performance.now() - t0) / 1000;
  await writeFile(join(root, DEMO_COMPLETE_MARKER), JSON.stringify({
    scenario: sc.name, seed: sc.seed, generatedSeconds: Math.round(seconds * 10) / 10,
  }, null, 1) + '\n');
  files += 3;
  progress(1, 'done');
  return { files, waveformBytes, seconds };
}
