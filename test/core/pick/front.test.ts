import { describe, expect, it } from 'vitest';
import { coincidence, type SitePosition } from '../../../core/pick/coincidence';
import { afterFront, earliestFront } from '../../../core/pick/front';
import type { CandidateEvent, StationTrigger } from '../../../core/pick/types';
import { microsFromIso } from '../../../core/time';

const T = microsFromIso('2026-12-02T03:29:24.000000Z');

function trig(station: string, onSeconds: number, lengthSeconds = 1.5): StationTrigger {
  const on = T + Math.round(onSeconds * 1e6);
  const off = on + Math.round(lengthSeconds * 1e6);
  return { id: { network: 'XX', station, location: '', channel: 'HHZ' }, on, off, peakRatio: 8, peakTime: on + 500_000, start: on - 10_000_000, end: off + 20_000_000, endedBy: 'ratio' };
}
const at = (s: number) => T + Math.round(s * 1e6);
const seconds = (ts: readonly StationTrigger[]) => ts.map((t) => [t.id.station, (t.on - T) / 1e6]);

// Five sites on flat coordinates (km). Distances worked by hand: AB 10, AC 20, AD 30, AE 40, BC
// sqrt(10^2 + 20^2) = 22.36, BD 20, BE 30, CD sqrt(30^2 + 20^2) = 36.06, CE sqrt(40^2 + 20^2) = 44.72, DE 10.
const sites = new Map<string, SitePosition>([
  ['XX.A', { x: 0, y: 0 }], ['XX.B', { x: 10, y: 0 }], ['XX.C', { x: 0, y: 20 }], ['XX.D', { x: 30, y: 0 }], ['XX.E', { x: 40, y: 0 }],
]);
// A first event reaching A, B and C at 0, 1.5 and 2.0 s; a second one reaching D and E at 7.5 and 9.5 s.
const pair = [trig('A', 0), trig('B', 1.5), trig('C', 2.0), trig('D', 7.5), trig('E', 9.5)];
// The picker's network first P bound (core/pick/eventSites LOCAL_EVENT_PICKING): 5 km/s plus 1 s.
const SPEED = 5, SLACK = 1;

describe('earliestFront', () => {
  it('keeps the triggers one P wave front can hold, from the earliest (worked by hand)', () => {
    // The coincidence's own bound (3 km/s + 1 s) holds all five: e.g. D - A = 7.5 <= 30/3 + 1 = 11,
    // E - C = 7.5 <= 44.72/3 + 1 = 15.9, D - B = 6 <= 20/3 + 1 = 7.67 s. One candidate.
    const events = coincidence(pair, sites, { network: 'XX' });
    expect(events.length).toBe(1);
    expect(events[0].sites).toEqual(['XX.A', 'XX.B', 'XX.C', 'XX.D', 'XX.E']);
    // At 5 km/s + 1 s: B - A = 1.5 <= 10/5 + 1 = 3; C - A = 2 <= 20/5 + 1 = 5 and C - B = 0.5 <= 22.36/5 + 1 = 5.47,
    // so A, B, C; D - A = 7.5 > 30/5 + 1 = 7 and E - A = 9.5 > 40/5 + 1 = 9: not held.
    const front = earliestFront(events[0], sites, SPEED, SLACK, 3)!;
    expect(front).not.toBeNull();
    expect(seconds(front.triggers)).toEqual([['A', 0], ['B', 1.5], ['C', 2.0]]);
    expect(front.sites).toEqual(['XX.A', 'XX.B', 'XX.C']);
    expect(front.id).toBe(events[0].id);
    expect(front.time).toBe(at(0));
    expect(front.secondary).toEqual([]);
    // start and end: the triggers' own (10 s before on; 1.5 s + 20 s after on), so from A's and C's.
    expect(front.start).toBe(at(-10));
    expect(front.end).toBe(at(2.0 + 1.5 + 20));
  });

  it('is null when every member fits one front, or when the front holds fewer than minSites sites', () => {
    const one = coincidence([trig('A', 0), trig('B', 1.5), trig('C', 2.0)], sites, { network: 'XX' })[0];
    expect(earliestFront(one, sites, SPEED, SLACK, 3)).toBeNull();
    const two = coincidence(pair, sites, { network: 'XX' })[0];
    expect(earliestFront(two, sites, SPEED, SLACK, 4)).toBeNull();
  });

  it('a trigger just inside the bound joins, just outside it does not', () => {
    // D - A = 7.0 s, exactly A's bound 30/5 + 1 = 7: joins; E - A = 9.001 s, 0.001 s beyond 40/5 + 1 = 9: does not.
    const ev = coincidence([trig('A', 0), trig('D', 7.0), trig('E', 9.001), trig('C', 2.0)], sites, { network: 'XX' })[0];
    // C - A = 2 <= 5; D - A = 7 <= 7, D - C = 5 <= 36.06/5 + 1 = 8.21: held. E: beyond A's bound.
    expect(seconds(earliestFront(ev, sites, SPEED, SLACK, 3)!.triggers)).toEqual([['A', 0], ['C', 2.0], ['D', 7.0]]);
  });

  it('refuses a speed, slack or minSites it cannot use', () => {
    const ev = coincidence(pair, sites, { network: 'XX' })[0];
    expect(() => earliestFront(ev, sites, 0, SLACK, 3)).toThrow(/speed/);
    expect(() => earliestFront(ev, sites, SPEED, -1, 3)).toThrow(/slack/);
    expect(() => earliestFront(ev, sites, SPEED, SLACK, 0)).toThrow(/minSites/);
  });
});

describe('afterFront', () => {
  it('gives the triggers later than more than half of the front allows for a P (worked by hand)', () => {
    // The candidate of the first test with secondary triggers at A (3.0 s) and B (9.0 s).
    const base = coincidence(pair, sites, { network: 'XX' })[0];
    const ev: CandidateEvent = { ...base, secondary: [trig('A', 3.0), trig('B', 9.0)] };
    const front = earliestFront(ev, sites, SPEED, SLACK, 3)!;
    // Bounds from the front's triggers A 0, B 1.5, C 2.0:
    //  D 7.5: > 0 + 30/5 + 1 = 7 (A), > 1.5 + 20/5 + 1 = 6.5 (B), not > 2 + 36.06/5 + 1 = 10.21 (C): 2 of 3, later.
    //  E 9.5: > 0 + 9 (A), > 1.5 + 30/5 + 1 = 8.5 (B), not > 2 + 44.72/5 + 1 = 11.94 (C): 2 of 3, later.
    //  A 3.0: > 0 + 0 + 1 (A), not > 1.5 + 3 (B), not > 2 + 5 (C): 1 of 3, not later.
    //  B 9.0: > 0 + 3 (A), > 1.5 + 1 (B), > 2 + 22.36/5 + 1 = 7.47 (C): 3 of 3, later.
    expect(seconds(afterFront(ev, front, sites, SPEED, SLACK))).toEqual([['D', 7.5], ['B', 9.0], ['E', 9.5]]);
    // The coincidence on them again: three sites agreeing (B - D = 1.5 <= 20/3 + 1, E - D = 2 <= 10/3 + 1,
    // E - B = 0.5 <= 30/3 + 1): one candidate of its own, from D's trigger at 7.5 s (03:29:31.5).
    const again = coincidence(afterFront(ev, front, sites, SPEED, SLACK), sites, { network: 'XX', reserved: new Set([ev.id]) });
    expect(again.map((e) => [e.id, e.sites])).toEqual([['XX.20261202T032931', ['XX.D', 'XX.B', 'XX.E']]]);
  });

  it('exactly on the bound is not later', () => {
    const base = coincidence([trig('A', 0), trig('B', 1.5), trig('C', 2.0)], sites, { network: 'XX' })[0];
    // D at 7.0 s: exactly A's bound (0 + 30/5 + 1 = 7, not later), later than B's (1.5 + 20/5 + 1 = 6.5),
    // within C's (2 + 36.06/5 + 1 = 10.21): later than 1 of 3, not more than half.
    const ev: CandidateEvent = { ...base, triggers: [...base.triggers, trig('D', 7.0)] };
    const front: CandidateEvent = { ...base, secondary: [] };
    expect(afterFront(ev, front, sites, SPEED, SLACK)).toEqual([]);
  });
});
