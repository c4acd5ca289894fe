/**
 * miniSEED 2.4 writer: integer samples into big-endian Steim-2 (or Steim-1) data records with
 * blockettes 1000 and 1001 (FDSN SEED Reference Manual v2.4, chapter 8 "Fixed Section of Data
 * Header", blockettes 100, 1000 and 1001 in chapter 8, Steim compression in Appendix B).
 *
 * Records are packed greedily: each word of a Steim frame takes as many of the next differences as
 * fit its densest layout (the frames come out byte-identical to libmseed 2.19's msr_pack). Where a
 * difference is too wide for the preferred encoding (beyond 30 bits for Steim-2, beyond 32 bits for
 * Steim-1, e.g. spikes or clipping at full scale), the record is closed before it if it already
 * holds at least as many samples as it has data words; otherwise (and for the record that starts at
 * the wide difference) the record is packed as Steim-1 instead, or as INT32 when even Steim-1
 * cannot hold a difference. So the fallback covers about one record around each wide stretch and
 * no sample is ever written wrongly. Each record's first difference is the difference to the
 * previous record's last sample (zero for the first record), as Appendix B defines it.
 */
import type { ChannelId } from '../model';
import { yearDayFromMicros, type Micros } from '../time';

export interface MiniSeedWriteOptions {
  /** Record length in bytes: a power of two from 256 to 65536. Default 4096. */
  recordLength?: number;
  /** Preferred encoding: 10 Steim-1 or 11 Steim-2 (default). */
  encoding?: 10 | 11;
  /** Data-quality indicator of every record. Default 'D'. */
  quality?: 'D' | 'R' | 'Q' | 'M';
  /** Sequence number of the first record, 1-999999 (wraps from 999999 to 1). Default 1. */
  sequenceStart?: number;
  /** Per-record flags, asked with each record's start time (µs). */
  recordFlags?: (recordStart: Micros) => {
    /** Blockette 1001 timing quality, percent 0-100 (default 0, unknown). */
    timingQuality?: number;
    /** Data-quality flags bit 7: time tag questionable. */
    questionableTime?: boolean;
    /** I/O and clock flags bit 5: clock locked. */
    clockLocked?: boolean;
  };
}

const STEIM1 = 10;
const STEIM2 = 11;
const INT32 = 3;
/** Samples per record are a 16-bit count in the fixed header. */
const MAX_RECORD_SAMPLES = 65_535;
const CODE_PATTERN = /^[A-Z0-9]*$/;

/** Fixed-header sample rate fields and whether they hold `rate` exactly. */
interface RateFields {
  factor: number;
  multiplier: number;
  exact: boolean;
}

/** Rate from factor and multiplier as the SEED manual v2.4 (fixed header fields 10 and 11) defines it. */
function manualRate(f: number, m: number): number {
  if (f > 0 && m > 0) return f * m;
  if (f > 0 && m < 0) return -f / m;
  if (f < 0 && m > 0) return -m / f;
  return 1 / (f * m);
}

/** Rate from factor and multiplier computed in the order libmseed 2.19 uses (ms_nomsamprate). */
function libmseedRate(f: number, m: number): number {
  let r = f > 0 ? f : -1 / f;
  if (m > 0) r *= m;
  else r = -(r / m);
  return r;
}

function fieldsFor(rate: number, f: number, m: number): RateFields {
  return { factor: f, multiplier: m, exact: manualRate(f, m) === rate && libmseedRate(f, m) === rate };
}

/** Splits integer `v` into a * b with both at most 32767, or null. */
function splitInt16(v: number): [number, number] | null {
  for (let a = Math.ceil(v / 32767); a <= 32767; a++) {
    if (v % a === 0 && v / a <= 32767) return [v / a, a];
  }
  return null;
}

/**
 * Sample rate factor and multiplier for `rate` (SEED manual v2.4, fixed header fields 10-11):
 * integer rates as factor (times a multiplier above 32767), integer periods as a negative factor,
 * other rates as a ratio factor / -multiplier found by continued fractions; when nothing holds the
 * rate exactly, the nearest such ratio (and the caller adds blockette 100).
 */
function rateFields(rate: number): RateFields {
  if (Number.isInteger(rate)) {
    if (rate <= 32767) return fieldsFor(rate, rate, 1);
    const split = splitInt16(rate);
    if (split) return fieldsFor(rate, split[0], split[1]);
  }
  const period = 1 / rate;
  if (Number.isInteger(period)) {
    if (period <= 32767) {
      const f = fieldsFor(rate, -period, 1);
      if (f.exact) return f;
    } else {
      // The first split whose ratio both ways of computing it give exactly.
      for (let a = Math.ceil(period / 32767); a <= 32767; a++) {
        if (period % a !== 0 || period / a > 32767) continue;
        const f = fieldsFor(rate, -(period / a), -a);
        if (f.exact) return f;
      }
    }
  }
  // Continued fraction convergents p/q of the rate with p, q <= 32767.
  let best: RateFields | null = null;
  let p0 = 0, q0 = 1, p1 = 1, q1 = 0;
  let x = rate;
  for (let i = 0; i < 64; i++) {
    const a = Math.floor(x);
    const p2 = a * p1 + p0;
    const q2 = a * q1 + q0;
    if (p2 > 32767 || q2 > 32767) break;
    if (p2 > 0) {
      best = fieldsFor(rate, p2, -q2);
      if (best.exact) return best;
    }
    p0 = p1; q0 = q1; p1 = p2; q1 = q2;
    const frac = x - a;
    if (frac === 0) break;
    x = 1 / frac;
  }
  if (best) return best;
  // Rates beyond 32767 Hz that are not a product of two 16-bit integers: the nearest product.
  if (rate > 32767) {
    for (let d = 0; ; d++) {
      for (const v of [Math.round(rate) - d, Math.round(rate) + d]) {
        const split = splitInt16(v);
        if (split) return fieldsFor(rate, split[0], split[1]);
      }
    }
  }
  // Rates below 1/32767 Hz whose period is not a product of two 16-bit integers.
  for (let d = 0; ; d++) {
    for (const v of [Math.round(period) - d, Math.round(period) + d]) {
      const split = splitInt16(v);
      if (split) return fieldsFor(rate, -split[0], -split[1]);
    }
  }
}

function checkCode(name: string, value: unknown, min: number, max: number): string {
  if (typeof value !== 'string' || value.length < min || value.length > max || !CODE_PATTERN.test(value)) {
    throw new RangeError(
      `${name} code must be ${min}-${max} upper-case letters or digits (SEED manual v2.4, fixed header), got ${JSON.stringify(value)}`,
    );
  }
  return value;
}

// Scratch shared by every call (core code runs single-threaded): the differences of one word.
const diffs = new Float64Array(8);

/** Result of packing one Steim record: samples packed, frames used, and whether a too-wide difference stopped it. */
let packedCount = 0;
let packedFrames = 0;
let stoppedWide = false;

/**
 * Packs samples x[s..] as Steim-2 frames into `dv` from byte `data` (frames 64 bytes each), at most
 * `limit` samples. Sets packedCount, packedFrames, stoppedWide.
 */
function packSteim2(x: Int32Array, s: number, limit: number, dv: DataView, data: number, frames: number): void {
  const end = s + limit;
  let p = s;
  let wide = false;
  let framesUsed = 0;
  for (let f = 0; f < frames && p < end && !wide; f++) {
    const frame = data + 64 * f;
    let ctrl = 0;
    let wi = f === 0 ? 3 : 1;
    for (; wi < 16 && p < end; wi++) {
      if (end - p >= 7) {
        // Fast path, seven differences ahead. |2d + 1| < 2^b exactly when d fits a signed b-bit
        // field. The first four decide between the wide layouts; the last three are looked at only
        // when four fit in 8 bits.
        const x0 = x[p], x1 = x[p + 1], x2 = x[p + 2], x3 = x[p + 3];
        const a0 = x0 - (p > 0 ? x[p - 1] : x0);
        const a1 = x1 - x0, a2 = x2 - x1, a3 = x3 - x2;
        let m = Math.abs(2 * a0 + 1);
        if (m >= 0x40000000) { wide = true; break; }
        let t = Math.abs(2 * a1 + 1); if (t > m) m = t;
        const m2 = m;
        t = Math.abs(2 * a2 + 1); if (t > m) m = t;
        const m3 = m;
        t = Math.abs(2 * a3 + 1); if (t > m) m = t;
        let w: number;
        if (m < 256) {
          const x4 = x[p + 4], x5 = x[p + 5], x6 = x[p + 6];
          const a4 = x4 - x3, a5 = x5 - x4, a6 = x6 - x5;
          t = Math.abs(2 * a4 + 1); if (t > m) m = t;
          const m5 = m;
          t = Math.abs(2 * a5 + 1); if (t > m) m = t;
          const m6 = m;
          t = Math.abs(2 * a6 + 1); if (t > m) m = t;
          if (m < 16) {
            w = 0x80000000 | (a0 & 0xf) << 24 | (a1 & 0xf) << 20 | (a2 & 0xf) << 16
              | (a3 & 0xf) << 12 | (a4 & 0xf) << 8 | (a5 & 0xf) << 4 | (a6 & 0xf);
            ctrl |= 3 << (30 - 2 * wi); p += 7;
          } else if (m6 < 32) {
            w = 0x40000000 | (a0 & 0x1f) << 25 | (a1 & 0x1f) << 20 | (a2 & 0x1f) << 15
              | (a3 & 0x1f) << 10 | (a4 & 0x1f) << 5 | (a5 & 0x1f);
            ctrl |= 3 << (30 - 2 * wi); p += 6;
          } else if (m5 < 64) {
            w = (a0 & 0x3f) << 24 | (a1 & 0x3f) << 18 | (a2 & 0x3f) << 12 | (a3 & 0x3f) << 6 | (a4 & 0x3f);
            ctrl |= 3 << (30 - 2 * wi); p += 5;
          } else {
            w = (a0 & 0xff) << 24 | (a1 & 0xff) << 16 | (a2 & 0xff) << 8 | (a3 & 0xff);
            ctrl |= 1 << (30 - 2 * wi); p += 4;
          }
        } else if (m3 < 1024) {
          w = 0xc0000000 | (a0 & 0x3ff) << 20 | (a1 & 0x3ff) << 10 | (a2 & 0x3ff);
          ctrl |= 2 << (30 - 2 * wi); p += 3;
        } else if (m2 < 32768) {
          w = 0x80000000 | (a0 & 0x7fff) << 15 | (a1 & 0x7fff);
          ctrl |= 2 << (30 - 2 * wi); p += 2;
        } else {
          w = 0x40000000 | (a0 & 0x3fffffff);
          ctrl |= 2 << (30 - 2 * wi); p += 1;
        }
        dv.setInt32(frame + 4 * wi, w, false);
        continue;
      }
      // Last words of the data or of a record's 65535 samples: fewer than seven differences left.
      const avail = end - p < 7 ? end - p : 7;
      const prev = p > 0 ? x[p - 1] : x[0];
      // Differences and running maximum of their magnitude (m = d >= 0 ? d : -d - 1, so a signed
      // b-bit field holds d exactly when m < 2^(b-1)).
      let d = x[p] - prev;
      diffs[0] = d;
      const m0 = d < 0 ? -d - 1 : d;
      if (m0 >= 0x20000000) { wide = true; break; }
      let mx = m0;
      let k = 1;
      let m2 = mx, m3 = mx, m4 = mx, m5 = mx, m6 = mx, m7 = mx;
      for (; k < avail; k++) {
        d = x[p + k] - x[p + k - 1];
        diffs[k] = d;
        const m = d < 0 ? -d - 1 : d;
        if (m > mx) mx = m;
        if (k === 1) m2 = mx;
        else if (k === 2) m3 = mx;
        else if (k === 3) m4 = mx;
        else if (k === 4) m5 = mx;
        else if (k === 5) m6 = mx;
        else m7 = mx;
      }
      let w: number;
      let code: number;
      let used: number;
      if (k === 7 && m7 < 8) {
        used = 7; code = 3;
        w = 0x80000000 | (diffs[0] & 0xf) << 24 | (diffs[1] & 0xf) << 20 | (diffs[2] & 0xf) << 16
          | (diffs[3] & 0xf) << 12 | (diffs[4] & 0xf) << 8 | (diffs[5] & 0xf) << 4 | (diffs[6] & 0xf);
      } else if (k >= 6 && m6 < 16) {
        used = 6; code = 3;
        w = 0x40000000 | (diffs[0] & 0x1f) << 25 | (diffs[1] & 0x1f) << 20 | (diffs[2] & 0x1f) << 15
          | (diffs[3] & 0x1f) << 10 | (diffs[4] & 0x1f) << 5 | (diffs[5] & 0x1f);
      } else if (k >= 5 && m5 < 32) {
        used = 5; code = 3;
        w = (diffs[0] & 0x3f) << 24 | (diffs[1] & 0x3f) << 18 | (diffs[2] & 0x3f) << 12
          | (diffs[3] & 0x3f) << 6 | (diffs[4] & 0x3f);
      } else if (k >= 4 && m4 < 128) {
        used = 4; code = 1;
        w = (diffs[0] & 0xff) << 24 | (diffs[1] & 0xff) << 16 | (diffs[2] & 0xff) << 8 | (diffs[3] & 0xff);
      } else if (k >= 3 && m3 < 512) {
        used = 3; code = 2;
        w = 0xc0000000 | (diffs[0] & 0x3ff) << 20 | (diffs[1] & 0x3ff) << 10 | (diffs[2] & 0x3ff);
      } else if (k >= 2 && m2 < 16384) {
        used = 2; code = 2;
        w = 0x80000000 | (diffs[0] & 0x7fff) << 15 | (diffs[1] & 0x7fff);
      } else {
        used = 1; code = 2;
        w = 0x40000000 | (diffs[0] & 0x3fffffff);
      }
      dv.setInt32(frame + 4 * wi, w | 0, false);
      ctrl |= code << (30 - 2 * wi);
      p += used;
    }
    if (f === 0 || wi > 1) {
      dv.setInt32(frame, ctrl | 0, false);
      framesUsed = f + 1;
    }
  }
  packedCount = p - s;
  packedFrames = framesUsed;
  stoppedWide = wide;
}

/** As {@link packSteim2} for Steim-1 (four 8-bit, two 16-bit or one 32-bit difference per word). */
function packSteim1(x: Int32Array, s: number, limit: number, dv: DataView, data: number, frames: number): void {
  const end = s + limit;
  let p = s;
  let wide = false;
  let framesUsed = 0;
  for (let f = 0; f < frames && p < end && !wide; f++) {
    const frame = data + 64 * f;
    let ctrl = 0;
    let wi = f === 0 ? 3 : 1;
    for (; wi < 16 && p < end; wi++) {
      const avail = end - p < 4 ? end - p : 4;
      const prev = p > 0 ? x[p - 1] : x[0];
      let d = x[p] - prev;
      diffs[0] = d;
      const m0 = d < 0 ? -d - 1 : d;
      if (m0 > 0x7fffffff) { wide = true; break; }
      let mx = m0;
      let m2 = mx;
      let k = 1;
      for (; k < avail; k++) {
        d = x[p + k] - x[p + k - 1];
        diffs[k] = d;
        const m = d < 0 ? -d - 1 : d;
        if (m > mx) mx = m;
        if (k === 1) m2 = mx;
      }
      let w: number;
      let code: number;
      let used: number;
      if (k === 4 && mx < 128) {
        used = 4; code = 1;
        w = (diffs[0] & 0xff) << 24 | (diffs[1] & 0xff) << 16 | (diffs[2] & 0xff) << 8 | (diffs[3] & 0xff);
      } else if (k >= 2 && m2 < 32768) {
        used = 2; code = 2;
        w = (diffs[0] & 0xffff) << 16 | (diffs[1] & 0xffff);
      } else {
        used = 1; code = 3;
        w = diffs[0] | 0;
      }
      dv.setInt32(frame + 4 * wi, w | 0, false);
      ctrl |= code << (30 - 2 * wi);
      p += used;
    }
    if (f === 0 || wi > 1) {
      dv.setInt32(frame, ctrl | 0, false);
      framesUsed = f + 1;
    }
  }
  packedCount = p - s;
  packedFrames = framesUsed;
  stoppedWide = wide;
}

/**
 * Writes `samples` (integer counts) of channel `id`, first sample at `start` (µs), at `sampleRate`
 * (Hz) as big-endian miniSEED 2.4 data records with blockettes 1000 and 1001 (and 100 when the
 * fixed header's rate factor and multiplier cannot hold the rate exactly). Record r starts at
 * start + round(i * 1e6 / sampleRate) µs, i its first sample's index; the 0.0001 s BTIME holds that
 * time rounded to the nearest 100 µs and blockette 1001 the remaining -50..+49 µs.
 */
export function writeMiniSeed(
  id: ChannelId, start: Micros, sampleRate: number, samples: Int32Array, opts: MiniSeedWriteOptions = {},
): Uint8Array {
  if (id === null || typeof id !== 'object') throw new TypeError(`id must be a ChannelId, got ${String(id)}`);
  const network = checkCode('network', id.network, 0, 2);
  const station = checkCode('station', id.station, 1, 5);
  const location = checkCode('location', id.location, 0, 2);
  const channel = checkCode('channel', id.channel, 1, 3);
  if (!Number.isSafeInteger(start)) throw new RangeError(`start must be integer microseconds, got ${start}`);
  const startYear = yearDayFromMicros(start).year;
  if (startYear < 1900 || startYear > 2100) {
    throw new RangeError(`start must lie in the years 1900-2100 that miniSEED readers accept, got year ${startYear}`);
  }
  if (typeof sampleRate !== 'number' || !Number.isFinite(sampleRate) || sampleRate < 1 / (32767 * 32767) || sampleRate > 32767 * 32767) {
    throw new RangeError(`sampleRate must be between 1/32767² and 32767² Hz, got ${sampleRate}`);
  }
  if (!(samples instanceof Int32Array)) throw new TypeError('samples must be an Int32Array of counts');
  const recordLength = opts.recordLength ?? 4096;
  const exponent = Math.log2(recordLength);
  if (!Number.isInteger(exponent) || exponent < 8 || exponent > 16) {
    throw new RangeError(`recordLength must be a power of two from 256 to 65536 bytes, got ${recordLength}`);
  }
  const preferred = opts.encoding ?? STEIM2;
  if (preferred !== STEIM1 && preferred !== STEIM2) {
    throw new RangeError(`encoding must be 10 (Steim-1) or 11 (Steim-2), got ${String(preferred)}`);
  }
  const quality = opts.quality ?? 'D';
  if (quality !== 'D' && quality !== 'R' && quality !== 'Q' && quality !== 'M') {
    throw new RangeError(`quality must be 'D', 'R', 'Q' or 'M', got ${JSON.stringify(quality)}`);
  }
  let sequence = opts.sequenceStart ?? 1;
  if (!Number.isInteger(sequence) || sequence < 1 || sequence > 999_999) {
    throw new RangeError(`sequenceStart must be an integer from 1 to 999999, got ${sequence}`);
  }
  const recordFlags = opts.recordFlags;
  if (recordFlags !== undefined && typeof recordFlags !== 'function') {
    throw new TypeError('recordFlags must be a function of the record start time');
  }

  const n = samples.length;
  if (n === 0) return new Uint8Array(0);

  const rate = rateFields(sampleRate);
  const withB100 = !rate.exact;
  // Steim frames start on a 64-byte boundary: the data follow the 48-byte fixed header and the
  // blockettes 1000 (8 bytes), 1001 (8 bytes) and, when present, 100 (12 bytes).
  const dataOffset = withB100 ? 128 : 64;
  if (dataOffset >= recordLength) {
    throw new RangeError(`recordLength ${recordLength} leaves no room for data after blockette 100; use 512 bytes or more`);
  }
  const frames = (recordLength - dataOffset) >> 6;
  const dataWords = frames * 15 - 2;
  const int32PerRecord = Math.min((recordLength - dataOffset) >> 2, MAX_RECORD_SAMPLES);

  // Header template: everything that is the same in every record.
  const template = new Uint8Array(dataOffset);
  const tv = new DataView(template.buffer);
  const ascii = (at: number, text: string, width: number) => {
    for (let i = 0; i < width; i++) template[at + i] = i < text.length ? text.charCodeAt(i) : 0x20;
  };
  ascii(6, quality, 1);
  ascii(7, ' ', 1);
  ascii(8, station, 5);
  ascii(13, location, 2);
  ascii(15, channel, 3);
  ascii(18, network, 2);
  tv.setInt16(32, rate.factor, false);
  tv.setInt16(34, rate.multiplier, false);
  template[39] = withB100 ? 3 : 2;
  tv.setUint16(44, dataOffset, false);
  tv.setUint16(46, 48, false);
  tv.setUint16(48, 1000, false);
  tv.setUint16(50, 56, false);
  template[53] = 1; // big-endian
  template[54] = exponent;
  tv.setUint16(56, 1001, false);
  tv.setUint16(58, withB100 ? 64 : 0, false);
  if (withB100) {
    tv.setUint16(64, 100, false);
    tv.setUint16(66, 0, false);
    tv.setFloat32(68, sampleRate, false);
  }

  // Output grows by doubling; a first guess of 2 bytes per sample suits Steim-2 on seismic noise.
  let out = new Uint8Array(Math.max(recordLength, (Math.ceil((n * 2) / recordLength) + 1) * recordLength));
  let dv = new DataView(out.buffer);
  let o = 0;

  let s = 0;
  while (s < n) {
    if (o + recordLength > out.length) {
      const bigger = new Uint8Array(out.length * 2);
      bigger.set(out.subarray(0, o));
      out = bigger;
      dv = new DataView(out.buffer);
    }
    const remaining = n - s < MAX_RECORD_SAMPLES ? n - s : MAX_RECORD_SAMPLES;
    const data = o + dataOffset;
    let encoding: number = preferred;
    let count = 0;
    let framesUsed = 0;
    if (encoding === STEIM2) {
      packSteim2(samples, s, remaining, dv, data, frames);
      if (stoppedWide && packedCount < dataWords) {
        out.fill(0, data, o + recordLength);
        encoding = STEIM1;
      } else {
        count = packedCount;
        framesUsed = packedFrames;
      }
    }
    if (encoding === STEIM1) {
      packSteim1(samples, s, remaining, dv, data, frames);
      if (stoppedWide && packedCount < dataWords) {
        out.fill(0, data, o + recordLength);
        encoding = INT32;
      } else {
        count = packedCount;
        framesUsed = packedFrames;
      }
    }
    if (encoding === INT32) {
      count = remaining < int32PerRecord ? remaining : int32PerRecord;
      for (let i = 0; i < count; i++) dv.setInt32(data + 4 * i, samples[s + i], false);
    } else {
      // Forward and reverse integration constants: the record's first and last sample.
      dv.setInt32(data + 4, samples[s], false);
      dv.setInt32(data + 8, samples[s + count - 1], false);
    }

    // Header.
    out.set(template, o);
    let seq = sequence;
    for (let i = 5; i >= 0; i--) {
      out[o + i] = 0x30 + (seq % 10);
      seq = Math.floor(seq / 10);
    }
    sequence = sequence >= 999_999 ? 1 : sequence + 1;
    const t = start + Math.round((s * 1e6) / sampleRate);
    const below = ((t % 100) + 100) % 100;
    const offset = below < 50 ? below : below - 100;
    const f = yearDayFromMicros(t - offset);
    dv.setUint16(o + 20, f.year, false);
    dv.setUint16(o + 22, f.dayOfYear, false);
    out[o + 24] = f.hour;
    out[o + 25] = f.minute;
    out[o + 26] = f.second;
    dv.setUint16(o + 28, f.micros / 100, false);
    dv.setUint16(o + 30, count, false);
    out[o + 52] = encoding;
    dv.setInt8(o + 61, offset);
    out[o + 63] = framesUsed;
    if (recordFlags) {
      const flags = recordFlags(t);
      const tq = flags.timingQuality ?? 0;
      if (!Number.isInteger(tq) || tq < 0 || tq > 100) {
        throw new RangeError(`timingQuality must be an integer percent 0-100, got ${tq} for the record at ${t} µs`);
      }
      out[o + 60] = tq;
      if (flags.clockLocked) out[o + 37] |= 0x20;
      if (flags.questionableTime) out[o + 38] |= 0x80;
    }
    o += recordLength;
    s += count;
  }
  return out.slice(0, o);
}
