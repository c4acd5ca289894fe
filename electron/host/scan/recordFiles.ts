/**
 * Time-window access to a set of miniSEED files for the scan: a first walk over every file's record
 * headers in fixed-size chunks (core/mseed indexRecords: offsets, lengths, channel, time span of
 * each record; no samples decoded), then reads of only the records that a channel set needs in a time
 * window, decoded by the core's two-pass collector (which joins records across files, e.g. day files
 * split at midnight, into continuous segments). Memory: the record index (a few dozen bytes per
 * record) plus the samples of one window.
 */
import { open } from 'node:fs/promises';
import { channelKey, type ChannelData } from '../../../core/model';
import { MiniSeedCollector, MAX_RECORD_LENGTH, type RecordError } from '../../../core/mseed';
import { indexRecords, rangesForWindow, type IndexedRecord, type RecordIndex } from '../../../core/mseed/recordIndex';
import type { Micros } from '../../../core/time';

/** Bytes read per header-walk chunk. */
export const INDEX_CHUNK_BYTES = 8 * 1024 * 1024;

export interface IndexedFile {
  readonly path: string;
  readonly size: number;
  readonly index: RecordIndex;
}

/**
 * Walks the record headers of one file in chunks of `chunkBytes`. Records are taken from a chunk
 * only when complete in it; the next chunk starts after the last complete record. A bad stretch is
 * reported once, by the offset where it starts (as indexRecords reports it).
 */
export async function indexFile(path: string, size: number, chunkBytes = INDEX_CHUNK_BYTES): Promise<IndexedFile> {
  if (!(chunkBytes >= 2 * MAX_RECORD_LENGTH)) throw new RangeError(`chunkBytes must be at least ${2 * MAX_RECORD_LENGTH}, got ${chunkBytes}`);
  const records: IndexedRecord[] = [];
  const problems: number[] = [];
  const fh = await open(path, 'r');
  try {
    const buf = new Uint8Array(Math.min(chunkBytes, Math.max(size, 1)));
    let pos = 0;
    while (pos < size) {
      const want = Math.min(buf.length, size - pos);
      let got = 0;
      while (got < want) {
        const { bytesRead } = await fh.read(buf, got, want - got, pos + got);
        if (bytesRead === 0) break;
        got += bytesRead;
      }
      const atEnd = pos + got >= size || got < want;
      const part = indexRecords(buf.subarray(0, got), path);
      let end = 0;
      for (const r of part.records) {
        records.push({ ...r, offset: r.offset + pos });
        end = r.offset + r.length;
      }
      // Problems after the last complete record may be a record cut by the chunk's end: looked at again.
      const limit = atEnd ? got : Math.max(end, got - MAX_RECORD_LENGTH);
      for (const p of part.problems) {
        if (p >= limit) continue;
        const abs = p + pos;
        if (problems.length === 0 || problems[problems.length - 1] !== abs) problems.push(abs);
      }
      if (atEnd) break;
      pos += Math.max(end, limit);
    }
  } finally {
    await fh.close();
  }
  return { path, size, index: { records, problems } };
}

/** Channels and errors read for one window. */
export interface WindowRead {
  readonly channels: ChannelData[];
  /** Per file path: records that failed to decode (offset in the file, reason). */
  readonly errors: { path: string; error: RecordError }[];
  /** Bytes read from disk. */
  readonly bytes: number;
}

/**
 * The samples of `channels` ("NET.STA.LOC.CHA") in [from, to) µs: every record overlapping the
 * window, from every file, decoded and joined. Segments may reach outside the window by up to one
 * record at each end; callers cut them.
 */
export async function readWindow(files: readonly IndexedFile[], channels: ReadonlySet<string>, from: Micros, to: Micros): Promise<WindowRead> {
  const collector = new MiniSeedCollector();
  const parts: { file: number; path: string; ranges: { offset: number; bytes: Uint8Array }[] }[] = [];
  let total = 0;
  for (const f of files) {
    const ranges = rangesForWindow(f.index, channels, from, to, 0);
    if (ranges.length === 0) continue;
    const file = collector.addFile(f.path);
    const got: { offset: number; bytes: Uint8Array }[] = [];
    const fh = await open(f.path, 'r');
    try {
      for (const r of ranges) {
        const bytes = new Uint8Array(r.length);
        let n = 0;
        while (n < r.length) {
          const { bytesRead } = await fh.read(bytes, n, r.length - n, r.offset + n);
          if (bytesRead === 0) break;
          n += bytesRead;
        }
        got.push({ offset: r.offset, bytes: bytes.subarray(0, n) });
        total += n;
      }
    } finally {
      await fh.close();
    }
    for (const g of got) collector.scan(file, g.bytes, g.offset, true);
    parts.push({ file, path: f.path, ranges: got });
  }
  collector.plan();
  for (const p of parts) for (const g of p.ranges) collector.decode(p.file, g.bytes, g.offset);
  const result = collector.finish();
  const errors: { path: string; error: RecordError }[] = [];
  for (const f of result.files) for (const e of f.errors) errors.push({ path: f.path, error: e });
  return { channels: result.channels.filter((c) => channels.has(channelKey(c.id))), errors, bytes: total };
}
