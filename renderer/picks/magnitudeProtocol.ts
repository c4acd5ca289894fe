/** Messages between the desk and the magnitude worker (renderer/picks/magnitudeWorker.ts). */
import type { EvaluationStatus } from '../../core/pick/types';
import type { ReviewLocation, SiteLocation } from '../../core/location/fromReview';
import type { RawPiece, ReviewMagnitude } from '../../core/review/reviewMagnitude';
import type { ChannelMeta } from '../../core/stationxml/types';
import type { ReviewEvent } from '../../core/review/types';

/** The channels' metadata and the sites' coordinates; sent when they change, held by the worker. */
export interface MagnitudeContext {
  key: number;
  metas: ChannelMeta[];
  sites: [string, SiteLocation][];
}

/**
 * The raw pieces of a job: those the worker holds for `readKey` ('held'), new ones to hold for the
 * jobs after this one too ('hold': the open event's, kept while its picks move), or pieces for this
 * job only ('once': the event list's and the exports', which leave the held ones alone).
 */
export type MagnitudePieces =
  | { kind: 'held'; readKey: string }
  | { kind: 'hold'; readKey: string; pieces: RawPiece[] }
  | { kind: 'once'; pieces: RawPiece[] };

export interface MagnitudeRequest {
  id: number;
  ev: ReviewEvent;
  loc: ReviewLocation;
  evaluationStatus: EvaluationStatus;
  pieces: MagnitudePieces;
  contextKey: number;
  /** Null: use the context held for `contextKey`. */
  context: MagnitudeContext | null;
}

export type MagnitudeReply =
  | { id: number; ok: true; value: ReviewMagnitude | null; ms: number }
  /** `stale`: the worker does not hold the context or the pieces the request names (send them). */
  | { id: number; ok: false; message: string; stale: boolean };
