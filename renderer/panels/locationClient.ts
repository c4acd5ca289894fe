/**
 * The desk's side of the location worker (locationWorker.ts). Two kinds of job share it, one at a
 * time (renderer/latestOnly.ts):
 * - `panels`: the open event's location, Wadati fit and predicted arrivals. Only the newest waiting
 *   job runs; an older one still waiting rejects with SupersededError, so moving a pick or stepping
 *   through events never queues a location per step.
 * - `locate`: a location for the event list or an export, in the order asked, after any panels job;
 *   `panelsLater`: the panels' results the same way (events located ahead of being opened).
 * The sites and the model go to the worker only when they change (by identity), and it holds them.
 *
 *   const locator = new LocationWorker();
 *   const { value, ms } = await locator.panels(event, sites, model);   // EventLocation
 *   const r = await locator.locate(event, sites, model);               // ReviewLocateResult
 */
import type { ReviewLocateOptions, ReviewLocateResult, SiteLocation } from '../../core/location/fromReview';
import type { VelocityModel } from '../../core/location/velocityModel';
import type { ReviewEvent } from '../../core/review/types';
import { LatestOnly } from '../latestOnly';
import { WorkerCalls, type WorkerPort } from '../workerPort';
import type { EventLocation } from './locationJobs';
import type { LocationReply, LocationRequest } from './locationProtocol';


interface Job {
  kind: 'panels' | 'locate';
  event: ReviewEvent;
  sites: ReadonlyMap<string, SiteLocation>;
  model: VelocityModel;
  options?: ReviewLocateOptions;
}

type Answer = { kind: 'panels'; value: EventLocation; ms: number } | { kind: 'locate'; value: ReviewLocateResult; ms: number };

export class LocationWorker {
  private readonly calls: WorkerCalls<LocationRequest, LocationReply>;
  private contextKey = 0;
  /** The sites and model the worker holds (as last sent). */
  private sent: { sites: ReadonlyMap<string, SiteLocation>; model: VelocityModel } | null = null;
  private readonly jobs = new LatestOnly<Job, Answer>((job) => this.run(job));

  constructor(worker?: WorkerPort) {
    this.calls = new WorkerCalls(worker ?? new Worker(new URL('./locationWorker.ts', import.meta.url), { type: 'module' }), 'location');
  }

  /**
   * The open event's location, Wadati fit and predicted arrivals, and the worker's computing time
   * (ms). Rejects with SupersededError when a newer panels job came before this one started.
   */
  async panels(event: ReviewEvent, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel, options?: ReviewLocateOptions): Promise<{ value: EventLocation; ms: number }> {
    const a = await this.jobs.submit({ kind: 'panels', event, sites, model, options });
    if (a.kind !== 'panels') throw new Error('the location worker answered a panels job with a location only');
    return { value: a.value, ms: a.ms };
  }

  /** As `panels`, but in the background lane: after the jobs asked before it, never dropped. */
  async panelsLater(event: ReviewEvent, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel, options?: ReviewLocateOptions): Promise<{ value: EventLocation; ms: number }> {
    const a = await this.jobs.queue({ kind: 'panels', event, sites, model, options });
    if (a.kind !== 'panels') throw new Error('the location worker answered a panels job with a location only');
    return { value: a.value, ms: a.ms };
  }

  /** locateReviewEvent(event, sites, model, options) in the worker, after the jobs asked before it. */
  async locate(event: ReviewEvent, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel, options?: ReviewLocateOptions): Promise<ReviewLocateResult> {
    const a = await this.jobs.queue({ kind: 'locate', event, sites, model, options });
    if (a.kind !== 'locate') throw new Error('the location worker answered a location job with panels');
    return a.value;
  }

  private async run(job: Job): Promise<Answer> {
    for (let attempt = 0; attempt < 2; attempt++) {
      const fresh = !this.sent || this.sent.sites !== job.sites || this.sent.model !== job.model;
      if (fresh) {
        this.contextKey++;
        this.sent = { sites: job.sites, model: job.model };
      }
      const req: LocationRequest = {
        id: this.calls.id(), kind: job.kind, event: job.event, options: job.options, contextKey: this.contextKey,
        context: fresh ? { key: this.contextKey, sites: [...job.sites], model: job.model } : null,
      };
      const reply = await this.calls.call(req);
      if (reply.ok) return reply.kind === 'panels' ? { kind: 'panels', value: reply.value, ms: reply.ms } : { kind: 'locate', value: reply.value, ms: reply.ms };
      if (!reply.stale) throw new Error(reply.message);
      this.sent = null;
    }
    throw new Error('the location worker lost the sites and model it was sent');
  }

  terminate(): void {
    this.calls.terminate();
  }
}
