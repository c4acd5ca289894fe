/**
 * What the location worker computes, as plain functions (so tests can run them without a worker):
 * `eventLocation` is the open event's location, Wadati fit and predicted arrivals for the panels;
 * `LocationJobs` answers the worker's requests with the sites and model it holds.
 *
 * The worker holds the model object across requests: the travel-time code keeps its compiled
 * layers and tables per model object (core/location/travelTime.ts, travelTimeTable.ts), so a model
 * sent with every request would be compiled again for each.
 */
import {
  locateReviewEvent, predictedArrivals, wadatiOfEvent,
  type PredictedArrival, type ReviewLocateOptions, type ReviewLocateResult, type SiteLocation,
} from '../../core/location/fromReview';
import type { VelocityModel } from '../../core/location/velocityModel';
import type { WadatiResult } from '../../core/location/wadati';
import type { ReviewEvent } from '../../core/review/types';
import type { LocationContext, LocationReply, LocationRequest } from './locationProtocol';

/** What the panels draw from: the event's location, its Wadati fit, and the first P and S at every site. */
export interface EventLocation {
  location: ReviewLocateResult;
  wadati: WadatiResult;
  /** Null when the event is not located. */
  predicted: Map<string, PredictedArrival> | null;
}

/**
 * Locates `event` (core/location/fromReview.ts), fits its Wadati line and predicts the arrivals at
 * every site from the solution. Failures are values: a location that throws (a bad pick or site)
 * becomes a 'did-not-converge' failure with its message, a Wadati fit that throws a 'degenerate' one.
 */
export function eventLocation(
  event: ReviewEvent, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel, options?: ReviewLocateOptions,
): EventLocation {
  let location: ReviewLocateResult;
  let wadati: WadatiResult;
  try {
    location = locateReviewEvent(event, sites, model, options);
  } catch (e) {
    location = { ok: false, code: 'did-not-converge', message: e instanceof Error ? e.message : String(e), skipped: [] };
  }
  try {
    wadati = wadatiOfEvent(event);
  } catch (e) {
    wadati = { ok: false, code: 'degenerate', message: e instanceof Error ? e.message : String(e) };
  }
  const predicted = location.ok ? predictedArrivals(location.value.hypocentre, sites, model) : null;
  return { location, wadati, predicted };
}

/** The worker's side: keeps the last context and answers requests with it. */
export class LocationJobs {
  private held: { key: number; sites: Map<string, SiteLocation>; model: VelocityModel } | null = null;

  answer(req: LocationRequest): LocationReply {
    if (req.context) this.hold(req.context);
    const h = this.held;
    if (!h || h.key !== req.contextKey) return { id: req.id, ok: false, message: `location context ${req.contextKey} not held (holding ${h?.key ?? 'none'})`, stale: true };
    const t0 = performance.now();
    try {
      if (req.kind === 'panels') {
        const value = eventLocation(req.event, h.sites, h.model, req.options);
        return { id: req.id, ok: true, kind: 'panels', value, ms: performance.now() - t0 };
      }
      const value = locateReviewEvent(req.event, h.sites, h.model, req.options);
      return { id: req.id, ok: true, kind: 'locate', value, ms: performance.now() - t0 };
    } catch (e) {
      return { id: req.id, ok: false, message: e instanceof Error ? e.message : String(e), stale: false };
    }
  }

  private hold(c: LocationContext): void {
    this.held = { key: c.key, sites: new Map(c.sites), model: c.model };
  }
}
