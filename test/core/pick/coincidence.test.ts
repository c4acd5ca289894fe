import { describe, expect, it } from 'vitest';
import { coincidence, idTime, siteDistanceKm, unexplainedTriggers, type PredictedArrivals, type SitePosition } from '../../../core/pick/coincidence';
import type { StationTrigger } from '../../../core/pick/types';
import { microsFromIso } from '../../../core/time';
import { numpy, numpyVersions } from './numpy';

const T = microsFromIso('2026-12-02T03:29:24.400000Z');

function trig(station: string, onSeconds: number, lengthSeconds = 20): StationTrigger {
  const on = T + Math.round(onSeconds * 1e6);
  const off = on + Math.round(lengthSeconds * 1e6);
  return { id: { network: 'XX', station, location: '', channel: 'HHZ' }, on, off, peakRatio: 8, peakTime: on + 500_000, start: on - 10_000_000, end: off + 20_000_000, endedBy: 'ratio' };
}

// Four sites on a 20 km square (flat coordinates, km); a fifth 200 km away.
const square = new Map<string, SitePosition>([
  ['XX.A', { x: 0, y: 0 }], ['XX.B', { x: 20, y: 0 }], ['XX.C', { x: 0, y: 20 }], ['XX.D', { x: 20, y: 20 }],
  ['XX.F', { x: 200, y: 0 }],
]);
// P from a source at (10, 10), 8 km deep, 6 km/s: every site at sqrt(100 + 100 + 64) = 16.25 km, 2.708 s;
// trigger delays of 0.1-0.4 s on top.
const event = [trig('A', 2.81), trig('B', 2.91), trig('C', 3.01), trig('D', 3.11)];

describe('site distance', () => {
  it(`great-circle distances match the haversine formula computed by numpy (${numpyVersions()}) and worked values`, () => {
    const pairs: [SitePosition & { latitude: number; longitude: number }, SitePosition & { latitude: number; longitude: number }][] = [
      [{ latitude: 0, longitude: 0 }, { latitude: 1, longitude: 0 }],
      [{ latitude: 0, longitude: 0 }, { latitude: 0, longitude: 90 }],
      [{ latitude: 46.05, longitude: 14.51 }, { latitude: 45.81, longitude: 15.98 }],
      [{ latitude: -33.9, longitude: 151.2 }, { latitude: 51.5, longitude: -0.13 }],
    ];
    const flat = new Float64Array(pairs.flatMap(([a, b]) => [a.latitude, a.longitude, b.latitude, b.longitude]));
    const [want] = numpy(`
p = np.radians(inputs[0].reshape(-1, 4))
h = np.sin((p[:, 2] - p[:, 0]) / 2) ** 2 + np.cos(p[:, 0]) * np.cos(p[:, 2]) * np.sin((p[:, 3] - p[:, 1]) / 2) ** 2
outputs = [2 * 6371.0 * np.arcsin(np.sqrt(h))]`, [flat]);
    pairs.forEach(([a, b], i) => expect(siteDistanceKm(a, b)).toBeCloseTo(want[i], 9));
    // One degree of a meridian on a sphere of radius 6371 km: 6371 pi / 180 = 111.195 km; a quarter of the equator 10007.5 km.
    expect(siteDistanceKm(pairs[0][0], pairs[0][1])).toBeCloseTo(111.195, 3);
    expect(siteDistanceKm(pairs[1][0], pairs[1][1])).toBeCloseTo(10007.543, 3);
    expect(siteDistanceKm({ x: 0, y: 0 }, { x: 3, y: 4 })).toBe(5);
    expect(() => siteDistanceKm({ x: 0, y: 0 }, { latitude: 0, longitude: 0 })).toThrow(TypeError);
  });
});

describe('network coincidence', () => {
  it('four sites triggering within what their distances allow make one event; a noise trigger 30 s earlier is left out', () => {
    const ev = coincidence([trig('B', -27), ...event], square, { network: 'XX' });
    expect(ev.length).toBe(1);
    expect(ev[0].sites).toEqual(['XX.A', 'XX.B', 'XX.C', 'XX.D']);
    expect(ev[0].time).toBe(event[0].on);
    expect(ev[0].id).toBe('XX.20261202T032927'); // 03:29:27.21 rounded down to the second
    expect(ev[0].start).toBe(event[0].start);
    expect(ev[0].end).toBe(event[3].end);
  });

  it('triggers further apart in time than distance / vMin + slack do not group', () => {
    // A and B are 20 km apart: at most 20/3 + 1 = 7.67 s. A and C at 8 s apart break the rule.
    const far = [trig('A', 0), trig('B', 7.5), trig('C', 8.0)];
    const ev = coincidence(far, square, { network: 'XX', minSites: 2 });
    expect(ev.map((e) => e.sites)).toEqual([['XX.A', 'XX.B']]);
    expect(coincidence(far, square, { network: 'XX' })).toEqual([]);
  });

  it('at least minSites sites (default 3) must agree', () => {
    expect(coincidence(event.slice(0, 2), square, { network: 'XX' })).toEqual([]);
    expect(coincidence(event.slice(0, 2), square, { network: 'XX', minSites: 2 }).length).toBe(1);
    expect(coincidence(event.slice(0, 3), square, { network: 'XX' }).length).toBe(1);
  });

  it('later triggers of member sites within the event (e.g. on S) are kept as secondary and do not make a second event', () => {
    const sTrig = [trig('A', 6.0, 5), trig('B', 6.2, 5), trig('C', 6.3, 5)];
    const ev = coincidence([...event.map((t) => ({ ...t, off: t.on + 3_000_000 })), ...sTrig], square, { network: 'XX' });
    expect(ev.length).toBe(1);
    expect(ev[0].secondary.map((t) => t.id.station)).toEqual(['A', 'B', 'C']);
  });

  it('the result does not depend on the order of the triggers', () => {
    const a = coincidence([...event, trig('B', 60), trig('C', 60.5), trig('A', 61)], square, { network: 'XX' });
    const b = coincidence([trig('A', 61), event[2], trig('C', 60.5), event[0], event[3], trig('B', 60), event[1]], square, { network: 'XX' });
    expect(b).toEqual(a);
    expect(a.map((e) => e.id)).toEqual(['XX.20261202T032927', 'XX.20261202T033024']);
  });

  it('two events in the same grid cell get suffixes b, c in time order', () => {
    expect(idTime(T, 1)).toBe('20261202T032924');
    expect(idTime(T, 2)).toBe('20261202T032924');
    expect(idTime(T + 1_700_000, 2)).toBe('20261202T032926');
    // vMin 100 km/s and slack 0.1 s: at most 28.3/100 + 0.1 = 0.38 s between triggers here.
    const first = [trig('A', 0.0), trig('B', 0.1), trig('C', 0.2)].map((t) => ({ ...t, off: t.on + 200_000 }));
    const second = [trig('A', 0.8, 1), trig('B', 0.85, 1), trig('C', 0.9, 1)];
    const ev = coincidence([...first, ...second], square, { network: 'XX', slack: 0.1, vMin: 100, idGrid: 2 });
    expect(ev.map((e) => e.id)).toEqual(['XX.20261202T032924', 'XX.20261202T032924b']);
  });

  it('a re-scan whose late data add an earlier trigger keeps the earlier scan\'s identifier when given it', () => {
    const first = coincidence(event, square, { network: 'XX' });
    // Late data from a site closer to the source triggered 0.5 s before A, in the previous second.
    const withLate = [...event, { ...trig('F', 2.3) }];
    const positions = new Map(square).set('XX.F', { x: 10, y: 12 });
    const fresh = coincidence(withLate, positions, { network: 'XX' });
    expect(fresh[0].id).toBe('XX.20261202T032926');
    const kept = coincidence(withLate, positions, { network: 'XX', previous: first });
    expect(kept[0].id).toBe(first[0].id);
    expect(kept[0].sites.length).toBe(5);
  });

  it('triggers of sites without a position are left out', () => {
    const ev = coincidence([...event.slice(0, 2), trig('Q', 3.0)], square, { network: 'XX' });
    expect(ev).toEqual([]);
  });

  it('rejects bad options naming the value and the allowed range', () => {
    expect(() => coincidence(event, square, { network: 'XX', minSites: 0 })).toThrow(/minSites must be an integer >= 1, got 0/);
    expect(() => coincidence(event, square, { network: 'XX', vMin: -1 })).toThrow(/vMin \(km\/s\) must be > 0, got -1/);
    expect(() => coincidence(event, square, { network: 'a b' })).toThrow(/network must be 1-16 letters/);
  });
});

// A second event inside the first one's coincidence window. Straight rays in a uniform half-space,
// vp 6.0 and vs 3.5 km/s (values chosen for the test), t = hypocentral distance / v, worked by hand:
//   first event at (10, 10), 8 km deep, origin T: every site at sqrt(100 + 100 + 64) = 16.2481 km,
//     P 2.70801 s, S 4.64231 s;
//   second event at (0, 0), 8 km deep, origin T + 8 s: site A at 8 km, P 1.33333 s; B and C at
//     sqrt(400 + 64) = 21.5407 km, P 3.59011 s; D at sqrt(800 + 64) = 29.3939 km, P 4.89898 s; so P
//     at A 9.33333, B and C 11.59011, D 12.89898 s after T.
// Triggers come 0.1-0.2 s after their onsets (a fraction of the STA window).
describe('triggers a located candidate does not explain (a second event in its window)', () => {
  const P1 = 2.70801, S1 = 4.64231;
  const first = [trig('A', 2.81, 1.5), trig('B', 2.91, 1.5), trig('C', 3.01, 1.5), trig('D', 3.11, 1.5)];
  const sTriggers = [trig('A', 4.80, 1.5), trig('D', 4.75, 1.5)];
  const second = [trig('A', 9.45, 1.5), trig('B', 11.70, 1.5), trig('C', 11.75, 1.5), trig('D', 13.05, 1.5)];
  const at = (s: number) => T + Math.round(s * 1e6);
  const firstOrigin: PredictedArrivals = (site) => (square.has(site) ? { P: at(P1), S: at(S1) } : null);

  it('the coincidence makes one candidate of both events; the triggers the first origin explains at neither P nor S are the second event\'s', () => {
    const events = coincidence([...first, ...sTriggers, ...second], square, { network: 'XX' });
    // The second event's triggers all come within the first's span plus the largest move-out
    // (sqrt(800) / 3 + 1 = 10.43 s after the last member's off time), so they are secondary.
    expect(events.length).toBe(1);
    expect(events[0].secondary.length).toBe(6);
    const left = unexplainedTriggers(events[0], firstOrigin, 1.0, 3);
    // S triggers 0.16 and 0.11 s after the predicted S are explained; the others lie 4.8-8.4 s after it.
    expect(left.map((t) => [t.id.station, (t.on - T) / 1e6])).toEqual([['A', 9.45], ['B', 11.7], ['C', 11.75], ['D', 13.05]]);
    // Coincidence on them again: one candidate of four sites, at the second event's first trigger,
    // its identifier from that time (T + 9.45 s = 03:29:33.85).
    const again = coincidence(left, square, { network: 'XX', reserved: new Set([events[0].id]) });
    expect(again.length).toBe(1);
    expect(again[0].sites).toEqual(['XX.A', 'XX.B', 'XX.C', 'XX.D']);
    expect(again[0].time).toBe(at(9.45));
    expect(again[0].id).toBe('XX.20261202T032933');
    // An identifier already given is skipped.
    expect(coincidence(left, square, { network: 'XX', reserved: new Set(['XX.20261202T032933']) })[0].id).toBe('XX.20261202T032933b');
  });

  it('a trigger within slack of the predicted P or S is explained, just outside it is not', () => {
    // C triggers 1.001 s before the predicted P (its first trigger, so a member, and the seed), and
    // again at 3.01 s; A and B trigger 0.999 and 1.001 s after the predicted S.
    const ev = coincidence([...first, trig('C', P1 - 1.001, 1.5), trig('A', S1 + 0.999, 1.5), trig('B', S1 + 1.001, 1.5)], square, { network: 'XX' })[0];
    expect(ev.triggers.map((t) => t.id.station)).toEqual(['C', 'A', 'B', 'D']);
    expect(ev.secondary.length).toBe(3);
    const left = unexplainedTriggers(ev, firstOrigin, 1.0, 3);
    expect(left.map((t) => [t.id.station, t.on - T])).toEqual([['C', 1_707_010], ['B', 5_643_310]]);
    expect(unexplainedTriggers(ev, firstOrigin, 1.002, 3)).toEqual([]);
  });

  it('nothing is left when the origin explains the triggers of fewer than minSites sites, or a site has no prediction', () => {
    const events = coincidence([...first, ...second], square, { network: 'XX' });
    // Predictions only for C and D, 100 s away: no site explained, so the origin is not this candidate's.
    const elsewhere: PredictedArrivals = (site) => (site === 'XX.C' || site === 'XX.D' ? { P: at(100), S: at(110) } : null);
    expect(unexplainedTriggers(events[0], elsewhere, 1.0, 3)).toEqual([]);
    // Sites without a prediction (A, B) count as explained: two sites, enough for minSites 2, and
    // C's and D's triggers (first and second event) are left.
    expect(unexplainedTriggers(events[0], elsewhere, 1.0, 2).map((t) => [t.id.station, (t.on - T) / 1e6]))
      .toEqual([['C', 3.01], ['D', 3.11], ['C', 11.75], ['D', 13.05]]);
  });

  it('refuses a bad slack or minSites', () => {
    const ev = coincidence(first, square, { network: 'XX' })[0];
    expect(() => unexplainedTriggers(ev, firstOrigin, -1, 3)).toThrow(/slack \(s\) must be >= 0, got -1/);
    expect(() => unexplainedTriggers(ev, firstOrigin, 1, 0)).toThrow(/minSites must be an integer >= 1, got 0/);
  });
});
