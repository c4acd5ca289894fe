/**
 * Messages between the renderer's main thread and its data workers. Samples travel as transferred
 * typed arrays, never as JSON lists.
 */
import type { FilterRequest } from '../../core/dsp';
import type { Micros } from '../../core/time';
import type { Envelope } from '../../core/view/envelope';

export interface SegmentSummary {
  start: Micros;
  end: Micros;
  sampleRate: number;
  samples: number;
  encoding: number;
  recordLength: number;
  timingQualityMin: number | null;
  questionableTimeRecords: number;
  clockLockedRecords: number;
  records: number;
}

export interface ChannelSummary {
  key: string;
  segments: SegmentSummary[];
  gaps: { start: Micros; end: Micros }[];
  overlaps: { start: Micros; end: Micros }[];
  duplicatesDropped: number;
}

/** Levels of one channel on the absolute grid of `binMicros` bins; bin k starts at (firstBin + k) * binMicros. */
export interface ChannelLevels {
  key: string;
  firstBin: number;
  rms: Float32Array;
  peak: Float32Array;
  /** 1 where the bin looks clipped (core/view/levels' rule), else 0. */
  clipped: Uint8Array;
}

export interface IndexRequest { type: 'index'; id: number; path: string; bytes: Uint8Array; binMicros: number }
export interface IndexReply {
  type: 'index'; id: number; path: string;
  /** Record index as parallel arrays: channel (index into `channelKeys`), offset, length, start, end. */
  channelKeys: string[];
  recChannel: Int32Array; recOffset: Float64Array; recLength: Int32Array; recStart: Float64Array; recEnd: Float64Array;
  channels: ChannelSummary[];
  levels: ChannelLevels[];
  errors: { offset: number; reason: string }[];
  logChannels: string[];
}

export interface WindowChunk { path: string; base: number; bytes: Uint8Array }
export interface WindowRequest {
  type: 'window'; id: number;
  chunks: WindowChunk[];
  /** Channels wanted, "NET.STA.LOC.CHA". */
  channels: string[];
  start: Micros;
  end: Micros;
  filter: FilterRequest | null;
  zeroPhase: boolean;
  /** Identifies the decoded data; when the worker still holds data under this key, `chunks` is empty and it is reused. */
  cacheKey: string;
  /** Keep the decoded data for the next request (windows of the view); other reads leave the kept data alone. */
  keep: boolean;
}
/** A continuous piece of a channel inside the window. */
export interface WindowPiece {
  key: string;
  /** Time of samples[0], µs. */
  start: Micros;
  sampleRate: number;
  samples: Float32Array;
  /** Largest absolute raw count in the piece (to spot clipping against the digitiser's range). */
  rawPeak: number;
  /** The raw samples sit flat at their peak for 4 samples or more: clipped. */
  clipped: boolean;
  /**
   * Every raw sample has one value (a dead channel): the filtered samples are then set to zero, as a
   * constant filters to nothing, instead of the filter's dying start-up magnified by the scaling.
   */
  flat: boolean;
  /** Min/max pyramid of `samples` for drawing, built in the worker once per filter. */
  envelope: Envelope;
}
export interface WindowReply {
  type: 'window'; id: number;
  pieces: WindowPiece[];
  notes: string[];
  errors: { path: string; offset: number; reason: string }[];
  /** Where the worker spent its time, ms: decoding (0 when the kept data was reused), filtering, trimming and building pyramids. */
  timing: { decodeMs: number; filterMs: number; packMs: number };
}

/** Decoded view windows (or parts of one) a worker keeps; the oldest is dropped beyond this. */
export const KEPT_WINDOWS = 4;

/** The worker no longer holds the data a request without chunks asked for (the caller reads it again). */
export const NOT_KEPT = 'window data not kept';

export interface FailReply { type: 'fail'; id: number; message: string }

export type WorkerRequest = IndexRequest | WindowRequest;
export type WorkerReply = IndexReply | WindowReply | FailReply;
