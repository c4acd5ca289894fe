/**
 * A second earthquake 9 s after another, through `daybreak scan` itself: a two-minute generated night
 * on the demo network (test/support/pickingAccuracy accuracyNight's stations, noise and velocity
 * model, seed 101) holding two local events of ML 1.8 and 2.1, 30 km apart, the second 9 s after the
 * first. Both lie within the network's coincidence window, so before core/pick unexplainedTriggers
 * the scan made one candidate of them (measured by this test on the scan without it, which fails the
 * first check). Judged against the generator's truth at the recorded times (scanNight.ts).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readQuakeMl, type QmlEvent } from '../../../core/quakeml';
import { offsetPoint } from '../../../core/synth/geometry';
import type { EventSpec } from '../../../core/synth/types';
import { microsFromIso } from '../../../core/time';
import { accuracyNight } from '../../support/pickingAccuracy';
import { runScan, writeNight, type WrittenNight } from './scanNight';

let dir = '';
let night: WrittenNight;
let events: QmlEvent[] = [];
let code: number | null = null;
let stdout = '';

const CENTRE = { latitude: 43.38, longitude: 2.66 };

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'daybreak-scan-pair-'));
  const base = accuracyNight(101, { minutes: 2, events: 1, magnitudes: [1.8, 1.8] });
  const ev = (id: string, seconds: number, north: number, east: number, depthKm: number, magnitude: number): EventSpec => ({
    id, type: 'earthquake', origin: base.start + Math.round(seconds * 1e6), ...offsetPoint(CENTRE.latitude, CENTRE.longitude, north, east),
    depthKm, magnitude, mechanism: { strike: 120, dip: 60, rake: -90 },
  });
  // 30 km apart: (10, -12) and (-8, 12) km from the centre, sqrt(18^2 + 24^2) = 30 km.
  const sc = { ...base, events: [ev('first', 40, 10, -12, 7, 1.8), ev('second', 49, -8, 12, 9, 2.1)] };
  night = writeNight(sc, join(dir, 'night'));
  const out = join(dir, 'scan.xml');
  const r = runScan(night, out);
  code = r.code;
  stdout = r.stdout;
  events = readQuakeMl(readFileSync(out, 'utf8'), out).events;
}, 120_000);
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Picks of `e` within `seconds` of the true arrival of their phase at their station of event `id`. */
function within(e: QmlEvent, id: string, seconds: number): number {
  return e.picks.filter((p) => night.truth.some((a, i) => night.truthEvent[i] === id && a.station === p.waveformId.station && a.wave === p.phaseHint
    && Math.abs(p.time - microsFromIso(a.recordedTime)) <= seconds * 1e6)).length;
}

describe('daybreak scan finds a second event inside the first one\'s coincidence window', () => {
  it('writes one candidate per event, each with its own picks', () => {
    expect(code).toBe(0);
    expect(events.length).toBe(2);
    const [a, b] = events;
    // Each candidate's picks are its own event's: at least 10 within 0.1 s, none of the other's.
    expect(within(a, 'first', 0.1)).toBeGreaterThanOrEqual(10);
    expect(within(b, 'second', 0.1)).toBeGreaterThanOrEqual(10);
    expect(within(a, 'second', 0.2)).toBe(0);
    expect(within(b, 'first', 0.2)).toBe(0);
    // At least 90 % of each candidate's picks within 0.2 s of their arrival.
    expect(within(a, 'first', 0.2) / a.picks.length).toBeGreaterThanOrEqual(0.9);
    expect(within(b, 'second', 0.2) / b.picks.length).toBeGreaterThanOrEqual(0.9);
  });

  it('says where the second candidate came from, in its comment and the summary', () => {
    const [a, b] = events;
    expect(b.comment).toContain(`found inside ${a.id}'s coincidence window`);
    expect(stdout).toContain(`${b.id} (inside ${a.id}'s window)`);
  });
});
