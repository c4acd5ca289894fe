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
import { RecordTable } from './recordTable';

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

/** A segment while it is laid out: its records in sample order and its total length. */
interface SegmentPlan {
  kind: SampleKind;
  rate: number;
  /** Rows of the record table. */
  records: number[];
  total: number;
  /** Expected time of the sample after the last one, µs (from the last record's own start). */
  next: number;
  samples: SampleArray | null;
}

interface ChannelBuild {
  id: ChannelId;
  /** Position in the collector's channel list (the record table's channel column). */
  index: number;
  /** Rows of the record table. */
  records: number[];
  plans: SegmentPlan[];
  /** Records (rows) that overlap held data, in time order. */
  overlapping: number[];
}

function newChannelBuild(id: ChannelId, index: number): ChannelBuild {
  return { id, index, records: [], plans: [], overlapping: [] };
}

function newSegmentPlan(kind: SampleKind, rate: number, next: number): SegmentPlan {
  return { kind, rate, records: [], total: 0, next, samples: null };
}

interface FileState {
  path: string;
  records: number;
  errors: RecordError[];
  /** Records (rows of the record table) to decode in pass 2, in file order. */
  queue: number[];
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
  /** The channels in the order they were first seen (the record table's channel column indexes it). */
  private readonly channelList: ChannelBuild[] = [];
  private readonly logs = new Map<string, { id: ChannelId; entries: { time: Micros; text: string }[] }>();
  /** Every waveform record, one row each; rows are numbered in the order records were read. */
  private readonly table = new RecordTable();
  private planned = false;
  /** The channel the last record went to, and the id object it was found by (header templates reuse theirs). */
  private lastId: ChannelId | null = null;
  private lastChannel = -1;

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
        if (!keptHeader) keptHeader = shapeKeepers.push(parsed) > 0;
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
    if (!keptTemplate) keptTemplate = shapeKeepers.push(t) > 0;
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
    let c = this.lastChannel;
    if (c < 0 || h.id !== this.lastId) {
      const key = channelKey(h.id);
      let ch = this.channels.get(key);
      if (ch === undefined) {
        this.channels.set(key, (ch = newChannelBuild(h.id, this.channelList.length)));
        this.channelList.push(ch);
      }
      c = ch.index;
      this.lastId = h.id;
      this.lastChannel = c;
    }
    const r = this.table.add(
      file, base + p, h.start, h.sampleRate, h.sampleCount, h.encoding, h.littleEndian, h.recordLength, h.dataOffset,
      flags, h.timingQuality ?? -1, h.quality.charCodeAt(0), c,
    );
    this.channelList[c].records.push(r);
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
    const t = this.table;
    const { start, rate, count, encoding, skip, seg, heldAt } = t;
    // Rows are numbered in reading order, so the row breaks ties between equal start times.
    const byTime = (a: number, b: number) => start[a] - start[b] || a - b;
    for (const ch of this.channelList) {
      ch.records.sort(byTime);
      let cur: SegmentPlan | null = null;
      for (const r of ch.records) {
        const kind = sampleKindOf(encoding[r]);
        if (cur) {
          const half = 5e5 / cur.rate;
          const compatible = cur.kind === kind && ratesCompatible(cur.rate, rate[r]);
          if (start[r] < cur.next - half) {
            // Overlaps data held: compare the overlapping samples later, place the rest.
            let n = count[r];
            if (compatible) n = Math.min(count[r], Math.round(((cur.next - start[r]) * rate[r]) / 1e6));
            seg[r] = ch.plans.length - 1;
            skip[r] = n;
            heldAt[r] = cur.total - n;
            ch.overlapping.push(r);
            if (n < count[r]) this.place(cur, r, start[r] + ((n * 1e6) / rate[r]));
            continue;
          }
          if (compatible && start[r] <= cur.next + half) {
            seg[r] = ch.plans.length - 1;
            this.place(cur, r, start[r]);
            continue;
          }
        }
        cur = newSegmentPlan(kind, rate[r], start[r]);
        ch.plans.push(cur);
        seg[r] = ch.plans.length - 1;
        this.place(cur, r, start[r]);
      }
      for (const plan of ch.plans) plan.samples = makeArray(plan.kind, plan.total);
    }
    const offset = t.offset;
    for (const fs of this.files) fs.queue.sort((a, b) => offset[a] - offset[b]);
  }

  private place(plan: SegmentPlan, r: number, firstTime: number): void {
    const t = this.table;
    t.at[r] = plan.total;
    const n = t.count[r] - t.skip[r];
    plan.records.push(r);
    plan.total += n;
    plan.next = firstTime + (n * 1e6) / t.rate[r];
  }

  /**
   * File offset at which pass 2 needs the next chunk of file `file` to begin, or -1 when every
   * record of the file has been decoded.
   */
  decodeNeeds(file: number): number {
    const fs = this.files[file];
    return fs.cursor < fs.queue.length ? this.table.offset[fs.queue[fs.cursor]] : -1;
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
    const { offset, recordLength } = this.table;
    while (fs.cursor < q.length) {
      const r = q[fs.cursor];
      const p = offset[r] - base;
      if (p < 0 || p + recordLength[r] > bytes.length) break;
      this.decodeRecord(fs, r, bytes, p);
      fs.cursor++;
    }
    return this.decodeNeeds(file);
  }

  private decodeRecord(fs: FileState, r: number, bytes: Uint8Array, p: number): void {
    const t = this.table;
    const plan = this.channelList[t.channel[r]].plans[t.seg[r]];
    if (!plan || !plan.samples) { t.status[r] = 2; return; }
    t.decoded[r] = 1;
    const dataStart = p + t.dataOffset[r];
    const dataLength = t.recordLength[r] - t.dataOffset[r];
    const encoding = t.encoding[r];
    const count = t.count[r];
    const le = t.littleEndian[r] === 1;
    const skip = t.skip[r];
    try {
      if (skip === 0) {
        t.status[r] = decodeSamples(bytes, dataStart, dataLength, encoding, count, le, plan.samples, t.at[r]);
      } else {
        const kind = sampleKindOf(encoding);
        const all = makeArray(kind, count);
        t.status[r] = decodeSamples(bytes, dataStart, dataLength, encoding, count, le, all, 0);
        const head = all.subarray(0, skip);
        if (skip < count) plan.samples.set(all.subarray(skip) as never, t.at[r]);
        // Compare now when the held samples are already decoded, so a duplicate's samples are not kept.
        let verdict = 0;
        if (heldState(t, plan, r) === 1) verdict = plan.kind === kind && sameSamples(plan.samples, t.heldAt[r], head) ? 1 : 2;
        t.verdict[r] = verdict;
        if (verdict !== 1) t.head.set(r, head);
      }
    } catch (e) {
      t.status[r] = 2;
      fs.records--;
      fs.errors.push({ offset: t.offset[r], reason: e instanceof Error ? e.message : String(e) });
    }
  }

  /** Sorts out overlaps and duplicates and returns the channels, logs and per-file reports. */
  finish(): MiniSeedReadResult {
    if (!this.planned) this.plan();
    for (const fs of this.files) {
      for (; fs.cursor < fs.queue.length; fs.cursor++) {
        const r = fs.queue[fs.cursor];
        this.table.status[r] = 2;
        this.table.decoded[r] = 1;
        fs.records--;
        fs.errors.push({ offset: this.table.offset[r], reason: 'record was not given again for decoding (file changed or shortened between passes?)' });
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
    const t = this.table;
    let duplicatesDropped = 0;
    const conflicting: number[] = [];
    for (const r of ch.overlapping) {
      if (t.status[r] === 2) continue;
      const plan = ch.plans[t.seg[r]];
      const head = t.head.get(r);
      if (t.verdict[r] === 0 && head) {
        t.verdict[r] = plan.kind === sampleKindOf(t.encoding[r]) && heldState(t, plan, r) === 1
          && sameSamples(plan.samples as SampleArray, t.heldAt[r], head) ? 1 : 2;
      }
      if (t.verdict[r] === 1) {
        if (t.skip[r] === t.count[r]) duplicatesDropped++;
        continue;
      }
      if (head) conflicting.push(r);
    }
    const segments: Segment[] = [];
    for (const plan of ch.plans) pushPieces(t, ch.id, plan, segments);
    segments.sort((a, b) => a.start - b.start);
    const gaps: TimeSpan[] = [];
    for (let i = 1; i < segments.length; i++) {
      const a = segments[i - 1];
      const b = segments[i];
      const after = a.end + Math.round(1e6 / a.sampleRate);
      if (b.start > a.end + 1.5e6 / a.sampleRate) gaps.push({ start: after, end: b.start });
    }
    return { id: ch.id, segments, gaps, overlaps: overlapsOf(t, ch.id, conflicting), duplicatesDropped };
  }
}

/**
 * State of the held samples a record's first `skip` samples are compared with: 0 not all decoded
 * yet, 1 all decoded, 2 some of them failed to decode.
 */
function heldState(t: RecordTable, plan: SegmentPlan, r: number): 0 | 1 | 2 {
  const from = t.heldAt[r];
  const to = from + t.skip[r];
  if (from < 0) return 2;
  const recs = plan.records;
  const { at, count, skip, decoded, status } = t;
  // Records are in sample order: binary-search the first whose placed samples end after `from`.
  let lo = 0;
  let hi = recs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const m = recs[mid];
    if (at[m] + count[m] - skip[m] <= from) lo = mid + 1;
    else hi = mid;
  }
  let state: 0 | 1 | 2 = 1;
  for (let k = lo; k < recs.length && at[recs[k]] < to; k++) {
    const h = recs[k];
    if (h === r) continue;
    if (decoded[h] && status[h] === 2) return 2;
    if (!decoded[h]) state = 0;
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

/**
 * A segment of the records `recs[from .. to)` (table rows): record `recs[i]`'s first sample is at
 * time `starts[i - from]` and sample index `firsts[i - from]` of `samples`; the last record
 * contributes `lastCount` samples.
 */
function segmentOf(
  t: RecordTable, id: ChannelId, rate: number, samples: SampleArray, recs: readonly number[], from: number, to: number,
  starts: Float64Array, firsts: Int32Array, lastCount: number,
): Segment {
  let qMin: number | null = null;
  let qMax: number | null = null;
  let locked = 0; let questionable = 0; let leap = 0; let mismatch = 0;
  for (let i = from; i < to; i++) {
    const r = recs[i];
    const q = t.timingQuality[r];
    if (q >= 0) {
      qMin = qMin === null ? q : Math.min(qMin, q);
      qMax = qMax === null ? q : Math.max(qMax, q);
    }
    const flags = t.flags[r];
    if (flags & 1) locked++;
    if (flags & 2) questionable++;
    if (flags & 4) leap++;
    if (t.status[r] === 1) mismatch++;
  }
  const n = to - from;
  const last = recs[to - 1];
  const end = starts[n - 1] + Math.round(((lastCount - 1) * 1e6) / t.rate[last]);
  const first = recs[from];
  return {
    id, sampleRate: rate, start: starts[0], end, samples,
    recordStarts: starts, recordFirstSample: firsts,
    encoding: t.encoding[first], recordLength: t.recordLength[first], quality: String.fromCharCode(t.quality[first]),
    timing: {
      qualityMin: qMin, qualityMax: qMax, clockLockedRecords: locked, questionableTimeRecords: questionable,
      leapSecondRecords: leap, steimMismatchRecords: mismatch, records: n,
    },
  };
}

/** A planned segment as output segments: split around records that failed to decode (views, no copy). */
function pushPieces(t: RecordTable, id: ChannelId, plan: SegmentPlan, out: Segment[]): void {
  const samples = plan.samples as SampleArray;
  const recs = plan.records;
  const { at, count, skip, start, rate, status } = t;
  const flush = (from: number, to: number) => {
    if (to === from) return;
    const base = at[recs[from]];
    const last = recs[to - 1];
    const lastCount = count[last] - skip[last];
    const end = at[last] + lastCount;
    const starts = new Float64Array(to - from);
    const firsts = new Int32Array(to - from);
    for (let i = from; i < to; i++) {
      const r = recs[i];
      starts[i - from] = start[r] + Math.round((skip[r] * 1e6) / rate[r]);
      firsts[i - from] = at[r] - base;
    }
    const view = base === 0 && end === samples.length ? samples : samples.subarray(base, end);
    out.push(segmentOf(t, id, plan.rate, view, recs, from, to, starts, firsts, lastCount));
  };
  let runFrom = 0;
  for (let i = 0; i < recs.length; i++) {
    if (status[recs[i]] !== 2) continue;
    flush(runFrom, i);
    runFrom = i + 1;
  }
  flush(runFrom, recs.length);
}

/** Conflicting overlapping records as overlaps: contiguous ones joined, each kept with its samples. */
function overlapsOf(t: RecordTable, id: ChannelId, recs: number[]): Overlap[] {
  const { start, skip, rate, encoding } = t;
  const out: Overlap[] = [];
  let i = 0;
  while (i < recs.length) {
    const a = recs[i];
    let j = i + 1;
    let next = start[a] + (skip[a] * 1e6) / rate[a];
    let total = skip[a];
    while (j < recs.length) {
      const r = recs[j];
      const half = 5e5 / rate[a];
      if (sampleKindOf(encoding[r]) !== sampleKindOf(encoding[a]) || !ratesCompatible(rate[a], rate[r]) || Math.abs(start[r] - next) > half) break;
      next = start[r] + (skip[r] * 1e6) / rate[r];
      total += skip[r];
      j++;
    }
    // Each record contributes its `skip` leading samples (the part at times already held).
    const samples = makeArray(sampleKindOf(encoding[a]), total);
    const starts = new Float64Array(j - i);
    const firsts = new Int32Array(j - i);
    let at = 0;
    for (let k = i; k < j; k++) {
      const r = recs[k];
      samples.set(t.head.get(r) as never, at);
      starts[k - i] = start[r];
      firsts[k - i] = at;
      at += skip[r];
    }
    const last = recs[j - 1];
    const segment = segmentOf(t, id, rate[a], samples, recs, i, j, starts, firsts, skip[last]);
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

/**
 * One object of each shape (V8 hidden class) the collector's hot code works on, kept for the life
 * of the module. V8 holds a shape only while something uses it, and optimized code that checks for
 * a shape is thrown away when the shape is collected. Without these, the full garbage collection
 * that follows a read (all of the read's objects gone) discarded the collector's optimized code
 * ("weak objects" deoptimizations: about 65 over 12 reads of a station-day), and the next read ran
 * unoptimized until compiled again: 20-30 % slower. A header and a header template from the first
 * record ever read are added when they are made (small: a few hundred bytes).
 */
const shapeKeepers: unknown[] = [new MiniSeedCollector(), new RecordTable(), newChannelBuild({ network: '', station: '', location: '', channel: '' }, -1)];
shapeKeepers.push(newSegmentPlan(SampleKind.Int, 1, 0));
(shapeKeepers[0] as MiniSeedCollector).addFile('');
let keptHeader = false;
let keptTemplate = false;
