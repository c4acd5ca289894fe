/**
 * A light index of a miniSEED file's records: channel, byte offset, length and time span of each,
 * from the headers alone (no sample is decoded). The review app keeps it per file after its first
 * pass, then reads only the byte ranges of the records an event window needs.
 */
import { channelKey } from '../model';
import type { Micros } from '../time';
import { parseRecordHeader, looksLikeRecordStart, FIXED_HEADER_LENGTH } from './header';
import { MiniSeedError } from './errors';

export interface IndexedRecord {
  /** "NET.STA.LOC.CHA". */
  readonly channel: string;
  readonly offset: number;
  readonly length: number;
  /** Time of the first sample and the expected time of the sample after the last, µs. */
  readonly start: Micros;
  readonly end: Micros;
}

export interface RecordIndex {
  readonly records: IndexedRecord[];
  /** Byte offsets where the walk met something that was not a readable record header. */
  readonly problems: number[];
}

/** Walks the record headers of `bytes` (a whole file). Unreadable stretches are stepped over. */
export function indexRecords(bytes: Uint8Array, path: string): RecordIndex {
  const records: IndexedRecord[] = [];
  const problems: number[] = [];
  const len = bytes.length;
  let p = 0;
  while (p + FIXED_HEADER_LENGTH <= len) {
    let ok = false;
    if (looksLikeRecordStart(bytes, p)) {
      try {
        const h = parseRecordHeader(bytes, p, path);
        if (p + h.recordLength <= len) {
          const dur = h.sampleRate > 0 ? Math.round((h.sampleCount * 1e6) / h.sampleRate) : 0;
          records.push({ channel: channelKey(h.id), offset: p, length: h.recordLength, start: h.start, end: h.start + dur });
          p += h.recordLength;
          ok = true;
        }
      } catch (e) {
        if (!(e instanceof MiniSeedError)) throw e;
      }
    }
    if (!ok) {
      if (problems.length === 0 || problems[problems.length - 1] !== p - 1) problems.push(p);
      p++;
      while (p + FIXED_HEADER_LENGTH <= len && !looksLikeRecordStart(bytes, p)) p++;
    }
  }
  return { records, problems };
}

/** A byte range of one file. */
export interface ByteRange {
  readonly offset: number;
  readonly length: number;
}

/**
 * Byte ranges holding every record of the given channels that overlaps [start, end) µs, adjacent
 * or nearly adjacent records (closer than `joinGap` bytes) merged into one range.
 */
export function rangesForWindow(index: RecordIndex, channels: ReadonlySet<string>, start: Micros, end: Micros, joinGap = 16384): ByteRange[] {
  const picked: IndexedRecord[] = [];
  for (const r of index.records) {
    if (r.end > start && r.start < end && channels.has(r.channel)) picked.push(r);
  }
  picked.sort((a, b) => a.offset - b.offset);
  const out: { offset: number; length: number }[] = [];
  for (const r of picked) {
    const last = out[out.length - 1];
    if (last && r.offset <= last.offset + last.length + joinGap) {
      last.length = Math.max(last.length, r.offset + r.length - last.offset);
    } else out.push({ offset: r.offset, length: r.length });
  }
  return out;
}
