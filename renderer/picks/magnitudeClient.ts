/**
 * The desk's side of the magnitude worker (magnitudeWorker.ts), one job at a time
 * (renderer/latestOnly.ts):
 * - `compute`: the open event's magnitude. Sends the event, and the raw pieces when they are new to
 *   the worker (moved, not copied; it keeps them for the next edit). Only the newest waiting job runs.
 * - `measure`: a magnitude for the event list or an export, from pieces read for it alone (moved to
 *   the worker, not copied), after any `compute` job waiting.
 * The channels' metadata and the sites go to the worker when the sites change (by identity: the
 * desk sets both when a dataset opens).
 */
import type { EvaluationStatus } from '../../core/pick/types';
import type { ReviewLocation, SiteLocation } from '../../core/location/fromReview';
import type { RawPiece, ReviewMagnitude } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { ReviewEvent } from '../../core/review/types';
import type { MagnitudePieces, MagnitudeReply, MagnitudeRequest } from './magnitudeProtocol';
import { LatestOnly } from '../latestOnly';
import { WorkerCalls, type WorkerPort } from '../workerPort';

interface MagnitudeInput {
  ev: ReviewEvent;
  loc: ReviewLocation;
  evaluationStatus: EvaluationStatus;
  metas(): ChannelMeta[];
  sites(): ReadonlyMap<string, SiteLocation>;
}

export interface MagnitudeJob extends MagnitudeInput {
  /** Identifies what the pieces were read for ("channels|from|to"). */
  readKey: string;
  /**
   * Reads the raw pieces (only called when the worker does not hold them for readKey). They are moved
   * to the worker: return pieces read for this call, which nothing else uses.
   */
  read(): Promise<RawPiece[]>;
}

/** A job with its own pieces (they are moved to the worker: do not use them afterwards). */
export interface MeasureJob extends MagnitudeInput {
  pieces: RawPiece[];
}

type Job = { kind: 'compute'; job: MagnitudeJob } | { kind: 'measure'; job: MeasureJob };

export class MagnitudeWorker {
  private readonly calls: WorkerCalls<MagnitudeRequest, MagnitudeReply>;
  /** readKey of the pieces the worker holds. */
  private heldKey: string | null = null;
  private contextKey = 0;
  /** The sites the worker's context was made with. */
  private sentSites: ReadonlyMap<string, SiteLocation> | null = null;
  private readonly jobs = new LatestOnly<Job, { value: ReviewMagnitude | null; ms: number }>((job) => this.run(job));

  constructor(worker?: WorkerPort) {
    this.calls = new WorkerCalls(worker ?? new Worker(new URL('./magnitudeWorker.ts', import.meta.url), { type: 'module' }), 'magnitude');
  }

  /**
   * The open event's magnitude (null when it has none) and the worker's computing time, ms. One job runs at
   * a time; a job still waiting when a newer one comes is dropped (its promise rejects with
   * SupersededError), so stepping through events does not queue a magnitude computation for each.
   */
  compute(job: MagnitudeJob): Promise<{ value: ReviewMagnitude | null; ms: number }> {
    return this.jobs.submit({ kind: 'compute', job });
  }

  /** The magnitude of `job.ev` from `job.pieces` (null when it has none), after the jobs asked before it. */
  async measure(job: MeasureJob): Promise<ReviewMagnitude | null> {
    return (await this.jobs.queue({ kind: 'measure', job })).value;
  }

  private async run(j: Job): Promise<{ value: ReviewMagnitude | null; ms: number }> {
    const job = j.job;
    for (let attempt = 0; attempt < 2; attempt++) {
      const sites = job.sites();
      const fresh = this.sentSites !== sites || attempt > 0;
      if (fresh) {
        this.contextKey++;
        this.sentSites = sites;
      }
      let pieces: MagnitudePieces;
      if (j.kind === 'measure') {
        pieces = { kind: 'once', pieces: onlyRead(j.job.pieces) };
      } else if (this.heldKey !== j.job.readKey || attempt > 0) {
        pieces = { kind: 'hold', readKey: j.job.readKey, pieces: onlyRead(await j.job.read()) };
        this.heldKey = j.job.readKey;
      } else {
        pieces = { kind: 'held', readKey: j.job.readKey };
      }
      // Samples sent are moved, not copied: at 60 sites the copy took the interface thread about 8 ms per event opened.
      const transfer = new Set<ArrayBuffer>();
      if (pieces.kind !== 'held') for (const p of pieces.pieces) if (p.samples.buffer instanceof ArrayBuffer) transfer.add(p.samples.buffer);
      const req: MagnitudeRequest = {
        id: this.calls.id(), ev: job.ev, loc: job.loc, evaluationStatus: job.evaluationStatus, pieces, contextKey: this.contextKey,
        context: fresh ? { key: this.contextKey, metas: job.metas(), sites: [...sites] } : null,
      };
      const reply = await this.calls.call(req, [...transfer]);
      if (reply.ok) return { value: reply.value, ms: reply.ms };
      if (!reply.stale || j.kind === 'measure') throw new Error(reply.message);
    }
    throw new Error('the magnitude worker lost the pieces or metadata it was sent');
  }

  terminate(): void {
    this.calls.terminate();
  }
}

/** Only the fields the magnitude reads (a window piece also carries its drawing pyramid). */
function onlyRead(pieces: readonly RawPiece[]): RawPiece[] {
  return pieces.map((p) => ({ key: p.key, start: p.start, sampleRate: p.sampleRate, samples: p.samples, clipped: p.clipped }));
}
