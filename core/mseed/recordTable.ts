/**
 * The collector's waveform records as columns of typed arrays (one row per record, rows numbered in
 * the order the records were added), instead of one object per record. A station-day holds about
 * 8,000 records per channel-file; as objects they were several MiB of live young-generation heap
 * that every garbage collection during a read (the large output arrays trigger some) had to copy
 * and trace. Columns are a handful of flat arrays that the collector neither copies nor traces.
 */
import type { SampleArray } from '../model';

/** Rows allocated at first; the columns double when full. */
const INITIAL_ROWS = 1024;

export class RecordTable {
  /** Rows in use. */
  length = 0;
  private capacity = 0;

  // ---- from the header (set by add) ----
  /** Index of the file (collector order). */
  file = new Int32Array(0);
  /** Byte offset of the record in its file. */
  offset = new Float64Array(0);
  /** Time of the first sample, µs since the epoch. */
  start = new Float64Array(0);
  /** Sample rate, samples/s. */
  rate = new Float64Array(0);
  /** Samples in the record. */
  count = new Int32Array(0);
  /** SEED data encoding (blockette 1000 field 3). */
  encoding = new Uint8Array(0);
  /** 1 when the data section is little-endian. */
  littleEndian = new Uint8Array(0);
  /** Record length, bytes. */
  recordLength = new Int32Array(0);
  /** Offset of the first data byte from the record start, bytes. */
  dataOffset = new Int32Array(0);
  /** Bit 0 clock locked, 1 questionable time, 2 leap second. */
  flags = new Uint8Array(0);
  /** Blockette 1001 timing quality in %, -1 when absent. */
  timingQuality = new Int16Array(0);
  /** Data quality indicator as a character code (D, R, Q, M). */
  quality = new Uint8Array(0);
  /** Index of the record's channel (collector order). */
  channel = new Int32Array(0);

  // ---- set while planning and decoding ----
  /** Segment sample index where this record's samples from `skip` on are placed (-1: none). */
  at = new Int32Array(0);
  /** Leading samples that overlap data already held: compared, not placed. */
  skip = new Int32Array(0);
  /** Index of the segment (in its channel's plan) this record belongs to, -1 when none. */
  seg = new Int32Array(0);
  /** Held samples this record's first `skip` samples are compared with start at this index. */
  heldAt = new Int32Array(0);
  /** 0 ok, 1 decoded with Steim mismatch, 2 could not be decoded. */
  status = new Uint8Array(0);
  /** 1 when pass 2 has been through this record. */
  decoded = new Uint8Array(0);
  /** Overlapping records: 0 not compared yet, 1 same samples as held, 2 different. */
  verdict = new Uint8Array(0);
  /** The first `skip` samples of overlapping records, decoded in pass 2 (rare), by row. */
  readonly head = new Map<number, SampleArray>();

  /** Appends a record; returns its row. */
  add(
    file: number, offset: number, start: number, rate: number, count: number, encoding: number, littleEndian: boolean,
    recordLength: number, dataOffset: number, flags: number, timingQuality: number, quality: number, channel: number,
  ): number {
    if (this.length === this.capacity) this.grow();
    const r = this.length++;
    this.file[r] = file;
    this.offset[r] = offset;
    this.start[r] = start;
    this.rate[r] = rate;
    this.count[r] = count;
    this.encoding[r] = encoding;
    this.littleEndian[r] = littleEndian ? 1 : 0;
    this.recordLength[r] = recordLength;
    this.dataOffset[r] = dataOffset;
    this.flags[r] = flags;
    this.timingQuality[r] = timingQuality;
    this.quality[r] = quality;
    this.channel[r] = channel;
    this.at[r] = -1;
    this.seg[r] = -1;
    return r;
  }

  private grow(): void {
    const n = Math.max(INITIAL_ROWS, this.capacity * 2);
    this.file = widen(this.file, new Int32Array(n));
    this.offset = widen(this.offset, new Float64Array(n));
    this.start = widen(this.start, new Float64Array(n));
    this.rate = widen(this.rate, new Float64Array(n));
    this.count = widen(this.count, new Int32Array(n));
    this.encoding = widen(this.encoding, new Uint8Array(n));
    this.littleEndian = widen(this.littleEndian, new Uint8Array(n));
    this.recordLength = widen(this.recordLength, new Int32Array(n));
    this.dataOffset = widen(this.dataOffset, new Int32Array(n));
    this.flags = widen(this.flags, new Uint8Array(n));
    this.timingQuality = widen(this.timingQuality, new Int16Array(n));
    this.quality = widen(this.quality, new Uint8Array(n));
    this.channel = widen(this.channel, new Int32Array(n));
    this.at = widen(this.at, new Int32Array(n));
    this.skip = widen(this.skip, new Int32Array(n));
    this.seg = widen(this.seg, new Int32Array(n));
    this.heldAt = widen(this.heldAt, new Int32Array(n));
    this.status = widen(this.status, new Uint8Array(n));
    this.decoded = widen(this.decoded, new Uint8Array(n));
    this.verdict = widen(this.verdict, new Uint8Array(n));
    this.capacity = n;
  }
}

function widen<T extends Int32Array | Float64Array | Uint8Array | Int16Array>(old: T, to: T): T {
  to.set(old as never);
  return to;
}
