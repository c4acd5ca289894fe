/**
 * The desk's side of the magnitude worker: sends the event (and the raw pieces when they are new to
 * the worker) and gives back the magnitude with the time its computation took.
 */
import type { EvaluationStatus } from '../../core/pick/types';
import type { ReviewLocation, SiteLocation } from '../../core/location/fromReview';
import type { RawPiece, ReviewMagnitude } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { ReviewEvent } from '../../core/review/types';
import type { MagnitudeData, MagnitudeReply, MagnitudeRequest } from './magnitudeProtocol';
import { LatestOnly } from '../latestOnly';

export interface MagnitudeJob {
  ev: ReviewEvent;
  loc: ReviewLocation;
  evaluationStatus: EvaluationStatus;
  /** Identifies what the pieces were read for ("channels|from|to"). */
  readKey: string;
  /** Reads the raw pieces (only called when the worker does not hold them for readKey). */
  read(): Promise<RawPiece[]>;
  metas(): ChannelMeta[];
  sites(): ReadonlyMap<string, SiteLocation>;
}

export class MagnitudeWorker {
  private readonly worker = new Worker(new URL('./magnitudeWorker.ts', import.meta.url), { type: 'module' });
  private readonly pending = new Map<number, (r: MagnitudeReply) => void>();
  private nextId = 1;
  /** readKey of the pieces last sent. */
  private sentKey: string | null = null;

  constructor() {
    this.worker.onmessage = (e: MessageEvent<MagnitudeReply>) => {
      const done = this.pending.get(e.data.id);
      this.pending.delete(e.data.id);
      done?.(e.data);
    };
    this.worker.onerror = (e) => {
      for (const [, done] of this.pending) done({ id: 0, ok: false, message: `magnitude worker failed: ${e.message}`, stale: false });
      this.pending.clear();
    };
  }

  private readonly jobs = new LatestOnly<MagnitudeJob, { value: ReviewMagnitude | null; ms: number }>((job) => this.run(job));

  /**
   * The job's magnitude (null when it has none) and the worker's computing time, ms. One job runs at
   * a time; a job still waiting when a newer one comes is dropped (its promise rejects with
   * SupersededError), so stepping through events does not queue a magnitude for each.
   */
  compute(job: MagnitudeJob): Promise<{ value: ReviewMagnitude | null; ms: number }> {
    return this.jobs.submit(job);
  }

  private async run(job: MagnitudeJob): Promise<{ value: ReviewMagnitude | null; ms: number }> {
    for (let attempt = 0; attempt < 2; attempt++) {
      let data: MagnitudeData | null = null;
      if (this.sentKey !== job.readKey || attempt > 0) {
        // Only the fields the magnitude reads (a window piece also carries its drawing pyramid).
        const pieces = (await job.read()).map((p) => ({ key: p.key, start: p.start, sampleRate: p.sampleRate, samples: p.samples, clipped: p.clipped }));
        data = { readKey: job.readKey, pieces, metas: job.metas(), sites: [...job.sites()] };
        this.sentKey = job.readKey;
      }
      const id = this.nextId++;
      const req: MagnitudeRequest = { id, ev: job.ev, loc: job.loc, evaluationStatus: job.evaluationStatus, readKey: job.readKey, data };
      const reply = await new Promise<MagnitudeReply>((resolve) => {
        this.pending.set(id, resolve);
        this.worker.postMessage(req);
      });
      if (reply.ok) return { value: reply.value, ms: reply.ms };
      if (!reply.stale) throw new Error(reply.message);
    }
    throw new Error('the magnitude worker lost the pieces it was sent');
  }

  terminate(): void {
    this.worker.terminate();
    this.pending.clear();
  }
}
