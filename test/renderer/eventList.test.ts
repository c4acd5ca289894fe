import { describe, expect, it } from 'vitest';
import { eventTime, sitesWithPicks, sortEvents, SORT_KEYS, type EventMeasure } from '../../renderer/eventList';
import type { ReviewEvent, ReviewPick, ReviewState } from '../../core/review';

const pick = (channel: string, i: number, time = i): ReviewPick => ({
  id: `p${i}`, phase: 'P', channel, time, lower: 0.1, upper: 0.1, onset: 'impulsive', polarity: null, mode: 'manual', status: 'confirmed', snr: null, questionableTiming: false,
});
/** Picks from 20 s into the window, 0.1 s apart (a detector's candidate window opens 20 s before its first pick). */
const event = (id: string, start: number, state: ReviewState, sites: number, picksPerSite = 1): ReviewEvent => ({
  id, source: 'detector', start, end: start + 60e6, state, type: null, typeCertainty: null, note: '',
  picks: Array.from({ length: sites * picksPerSite }, (_, i) => pick(`XX.S${i % sites}.00.HHZ`, i, start + 20e6 + i * 1e5)),
});
const events = [event('a', 3e6, 'done', 4), event('b', 1e6, 'todo', 7, 2), event('c', 2e6, 'discarded', 1), event('d', 4e6, 'started', 7)];
const measures: Record<string, EventMeasure> = { a: { rmsS: 0.2, ml: 1.1 }, b: { rmsS: null, ml: null }, c: { rmsS: 0.05, ml: 2.5 }, d: { rmsS: 0.3, ml: null } };
const measure = (e: ReviewEvent) => measures[e.id];
const ids = (list: ReviewEvent[]) => list.map((e) => e.id);

describe('eventTime', () => {
  it('is the earliest P pick used in the location, else the earliest pick not rejected, else the window start', () => {
    const e = event('x', 5e6, 'todo', 3);
    expect(eventTime(e)).toBe(25e6);
    const s = { ...e.picks[0], id: 's', phase: 'S' as const, time: 24e6 };
    const rejectedP = { ...e.picks[1], id: 'r', time: 23e6, status: 'rejected' as const };
    expect(eventTime({ ...e, picks: [...e.picks, s, rejectedP] })).toBe(25e6);
    expect(eventTime({ ...e, picks: [s, rejectedP] })).toBe(24e6);
    const leftOutP = { ...e.picks[1], id: 'l', time: 22e6, excluded: true };
    expect(eventTime({ ...e, picks: [...e.picks, leftOutP] })).toBe(25e6);
    expect(eventTime({ ...e, picks: [s, leftOutP] })).toBe(22e6);
    expect(eventTime({ ...e, picks: [] })).toBe(5e6);
  });
});

describe('sortEvents', () => {
  it('counts sites with picks, not picks', () => {
    expect(events.map(sitesWithPicks)).toEqual([4, 7, 1, 7]);
  });

  it('sorts by time, and by review state in working order (to do, started, done, discarded)', () => {
    expect(ids(sortEvents(events, 'time', false, measure))).toEqual(['b', 'c', 'a', 'd']);
    expect(ids(sortEvents(events, 'state', false, measure))).toEqual(['b', 'd', 'a', 'c']);
  });

  it('sorts by sites with picks, most first, ties by time; and the other way round', () => {
    expect(ids(sortEvents(events, 'sites', true, measure))).toEqual(['b', 'd', 'a', 'c']);
    expect(ids(sortEvents(events, 'sites', false, measure))).toEqual(['c', 'a', 'b', 'd']);
  });

  it('puts events without a value last whichever way, in time order', () => {
    expect(ids(sortEvents(events, 'rms', true, measure))).toEqual(['d', 'a', 'c', 'b']);
    expect(ids(sortEvents(events, 'rms', false, measure))).toEqual(['c', 'a', 'd', 'b']);
    expect(ids(sortEvents(events, 'magnitude', true, measure))).toEqual(['c', 'a', 'b', 'd']);
  });

  it('offers time and state smallest first, sites, RMS and magnitude largest first', () => {
    expect(SORT_KEYS.map((k) => [k.key, k.descending])).toEqual([['time', false], ['state', false], ['sites', true], ['rms', true], ['magnitude', true]]);
  });
});
