import { describe, expect, it } from 'vitest';
import { eventLocation, LocationJobs } from '../../../renderer/panels/locationJobs';
import { locateReviewEvent, predictedArrivals, wadatiOfEvent } from '../../../core/location/fromReview';
import { DEFAULT_MODEL } from '../../../core/location/velocityModel';
import { realLocationCase } from './realLocationCase';

describe('eventLocation: what the location worker computes for the panels', () => {
  const c = realLocationCase();

  it('is core/location called directly, value for value: location, Wadati fit and predicted arrivals of a real event', () => {
    const got = eventLocation(c.event, c.sites, c.model);
    const direct = locateReviewEvent(c.event, c.sites, c.model);
    if (!direct.ok) throw new Error(direct.message);
    expect(got.location).toEqual(direct);
    expect(got.wadati).toEqual(wadatiOfEvent(c.event));
    expect(got.predicted).toEqual(predictedArrivals(direct.value.hypocentre, c.sites, c.model));
    expect(got.predicted!.size).toBe(c.sites.size);
  });

  it('passes the options on (a held depth) and reports a location that cannot be had as a value with no predictions', () => {
    const held = eventLocation(c.event, c.sites, c.model, { fixedDepthKm: 0.5 });
    expect(held.location).toEqual(locateReviewEvent(c.event, c.sites, c.model, { fixedDepthKm: 0.5 }));
    expect(held.location.ok && held.location.value.hypocentre.depthFixed).toBe(true);
    const three = { ...c.event, picks: c.event.picks.filter((p) => p.phase === 'P').slice(0, 3) };
    const few = eventLocation(three, c.sites, c.model);
    expect(few.location.ok).toBe(false);
    expect(few.location).toEqual(locateReviewEvent(three, c.sites, c.model));
    expect(few.predicted).toBeNull();
  });

  it('turns a pick that the locator refuses (malformed channel) into a failed location carrying the locator\'s message', () => {
    const bad = { ...c.event, picks: [...c.event.picks, { ...c.event.picks[0], id: 'bad', channel: 'XX.ONLY' }] };
    expect(() => locateReviewEvent(bad, c.sites, c.model)).toThrow(RangeError);
    const got = eventLocation(bad, c.sites, c.model);
    expect(got.location).toEqual({ ok: false, code: 'did-not-converge', message: 'channel must be "NET.STA.LOC.CHA", got "XX.ONLY"', skipped: [] });
  });
});

describe('LocationJobs: the worker\'s side, holding the sites and model it was sent', () => {
  const c = realLocationCase();
  const context = { key: 1, sites: [...c.sites], model: c.model };

  it('answers panels and locate requests with the context sent once, and says so when asked for one it does not hold', () => {
    const jobs = new LocationJobs();
    const a = jobs.answer({ id: 1, kind: 'panels', event: c.event, contextKey: 1, context });
    if (!a.ok || a.kind !== 'panels') throw new Error('panels request failed');
    expect(a.value).toEqual(eventLocation(c.event, c.sites, c.model));
    expect(a.ms).toBeGreaterThanOrEqual(0);
    const b = jobs.answer({ id: 2, kind: 'locate', event: c.event, contextKey: 1, context: null });
    if (!b.ok || b.kind !== 'locate') throw new Error('locate request failed');
    expect(b.value).toEqual(locateReviewEvent(c.event, c.sites, c.model));
    expect(jobs.answer({ id: 3, kind: 'locate', event: c.event, contextKey: 2, context: null })).toEqual({ id: 3, ok: false, message: 'location context 2 not held (holding 1)', stale: true });
  });

  it('uses a new context as soon as it comes (another model gives another solution)', () => {
    const jobs = new LocationJobs();
    jobs.answer({ id: 1, kind: 'locate', event: c.event, contextKey: 1, context });
    const b = jobs.answer({ id: 2, kind: 'locate', event: c.event, contextKey: 2, context: { key: 2, sites: [...c.sites], model: DEFAULT_MODEL } });
    if (!b.ok) throw new Error(b.message);
    expect(b.value).toEqual(locateReviewEvent(c.event, c.sites, DEFAULT_MODEL));
    expect(b.value).not.toEqual(locateReviewEvent(c.event, c.sites, c.model));
  });
});
