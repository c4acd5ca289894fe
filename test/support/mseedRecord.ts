/**
 * miniSEED 2.4 records built byte by byte from the SEED Reference Manual v2.4 definitions, for tests:
 * chapter 8 (fixed section of data header: field offsets 0-47) and chapter 9 (blockette 100: type,
 * next, float32 rate, flags, 3 reserved; 1000: type, next, encoding, word order, record length
 * exponent, reserved; 1001: type, next, timing quality, microseconds, reserved, frame count).
 * Nothing here comes from the reader under test.
 */

export type Blockette =
  | { type: 1000; encoding: number; wordOrder?: number; exponent: number }
  | { type: 100; rate: number }
  | { type: 1001; timingQuality: number; micros: number; frames?: number }
  | { type: number; raw: Uint8Array };

export interface RecordSpec {
  sequence?: string;
  quality?: string;
  network?: string;
  station?: string;
  location?: string;
  channel?: string;
  year?: number;
  day?: number;
  hour?: number;
  minute?: number;
  second?: number;
  /** Units of 0.0001 s. */
  fract?: number;
  sampleCount: number;
  factor?: number;
  multiplier?: number;
  activity?: number;
  ioClock?: number;
  dataQuality?: number;
  /** Units of 0.0001 s. */
  timeCorrection?: number;
  /** Header fields little-endian (default big-endian). */
  littleEndian?: boolean;
  blockettes?: Blockette[];
  /** Offset of the first data byte; default: 64 (or the first 64-multiple after the blockettes). */
  dataOffset?: number;
  data: Uint8Array;
  recordLength: number;
}

function pad(s: string, n: number): number[] {
  return Array.from(s.padEnd(n, ' ').slice(0, n), (c) => c.charCodeAt(0));
}

/** Builds one record of `spec.recordLength` bytes. */
export function buildRecord(spec: RecordSpec): Uint8Array {
  const rec = new Uint8Array(spec.recordLength);
  const v = new DataView(rec.buffer);
  const le = spec.littleEndian ?? false;
  rec.set(pad(spec.sequence ?? '000001', 6), 0);
  rec[6] = (spec.quality ?? 'D').charCodeAt(0);
  rec[7] = 0x20;
  rec.set(pad(spec.station ?? 'STA', 5), 8);
  rec.set(pad(spec.location ?? '', 2), 13);
  rec.set(pad(spec.channel ?? 'HHZ', 3), 15);
  rec.set(pad(spec.network ?? 'XX', 2), 18);
  v.setUint16(20, spec.year ?? 2024, le);
  v.setUint16(22, spec.day ?? 1, le);
  rec[24] = spec.hour ?? 0;
  rec[25] = spec.minute ?? 0;
  rec[26] = spec.second ?? 0;
  v.setUint16(28, spec.fract ?? 0, le);
  v.setUint16(30, spec.sampleCount, le);
  v.setInt16(32, spec.factor ?? 100, le);
  v.setInt16(34, spec.multiplier ?? 1, le);
  rec[36] = spec.activity ?? 0;
  rec[37] = spec.ioClock ?? 0;
  rec[38] = spec.dataQuality ?? 0;
  const blks = spec.blockettes ?? [];
  rec[39] = blks.length;
  v.setInt32(40, spec.timeCorrection ?? 0, le);
  let at = 48;
  v.setUint16(46, blks.length ? 48 : 0, le);
  blks.forEach((b, i) => {
    const size = b.type === 100 ? 12 : 'raw' in b ? 4 + b.raw.length : 8;
    const next = i + 1 < blks.length ? at + size : 0;
    v.setUint16(at, b.type, le);
    v.setUint16(at + 2, next, le);
    if ('raw' in b) rec.set(b.raw, at + 4);
    else if (b.type === 1000) { rec[at + 4] = b.encoding; rec[at + 5] = b.wordOrder ?? 1; rec[at + 6] = b.exponent; }
    else if (b.type === 100) v.setFloat32(at + 4, b.rate, le);
    else if (b.type === 1001) { rec[at + 4] = b.timingQuality; v.setInt8(at + 5, b.micros); rec[at + 7] = b.frames ?? 0; }
    at += size;
  });
  const dataOffset = spec.dataOffset ?? Math.max(64, Math.ceil(at / 64) * 64);
  v.setUint16(44, dataOffset, le);
  rec.set(spec.data.subarray(0, spec.recordLength - dataOffset), dataOffset);
  return rec;
}

/** Data bytes of integer or float samples in one of the fixed-width encodings (1-5), either byte order. */
export function encodeFixed(encoding: 1 | 2 | 3 | 4 | 5, values: number[], littleEndian: boolean): Uint8Array {
  const width = { 1: 2, 2: 3, 3: 4, 4: 4, 5: 8 }[encoding];
  const out = new Uint8Array(values.length * width);
  const v = new DataView(out.buffer);
  values.forEach((x, i) => {
    const p = i * width;
    if (encoding === 1) v.setInt16(p, x, littleEndian);
    else if (encoding === 3) v.setInt32(p, x, littleEndian);
    else if (encoding === 4) v.setFloat32(p, x, littleEndian);
    else if (encoding === 5) v.setFloat64(p, x, littleEndian);
    else {
      // INT24: three bytes, two's complement (SEED manual v2.4, data encoding 2).
      const u = x & 0xffffff;
      const bytes = [(u >> 16) & 0xff, (u >> 8) & 0xff, u & 0xff];
      if (littleEndian) bytes.reverse();
      out.set(bytes, p);
    }
  });
  return out;
}

/**
 * Steim-1 frames (SEED manual v2.4, appendix B) holding `values`, every difference written as one
 * 32-bit word (code 3), the simplest valid form. `xn` overrides the reverse integration constant.
 */
export function encodeSteim1Plain(values: number[], frames: number, xn?: number): Uint8Array {
  const out = new Uint8Array(frames * 64);
  const v = new DataView(out.buffer);
  const diffs = values.map((x, i) => (i === 0 ? 0 : x - values[i - 1]));
  let k = 0;
  for (let f = 0; f < frames; f++) {
    let w0 = 0;
    for (let i = f === 0 ? 3 : 1; i < 16 && k < diffs.length; i++, k++) {
      w0 |= 3 << (30 - 2 * i);
      v.setInt32(f * 64 + 4 * i, diffs[k]);
    }
    v.setUint32(f * 64, w0 >>> 0);
  }
  v.setInt32(4, values[0]);
  v.setInt32(8, xn ?? values[values.length - 1]);
  return out;
}

/** Concatenation of byte arrays. */
export function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out;
}
