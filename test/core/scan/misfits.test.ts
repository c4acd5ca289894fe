/**
 * Misfits read again, through `daybreak scan` itself: a one-hour generated night (seed 101, 24 local
 * events of ML 0.5-2.5 on the demo network, the first night of test/bench/accuracy.bench.ts) whose
 * automatic picks, before core/scan/reread.ts, lay more than 1 s from every true arrival of their phase
 * at their site for 4.5 % of them (mostly a "P" read on S where P lay in the noise, and the S after
 * it); measured by this test on the scan without the re-reading, which fails its first check.
 * Judged against the generator's truth at the recorded times (scanNight.ts).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readQuakeMl, type QmlEvent } from '../../../core/quakeml';
import { microsFromIso } from '../../../core/time';
import { accuracyNight } from '../../support/pickingAccuracy';
import { runScan, writeNight, type WrittenNight } from './scanNight';

let dir = '';
let night: WrittenNight;
let events: QmlEvent[] = [];
let code: number | null = null;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'daybreak-scan-misfits-'));
  night = writeNight(accuracyNight(101, { minutes: 60, events: 24, magnitudes: [0.5, 2.5] }), join(dir, 'night'));
  const out = join(dir, 'scan.xml');
  code = runScan(night, out).code;
  events = readQuakeMl(readFileSync(out, 'utf8'), out).events;
}, 180_000);
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Seconds from a pick to the nearest true arrival of its phase at its station (recorded time). */
function offBy(station: string, phase: string, time: number): number {
  let best = Infinity;
  for (const a of night.truth) {
    if (a.station === station && a.wave === phase) best = Math.min(best, Math.abs(time - microsFromIso(a.recordedTime)) / 1e6);
  }
  return best;
}

describe('daybreak scan reads the picks its locations do not fit again', () => {
  it('leaves at most 1 % of its picks more than 1 s from their arrival (night 101)', () => {
    expect(code).toBe(0);
    const picks = events.flatMap((e) => e.picks);
    expect(picks.length).toBeGreaterThan(400);
    const wild = picks.filter((p) => offBy(p.waveformId.station, p.phaseHint, p.time) > 1);
    expect(wild.length / picks.length).toBeLessThanOrEqual(0.01);
  });

  it('says what it changed: re-read picks in their comment, dropped ones in the event\'s', () => {
    const again = events.flatMap((e) => e.picks).filter((p) => /read again at the location's predicted [PS]/.test(p.comment ?? ''));
    const dropped = events.filter((e) => /dropped as not fitting the location/.test(e.comment ?? ''));
    expect(again.length).toBeGreaterThan(0);
    expect(dropped.length).toBeGreaterThan(0);
    // A re-read pick lies near its arrival.
    for (const p of again) expect(offBy(p.waveformId.station, p.phaseHint, p.time)).toBeLessThan(0.5);
  });
});
