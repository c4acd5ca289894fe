/** Messages between the desk and the magnitude worker (renderer/picks/magnitudeWorker.ts). */
import type { EvaluationStatus } from '../../core/pick/types';
import type { ReviewLocation, SiteLocation } from '../../core/location/fromReview';
import type { RawPiece, ReviewMagnitude } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { ReviewEvent } from '../../core/review/types';

/** What the pieces were read for ("channels|from|to"), and, when they are new to the worker, the pieces. */
export interface MagnitudeData {
  readKey: string;
  pieces: RawPiece[];
  metas: ChannelMeta[];
  sites: [string, SiteLocation][];
}

export interface MagnitudeRequest {
  id: number;
  ev: ReviewEvent;
  loc: ReviewLocation;
  evaluationStatus: EvaluationStatus;
  readKey: string;
  /** Null: use the pieces held for `readKey`. */
  data: MagnitudeData | null;
}

export type MagnitudeReply =
  | { id: number; ok: true; value: ReviewMagnitude | null; ms: number }
  /** `stale`: the worker does not hold the pieces for the request's readKey (send them). */
  | { id: number; ok: false; message: string; stale: boolean };
