import { describe, expect, it } from 'vitest';
import { LocationWorker } from '../../../renderer/panels/locationClient';
import { LocationJobs } from '../../../renderer/panels/locationJobs';
import type { LocationRequest } from '../../../renderer/panels/locationProtocol';
import { SupersededError } from '../../../renderer/latestOnly';
import type { WorkerPort } from '../../../renderer/workerPort';
import { locateReviewEvent, predictedArrivals, wadatiOfEvent } from '../../../core/location/fromReview';
import { checkVelocityModel } from '../../../core/location/velocityModel';
import { realLocationCase } from './realLocationCase';

/**
 * A worker as the browser gives it, minus the thread: every message is structured-cloned on the way
 * in and out (as postMessage does) and answered by LocationJobs on a later task.
 */
class CloningWorker implements WorkerPort {
  onmessage: ((e: MessageEvent) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  readonly received: LocationRequest[] = [];
  /** Replaced by a test to stand for a worker that lost what it held. */
  jobs = new LocationJobs();
  postMessage(message: unknown): void {
    const req = structuredClone(message) as LocationRequest;
    this.received.push(req);
    setTimeout(() => this.onmessage?.({ data: structuredClone(this.jobs.answer(req)) } as MessageEvent), 0);
  }
  terminate(): void {}
}


describe('LocationWorker: locations through the worker\'s messages', () => {
  const c = realLocationCase();

  it('gives the panels exactly what core/location gives called directly: solution, errors, residuals, Wadati fit, predictions', async () => {
    const w = new CloningWorker();
    const locator = new LocationWorker(w);
    const { value } = await locator.panels(c.event, c.sites, c.model);
    const direct = locateReviewEvent(c.event, c.sites, c.model);
    if (!direct.ok || !value.location.ok) throw new Error('not located');
    expect(value.location).toEqual(direct);
    // the figures the analyst reads, bit for bit
    const h = value.location.value.hypocentre;
    const d = direct.value.hypocentre;
    for (const k of ['originTime', 'latDeg', 'lonDeg', 'depthKm', 'rmsS', 'originTimeErrorS', 'depthErrorKm', 'gapDeg'] as const) expect(Object.is(h[k], d[k])).toBe(true);
    expect(h.ellipse).toStrictEqual(d.ellipse);
    expect(value.location.value.arrivals.map((a) => a.residualS)).toStrictEqual(direct.value.arrivals.map((a) => a.residualS));
    expect(value.wadati).toEqual(wadatiOfEvent(c.event));
    expect(value.predicted).toEqual(predictedArrivals(d, c.sites, c.model));
    expect(await locator.locate(c.event, c.sites, c.model, { fixedDepthKm: 1 })).toEqual(locateReviewEvent(c.event, c.sites, c.model, { fixedDepthKm: 1 }));
  });

  it('sends the sites and the model with the first job only, and again when either changes', async () => {
    const w = new CloningWorker();
    const locator = new LocationWorker(w);
    await locator.panels(c.event, c.sites, c.model);
    await locator.locate(c.event, c.sites, c.model);
    const other = checkVelocityModel([{ topKm: 0, vp: 5, vs: 2.9 }], 'other');
    const r = await locator.locate(c.event, c.sites, other);
    expect(w.received.map((q) => q.context !== null)).toEqual([true, false, true]);
    expect(w.received.map((q) => q.contextKey)).toEqual([1, 1, 2]);
    expect(r).toEqual(locateReviewEvent(c.event, c.sites, other));
  });

  it('drops a panels job replaced while waiting, runs the newest, and runs list jobs after it in the order asked', async () => {
    const w = new CloningWorker();
    const locator = new LocationWorker(w);
    const moved = { ...c.event, picks: c.event.picks.map((p, i) => (i === 0 ? { ...p, time: p.time + 30_000 } : p)) };
    const first = locator.panels(c.event, c.sites, c.model);
    const list1 = locator.locate(c.event, c.sites, c.model);
    const stale = locator.panels(c.event, c.sites, c.model);
    const list2 = locator.locate(moved, c.sites, c.model);
    const newest = locator.panels(moved, c.sites, c.model);
    await expect(stale).rejects.toBeInstanceOf(SupersededError);
    const [a, b, l1, l2] = await Promise.all([first, newest, list1, list2]);
    expect(w.received.map((q) => `${q.kind} ${q.event.picks[0].time - c.event.picks[0].time}`)).toEqual(['panels 0', 'panels 30000', 'locate 0', 'locate 30000']);
    expect(a.value.location).toEqual(locateReviewEvent(c.event, c.sites, c.model));
    expect(b.value.location).toEqual(locateReviewEvent(moved, c.sites, c.model));
    expect(l1).toEqual(a.value.location);
    expect(l2).toEqual(b.value.location);
  });

  it('sends the context again when the worker says it lost it, and passes a failure on as an error', async () => {
    const w = new CloningWorker();
    const locator = new LocationWorker(w);
    await locator.locate(c.event, c.sites, c.model);
    w.jobs = new LocationJobs();
    expect(await locator.locate(c.event, c.sites, c.model)).toEqual(locateReviewEvent(c.event, c.sites, c.model));
    expect(w.received.map((q) => q.context !== null)).toEqual([true, false, true]);
    await expect(locator.locate(c.event, c.sites, c.model, { minUncertaintyS: 0 })).rejects.toThrow('minUncertaintyS must be in (0, 10] s, got 0');
  });
});
