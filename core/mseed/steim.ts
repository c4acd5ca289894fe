/**
 * Steim-1 and Steim-2 decoding (SEED Reference Manual v2.4, appendix B "Compression algorithms",
 * Steim1 and Steim2). Data are 64-byte frames of sixteen 32-bit words; word 0 of each frame holds
 * sixteen 2-bit codes, one per word. In the first frame words 1 and 2 are the forward and reverse
 * integration constants X0 (the first sample) and Xn (the last sample). The first difference of a
 * record refers to the previous record and is not used: sample 0 is X0, sample i = sample i-1 + d_i.
 *
 * Speed: words are read big-endian with byte shifts (no DataView; little-endian data is first copied
 * byte-swapped into a scratch buffer, so there is one inner loop per encoding), differences are integrated as they are
 * unpacked into one scratch buffer that is allocated once and grown only for larger records, and the
 * samples are then copied to the caller's array in one block. The Steim-1 and Steim-2 frame loops
 * look alike but are kept apart on purpose: one loop per encoding keeps each word's dispatch short.
 */

/** Decoded and the last sample equals the reverse integration constant Xn. */
export const STEIM_OK = 0;
/** Decoded, but the last sample differs from Xn: samples kept, record to be flagged (as libmseed does). */
export const STEIM_MISMATCH = 1;
/** The frames hold fewer differences than the record's sample count. */
export const STEIM_TOO_FEW = -1;
/** A word carries a code combination the encoding does not define. */
export const STEIM_BAD_CODE = -2;
/** The data section is shorter than one frame. */
export const STEIM_NO_FRAMES = -3;

/** Most differences one 64-byte frame can hold: Steim-1 15 words x 4, Steim-2 15 words x 7. */
export const STEIM1_MAX_PER_FRAME = 60;
export const STEIM2_MAX_PER_FRAME = 105;

let scratch = new Int32Array(16384);
function scratchFor(n: number): Int32Array {
  if (scratch.length < n) scratch = new Int32Array(Math.max(n, scratch.length * 2));
  return scratch;
}

let swapScratch = new Uint8Array(4096);
/**
 * Big-endian copy of little-endian Steim frames (blockette 1000 word order 0, rare), byte-swapped as
 * libmseed 2.19 reads them: word 0, X0, Xn and 32-bit-coded words as whole words; Steim-1 code-2
 * words as two 16-bit halves, each swapped in place; code-1 words (four 8-bit differences) left in
 * memory order. The decoders then run their one big-endian loop over the copy.
 */
function swapFrames(b: Uint8Array, p: number, frames: number, steim1: boolean): Uint8Array {
  const n = frames << 6;
  if (swapScratch.length < n) swapScratch = new Uint8Array(n);
  const s = swapScratch;
  for (let f = 0; f < n; f += 64) {
    const q = p + f;
    const w0 = b[q] | (b[q + 1] << 8) | (b[q + 2] << 16) | (b[q + 3] << 24);
    for (let i = 0; i < 16; i++) {
      const k = f + 4 * i;
      const c = i === 0 || (f === 0 && i < 3) ? 0 : (w0 >>> (30 - 2 * i)) & 3;
      if (c === 1) {
        s[k] = b[q + 4 * i]; s[k + 1] = b[q + 4 * i + 1]; s[k + 2] = b[q + 4 * i + 2]; s[k + 3] = b[q + 4 * i + 3];
      } else if (c === 2 && steim1) {
        s[k] = b[q + 4 * i + 1]; s[k + 1] = b[q + 4 * i]; s[k + 2] = b[q + 4 * i + 3]; s[k + 3] = b[q + 4 * i + 2];
      } else {
        s[k] = b[q + 4 * i + 3]; s[k + 1] = b[q + 4 * i + 2]; s[k + 2] = b[q + 4 * i + 1]; s[k + 3] = b[q + 4 * i];
      }
    }
  }
  return s;
}

/** Last Xn read by a decoder (for reports and tests). */
export const steimLast = { x0: 0, xn: 0, last: 0, decoded: 0 };

function wordBE(b: Uint8Array, p: number): number {
  return (b[p] << 24) | (b[p + 1] << 16) | (b[p + 2] << 8) | b[p + 3];
}

/**
 * The first difference stored in the frames (needed to start the integration from X0), or
 * undefined when there is none.
 */
function firstDifference(b: Uint8Array, p: number, frames: number, steim2: boolean): number | undefined {
  for (let f = 0; f < frames; f++) {
    const fp = p + (f << 6);
    const w0 = wordBE(b, fp);
    for (let i = f === 0 ? 3 : 1; i < 16; i++) {
      const c = (w0 >>> (30 - 2 * i)) & 3;
      if (c === 0) continue;
      const w = wordBE(b, fp + 4 * i);
      if (c === 1) return w >> 24;
      if (!steim2) return c === 2 ? w >> 16 : w;
      const dnib = w >>> 30;
      if (c === 2) return dnib === 1 ? (w << 2) >> 2 : dnib === 2 ? (w << 2) >> 17 : (w << 2) >> 22;
      return dnib === 0 ? (w << 2) >> 26 : dnib === 1 ? (w << 2) >> 27 : (w << 4) >> 28;
    }
  }
  return undefined;
}

/**
 * Decodes `count` Steim-2 samples from the `length` bytes at `p` (whole frames) into
 * `out[at .. at + count)`. `littleEndian`: blockette 1000 word order 0 (see swapFrames).
 * Returns STEIM_OK, STEIM_MISMATCH or a negative STEIM_* error code; `out` is untouched on error.
 */
export function decodeSteim2(
  b: Uint8Array, p: number, length: number, count: number, littleEndian: boolean, out: Int32Array, at: number,
): number {
  const frames = length >>> 6;
  if (count === 0) return STEIM_OK;
  if (frames === 0) return STEIM_NO_FRAMES;
  if (littleEndian) {
    b = swapFrames(b, p, frames, false);
    p = 0;
  }
  const s = scratchFor(frames * STEIM2_MAX_PER_FRAME + 8);
  const x0 = wordBE(b, p + 4);
  const xn = wordBE(b, p + 8);
  const d0 = firstDifference(b, p, frames, true);
  if (d0 === undefined) return STEIM_TOO_FEW;
  let last = (x0 - d0) | 0;
  let n = 0;
  for (let f = 0; f < frames && n < count; f++) {
    const fp = p + (f << 6);
    const w0 = (b[fp] << 24) | (b[fp + 1] << 16) | (b[fp + 2] << 8) | b[fp + 3];
    for (let i = f === 0 ? 3 : 1; i < 16; i++) {
      const c = (w0 >>> (30 - 2 * i)) & 3;
      if (c === 0) continue;
      const wp = fp + (i << 2);
      const w = (b[wp] << 24) | (b[wp + 1] << 16) | (b[wp + 2] << 8) | b[wp + 3];
      if (c === 1) {
        s[n] = last = (last + (w >> 24)) | 0;
        s[n + 1] = last = (last + ((w << 8) >> 24)) | 0;
        s[n + 2] = last = (last + ((w << 16) >> 24)) | 0;
        s[n + 3] = last = (last + ((w << 24) >> 24)) | 0;
        n += 4;
      } else if (c === 2) {
        const dnib = w >>> 30;
        if (dnib === 1) {
          s[n++] = last = (last + ((w << 2) >> 2)) | 0;
        } else if (dnib === 2) {
          s[n] = last = (last + ((w << 2) >> 17)) | 0;
          s[n + 1] = last = (last + ((w << 17) >> 17)) | 0;
          n += 2;
        } else if (dnib === 3) {
          s[n] = last = (last + ((w << 2) >> 22)) | 0;
          s[n + 1] = last = (last + ((w << 12) >> 22)) | 0;
          s[n + 2] = last = (last + ((w << 22) >> 22)) | 0;
          n += 3;
        } else {
          return STEIM_BAD_CODE;
        }
      } else {
        const dnib = w >>> 30;
        if (dnib === 0) {
          s[n] = last = (last + ((w << 2) >> 26)) | 0;
          s[n + 1] = last = (last + ((w << 8) >> 26)) | 0;
          s[n + 2] = last = (last + ((w << 14) >> 26)) | 0;
          s[n + 3] = last = (last + ((w << 20) >> 26)) | 0;
          s[n + 4] = last = (last + ((w << 26) >> 26)) | 0;
          n += 5;
        } else if (dnib === 1) {
          s[n] = last = (last + ((w << 2) >> 27)) | 0;
          s[n + 1] = last = (last + ((w << 7) >> 27)) | 0;
          s[n + 2] = last = (last + ((w << 12) >> 27)) | 0;
          s[n + 3] = last = (last + ((w << 17) >> 27)) | 0;
          s[n + 4] = last = (last + ((w << 22) >> 27)) | 0;
          s[n + 5] = last = (last + ((w << 27) >> 27)) | 0;
          n += 6;
        } else if (dnib === 2) {
          s[n] = last = (last + ((w << 4) >> 28)) | 0;
          s[n + 1] = last = (last + ((w << 8) >> 28)) | 0;
          s[n + 2] = last = (last + ((w << 12) >> 28)) | 0;
          s[n + 3] = last = (last + ((w << 16) >> 28)) | 0;
          s[n + 4] = last = (last + ((w << 20) >> 28)) | 0;
          s[n + 5] = last = (last + ((w << 24) >> 28)) | 0;
          s[n + 6] = last = (last + ((w << 28) >> 28)) | 0;
          n += 7;
        } else {
          return STEIM_BAD_CODE;
        }
      }
    }
  }
  return finish(s, n, count, x0, xn, out, at);
}

/**
 * Decodes `count` Steim-1 samples from the `length` bytes at `p` into `out[at .. at + count)`.
 * Same conventions and return codes as {@link decodeSteim2}.
 */
export function decodeSteim1(
  b: Uint8Array, p: number, length: number, count: number, littleEndian: boolean, out: Int32Array, at: number,
): number {
  const frames = length >>> 6;
  if (count === 0) return STEIM_OK;
  if (frames === 0) return STEIM_NO_FRAMES;
  if (littleEndian) {
    b = swapFrames(b, p, frames, true);
    p = 0;
  }
  const s = scratchFor(frames * STEIM1_MAX_PER_FRAME + 8);
  const x0 = wordBE(b, p + 4);
  const xn = wordBE(b, p + 8);
  const d0 = firstDifference(b, p, frames, false);
  if (d0 === undefined) return STEIM_TOO_FEW;
  let last = (x0 - d0) | 0;
  let n = 0;
  for (let f = 0; f < frames && n < count; f++) {
    const fp = p + (f << 6);
    const w0 = (b[fp] << 24) | (b[fp + 1] << 16) | (b[fp + 2] << 8) | b[fp + 3];
    for (let i = f === 0 ? 3 : 1; i < 16; i++) {
      const c = (w0 >>> (30 - 2 * i)) & 3;
      if (c === 0) continue;
      const wp = fp + (i << 2);
      const w = (b[wp] << 24) | (b[wp + 1] << 16) | (b[wp + 2] << 8) | b[wp + 3];
      if (c === 1) {
        s[n] = last = (last + (w >> 24)) | 0;
        s[n + 1] = last = (last + ((w << 8) >> 24)) | 0;
        s[n + 2] = last = (last + ((w << 16) >> 24)) | 0;
        s[n + 3] = last = (last + ((w << 24) >> 24)) | 0;
        n += 4;
      } else if (c === 2) {
        s[n] = last = (last + (w >> 16)) | 0;
        s[n + 1] = last = (last + ((w << 16) >> 16)) | 0;
        n += 2;
      } else {
        s[n++] = last = (last + w) | 0;
      }
    }
  }
  return finish(s, n, count, x0, xn, out, at);
}

function finish(s: Int32Array, n: number, count: number, x0: number, xn: number, out: Int32Array, at: number): number {
  steimLast.x0 = x0;
  steimLast.xn = xn;
  steimLast.decoded = n;
  if (n < count) return STEIM_TOO_FEW;
  out.set(n === count ? s.subarray(0, n) : s.subarray(0, count), at);
  const lastSample = s[count - 1];
  steimLast.last = lastSample;
  return lastSample === xn ? STEIM_OK : STEIM_MISMATCH;
}

/** Words in order of reasons for the negative return codes. */
export function steimErrorReason(code: number, encodingName: string, count: number): string {
  switch (code) {
    case STEIM_TOO_FEW: return `${encodingName} frames hold ${steimLast.decoded} differences, fewer than the ${count} samples the header states`;
    case STEIM_BAD_CODE: return `${encodingName} frame has an undefined difference code`;
    case STEIM_NO_FRAMES: return `${encodingName} data section is shorter than one 64-byte frame`;
    default: return `${encodingName} decoding failed (code ${code})`;
  }
}
