/**
 * Assembling records into channels. The collector works in two passes over the bytes so that each
 * output sample array is allocated once, at its final size:
 *
 *   1. `scan`: the record headers of every file (given in chunks of any size) are read and checked;
 *      bad stretches are reported with their byte offset and stepped over; ASCII log text is kept.
 *   2. `plan`: per channel, records are sorted by time and laid out into segments (continuations,
 *      gaps, overlaps); each segment's sample array is allocated from the sample counts.
 *   3. `decode`: the same bytes are given again (in chunks) and every record's samples are decoded
 *      straight into their place.
 *   4. `finish`: overlapping records are compared with the data held (identical = duplicate,
 *      dropped and counted; different = a conflicting overlap, kept apart and listed) and the
 *      channels, gaps and reports are returned.
 *
 * Merge rules: a record continues a segment when its start lies within half a sample of the time
 * after the segment's last sample, its samples are of the same kind (integer / float32 / float64)
 * and its rate differs from the segment's by less than 1e-4 relative (common practice; libmseed's
 * default tolerances are the same half sample and 1e-4). A record starting more than half a sample
 * later begins a new segment after a gap. A record starting earlier overlaps: its first samples
 * (those at times already held) are compared with the held samples, and its remaining samples, if
 * any, continue the segment.
 */
import { type ChannelData, type ChannelId, type LogChannel, type Overlap, type SampleArray, type Segment, type TimeSpan, channelKey } from '../model';
import { microsFromYearDay, type Micros } from '../time';
import { decodeAscii, decodeSamples, SampleKind, sampleKindOf, capacityProblem } from './decode';
import { MiniSeedError, MSEED3_REASON } from './errors';
import {
  FIXED_HEADER_LENGTH, MAX_RECORD_LENGTH, MIN_RECORD_LENGTH, isMiniSeed3, looksLikeRecordStart, miniSeed3RecordLength,
  parseRecordHeader, type RecordHeader,
} from './header';

/** A bad record or a stretch of bytes that is not miniSEED. */
export interface RecordError { offset: number; reason: string }
/** What was found in one file. */
export interface FileReport { path: string; records: number; errors: RecordError[] }
/** Everything read from a set of files. */
export interface MiniSeedReadResult { files: FileReport[]; channels: ChannelData[]; logs: LogChannel[] }

/**
 * Bytes a chunk given to {@link MiniSeedCollector.scan} must extend past a record start (unless the
 * chunk ends the file) for the record to be read from it: the longest record plus the next header.
 */
export const SCAN_LOOKAHEAD = MAX_RECORD_LENGTH + FIXED_HEADER_LENGTH;

/** One waveform record, as much as the merge and the decoder need (numbers only, kept small). */
class RecordRef {
  /** Segment sample index where this record's samples from `skip` on are placed (-1: none). */
  at = -1;
  /** Leading samples that overlap data already held: compared, not placed. */
  skip = 0;
  /** Index of the segment (in its channel's plan) this record belongs to, -1 when none. */
  seg = -1;
  /** Held samples this record's first `skip` samples are compared with start at this index. */
  heldAt = 0;
  /** 0 ok, 1 decoded with Steim mismatch, 2 could not be decoded. */
  status = 0;
  /** Pass 2 has been through this record. */
  decoded = false;
  /** Overlapping records: 0 not compared yet, 1 same samples as held, 2 different. */
  verdict = 0;
  /** The first `skip` samples, decoded in pass 2 (rare: overlapping records only). */
  head: SampleArray | null = null;
  /** The channel's segment plans (set when the record is added). */
  plans: SegmentPlan[] | null = null;

  constructor(
    readonly file: number,
    readonly offset: number,
    readonly start: Micros,
    readonly rate: number,
    readonly count: number,
    readonly encoding: number,
    readonly littleEndian: boolean,
    readonly recordLength: number,
    readonly dataOffset: number,
    /** Bit 0 clock locked, 1 questionable time, 2 leap second. */
    readonly flags: number,
    /** Blockette 1001 timing quality, -1 when absent. */
    readonly timingQuality: number,
    readonly quality: string,
    readonly order: number,
  ) {}

  get kind(): SampleKind { return sampleKindOf(this.encoding); }
}

/** A segment while it is laid out: its records in sample order and its total length. */
interface SegmentPlan {
  kind: SampleKind;
  rate: number;
  records: RecordRef[];
  total: number;
  /** Expected time of the sample after the last one, µs (from the last record's own start). */
  next: number;
  samples: SampleArray | null;
}

interface ChannelBuild {
  id: ChannelId;
  records: RecordRef[];
  plans: SegmentPlan[];
  /** Records that overlap held data, in time order. */
  overlapping: RecordRef[];
}

interface FileState {
  path: string;
  records: number;
  errors: RecordError[];
  /** Records to decode in pass 2, in file order. */
  queue: RecordRef[];
  cursor: number;
  /** Start and reason of a bad stretch being stepped over, or -1. */
  badStart: number;
  badReason: string;
  /** Start of a run of miniSEED 3 records being stepped over, or -1. */
  ms3Start: number;
  ms3Count: number;
  lastRecordLength: number;
  /** Headers of the last streams read in full, for reading their next records quickly (newest last). */
  templates: HeaderTemplate[];
}

/** The header fields the collector uses (a {@link RecordHeader} has them all). */
interface HeaderFields {
  id: ChannelId;
  start: Micros;
  sampleRate: number;
  sampleRateFactor: number;
  sampleRateMultiplier: number;
  sampleCount: number;
  encoding: number;
  littleEndian: boolean;
  recordLength: number;
  dataOffset: number;
  quality: string;
  timingQuality: number | null;
  clockLocked: boolean;
  questionableTime: boolean;
  leapSecond: boolean;
}

/**
 * A record header read in full by parseRecordHeader, kept to read the following records of the same
 * stream without allocating. Consecutive records of a stream differ only in the sequence number,
 * start time, sample count, flags, time correction and blockette 1001's fields; a record whose other
 * header bytes (quality, reserved byte, codes, rate factor and multiplier, data and blockette offsets,
 * every blockette's type and next offset, blockettes 1000 and 100 whole) equal the template's is read
 * from the changing fields alone, with the same range checks parseRecordHeader makes. Anything else
 * (a failed check included) goes to parseRecordHeader, so errors and their wording stay its own.
 */
class HeaderTemplate {
  /** The template record's first bytes (up to its last compared byte). */
  private readonly bytes: Uint8Array;
  /** Offsets (from the record start) of the bytes that must be equal. */
  private readonly same: Int32Array;
  private readonly le: boolean;
  /** Offset of the (last) blockette 1001, -1 without one. */
  private readonly b1001: number;
  /** What {@link read} returns, refilled per record. */
  private readonly out: HeaderFields;

  private constructor(bytes: Uint8Array, same: Int32Array, le: boolean, b1001: number, h: RecordHeader) {
    this.bytes = bytes;
    this.same = same;
    this.le = le;
    this.b1001 = b1001;
    this.out = {
      id: h.id, start: 0, sampleRate: h.sampleRate, sampleRateFactor: h.sampleRateFactor, sampleRateMultiplier: h.sampleRateMultiplier,
      sampleCount: 0, encoding: h.encoding, littleEndian: h.littleEndian, recordLength: h.recordLength, dataOffset: h.dataOffset,
      quality: h.quality, timingQuality: null, clockLocked: false, questionableTime: false, leapSecond: false,
    };
  }

  /** A template from a record parseRecordHeader read at `p`, or null when its kind is not worth one. */
  static from(b: Uint8Array, p: number, h: RecordHeader): HeaderTemplate | null {
    const kind = sampleKindOf(h.encoding);
    if (!h.hasBlockette1000 || kind === SampleKind.Text || kind === SampleKind.Unsupported) return null;
    if (!(h.sampleRate > 0 && Number.isFinite(h.sampleRate))) return null;
    if (h.dataOffset < FIXED_HEADER_LENGTH || h.dataOffset >= h.recordLength) return null;
    const le = h.headerLittleEndian;
    const same: number[] = [];
    const range = (from: number, to: number) => { for (let k = from; k < to; k++) same.push(k); };
    range(6, 20);
    range(32, 36);
    range(44, 48);
    let b1001 = -1;
    for (let blk = u16(b, p + 46, le); blk !== 0; blk = u16(b, p + blk + 2, le)) {
      const type = u16(b, p + blk, le);
      range(blk, blk + 4);
      if (type === 1000 || type === 100) range(blk + 4, blk + 8);
      else if (type === 1001) b1001 = blk;
    }
    const span = Math.max(...same) + 1;
    return new HeaderTemplate(b.slice(p, p + span), Int32Array.from(same), le, b1001, h);
  }

  /**
   * The header of the record at `p` (with `avail` bytes from `p` to the end of the chunk) when it
   * matches the template and passes the checks, else null. The result is reused by the next call.
   */
  read(b: Uint8Array, p: number, avail: number): HeaderFields | null {
    const out = this.out;
    if (avail < out.recordLength) return null;
    const t = this.bytes;
    const same = this.same;
    for (let k = 0; k < same.length; k++) {
      const o = same[k];
      if (b[p + o] !== t[o]) return null;
    }
    for (let k = 0; k < 6; k++) {
      const c = b[p + k];
      if (!((c >= 0x30 && c <= 0x39) || c === 0x20 || c === 0)) return null;
    }
    const le = this.le;
    // parseRecordHeader takes the header as big-endian when the year and day are valid so.
    const yearBE = (b[p + 20] << 8) | b[p + 21];
    const dayBE = (b[p + 22] << 8) | b[p + 23];
    const validBE = yearBE >= 1900 && yearBE <= 2100 && dayBE >= 1 && dayBE <= 366;
    if (validBE === le) return null;
    const year = le ? u16(b, p + 20, true) : yearBE;
    const day = le ? u16(b, p + 22, true) : dayBE;
    if (le && !(year >= 1900 && year <= 2100 && day >= 1 && day <= 366)) return null;
    const hour = b[p + 24];
    const minute = b[p + 25];
    const second = b[p + 26];
    const fract = u16(b, p + 28, le);
    if (hour > 23 || minute > 59 || second > 60 || fract > 9999) return null;
    const activity = b[p + 36];
    const correction = 100 * (le
      ? b[p + 40] | (b[p + 41] << 8) | (b[p + 42] << 16) | (b[p + 43] << 24)
      : (b[p + 40] << 24) | (b[p + 41] << 16) | (b[p + 42] << 8) | b[p + 43]);
    let micros = 0;
    if (this.b1001 >= 0) {
      out.timingQuality = b[p + this.b1001 + 4];
      micros = (b[p + this.b1001 + 5] << 24) >> 24;
    }
    out.start = microsFromYearDay(year, day, hour, minute, second, fract * 100) + micros
      + ((activity & 0x02) === 0 ? correction : 0);
    out.sampleCount = u16(b, p + 30, le);
    out.leapSecond = second === 60 || (activity & 0x30) !== 0;
    out.clockLocked = (b[p + 37] & 0x20) !== 0;
    out.questionableTime = (b[p + 38] & 0x80) !== 0;
    return out;
  }
}

/** Streams per file whose header templates are kept. */
const MAX_TEMPLATES = 8;

function u16(b: Uint8Array, p: number, le: boolean): number {
  return le ? b[p] | (b[p + 1] << 8) : (b[p] << 8) | b[p + 1];
}

function makeArray(kind: SampleKind, n: number): SampleArray {
  return kind === SampleKind.Float32 ? new Float32Array(n) : kind === SampleKind.Float64 ? new Float64Array(n) : new Int32Array(n);
}

function ratesCompatible(a: number, b: number): boolean {
  return Math.abs(a - b) < 1e-4 * a;
}

/**
 * Collects records from any number of files in two passes (see the module comment). Use:
 * `addFile` per file, `scan` over each file's bytes, `plan`, `decode` over each file's bytes again
 * (only the byte ranges `decodeNeeds` says), then `finish`. `readMiniSeedBuffer` and the host's
 * streaming file reader both drive it.
 */
export class MiniSeedCollector {
  private readonly files: FileState[] = [];
  private readonly channels = new Map<string, ChannelBuild>();
  private readonly logs = new Map<string, { id: ChannelId; entries: { time: Micros; text: string }[] }>();
  private order = 0;
  private planned = false;
  /** The channel the last record went to, and the id object it was found by (header templates reuse theirs). */
  private lastId: ChannelId | null = null;
  private lastChannel: ChannelBuild | null = null;

  /** Registers a file (or an in-memory buffer under a name); returns its index. */
  addFile(path: string): number {
    this.files.push({
      path, records: 0, errors: [], queue: [], cursor: 0, badStart: -1, badReason: '', ms3Start: -1, ms3Count: 0,
      lastRecordLength: 0, templates: [],
    });
    return this.files.length - 1;
  }

  /**
   * Pass 1 over `bytes`, which hold the file's bytes from file offset `base` on. Reads every record
   * that starts in the chunk and is complete in it (with {@link SCAN_LOOKAHEAD} bytes after its start,
   * unless `atEnd`: the chunk ends the file). Returns the file offset at which the next chunk must
   * begin.
   */
  scan(file: number, bytes: Uint8Array, base: number, atEnd: boolean): number {
    const fs = this.files[file];
    if (!fs) throw new RangeError(`scan: file index must be 0..${this.files.length - 1}, got ${file}`);
    if (this.planned) throw new Error('scan: the collector has already been planned');
    const len = bytes.length;
    const stopAt = atEnd ? len : len - SCAN_LOOKAHEAD;
    let p = 0;
    while (p < stopAt) {
      if (p + FIXED_HEADER_LENGTH > len) {
        this.beginBad(fs, base + p, `truncated: ${len - p} bytes at the end of the file are too few for a record header`);
        p = len;
        break;
      }
      // Records of a stream already seen are read from the fields that change (no allocation).
      let h: HeaderFields | null = null;
      if (fs.badStart < 0 && fs.ms3Start < 0) {
        for (let k = 0; k < fs.templates.length && h === null; k++) h = fs.templates[k].read(bytes, p, len - p);
      }
      if (h === null) {
        if (isMiniSeed3(bytes, p)) {
          this.endBad(fs, base + p);
          const l = miniSeed3RecordLength(bytes, p);
          if (fs.ms3Start < 0) { fs.ms3Start = base + p; fs.ms3Count = 0; }
          fs.ms3Count++;
          if (l >= 40 && p + l <= len) { p += l; continue; }
          this.endMs3(fs);
          this.beginBad(fs, base + p, `${MSEED3_REASON} (record length unreadable or truncated)`);
          p = this.resync(fs, bytes, p + 1, stopAt);
          continue;
        }
        if (fs.badStart >= 0 && !looksLikeRecordStart(bytes, p)) {
          p = this.resync(fs, bytes, p + 1, stopAt);
          continue;
        }
        let parsed: RecordHeader;
        try {
          parsed = parseRecordHeader(bytes, p, fs.path);
        } catch (e) {
          if (!(e instanceof MiniSeedError)) throw e;
          this.endMs3(fs);
          this.endBad(fs, base + p);
          this.beginBad(fs, base + p, e.reason);
          p = this.resync(fs, bytes, p + 1, stopAt);
          continue;
        }
        this.endMs3(fs);
        this.endBad(fs, base + p);
        this.remember(fs, HeaderTemplate.from(bytes, p, parsed));
        h = parsed;
      }
      // A record length field that a bit flip made too long shows as a record header inside it
      // (looked for when the length differs from the previous record's).
      const inner = h.recordLength === fs.lastRecordLength ? 0 : this.innerHeader(bytes, p, h.recordLength);
      if (inner > 0) {
        fs.errors.push({ offset: base + p, reason: `record length ${h.recordLength} stated, but the next record header starts ${inner} bytes on; record skipped` });
        p += inner;
        continue;
      }
      // A record cut short inside the file: what follows its stated end is no record header, but a
      // record header starts before that end. Only looked for when the end does not line up.
      const end = p + h.recordLength;
      if (end + FIXED_HEADER_LENGTH <= len && !looksLikeRecordStart(bytes, end) && !isMiniSeed3(bytes, end)) {
        const cut = this.headerWithin(bytes, p + FIXED_HEADER_LENGTH, end);
        if (cut > 0) {
          fs.errors.push({ offset: base + p, reason: `record cut short: ${h.recordLength} bytes stated, but the next record header starts ${cut - p} bytes on; record skipped` });
          p = cut;
          continue;
        }
      }
      this.addRecord(fs, file, bytes, p, base, h);
      fs.lastRecordLength = h.recordLength;
      p += h.recordLength;
    }
    if (atEnd) {
      this.endMs3(fs);
      this.endBad(fs, base + len, true);
      if (base + len === 0) fs.errors.push({ offset: 0, reason: 'empty file' });
    }
    return base + p;
  }

  /** Keeps `t` among the file's header templates (a few streams: multiplexed files interleave them). */
  private remember(fs: FileState, t: HeaderTemplate | null): void {
    if (t === null) return;
    if (fs.templates.length >= MAX_TEMPLATES) fs.templates.shift();
    fs.templates.push(t);
  }

  /** Offset (from the record start) of a record header found inside a record of length `len`, or 0. */
  private innerHeader(bytes: Uint8Array, p: number, len: number): number {
    for (let d = MIN_RECORD_LENGTH; d < len; d *= 2) {
      if (looksLikeRecordStart(bytes, p + d)) return d;
    }
    return 0;
  }

  /** First offset in [from, to) where a record header (2 or 3) starts, or 0. */
  private headerWithin(bytes: Uint8Array, from: number, to: number): number {
    for (let q = from; q < to; q++) if (looksLikeRecordStart(bytes, q) || isMiniSeed3(bytes, q)) return q;
    return 0;
  }

  private addRecord(fs: FileState, file: number, bytes: Uint8Array, p: number, base: number, h: HeaderFields): void {
    const kind = sampleKindOf(h.encoding);
    const problem = h.sampleCount > 0 ? capacityProblem(h.encoding, h.sampleCount, h.recordLength - h.dataOffset) : null;
    if (problem) {
      fs.errors.push({ offset: base + p, reason: problem });
      return;
    }
    fs.records++;
    if (kind === SampleKind.Text) {
      const key = channelKey(h.id);
      let log = this.logs.get(key);
      if (!log) this.logs.set(key, (log = { id: h.id, entries: [] }));
      log.entries.push({ time: h.start, text: h.sampleCount > 0 ? decodeAscii(bytes, p + h.dataOffset, h.sampleCount) : '' });
      return;
    }
    if (h.sampleCount === 0) return;
    if (!(h.sampleRate > 0) || !Number.isFinite(h.sampleRate)) {
      fs.errors.push({ offset: base + p, reason: `sample rate ${h.sampleRate} (factor ${h.sampleRateFactor}, multiplier ${h.sampleRateMultiplier}) for a record with ${h.sampleCount} samples` });
      fs.records--;
      return;
    }
    const flags = (h.clockLocked ? 1 : 0) | (h.questionableTime ? 2 : 0) | (h.leapSecond ? 4 : 0);
    const r = new RecordRef(
      file, base + p, h.start, h.sampleRate, h.sampleCount, h.encoding, h.littleEndian, h.recordLength, h.dataOffset,
      flags, h.timingQuality ?? -1, h.quality, this.order++,
    );
    let ch = this.lastChannel;
    if (ch === null || h.id !== this.lastId) {
      const key = channelKey(h.id);
      ch = this.channels.get(key) ?? null;
      if (ch === null) this.channels.set(key, (ch = { id: h.id, records: [], plans: [], overlapping: [] }));
      this.lastId = h.id;
      this.lastChannel = ch;
    }
    r.plans = ch.plans;
    ch.records.push(r);
    fs.queue.push(r);
  }

  private beginBad(fs: FileState, offset: number, reason: string): void {
    if (fs.badStart >= 0) return;
    fs.badStart = offset;
    fs.badReason = reason;
  }

  /** Closes a bad stretch at `offset` (`atEof`: the stretch runs to the end of the file). */
  private endBad(fs: FileState, offset: number, atEof = false): void {
    if (fs.badStart < 0) return;
    const skipped = offset - fs.badStart;
    const wholeFile = atEof && fs.badStart === 0 && fs.records === 0 && fs.errors.length === 0;
    fs.errors.push({
      offset: fs.badStart,
      reason: wholeFile ? `not a miniSEED file: no record found in its ${skipped} bytes (at byte 0: ${fs.badReason})`
        : atEof ? `${fs.badReason}; the remaining ${skipped} bytes hold no record header`
          : `${fs.badReason}; ${skipped} bytes skipped to the next record header`,
    });
    fs.badStart = -1;
  }

  private endMs3(fs: FileState): void {
    if (fs.ms3Start < 0) return;
    fs.errors.push({ offset: fs.ms3Start, reason: `${MSEED3_REASON} (${fs.ms3Count} miniSEED 3 record${fs.ms3Count === 1 ? '' : 's'} skipped)` });
    fs.ms3Start = -1;
  }

  /** Next offset >= `from` where a record header (2 or 3) starts, or `stopAt` when none in range. */
  private resync(fs: FileState, bytes: Uint8Array, from: number, stopAt: number): number {
    const guess = from - 1 + fs.lastRecordLength;
    if (fs.lastRecordLength > 0 && guess < stopAt && looksLikeRecordStart(bytes, guess)) return guess;
    for (let q = from; q < stopAt; q++) {
      if (looksLikeRecordStart(bytes, q) || isMiniSeed3(bytes, q)) return q;
    }
    return stopAt;
  }

  /** Lays the records out into segments and allocates every sample array (once, at final size). */
  plan(): void {
    if (this.planned) return;
    this.planned = true;
    for (const ch of this.channels.values()) {
      ch.records.sort((a, b) => a.start - b.start || a.order - b.order);
      let cur: SegmentPlan | null = null;
      for (const r of ch.records) {
        const kind = r.kind;
        if (cur) {
          const half = 5e5 / cur.rate;
          const compatible = cur.kind === kind && ratesCompatible(cur.rate, r.rate);
          if (r.start < cur.next - half) {
            // Overlaps data held: compare the overlapping samples later, place the rest.
            let skip = r.count;
            if (compatible) skip = Math.min(r.count, Math.round(((cur.next - r.start) * r.rate) / 1e6));
            r.seg = ch.plans.length - 1;
            r.skip = skip;
            r.heldAt = cur.total - skip;
            ch.overlapping.push(r);
            if (skip < r.count) this.place(cur, r, r.start + ((skip * 1e6) / r.rate));
            continue;
          }
          if (compatible && r.start <= cur.next + half) {
            r.seg = ch.plans.length - 1;
            this.place(cur, r, r.start);
            continue;
          }
        }
        cur = { kind, rate: r.rate, records: [], total: 0, next: r.start, samples: null };
        ch.plans.push(cur);
        r.seg = ch.plans.length - 1;
        this.place(cur, r, r.start);
      }
      for (const plan of ch.plans) plan.samples = makeArray(plan.kind, plan.total);
    }
    for (const fs of this.files) fs.queue.sort((a, b) => a.offset - b.offset);
  }

  private place(seg: SegmentPlan, r: RecordRef, firstTime: number): void {
    r.at = seg.total;
    const n = r.count - r.skip;
    seg.records.push(r);
    seg.total += n;
    seg.next = firstTime + (n * 1e6) / r.rate;
  }

  /**
   * File offset at which pass 2 needs the next chunk of file `file` to begin, or -1 when every
   * record of the file has been decoded.
   */
  decodeNeeds(file: number): number {
    const fs = this.files[file];
    return fs.cursor < fs.queue.length ? fs.queue[fs.cursor].offset : -1;
  }

  /**
   * Pass 2 over `bytes` (file bytes from offset `base`): decodes every planned record that lies
   * wholly inside the chunk into its place. Returns the file offset the next chunk must begin at, or
   * -1 when the file is done.
   */
  decode(file: number, bytes: Uint8Array, base: number): number {
    const fs = this.files[file];
    if (!fs) throw new RangeError(`decode: file index must be 0..${this.files.length - 1}, got ${file}`);
    if (!this.planned) this.plan();
    const q = fs.queue;
    while (fs.cursor < q.length) {
      const r = q[fs.cursor];
      const p = r.offset - base;
      if (p < 0 || p + r.recordLength > bytes.length) break;
      this.decodeRecord(fs, r, bytes, p);
      fs.cursor++;
    }
    return this.decodeNeeds(file);
  }

  private decodeRecord(fs: FileState, r: RecordRef, bytes: Uint8Array, p: number): void {
    const seg = r.plans ? r.plans[r.seg] : undefined;
    if (!seg || !seg.samples) { r.status = 2; return; }
    const dataStart = p + r.dataOffset;
    const dataLength = r.recordLength - r.dataOffset;
    try {
      if (r.skip === 0) {
        r.status = decodeSamples(bytes, dataStart, dataLength, r.encoding, r.count, r.littleEndian, seg.samples, r.at);
      } else {
        const all = makeArray(r.kind, r.count);
        r.status = decodeSamples(bytes, dataStart, dataLength, r.encoding, r.count, r.littleEndian, all, 0);
        r.head = all.subarray(0, r.skip);
        if (r.skip < r.count) seg.samples.set(all.subarray(r.skip) as never, r.at);
        // Compare now when the held samples are already decoded, so a duplicate's samples are not kept.
        if (heldState(seg, r) === 1) {
          r.verdict = seg.kind === r.kind && sameSamples(seg.samples, r.heldAt, r.head) ? 1 : 2;
          if (r.verdict === 1) r.head = null;
        }
      }
    } catch (e) {
      r.status = 2;
      fs.records--;
      fs.errors.push({ offset: r.offset, reason: e instanceof Error ? e.message : String(e) });
    }
    r.decoded = true;
  }

  /** Sorts out overlaps and duplicates and returns the channels, logs and per-file reports. */
  finish(): MiniSeedReadResult {
    if (!this.planned) this.plan();
    for (const fs of this.files) {
      for (; fs.cursor < fs.queue.length; fs.cursor++) {
        const r = fs.queue[fs.cursor];
        r.status = 2;
        r.decoded = true;
        fs.records--;
        fs.errors.push({ offset: r.offset, reason: 'record was not given again for decoding (file changed or shortened between passes?)' });
      }
    }
    const channels: ChannelData[] = [];
    for (const [, ch] of [...this.channels.entries()].sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))) {
      const data = this.finishChannel(ch);
      // A channel all of whose records failed to decode has nothing to show; its errors are reported.
      if (data.segments.length > 0 || data.overlaps.length > 0) channels.push(data);
    }
    const logs: LogChannel[] = [...this.logs.entries()]
      .sort((a, b) => (a[0] < b[0] ? -1 : 1))
      .map(([, l]) => {
        l.entries.sort((a, b) => a.time - b.time);
        const entries = l.entries.filter((e, i, all) => i === 0 || e.time !== all[i - 1].time || e.text !== all[i - 1].text);
        return { id: l.id, entries };
      });
    const files: FileReport[] = this.files.map((f) => ({
      path: f.path, records: f.records, errors: f.errors.sort((a, b) => a.offset - b.offset),
    }));
    return { files, channels, logs };
  }

  private finishChannel(ch: ChannelBuild): ChannelData {
    let duplicatesDropped = 0;
    const conflicting: RecordRef[] = [];
    for (const r of ch.overlapping) {
      if (r.status === 2) continue;
      const seg = ch.plans[r.seg];
      if (r.verdict === 0 && r.head) {
        r.verdict = seg.kind === r.kind && heldState(seg, r) === 1 && sameSamples(seg.samples as SampleArray, r.heldAt, r.head) ? 1 : 2;
      }
      if (r.verdict === 1) {
        if (r.skip === r.count) duplicatesDropped++;
        continue;
      }
      if (r.head) conflicting.push(r);
    }
    const segments: Segment[] = [];
    for (const plan of ch.plans) pushPieces(ch.id, plan, segments);
    segments.sort((a, b) => a.start - b.start);
    const gaps: TimeSpan[] = [];
    for (let i = 1; i < segments.length; i++) {
      const a = segments[i - 1];
      const b = segments[i];
      const after = a.end + Math.round(1e6 / a.sampleRate);
      if (b.start > a.end + 1.5e6 / a.sampleRate) gaps.push({ start: after, end: b.start });
    }
    return { id: ch.id, segments, gaps, overlaps: overlapsOf(ch.id, conflicting), duplicatesDropped };
  }
}

/**
 * State of the held samples a record's first `skip` samples are compared with: 0 not all decoded
 * yet, 1 all decoded, 2 some of them failed to decode.
 */
function heldState(seg: SegmentPlan, r: RecordRef): 0 | 1 | 2 {
  const from = r.heldAt;
  const to = r.heldAt + r.skip;
  if (from < 0) return 2;
  const recs = seg.records;
  // Records are in sample order: binary-search the first whose placed samples end after `from`.
  let lo = 0;
  let hi = recs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const m = recs[mid];
    if (m.at + m.count - m.skip <= from) lo = mid + 1;
    else hi = mid;
  }
  let state: 0 | 1 | 2 = 1;
  for (let k = lo; k < recs.length && recs[k].at < to; k++) {
    const h = recs[k];
    if (h === r) continue;
    if (h.decoded && h.status === 2) return 2;
    if (!h.decoded) state = 0;
  }
  return state;
}

function sameSamples(held: SampleArray | null, at: number, head: SampleArray): boolean {
  if (!held) return false;
  if (at + head.length > held.length) return false;
  for (let i = 0; i < head.length; i++) {
    const a = held[at + i];
    const b = head[i];
    if (a !== b && !(a !== a && b !== b)) return false;
  }
  return true;
}

function recordsToSegment(id: ChannelId, rate: number, samples: SampleArray, recs: RecordRef[], base: number): Segment {
  const recordStarts = new Float64Array(recs.length);
  const recordFirstSample = new Int32Array(recs.length);
  let qMin: number | null = null;
  let qMax: number | null = null;
  let locked = 0; let questionable = 0; let leap = 0; let mismatch = 0;
  for (let i = 0; i < recs.length; i++) {
    const r = recs[i];
    recordStarts[i] = r.start + Math.round((r.skip * 1e6) / r.rate);
    recordFirstSample[i] = r.at - base;
    if (r.timingQuality >= 0) {
      qMin = qMin === null ? r.timingQuality : Math.min(qMin, r.timingQuality);
      qMax = qMax === null ? r.timingQuality : Math.max(qMax, r.timingQuality);
    }
    if (r.flags & 1) locked++;
    if (r.flags & 2) questionable++;
    if (r.flags & 4) leap++;
    if (r.status === 1) mismatch++;
  }
  const last = recs[recs.length - 1];
  const lastCount = last.count - last.skip;
  const end = recordStarts[recs.length - 1] + Math.round(((lastCount - 1) * 1e6) / last.rate);
  const first = recs[0];
  return {
    id, sampleRate: rate, start: recordStarts[0], end, samples,
    recordStarts, recordFirstSample,
    encoding: first.encoding, recordLength: first.recordLength, quality: first.quality,
    timing: {
      qualityMin: qMin, qualityMax: qMax, clockLockedRecords: locked, questionableTimeRecords: questionable,
      leapSecondRecords: leap, steimMismatchRecords: mismatch, records: recs.length,
    },
  };
}

/** A planned segment as output segments: split around records that failed to decode (views, no copy). */
function pushPieces(id: ChannelId, plan: SegmentPlan, out: Segment[]): void {
  const samples = plan.samples as SampleArray;
  let run: RecordRef[] = [];
  const flush = () => {
    if (run.length === 0) return;
    const from = run[0].at;
    const lastR = run[run.length - 1];
    const to = lastR.at + lastR.count - lastR.skip;
    const view = from === 0 && to === samples.length ? samples : samples.subarray(from, to);
    out.push(recordsToSegment(id, plan.rate, view, run, from));
    run = [];
  };
  for (const r of plan.records) {
    if (r.status === 2) flush();
    else run.push(r);
  }
  flush();
}

/** Conflicting overlapping records as overlaps: contiguous ones joined, each kept with its samples. */
function overlapsOf(id: ChannelId, recs: RecordRef[]): Overlap[] {
  const out: Overlap[] = [];
  let i = 0;
  while (i < recs.length) {
    let j = i + 1;
    let next = recs[i].start + (recs[i].skip * 1e6) / recs[i].rate;
    let total = recs[i].skip;
    while (j < recs.length) {
      const r = recs[j];
      const half = 5e5 / recs[i].rate;
      if (r.kind !== recs[i].kind || !ratesCompatible(recs[i].rate, r.rate) || Math.abs(r.start - next) > half) break;
      next = r.start + (r.skip * 1e6) / r.rate;
      total += r.skip;
      j++;
    }
    const group = recs.slice(i, j);
    const samples = makeArray(group[0].kind, total);
    const placed: RecordRef[] = [];
    let at = 0;
    for (const r of group) {
      samples.set(r.head as never, at);
      const p = new RecordRef(r.file, r.offset, r.start, r.rate, r.skip, r.encoding, r.littleEndian, r.recordLength,
        r.dataOffset, r.flags, r.timingQuality, r.quality, r.order);
      p.at = at;
      p.status = r.status;
      placed.push(p);
      at += r.skip;
    }
    const segment = recordsToSegment(id, group[0].rate, samples, placed, 0);
    out.push({ start: segment.start, end: segment.end, segment });
    i = j;
  }
  return out;
}

/** Reads every record of one in-memory file (both passes over the same bytes). */
export function collectBuffer(bytes: Uint8Array, path: string): MiniSeedReadResult {
  const c = new MiniSeedCollector();
  const f = c.addFile(path);
  c.scan(f, bytes, 0, true);
  c.plan();
  c.decode(f, bytes, 0);
  return c.finish();
}
