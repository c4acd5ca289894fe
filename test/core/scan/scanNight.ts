/**
 * The scan command on a generated night, scored against the generator's truth: writes a scenario
 * (core/synth) as miniSEED day files with its StationXML and velocity model, runs `daybreak scan` on
 * them as a child process (exactly as cron would), reads the QuakeML it writes and scores the picks
 * with test/support/pickingAccuracy.ts's rules (a pick counts for the nearest arrival of its phase and
 * station; a miss counts as a failure; SNR classes as issue 4 defines them).
 *
 * Arrivals are scored at their recorded time (the time tags of the written files, which is what the
 * scan reads; it differs from the true time only where the scenario has a clock fault). Events found
 * and false events use the scan's P and S picks in place of its triggers (the QuakeML carries picks,
 * not triggers): an event is found when the scan has a P pick within 3 s of one of its P arrivals with
 * SNR > 5 at 4 or more sites; a candidate is false when none of its picks lies within 3 s of a true
 * arrival at that station.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { velocityModelJson } from '../../../core/location/velocityModel';
import type { CandidateEvent, Pick, StationTrigger } from '../../../core/pick';
import { readQuakeMl } from '../../../core/quakeml';
import { writeStationXml } from '../../../core/stationxml/write';
import { channelFiles } from '../../../core/synth/files';
import { scenarioInventory } from '../../../core/synth/inventory';
import { renderStation } from '../../../core/synth/render';
import { stationTruth, type TruthArrival } from '../../../core/synth/truth';
import type { Scenario } from '../../../core/synth/types';
import { microsFromIso } from '../../../core/time';
import { scoreChain, type ChainResult, type RenderedNight, type Score } from '../../support/pickingAccuracy';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

/** A night written to disk: the folder, its truth arrivals (with their event ids) and its length. */
export interface WrittenNight {
  readonly dir: string;
  readonly truth: TruthArrival[];
  readonly truthEvent: string[];
  readonly hours: number;
}

/** Writes `sc` into `dir`: waveforms/*.mseed, stations.xml, model.json. */
export function writeNight(sc: Scenario, dir: string): WrittenNight {
  mkdirSync(join(dir, 'waveforms'), { recursive: true });
  writeFileSync(join(dir, 'stations.xml'), writeStationXml(scenarioInventory(sc)));
  writeFileSync(join(dir, 'model.json'), velocityModelJson(sc.model));
  const truth: TruthArrival[] = [];
  const truthEvent: string[] = [];
  for (const st of sc.stations) {
    const rs = renderStation(sc, st.code);
    for (const [ev, list] of stationTruth(sc, rs)) for (const a of list) {
      truth.push(a);
      truthEvent.push(ev);
    }
    for (const rc of rs.channels) for (const f of channelFiles(sc, rc)) writeFileSync(join(dir, 'waveforms', f.name), f.bytes);
  }
  return { dir, truth, truthEvent, hours: (sc.end - sc.start) / 3.6e9 };
}

/** A night written by `daybreak demo --out DIR` (its truth.json). */
export function demoNight(dir: string): WrittenNight {
  const t = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8')) as {
    scenario: { start: string; end: string }; events: { id: string; arrivals: TruthArrival[] }[];
  };
  const truth: TruthArrival[] = [];
  const truthEvent: string[] = [];
  for (const e of t.events) for (const a of e.arrivals) {
    truth.push(a);
    truthEvent.push(e.id);
  }
  return { dir, truth, truthEvent, hours: (microsFromIso(t.scenario.end) - microsFromIso(t.scenario.start)) / 3.6e9 };
}

/** Runs `daybreak scan` on a written night into `out`; extra options before the path. */
export function runScan(night: WrittenNight, out: string, extra: readonly string[] = []): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [
    join(root, 'bin/daybreak.mjs'), 'scan', '--stations', join(night.dir, 'stations.xml'), '--model', join(night.dir, 'model.json'),
    '--out', out, ...extra, join(night.dir, 'waveforms'),
  ], { cwd: root, encoding: 'utf8', timeout: 600_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The scan's QuakeML as picks and candidate events (P picks as triggers, S picks as secondary ones). */
export function scanResult(qmlPath: string): ChainResult {
  const doc = readQuakeMl(readFileSync(qmlPath, 'utf8'), qmlPath);
  const picks: Pick[] = [];
  const events: CandidateEvent[] = [];
  for (const e of doc.events) {
    const list: Pick[] = e.picks.map((p) => ({
      phaseHint: p.phaseHint === 'S' ? 'S' : 'P', waveformId: p.waveformId, time: p.time,
      lowerUncertainty: p.lowerUncertainty ?? 0, upperUncertainty: p.upperUncertainty ?? 0, snr: 0, onset: p.onset ?? 'questionable',
      polarity: p.polarity, evaluationMode: 'automatic', evaluationStatus: 'preliminary', questionableTiming: false,
    }));
    picks.push(...list);
    const asTrigger = (p: Pick): StationTrigger => ({ id: p.waveformId, on: p.time, off: p.time, peakRatio: 0, peakTime: p.time, start: p.time, end: p.time, endedBy: 'ratio' });
    const ps = list.filter((p) => p.phaseHint === 'P').map(asTrigger);
    const ss = list.filter((p) => p.phaseHint === 'S').map(asTrigger);
    const time = ps.length ? Math.min(...ps.map((t) => t.on)) : 0;
    events.push({ id: e.id, time, start: time, end: time, sites: ps.map((t) => `${t.id.network}.${t.id.station}`), triggers: ps, secondary: ss });
  }
  return { picks, events };
}

/** Scores a scan's result on a written night; arrivals of the events in `leaveOut` are not scored. */
export function scoreScan(night: WrittenNight, result: ChainResult, leaveOut: ReadonlySet<string> = new Set()): Score {
  // scoreChain reads the truth's timeMicros: give it the recorded time (what the files' tags say).
  const truth = night.truth.map((a) => ({ ...a, timeMicros: microsFromIso(a.recordedTime) }));
  const view = { truth, truthEvent: night.truthEvent, hours: night.hours } as unknown as RenderedNight;
  return scoreChain(view, result, leaveOut);
}
