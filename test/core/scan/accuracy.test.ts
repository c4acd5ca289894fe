/**
 * The accuracy targets of issue 4 section 5, measured on what `daybreak scan` writes: two 8-minute
 * synthetic nights on the demo network (seeds 11 and 12, three local events of ML 1.2-2.4 each: the
 * nights of test/core/pick/accuracy.test.ts), written as miniSEED with their StationXML, scanned by
 * the command as cron would run it, its QuakeML scored against the generator's truth arrivals
 * (core/synth: true times and polarities from the ray geometry, SNR as the issue defines it; see
 * scanNight.ts for the scoring rules). A missed arrival counts as a failure. The full nights and the
 * demo night are measured by test/bench/accuracy.bench.ts.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { accuracyNight, mergeScores, scoreTable, share, type Score } from '../../support/pickingAccuracy';
import { runScan, scanResult, scoreScan, writeNight } from './scanNight';

let dir = '';
let score: Score;
const codes: (number | null)[] = [];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'daybreak-scan-accuracy-'));
  const scores = [11, 12].map((seed) => {
    const night = writeNight(accuracyNight(seed, { minutes: 8, events: 3, magnitudes: [1.2, 2.4] }), join(dir, `night-${seed}`));
    const out = join(dir, `scan-${seed}.xml`);
    codes.push(runScan(night, out).code);
    return scoreScan(night, scanResult(out));
  });
  score = mergeScores(scores);
  console.log(scoreTable([{ name: 'scan', score }]));
}, 120_000);
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('daybreak scan on two short synthetic nights, scored against the generator\'s truth', () => {
  it('runs cleanly and has enough arrivals in each scored SNR class for the shares to mean something', () => {
    expect(codes).toEqual([0, 0]);
    expect(score.p['>=10'].arrivals).toBeGreaterThanOrEqual(30);
    expect(score.s['>=10'].arrivals).toBeGreaterThanOrEqual(30);
    expect(score.p['4-10'].arrivals).toBeGreaterThanOrEqual(10);
    expect(score.s['4-10'].arrivals).toBeGreaterThanOrEqual(10);
  });

  it('picks at least 95 % of P with SNR >= 10 within 0.05 s and 90 % of S within 0.10 s', () => {
    expect(share(score.p['>=10'].within[0], score.p['>=10'].arrivals)).toBeGreaterThanOrEqual(0.95);
    expect(share(score.s['>=10'].within[0], score.s['>=10'].arrivals)).toBeGreaterThanOrEqual(0.9);
  });

  it('picks at least 85 % of P with SNR 4-10 within 0.10 s and 75 % of S within 0.20 s', () => {
    expect(share(score.p['4-10'].within[1], score.p['4-10'].arrivals)).toBeGreaterThanOrEqual(0.85);
    expect(share(score.s['4-10'].within[1], score.s['4-10'].arrivals)).toBeGreaterThanOrEqual(0.75);
  });

  it('gives a polarity for at least 80 % of P with SNR >= 10, right for at least 95 % of those', () => {
    expect(share(score.polarity.given, score.polarity.arrivals)).toBeGreaterThanOrEqual(0.8);
    expect(share(score.polarity.right, score.polarity.given)).toBeGreaterThanOrEqual(0.95);
  });

  it('finds every event with P above SNR 5 at 4 or more sites and writes no false candidate event', () => {
    expect(score.eventsToFind).toBeGreaterThanOrEqual(5);
    expect(score.eventsFound).toBe(score.eventsToFind);
    expect(score.falseEvents).toBe(0); // under 0.5 per hour over 0.27 h means none
  });
});
