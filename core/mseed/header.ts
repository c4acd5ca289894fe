/**
 * The miniSEED 2.4 record header: the 48-byte fixed section of the data header and the blockettes
 * the reader uses (SEED Reference Manual v2.4, chapter 8 "Fixed Section of Data Header", and
 * chapter 9 blockettes 100, 1000 and 1001). Every other blockette is stepped over.
 */
import type { ChannelId } from '../model';
import { microsFromYearDay, type Micros } from '../time';
import { MiniSeedError, MSEED3_REASON } from './errors';

/** Smallest and largest record length this reader accepts, bytes (blockette 1000 exponents 7-16). */
export const MIN_RECORD_LENGTH = 128;
export const MAX_RECORD_LENGTH = 65536;
/** Bytes of the fixed section of the data header. */
export const FIXED_HEADER_LENGTH = 48;

/** One record's header, as read. Flags keep the bit numbering of the SEED manual (bit 0 = 1). */
export interface RecordHeader {
  readonly id: ChannelId;
  /**
   * Time of the first sample, µs since the epoch: the BTIME start, plus blockette 1001's
   * microseconds, plus the time correction (field 16, units of 0.0001 s) only when activity flag
   * bit 1 says it has not been applied yet.
   */
  readonly start: Micros;
  /** Samples per second: blockette 100's actual rate when present, else from factor and multiplier. */
  readonly sampleRate: number;
  /** Samples per second from the fixed header's factor and multiplier alone. */
  readonly nominalSampleRate: number;
  readonly sampleRateFactor: number;
  readonly sampleRateMultiplier: number;
  /** Number of samples (for ASCII records: number of characters). */
  readonly sampleCount: number;
  /** SEED data encoding (blockette 1000 field 3; Steim-1 when the record has no blockette 1000). */
  readonly encoding: number;
  /** Byte order of the data section (blockette 1000 field 4; the header's without blockette 1000). */
  readonly littleEndian: boolean;
  /** Byte order of the header fields (detected from the start year and day). */
  readonly headerLittleEndian: boolean;
  /** Record length, bytes (blockette 1000, or the distance to the next record header). */
  readonly recordLength: number;
  /** Offset of the first data byte from the start of the record, bytes. */
  readonly dataOffset: number;
  /** Data header/quality indicator: 'D', 'R', 'Q' or 'M'. */
  readonly quality: string;
  /** Sequence number field as written (six characters, may be blank). */
  readonly sequence: string;
  /** Activity flags (bit 1: time correction applied; bits 4/5: positive/negative leap second). */
  readonly activityFlags: number;
  /** I/O and clock flags (bit 5: clock locked). */
  readonly ioClockFlags: number;
  /** Data quality flags (bit 7: time tag questionable). */
  readonly dataQualityFlags: number;
  /** Blockette 1001 timing quality, 0-100 %, or null without blockette 1001. */
  readonly timingQuality: number | null;
  /** A leap second is flagged (activity bits 4 or 5) or the start time's second field is 60. */
  readonly leapSecond: boolean;
  /** The start time's second field was 60. */
  readonly secondIs60: boolean;
  /** I/O flag bit 5: clock locked. */
  readonly clockLocked: boolean;
  /** Data quality flag bit 7: time tag questionable. */
  readonly questionableTime: boolean;
  /** Time correction field, µs (applied to `start` only when `timeCorrectionAdded`). */
  readonly timeCorrection: number;
  readonly timeCorrectionAdded: boolean;
  /** Blockette 1001 microseconds (-50..+49 as written), added to `start`. */
  readonly microsecondOffset: number;
  readonly hasBlockette1000: boolean;
  /** Blockette types in chain order. */
  readonly blockettes: readonly number[];
}

// ---- small readers (header fields are few; no DataView per record) ----

function u16(b: Uint8Array, p: number, le: boolean): number {
  return le ? b[p] | (b[p + 1] << 8) : (b[p] << 8) | b[p + 1];
}
function i16(b: Uint8Array, p: number, le: boolean): number {
  return (u16(b, p, le) << 16) >> 16;
}
function i32(b: Uint8Array, p: number, le: boolean): number {
  return le
    ? b[p] | (b[p + 1] << 8) | (b[p + 2] << 16) | (b[p + 3] << 24)
    : (b[p] << 24) | (b[p + 1] << 16) | (b[p + 2] << 8) | b[p + 3];
}
const f32Scratch = new Float32Array(1);
const f32Bytes = new Uint8Array(f32Scratch.buffer);
const hostLittleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
function f32(b: Uint8Array, p: number, le: boolean): number {
  const swap = le !== hostLittleEndian;
  for (let k = 0; k < 4; k++) f32Bytes[swap ? 3 - k : k] = b[p + k];
  return f32Scratch[0];
}

/** Text of a fixed-width code field: ASCII, trailing/leading spaces and NULs removed. */
function code(b: Uint8Array, p: number, n: number): string {
  let s = '';
  for (let k = 0; k < n; k++) {
    const c = b[p + k];
    if (c !== 0) s += String.fromCharCode(c);
  }
  return s.trim();
}

function isSequenceChar(c: number): boolean {
  return (c >= 0x30 && c <= 0x39) || c === 0x20 || c === 0;
}
function isQualityChar(c: number): boolean {
  return c === 0x44 || c === 0x52 || c === 0x51 || c === 0x4d; // D R Q M
}
function validYearDay(b: Uint8Array, p: number, le: boolean): boolean {
  const year = u16(b, p, le);
  const day = u16(b, p + 2, le);
  return year >= 1900 && year <= 2100 && day >= 1 && day <= 366;
}

/** Header byte order from the start year and day (the test libmseed also uses), or null. */
function headerByteOrder(b: Uint8Array, o: number): boolean | null {
  if (validYearDay(b, o + 20, false)) return false;
  if (validYearDay(b, o + 20, true)) return true;
  return null;
}

/** True when bytes at `offset` start a miniSEED 3 record (FDSN 2023: "MS" and format version 3). */
export function isMiniSeed3(bytes: Uint8Array, offset: number): boolean {
  return offset + 3 <= bytes.length && bytes[offset] === 0x4d && bytes[offset + 1] === 0x53 && bytes[offset + 2] === 3;
}

/**
 * Length of the miniSEED 3 record at `offset`, bytes (40-byte fixed header + identifier + extra
 * headers + data, FDSN miniSEED 3 specification, "Record structure"), or 0 when it cannot be read.
 */
export function miniSeed3RecordLength(bytes: Uint8Array, offset: number): number {
  if (offset + 40 > bytes.length) return 0;
  const sidLength = bytes[offset + 33];
  const extraLength = bytes[offset + 34] | (bytes[offset + 35] << 8);
  const dataLength = (bytes[offset + 36] | (bytes[offset + 37] << 8) | (bytes[offset + 38] << 16) | (bytes[offset + 39] << 24)) >>> 0;
  return 40 + sidLength + extraLength + dataLength;
}

/**
 * Cheap test that a miniSEED 2 fixed header starts at `offset` (the checks libmseed's
 * MS_ISVALIDHEADER makes): sequence number of digits/spaces, a quality indicator D/R/Q/M, a blank
 * reserved byte, a plausible year and day in either byte order, hour/minute/second in range.
 */
export function looksLikeRecordStart(b: Uint8Array, o: number): boolean {
  if (o < 0 || o + FIXED_HEADER_LENGTH > b.length) return false;
  if (!isQualityChar(b[o + 6])) return false;
  const r = b[o + 7];
  if (r !== 0x20 && r !== 0) return false;
  for (let k = 0; k < 6; k++) if (!isSequenceChar(b[o + k])) return false;
  if (headerByteOrder(b, o) === null) return false;
  return b[o + 24] <= 23 && b[o + 25] <= 59 && b[o + 26] <= 60;
}

/**
 * Length of a record that has no blockette 1000: the first power of two (128-65536 bytes) at which
 * the next record header starts, or the rest of the buffer when it is a power of two in that range
 * (the last record). 0 when neither is found.
 */
export function impliedRecordLength(bytes: Uint8Array, offset: number): number {
  for (let len = MIN_RECORD_LENGTH; len <= MAX_RECORD_LENGTH; len *= 2) {
    const next = offset + len;
    if (next === bytes.length) return len;
    if (next > bytes.length) return 0;
    if (looksLikeRecordStart(bytes, next) || isMiniSeed3(bytes, next)) return len;
  }
  return 0;
}

/**
 * Nominal sample rate from the fixed header's factor and multiplier (SEED manual v2.4, chapter 8,
 * fields 10-11: positive = multiply, negative = divide), samples/s. A multiplier of 0 is ignored.
 */
export function nominalRate(factor: number, multiplier: number): number {
  let rate = 0;
  if (factor > 0) rate = factor;
  else if (factor < 0) rate = -1 / factor;
  if (multiplier > 0) rate *= multiplier;
  else if (multiplier < 0) rate = -rate / multiplier;
  return rate;
}

function failAt(path: string, offset: number, reason: string): never {
  throw new MiniSeedError(path, offset, reason);
}

/**
 * Reads the record header at byte `offset` of `bytes`. Throws {@link MiniSeedError} (naming `path`
 * and `offset`) when the bytes are not a miniSEED 2 record, are a miniSEED 3 record, are truncated,
 * or hold out-of-range fields. The record's data is not looked at.
 */
export function parseRecordHeader(bytes: Uint8Array, offset: number, path = '(buffer)'): RecordHeader {
  if (!(bytes instanceof Uint8Array)) throw new TypeError('parseRecordHeader: bytes must be a Uint8Array');
  if (!Number.isInteger(offset) || offset < 0 || offset > bytes.length) {
    throw new RangeError(`parseRecordHeader: offset must be an integer in 0..${bytes.length}, got ${offset}`);
  }
  const b = bytes;
  const o = offset;
  const avail = b.length - o;
  if (isMiniSeed3(b, o)) failAt(path, offset, MSEED3_REASON);
  if (avail < FIXED_HEADER_LENGTH) failAt(path, offset, `truncated: ${avail} bytes left, a record header needs ${FIXED_HEADER_LENGTH}`);

  for (let k = 0; k < 6; k++) {
    if (!isSequenceChar(b[o + k])) failAt(path, offset, 'not a miniSEED record: the sequence number field (bytes 0-5) is not digits');
  }
  const q = b[o + 6];
  if (!isQualityChar(q)) failAt(path, offset, `not a miniSEED record: quality indicator is byte 0x${q.toString(16).padStart(2, '0')}, allowed D, R, Q, M`);
  const reserved = b[o + 7];
  if (reserved !== 0x20 && reserved !== 0) failAt(path, offset, 'not a miniSEED record: reserved byte 7 is not blank');

  const le = headerByteOrder(b, o);
  if (le === null) {
    failAt(path, offset, `start time year ${u16(b, o + 20, false)} / day ${u16(b, o + 22, false)} out of range (year 1900-2100, day 1-366) in either byte order`);
  }
  const hle = le as boolean;
  const year = u16(b, o + 20, hle);
  const day = u16(b, o + 22, hle);
  const hour = b[o + 24];
  const minute = b[o + 25];
  const second = b[o + 26];
  const fract = u16(b, o + 28, hle);
  if (hour > 23) failAt(path, offset, `start time hour ${hour} out of range 0-23`);
  if (minute > 59) failAt(path, offset, `start time minute ${minute} out of range 0-59`);
  if (second > 60) failAt(path, offset, `start time second ${second} out of range 0-60`);
  if (fract > 9999) failAt(path, offset, `start time fraction ${fract} out of range 0-9999 (units of 0.0001 s)`);

  const sampleCount = u16(b, o + 30, hle);
  const factor = i16(b, o + 32, hle);
  const multiplier = i16(b, o + 34, hle);
  const activityFlags = b[o + 36];
  const ioClockFlags = b[o + 37];
  const dataQualityFlags = b[o + 38];
  const timeCorrectionField = i32(b, o + 40, hle);
  const dataOffset = u16(b, o + 44, hle);
  let blk = u16(b, o + 46, hle);

  // Blockette chain. Offsets count from the record start; each must lie past the previous one, so
  // a chain that loops or points backwards ends with an error instead of running forever.
  let encoding = 10;
  let dataLittleEndian = false;
  let recordLength = 0;
  let hasB1000 = false;
  let b100Rate = 0;
  let timingQuality: number | null = null;
  let microsecondOffset = 0;
  const blockettes: number[] = [];
  let prev = FIXED_HEADER_LENGTH - 1;
  let chainEnd = FIXED_HEADER_LENGTH;
  const limit = Math.min(avail, MAX_RECORD_LENGTH);
  while (blk !== 0) {
    if (blk <= prev) {
      failAt(path, offset, blk < FIXED_HEADER_LENGTH
        ? `blockette offset ${blk} lies inside the fixed header (must be >= 48)`
        : `blockette chain loops back: next blockette offset ${blk} is not past ${prev}`);
    }
    if (blk + 4 > limit) failAt(path, offset, `blockette at offset ${blk} lies beyond the ${limit} bytes of the record`);
    const type = u16(b, o + blk, hle);
    const next = u16(b, o + blk + 2, hle);
    blockettes.push(type);
    let size = 4;
    if (type === 1000) {
      size = 8;
      if (blk + 8 > limit) failAt(path, offset, `blockette 1000 at offset ${blk} is truncated`);
      encoding = b[o + blk + 4];
      dataLittleEndian = b[o + blk + 5] === 0; // 1 = big-endian; other values: big-endian, as libmseed does
      const exp = b[o + blk + 6];
      if (exp < 7 || exp > 16) failAt(path, offset, `blockette 1000 record length exponent ${exp} out of range 7-16 (128-65536 bytes)`);
      recordLength = 2 ** exp;
      hasB1000 = true;
    } else if (type === 100) {
      size = 12;
      if (blk + 12 > limit) failAt(path, offset, `blockette 100 at offset ${blk} is truncated`);
      const r = f32(b, o + blk + 4, hle);
      if (!(r > 0) || !Number.isFinite(r)) failAt(path, offset, `blockette 100 actual sample rate ${r} is not a positive number`);
      b100Rate = r;
    } else if (type === 1001) {
      size = 8;
      if (blk + 8 > limit) failAt(path, offset, `blockette 1001 at offset ${blk} is truncated`);
      timingQuality = b[o + blk + 4];
      microsecondOffset = (b[o + blk + 5] << 24) >> 24;
    }
    chainEnd = Math.max(chainEnd, blk + size);
    prev = blk;
    blk = next;
    if (blk !== 0 && blk < prev + size) {
      failAt(path, offset, next <= prev ? `blockette chain loops back: next blockette offset ${next} is not past ${prev}`
        : `next blockette offset ${next} lies inside blockette ${type} at ${prev}`);
    }
  }

  if (!hasB1000) {
    recordLength = impliedRecordLength(b, o);
    if (recordLength === 0) failAt(path, offset, 'no blockette 1000, and no following record header or end of file gives the record length');
    dataLittleEndian = hle; // libmseed: without blockette 1000 the data has the header's byte order
  }
  if (recordLength > avail) failAt(path, offset, `truncated: record length is ${recordLength} bytes but only ${avail} remain`);
  if (chainEnd > recordLength) failAt(path, offset, `blockettes run to byte ${chainEnd}, past the record length ${recordLength}`);
  if (sampleCount > 0 && (dataOffset < FIXED_HEADER_LENGTH || dataOffset >= recordLength)) {
    failAt(path, offset, `data offset ${dataOffset} out of range ${FIXED_HEADER_LENGTH}-${recordLength - 1}`);
  }

  const timeCorrection = timeCorrectionField * 100;
  const timeCorrectionAdded = (activityFlags & 0x02) === 0 && timeCorrection !== 0;
  const start = microsFromYearDay(year, day, hour, minute, second, fract * 100)
    + microsecondOffset + (timeCorrectionAdded ? timeCorrection : 0);
  const nominal = nominalRate(factor, multiplier);

  return {
    id: { network: code(b, o + 18, 2), station: code(b, o + 8, 5), location: code(b, o + 13, 2), channel: code(b, o + 15, 3) },
    start,
    sampleRate: b100Rate > 0 ? b100Rate : nominal,
    nominalSampleRate: nominal,
    sampleRateFactor: factor,
    sampleRateMultiplier: multiplier,
    sampleCount,
    encoding,
    littleEndian: dataLittleEndian,
    headerLittleEndian: hle,
    recordLength,
    dataOffset,
    quality: String.fromCharCode(q),
    sequence: code(b, o, 6),
    activityFlags,
    ioClockFlags,
    dataQualityFlags,
    timingQuality,
    leapSecond: second === 60 || (activityFlags & 0x30) !== 0,
    secondIs60: second === 60,
    clockLocked: (ioClockFlags & 0x20) !== 0,
    questionableTime: (dataQualityFlags & 0x80) !== 0,
    timeCorrection,
    timeCorrectionAdded,
    microsecondOffset,
    hasBlockette1000: hasB1000,
    blockettes,
  };
}
