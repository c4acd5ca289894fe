import { describe, expect, it, beforeAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { decodeSteim1, decodeSteim2, readMiniSeedBuffer, STEIM_MISMATCH, STEIM_OK } from '../../../core/mseed/index';
import { STEIM_BAD_CODE, STEIM_TOO_FEW } from '../../../core/mseed/steim';
import { buildRecord, concat, encodeSteim1Plain } from '../../support/mseedRecord';

// References: FDSN SEED Reference Manual v2.4, appendix B (Steim1 and Steim2 compression: 64-byte
// frames, word 0 holds 2-bit codes per word, X0/Xn integration constants in frame 0, Steim-2 "dnib"
// sub-codes), and libmseed 2.19.8 (Debian libmseed-dev) read in the same run by a small C program.

const TEST_MSEED = '/usr/share/doc/libmseed-dev/examples/test.mseed';
const BUILD = join(__dirname, '..', '..', '.build');
const PROGRAM = join(BUILD, 'mseed-reader-steim-check');

// libmseed: read a file into a trace list (half-sample time tolerance, 1e-4 rate tolerance) and print
// each segment's id, start (µs since the epoch), rate, sample count and every integer sample.
const C_SOURCE = String.raw`
#include <stdio.h>
#include <libmseed.h>
int main(int argc, char **argv) {
  MSTraceList *mstl = NULL;
  if (ms_readtracelist(&mstl, argv[1], 0, -1.0, -1.0, 0, 1, 1, 0) != MS_NOERROR) return 1;
  for (MSTraceID *id = mstl->traces; id; id = id->next)
    for (MSTraceSeg *s = id->first; s; s = s->next) {
      printf("%s %lld %.6f %lld", id->srcname, (long long)s->starttime, s->samprate, (long long)s->numsamples);
      for (int64_t i = 0; i < s->numsamples; i++) printf(" %d", ((int *)s->datasamples)[i]);
      printf("\n");
    }
  mstl_free(&mstl, 1);
  return 0;
}
`;

interface RefSegment { id: string; start: number; rate: number; samples: number[] }
function libmseedSegments(file: string): RefSegment[] {
  return execFileSync(PROGRAM, [file]).toString().trim().split('\n').map((line) => {
    const [id, start, rate, n, ...s] = line.split(' ');
    expect(s.length).toBe(Number(n));
    return { id, start: Number(start), rate: Number(rate), samples: s.map(Number) };
  });
}

beforeAll(() => {
  mkdirSync(BUILD, { recursive: true });
  writeFileSync(`${PROGRAM}.c`, C_SOURCE);
  execFileSync('gcc', ['-O2', '-o', PROGRAM, `${PROGRAM}.c`, '-lmseed']);
});

describe('Steim-2 on the real test.mseed, against libmseed 2.19.8', () => {
  it('gives the same samples, sample count, rate and start time to the microsecond', () => {
    const ref = libmseedSegments(TEST_MSEED);
    const r = readMiniSeedBuffer(new Uint8Array(readFileSync(TEST_MSEED)), 'test.mseed');
    expect(r.files[0].errors).toEqual([]);
    expect(r.files[0].records).toBe(36);
    expect(ref).toHaveLength(1);
    expect(r.channels).toHaveLength(1);
    const ch = r.channels[0];
    expect(ch.segments).toHaveLength(1);
    const seg = ch.segments[0];
    expect(ref[0].id).toBe('IU_COLA_00_LHZ');
    expect(seg.samples.length).toBe(ref[0].samples.length);
    expect(seg.samples.length).toBe(4200);
    expect(seg.start).toBe(ref[0].start);
    expect(seg.sampleRate).toBe(ref[0].rate);
    expect(seg.samples[0]).toBe(ref[0].samples[0]);
    expect(seg.samples[4199]).toBe(ref[0].samples[4199]);
    expect(Array.from(seg.samples)).toEqual(ref[0].samples);
    expect(seg.timing.steimMismatchRecords).toBe(0);
    expect(seg.timing.records).toBe(36);
  });
});

// ---- frames written by hand from appendix B ----

/** Steim-2 word with sub-code `dnib` and `n` fields of `bits` bits each, right-aligned (appendix B). */
function steim2Word(dnib: number | null, bits: number, diffs: number[]): number {
  let w = dnib === null ? 0 : dnib << 30;
  diffs.forEach((d, i) => {
    const shift = bits * (diffs.length - 1 - i);
    w |= (d & ((1 << bits) - 1)) << shift;
  });
  return w >>> 0;
}

/**
 * One frame. Little-endian frames are laid out as libmseed 2.19.8 reads them (its unpackdata.c with
 * the swap flag): whole 32-bit words swapped, except code-1 words (four bytes, memory order) and
 * Steim-1 code-2 words (two 16-bit halves, each swapped in place).
 */
function frameBytes(words: number[], codes: number[], littleEndian = false, steim1 = false): Uint8Array {
  const out = new Uint8Array(64);
  const v = new DataView(out.buffer);
  let w0 = 0;
  codes.forEach((c, i) => { w0 |= c << (30 - 2 * i); });
  v.setUint32(0, w0 >>> 0, littleEndian);
  words.forEach((w, i) => {
    const c = codes[i + 1] ?? 0;
    const at = 4 * (i + 1);
    if (littleEndian && c === 1) v.setUint32(at, w >>> 0, false);
    else if (littleEndian && c === 2 && steim1) { v.setUint16(at, w >>> 16, true); v.setUint16(at + 2, w & 0xffff, true); }
    else v.setUint32(at, w >>> 0, littleEndian);
  });
  return out;
}

function integrate(x0: number, diffs: number[]): number[] {
  const out = [x0];
  for (let i = 1; i < diffs.length; i++) out.push(out[i - 1] + diffs[i]);
  return out;
}

// One Steim-2 frame using every word form: code 1 (4 x 8 bit), code 2 with dnib 1/2/3 (1 x 30,
// 2 x 15, 3 x 10 bit), code 3 with dnib 0/1/2 (5 x 6, 6 x 5, 7 x 4 bit).
const s2groups: [number, number | null, number, number[]][] = [
  [1, null, 8, [99, -128, 127, -1]],
  [2, 1, 30, [-536870912]],
  [2, 2, 15, [16383, -16384]],
  [2, 3, 10, [511, -512, 3]],
  [3, 0, 6, [31, -32, 0, 1, -2]],
  [3, 1, 5, [15, -16, 7, -8, 1, -1]],
  [3, 2, 4, [7, -8, 3, -3, 0, 1, -1]],
];
const s2diffs = s2groups.flatMap((g) => g[3]);
const X0 = 1000;
const s2samples = integrate(X0, s2diffs);

function steim2Frame(littleEndian = false, xn = s2samples[s2samples.length - 1]): Uint8Array {
  const words = [X0, xn, ...s2groups.map(([, dnib, bits, d]) => steim2Word(dnib, bits, d))];
  return frameBytes(words, [0, 0, 0, ...s2groups.map((g) => g[0])], littleEndian);
}

describe('Steim-2 frames written from the manual (appendix B)', () => {
  it('decodes every word form: sample 0 = X0, then the running sum of differences 1..n-1', () => {
    const out = new Int32Array(s2samples.length);
    expect(decodeSteim2(steim2Frame(), 0, 64, s2samples.length, false, out, 0)).toBe(STEIM_OK);
    expect(Array.from(out)).toEqual(s2samples);
  });

  it('decodes little-endian frames (blockette 1000 word order 0, laid out as libmseed 2.19.8 reads them) the same', () => {
    const out = new Int32Array(s2samples.length);
    expect(decodeSteim2(steim2Frame(true), 0, 64, s2samples.length, true, out, 0)).toBe(STEIM_OK);
    expect(Array.from(out)).toEqual(s2samples);
  });

  it('stops at the stated sample count and writes at the given index only', () => {
    const out = new Int32Array(12).fill(-7);
    expect(decodeSteim2(steim2Frame(), 0, 64, 10, false, out, 2)).toBe(STEIM_MISMATCH);
    expect(Array.from(out)).toEqual([-7, -7, ...s2samples.slice(0, 10)]);
  });

  it('keeps the samples and flags the record when the last sample differs from Xn (as libmseed does)', () => {
    const rec = buildRecord({ sampleCount: s2samples.length, data: steim2Frame(false, 12345), recordLength: 256,
      blockettes: [{ type: 1000, encoding: 11, exponent: 8 }] });
    const r = readMiniSeedBuffer(rec, 'mismatch.mseed');
    expect(r.files[0].errors).toEqual([]);
    const seg = r.channels[0].segments[0];
    expect(Array.from(seg.samples)).toEqual(s2samples);
    expect(seg.timing.steimMismatchRecords).toBe(1);
  });

  it('refuses undefined sub-codes (code 2 with dnib 0, code 3 with dnib 3)', () => {
    for (const [c, dnib] of [[2, 0], [3, 3]]) {
      const f = frameBytes([X0, X0, (dnib << 30) >>> 0], [0, 0, 0, c]);
      expect(decodeSteim2(f, 0, 64, 2, false, new Int32Array(2), 0)).toBe(STEIM_BAD_CODE);
    }
    const bad = frameBytes([X0, X0, 0], [0, 0, 0, 2]);
    const rec = buildRecord({ sampleCount: 1, data: bad, recordLength: 256, blockettes: [{ type: 1000, encoding: 11, exponent: 8 }] });
    const r = readMiniSeedBuffer(concat(new Uint8Array(0), rec), 'bad.mseed');
    expect(r.files[0].errors).toEqual([{ offset: 0, reason: 'STEIM2 frame has an undefined difference code' }]);
    expect(r.channels).toEqual([]);
  });

  it('refuses a sample count larger than the differences the frames hold', () => {
    const out = new Int32Array(40);
    expect(decodeSteim2(steim2Frame(), 0, 64, 29, false, out, 0)).toBe(STEIM_TOO_FEW);
    expect(out[0]).toBe(0);
  });
});

describe('Steim-1 frames written from the manual (appendix B)', () => {
  it('decodes codes 1 (4 x 8 bit), 2 (2 x 16 bit) and 3 (1 x 32 bit) in both byte orders', () => {
    const groups: [number, number[]][] = [[1, [5, -128, 127, 0]], [2, [-32768, 32767]], [3, [-2000000000]], [3, [2000000001]]];
    const diffs = groups.flatMap((g) => g[1]);
    const samples = integrate(-77, diffs);
    const words = groups.map(([c, d]) => (c === 1 ? steim2Word(null, 8, d) : c === 2 ? steim2Word(null, 16, d) : d[0] >>> 0));
    for (const le of [false, true]) {
      const f = frameBytes([-77 >>> 0, samples[samples.length - 1] >>> 0, ...words], [0, 0, 0, ...groups.map((g) => g[0])], le, true);
      const out = new Int32Array(samples.length);
      expect(decodeSteim1(f, 0, 64, samples.length, le, out, 0)).toBe(STEIM_OK);
      expect(Array.from(out)).toEqual(samples);
    }
  });

  it('reads records without blockette 1000 as Steim-1 with the header\'s byte order, as libmseed 2.19.8 does', () => {
    const values = [10, 12, 7, -100, 5000, 4999, 0, -65536];
    const a = buildRecord({ sampleCount: values.length, data: encodeSteim1Plain(values, 1), recordLength: 512 });
    const b = buildRecord({ sampleCount: values.length, data: encodeSteim1Plain(values, 1), recordLength: 512, second: 6 });
    const file = join(BUILD, 'mseed-reader-no-b1000.mseed');
    writeFileSync(file, concat(a, b));
    const ref = libmseedSegments(file);
    const r = readMiniSeedBuffer(concat(a, b), 'no1000.mseed');
    expect(r.files[0].errors).toEqual([]);
    expect(r.channels[0].segments.map((s) => ({ start: s.start, samples: Array.from(s.samples) })))
      .toEqual(ref.map((s) => ({ start: s.start, samples: s.samples })));
    expect(ref[0].samples).toEqual(values);
  });
});
