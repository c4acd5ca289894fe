/**
 * Two local events on a two-minute generated night, scanned by `daybreak scan` itself: the demo
 * network (test/support/pickingAccuracy accuracyNight's stations, noise and velocity model, seed 101),
 * the first event 40 s into the night at (10, -12) km from the network's centre and 7 km deep, the
 * second at (-8, 12) km and 9 km deep, sqrt(18^2 + 24^2) = 30 km away. Judged against the generator's
 * truth at the recorded times (scanNight.ts).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readQuakeMl, type QmlEvent } from '../../../core/quakeml';
import { offsetPoint } from '../../../core/synth/geometry';
import type { EventSpec } from '../../../core/synth/types';
import { microsFromIso } from '../../../core/time';
import { accuracyNight } from '../../support/pickingAccuracy';
import { runScan, writeNight, type WrittenNight } from './scanNight';

const CENTRE = { latitude: 43.38, longitude: 2.66 };

export interface PairScan {
  readonly night: WrittenNight;
  readonly events: QmlEvent[];
  readonly code: number | null;
  readonly stdout: string;
  /** Picks of `e` within `seconds` of the true arrival of their phase at their station of event `id` ('first' or 'second'). */
  readonly within: (e: QmlEvent, id: string, seconds: number) => number;
  /** Removes the night's folder. */
  readonly remove: () => void;
}

/** Writes and scans the night: the first event of magnitude `first`, the second `afterSeconds` later of magnitude `second`. */
export function scanPair(first: number, afterSeconds: number, second: number): PairScan {
  const dir = mkdtempSync(join(tmpdir(), 'daybreak-scan-pair-'));
  const base = accuracyNight(101, { minutes: 2, events: 1, magnitudes: [1.8, 1.8] });
  const ev = (id: string, seconds: number, north: number, east: number, depthKm: number, magnitude: number): EventSpec => ({
    id, type: 'earthquake', origin: base.start + Math.round(seconds * 1e6), ...offsetPoint(CENTRE.latitude, CENTRE.longitude, north, east),
    depthKm, magnitude, mechanism: { strike: 120, dip: 60, rake: -90 },
  });
  const sc = { ...base, events: [ev('first', 40, 10, -12, 7, first), ev('second', 40 + afterSeconds, -8, 12, 9, second)] };
  const night = writeNight(sc, join(dir, 'night'));
  const out = join(dir, 'scan.xml');
  const r = runScan(night, out);
  const events = readQuakeMl(readFileSync(out, 'utf8'), out).events;
  const within = (e: QmlEvent, id: string, seconds: number) => e.picks.filter((p) => night.truth.some((a, i) => night.truthEvent[i] === id
    && a.station === p.waveformId.station && a.wave === p.phaseHint && Math.abs(p.time - microsFromIso(a.recordedTime)) <= seconds * 1e6)).length;
  return { night, events, code: r.code, stdout: r.stdout, within, remove: () => rmSync(dir, { recursive: true, force: true }) };
}
