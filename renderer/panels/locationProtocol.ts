/** Messages between the desk and the location worker (renderer/panels/locationWorker.ts). */
import type { ReviewLocateOptions, ReviewLocateResult, SiteLocation } from '../../core/location/fromReview';
import type { VelocityModel } from '../../core/location/velocityModel';
import type { ReviewEvent } from '../../core/review/types';
import type { EventLocation } from './locationJobs';

/** The sites and the model the jobs are located with; sent when they change, held by the worker. */
export interface LocationContext {
  key: number;
  sites: [string, SiteLocation][];
  model: VelocityModel;
}

export interface LocationRequest {
  id: number;
  /** 'panels': location, Wadati fit and predicted arrivals (eventLocation); 'locate': the location only (locateReviewEvent). */
  kind: 'panels' | 'locate';
  event: ReviewEvent;
  options?: ReviewLocateOptions;
  contextKey: number;
  /** Null: use the context held for `contextKey`. */
  context: LocationContext | null;
}

export type LocationReply =
  | { id: number; ok: true; kind: 'panels'; value: EventLocation; ms: number }
  | { id: number; ok: true; kind: 'locate'; value: ReviewLocateResult; ms: number }
  /** `stale`: the worker does not hold the context the request names (send it). */
  | { id: number; ok: false; message: string; stale: boolean };
