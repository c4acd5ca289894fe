/**
 * Writes the demo scenario (core/synth) to a folder: the miniSEED day files of every channel under
 * waveforms/, the StationXML (stations.xml), the velocity model (model.json), the truth file
 * (truth.json, for tests and the compare-with-truth report only) and, last, the marker file that
 * tells the host the scenario is complete. Progress is reported per station.
 *
 * The stations are shared between two worker threads (the machine's cores; the work is CPU-bound:
 * noise, filters, FFTs, Steim-2 packing), so the calling thread stays free to serve requests. Where
 * workers cannot start (e.g. TypeScript cannot be loaded in them) the stations are done in the calling
 * thread, yielding to the event loop between stations.
 */
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { velocityModelJson } from '../../core/location/velocityModel';
import { writeStationXml } from '../../core/stationxml/write';
import { demoScenario, DEMO_SEED, GENERATOR_VERSION } from '../../core/synth/demo';
import { scenarioInventory } from '../../core/synth/inventory';
import { scenarioTruth, type TruthArrival } from '../../core/synth/truth';
import type { Scenario } from '../../core/synth/types';
import { writeStations, type StationsDone } from './scenarioStations';
import { DEMO_COMPLETE_MARKER } from './service';

export interface WriteScenarioOptions {
  /** Called with the fraction done (0-1) and what is being done. */
  onProgress?: (fraction: number, message: string) => void;
  /** Scenario seed (default: the shipped demo's). */
  seed?: number;
  /** Another scenario instead of the demo (tests use short ones). */
  scenario?: Scenario;
  /** Worker threads to use (default: up to 2, one per core; 0 = all in the calling thread). */
  workers?: number;
}

export interface WriteScenarioResult {
  /** Files written (waveform files, metadata, model, truth, marker). */
  files: number;
  /** Bytes of miniSEED written. */
  waveformBytes: number;
  /** Wall-clock time taken, s. */
  seconds: number;
  /** Worker threads that did the stations (0: the calling thread). */
  workers: number;
}

/** Splits stations into `k` groups of about equal work (samples per second of all their channels). */
function shareOut(sc: Scenario, k: number): string[][] {
  const groups = Array.from({ length: k }, () => ({ codes: [] as string[], load: 0 }));
  const load = (code: string) => sc.stations.find((s) => s.code === code)!.channels.reduce((n, c) => n + c.sampleRate, 0);
  for (const code of [...sc.stations.map((s) => s.code)].sort((a, b) => load(b) - load(a))) {
    const g = groups.reduce((a, b) => (b.load < a.load ? b : a));
    g.codes.push(code);
    g.load += load(code);
  }
  return groups.map((g) => g.codes).filter((c) => c.length > 0);
}

function workerEntry(): string | null {
  try {
    return join(dirname(fileURLToPath(import.meta.url)), 'scenarioWorker.mjs');
  } catch {
    return null;
  }
}

/** Runs one group of stations in a worker thread. */
function inWorker(entry: string, sc: Scenario, root: string, codes: string[], onStation: (code: string) => void): Promise<StationsDone> {
  return new Promise((resolve, reject) => {
    const w = new Worker(entry, { workerData: { scenario: sc, root, codes } });
    let result: StationsDone | null = null;
    w.on('message', (m: { kind: 'station'; code: string } | { kind: 'done'; done: StationsDone }) => {
      if (m.kind === 'station') onStation(m.code);
      else result = m.done;
    });
    w.on('error', reject);
    w.on('exit', (code) => (result ? resolve(result) : reject(new Error(`scenario worker stopped with code ${code} before finishing`))));
  });
}

const yieldToLoop = () => new Promise<void>((r) => setImmediate(r));

/** Generates the demo scenario into `root` (created if needed; earlier scenario files there are replaced). */
export async function writeScenario(root: string, opts: WriteScenarioOptions = {}): Promise<WriteScenarioResult> {
  const t0 = performance.now();
  const progress = opts.onProgress ?? (() => {});
  const sc = opts.scenario ?? demoScenario(opts.seed ?? DEMO_SEED);
  progress(0, 'preparing');
  await rm(join(root, DEMO_COMPLETE_MARKER), { force: true });
  await rm(join(root, 'waveforms'), { recursive: true, force: true });
  await mkdir(join(root, 'waveforms'), { recursive: true });
  await writeFile(join(root, 'model.json'), velocityModelJson(sc.model) + '\n');
  await writeFile(join(root, 'stations.xml'), writeStationXml(scenarioInventory(sc)));
  let files = 2;
  let waveformBytes = 0;
  const weight = new Map(sc.stations.map((st) => [st.code, st.channels.reduce((n, c) => n + c.sampleRate, 0)]));
  const total = [...weight.values()].reduce((a, b) => a + b, 0);
  let done = 0;
  const onStation = (code: string) => {
    done += weight.get(code) ?? 0;
    progress(Math.min(0.98, done / total), `station ${code} written`);
  };
  const entry = workerEntry();
  const want = Math.max(0, Math.min(opts.workers ?? 2, availableParallelism()));
  let results: StationsDone[] | null = null;
  let workers = 0;
  if (entry && want > 0) {
    const groups = shareOut(sc, want);
    try {
      results = await Promise.all(groups.map((g) => inWorker(entry, sc, root, g, onStation)));
      workers = groups.length;
    } catch {
      results = null; // fall back to the calling thread below
      done = 0;
    }
  }
  if (!results) {
    results = [await writeStations(sc, root, sc.stations.map((s) => s.code), async (code) => {
      onStation(code);
      await yieldToLoop();
    })];
  }
  const perStation: Map<string, TruthArrival[]>[] = [];
  for (const r of results) {
    files += r.files;
    waveformBytes += r.bytes;
    for (const entries of r.truth) perStation.push(new Map(entries));
  }
  // Truth in the scenario's station order, whatever order the workers finished in.
  perStation.sort((a, b) => stationIndex(sc, a) - stationIndex(sc, b));
  progress(0.99, 'truth file');
  await writeFile(join(root, 'truth.json'), JSON.stringify(scenarioTruth(sc, perStation), null, 1) + '\n');
  const seconds = (performance.now() - t0) / 1000;
  await writeFile(join(root, DEMO_COMPLETE_MARKER), JSON.stringify({
    scenario: sc.name, seed: sc.seed, generator: GENERATOR_VERSION, generatedSeconds: Math.round(seconds * 10) / 10,
  }, null, 1) + '\n');
  files += 3;
  progress(1, 'done');
  return { files, waveformBytes, seconds, workers };
}

function stationIndex(sc: Scenario, m: Map<string, TruthArrival[]>): number {
  const first = [...m.values()][0]?.[0];
  return first ? sc.stations.findIndex((s) => s.code === first.station) : -1;
}
