/**
 * The data model every part of Daybreak shares: channels named by SEED codes, segments of
 * continuous samples that keep each record's own start time, and a channel's segments with the gaps
 * and overlaps between them.
 */
import type { Micros } from './time';

/** A channel's SEED identity. Codes are kept as written, without padding spaces. */
export interface ChannelId {
  readonly network: string;
  readonly station: string;
  readonly location: string;
  readonly channel: string;
}

/** "NET.STA.LOC.CHA", the form used as a key and in every report (location may be empty: "NET.STA..CHA"). */
export function channelKey(id: ChannelId): string {
  return `${id.network}.${id.station}.${id.location}.${id.channel}`;
}

/** Parses "NET.STA.LOC.CHA" back into its codes. */
export function parseChannelKey(key: string): ChannelId {
  const parts = key.split('.');
  if (parts.length !== 4) throw new RangeError(`channel id must be NET.STA.LOC.CHA, got "${key}"`);
  const [network, station, location, channel] = parts;
  return { network, station, location, channel };
}

/** "NET.STA", the site a channel belongs to. */
export function stationKey(id: Pick<ChannelId, 'network' | 'station'>): string {
  return `${id.network}.${id.station}`;
}

/** Samples of a segment: integers as decoded (counts), or floats. */
export type SampleArray = Int32Array | Float32Array | Float64Array;

/** SEED data encodings (SEED manual v2.4, blockette 1000 field 3). */
export const Encoding = {
  Ascii: 0,
  Int16: 1,
  Int24: 2,
  Int32: 3,
  Float32: 4,
  Float64: 5,
  Steim1: 10,
  Steim2: 11,
} as const;

export function encodingName(code: number): string {
  switch (code) {
    case 0: return 'ASCII';
    case 1: return 'INT16';
    case 2: return 'INT24';
    case 3: return 'INT32';
    case 4: return 'FLOAT32';
    case 5: return 'FLOAT64';
    case 10: return 'STEIM1';
    case 11: return 'STEIM2';
    default: return `encoding ${code}`;
  }
}

/** A stretch of time, both ends inclusive of the samples they name. */
export interface TimeSpan {
  readonly start: Micros;
  readonly end: Micros;
}

/** Timing facts a segment's records carried, summed over the segment. */
export interface TimingSummary {
  /** Lowest and highest blockette 1001 timing quality (0-100 %), or null when no record had it. */
  qualityMin: number | null;
  qualityMax: number | null;
  /** Records whose I/O-and-clock flags said the clock was locked (bit 5). */
  clockLockedRecords: number;
  /** Records whose data-quality flags said the time tag is questionable (bit 7). */
  questionableTimeRecords: number;
  /** Records that carried a leap-second flag (activity bits 4/5) or a second field of 60. */
  leapSecondRecords: number;
  /** Records whose Steim integration constant did not match the last decoded sample. */
  steimMismatchRecords: number;
  /** All records in the segment. */
  records: number;
}

/**
 * A run of samples from records that continue each other. `recordStarts` and `recordFirstSample`
 * hold, per record in the segment, its own start time and the index of its first sample, so the time
 * of sample i is taken from the record that holds it ({@link sampleTime}), never from
 * start + i / rate over a whole day (digitiser clocks drift, and records carry that drift).
 */
export interface Segment {
  readonly id: ChannelId;
  /** Samples per second (the nominal rate, or blockette 100's actual rate when present). */
  readonly sampleRate: number;
  /** Time of the first sample. */
  readonly start: Micros;
  /** Time of the last sample. */
  readonly end: Micros;
  readonly samples: SampleArray;
  /** Per record: start time (µs), in record order. */
  readonly recordStarts: Float64Array;
  /** Per record: index in `samples` of its first sample. */
  readonly recordFirstSample: Int32Array;
  /** SEED encoding code of the records (the first record's if they differ). */
  readonly encoding: number;
  /** Record length in bytes (the first record's if they differ). */
  readonly recordLength: number;
  /** Data-quality indicator of the records: 'D', 'R', 'Q' or 'M'. */
  readonly quality: string;
  readonly timing: TimingSummary;
}

/** Index of the record in `seg` that holds sample `i` (binary search). */
export function recordIndexOf(seg: Segment, i: number): number {
  const first = seg.recordFirstSample;
  let lo = 0;
  let hi = first.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (first[mid] <= i) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Time of sample `i` of `seg`, from the start time of the record that holds it (µs, rounded). */
export function sampleTime(seg: Segment, i: number): Micros {
  const r = recordIndexOf(seg, i);
  return seg.recordStarts[r] + Math.round(((i - seg.recordFirstSample[r]) * 1e6) / seg.sampleRate);
}

/** Overlapping data with samples that disagree, kept apart from the segment it overlaps. */
export interface Overlap extends TimeSpan {
  /** The data that did not fit: the later-arriving segment. */
  readonly segment: Segment;
}

/** One channel's data from all the files read: its segments in time order and what lies between. */
export interface ChannelData {
  readonly id: ChannelId;
  readonly segments: Segment[];
  /** Missing data between consecutive segments: start = the sample after the last one, end = the next segment's first sample. */
  readonly gaps: TimeSpan[];
  /** Overlapping data whose samples differ from the segment already held. */
  readonly overlaps: Overlap[];
  /** Records dropped because an identical record (same time span and samples) was already held. */
  readonly duplicatesDropped: number;
}

/** A log (encoding 0, ASCII) channel: text, listed but not treated as a waveform. */
export interface LogChannel {
  readonly id: ChannelId;
  readonly entries: { readonly time: Micros; readonly text: string }[];
}
