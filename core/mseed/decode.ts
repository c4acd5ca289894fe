/**
 * Decoding of a record's data section for the fixed-width encodings (SEED Reference Manual v2.4,
 * blockette 1000 field 3 and chapter 10 "Data format"): INT16 (1), INT24 (2), INT32 (3), FLOAT32 (4),
 * FLOAT64 (5) and ASCII text (0), in either byte order; Steim-1 (10) and Steim-2 (11) are in
 * steim.ts and dispatched from here.
 */
import { encodingName } from '../model';
import { decodeSteim1, decodeSteim2, STEIM1_MAX_PER_FRAME, STEIM2_MAX_PER_FRAME, steimErrorReason, STEIM_OK } from './steim';

/** Which typed array an encoding decodes into. */
export const SampleKind = { Int: 0, Float32: 1, Float64: 2, Text: 3, Unsupported: -1 } as const;
export type SampleKind = (typeof SampleKind)[keyof typeof SampleKind];

export function sampleKindOf(encoding: number): SampleKind {
  switch (encoding) {
    case 1: case 2: case 3: case 10: case 11: return SampleKind.Int;
    case 4: return SampleKind.Float32;
    case 5: return SampleKind.Float64;
    case 0: return SampleKind.Text;
    default: return SampleKind.Unsupported;
  }
}

/** Bytes per sample of the fixed-width encodings, 0 for Steim (variable) and unsupported ones. */
export function bytesPerSample(encoding: number): number {
  switch (encoding) {
    case 0: return 1;
    case 1: return 2;
    case 2: return 3;
    case 3: case 4: return 4;
    case 5: return 8;
    default: return 0;
  }
}

/**
 * Why `count` samples of `encoding` cannot fit in `dataLength` bytes, or null when they can (for
 * Steim: at most 60 or 105 differences per 64-byte frame).
 */
export function capacityProblem(encoding: number, count: number, dataLength: number): string | null {
  if (sampleKindOf(encoding) === SampleKind.Unsupported) {
    return `encoding ${encoding} is not supported (supported: 0 ASCII, 1 INT16, 2 INT24, 3 INT32, 4 FLOAT32, 5 FLOAT64, 10 STEIM1, 11 STEIM2)`;
  }
  if (encoding === 10 || encoding === 11) {
    const frames = dataLength >>> 6;
    const max = frames * (encoding === 10 ? STEIM1_MAX_PER_FRAME : STEIM2_MAX_PER_FRAME);
    if (count > max) return `${count} samples stated, but ${frames} ${encodingName(encoding)} frames hold at most ${max}`;
    return null;
  }
  const need = count * bytesPerSample(encoding);
  if (need > dataLength) return `${count} ${encodingName(encoding)} samples need ${need} bytes, the data section has ${dataLength}`;
  return null;
}

export function decodeInt16(b: Uint8Array, p: number, count: number, le: boolean, out: Int32Array, at: number): void {
  if (le) for (let i = 0; i < count; i++, p += 2) out[at + i] = ((b[p] | (b[p + 1] << 8)) << 16) >> 16;
  else for (let i = 0; i < count; i++, p += 2) out[at + i] = (((b[p] << 8) | b[p + 1]) << 16) >> 16;
}

/** INT24: 24-bit two's complement integers, 3 bytes each (SEED manual v2.4, encoding 2). */
export function decodeInt24(b: Uint8Array, p: number, count: number, le: boolean, out: Int32Array, at: number): void {
  if (le) for (let i = 0; i < count; i++, p += 3) out[at + i] = ((b[p] | (b[p + 1] << 8) | (b[p + 2] << 16)) << 8) >> 8;
  else for (let i = 0; i < count; i++, p += 3) out[at + i] = (((b[p] << 16) | (b[p + 1] << 8) | b[p + 2]) << 8) >> 8;
}

export function decodeInt32(b: Uint8Array, p: number, count: number, le: boolean, out: Int32Array, at: number): void {
  if (le) for (let i = 0; i < count; i++, p += 4) out[at + i] = b[p] | (b[p + 1] << 8) | (b[p + 2] << 16) | (b[p + 3] << 24);
  else for (let i = 0; i < count; i++, p += 4) out[at + i] = (b[p] << 24) | (b[p + 1] << 16) | (b[p + 2] << 8) | b[p + 3];
}

export function decodeFloat32(b: Uint8Array, p: number, count: number, le: boolean, out: Float32Array, at: number): void {
  const v = new DataView(b.buffer, b.byteOffset + p, count * 4);
  for (let i = 0; i < count; i++) out[at + i] = v.getFloat32(i * 4, le);
}

export function decodeFloat64(b: Uint8Array, p: number, count: number, le: boolean, out: Float64Array, at: number): void {
  const v = new DataView(b.buffer, b.byteOffset + p, count * 8);
  for (let i = 0; i < count; i++) out[at + i] = v.getFloat64(i * 8, le);
}

const latin1 = new TextDecoder('latin1');

/** ASCII (encoding 0) text of `count` bytes, trailing NULs and blanks removed. */
export function decodeAscii(b: Uint8Array, p: number, count: number): string {
  return latin1.decode(b.subarray(p, p + count)).replace(/[\0\s]+$/, '');
}

/**
 * Float records may carry NaN or infinite values (IEEE 754 allows them; the SEED manual does not
 * define their meaning). Filters and STA/LTA carry a NaN forward through their state, so one such
 * sample would blank the rest of a trace: the record is refused instead (the caller reports it with
 * its file and offset and leaves a gap where it was). Returns 0 (clean) or throws with the reason.
 */
function finiteOrThrow(out: ArrayLike<number>, at: number, count: number): 0 {
  let bad = 0;
  let first = -1;
  for (let i = 0; i < count; i++) {
    const v = out[at + i];
    if (v - v !== 0) {
      if (bad++ === 0) first = i;
    }
  }
  if (bad > 0) {
    throw new Error(`${bad} of ${count} samples are not finite numbers (NaN or infinity; the first is sample ${first} of the record); record left out`);
  }
  return 0;
}

/** What a record's data decoding found: 0 clean, 1 Steim integration constant mismatch. */
export type DecodeOutcome = 0 | 1;

/**
 * Decodes `count` samples of `encoding` from the record data at `b[p .. p + length)` into
 * `out[at ..]` (Int32Array for integer encodings, Float32Array for FLOAT32, Float64Array for
 * FLOAT64). Returns 1 when a Steim record's last sample differs from its reverse integration
 * constant (samples kept), else 0. Throws an Error whose message is the reason when the data cannot
 * be decoded; callers add the file and offset.
 */
export function decodeSamples(
  b: Uint8Array, p: number, length: number, encoding: number, count: number, le: boolean,
  out: Int32Array | Float32Array | Float64Array, at: number,
): DecodeOutcome {
  const problem = capacityProblem(encoding, count, length);
  if (problem) throw new Error(problem);
  switch (encoding) {
    case 1: decodeInt16(b, p, count, le, out as Int32Array, at); return 0;
    case 2: decodeInt24(b, p, count, le, out as Int32Array, at); return 0;
    case 3: decodeInt32(b, p, count, le, out as Int32Array, at); return 0;
    case 4: decodeFloat32(b, p, count, le, out as Float32Array, at); return finiteOrThrow(out, at, count);
    case 5: decodeFloat64(b, p, count, le, out as Float64Array, at); return finiteOrThrow(out, at, count);
    case 10: case 11: {
      const r = encoding === 10
        ? decodeSteim1(b, p, length, count, le, out as Int32Array, at)
        : decodeSteim2(b, p, length, count, le, out as Int32Array, at);
      if (r < 0) throw new Error(steimErrorReason(r, encodingName(encoding), count));
      return r === STEIM_OK ? 0 : 1;
    }
    default: throw new Error(`encoding ${encoding} cannot be decoded into samples`);
  }
}
