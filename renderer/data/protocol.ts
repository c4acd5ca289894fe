/**
 * Messages between the renderer's main thread and its data workers. Samples travel as transferred
 * typed arrays, never as JSON lists.
 */
import type { FilterRequest } from '../../core/dsp';
import type { Micros } from '../../core/time';

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
}
export interface WindowReply {
  type: 'window'; id: number;
  pieces: WindowPiece[];
  notes: string[];
  errors: { path: string; offset: number; reason: string }[];
}

export interface FailReply { type: 'fail'; id: number; message: string }

export type WorkerRequest = IndexRequest | WindowRequest;
export type WorkerReply = IndexReply | WindowReply | FailReply;
