import { describe, expect, it } from 'vitest';
import { decodeSamples, readMiniSeedBuffer } from '../../../core/mseed/index';
import { capacityProblem, decodeInt24 } from '../../../core/mseed/decode';
import { buildRecord, concat, encodeFixed } from '../../support/mseedRecord';

// References: FDSN SEED Reference Manual v2.4, blockette 1000 field 3 (encodings 0 ASCII, 1 16-bit
// integers, 2 24-bit integers, 3 32-bit integers, 4 IEEE float, 5 IEEE double) and field 4 (word
// order: 0 little-endian, 1 big-endian). Data bytes are written by Node's DataView (IEEE 754 and
// two's complement by the ECMAScript specification) or, for INT24, byte by byte in the test helper.

const ints = [0, 1, -1, 32767, -32768, 12345, -23456];
const int24s = [0, 1, -1, 0x7fffff, -0x800000, 0x123456, -0x123456];
const int32s = [0, 1, -1, 2147483647, -2147483648, 123456789, -987654321];
const floats = [0, 1.5, -2.25, 3.4028234663852886e38, 1.401298464324817e-45, -0.1, Math.PI];

function oneRecord(encoding: 1 | 2 | 3 | 4 | 5, values: number[], le: boolean, recordLength = 512) {
  const rec = buildRecord({
    sampleCount: values.length, data: encodeFixed(encoding, values, le), recordLength, littleEndian: le,
    blockettes: [{ type: 1000, encoding, wordOrder: le ? 0 : 1, exponent: Math.log2(recordLength) }],
  });
  const r = readMiniSeedBuffer(rec, `enc${encoding}.mseed`);
  expect(r.files[0].errors).toEqual([]);
  expect(r.channels).toHaveLength(1);
  return r.channels[0].segments[0].samples;
}

describe('decoding the fixed-width encodings', () => {
  for (const le of [false, true]) {
    const order = le ? 'little-endian' : 'big-endian';
    it(`INT16 (1), ${order}: sign-extended into an Int32Array`, () => {
      const s = oneRecord(1, ints, le);
      expect(s).toBeInstanceOf(Int32Array);
      expect(Array.from(s)).toEqual(ints);
    });
    it(`INT24 (2), ${order}: three-byte two's complement, extremes 0x7fffff and -0x800000`, () => {
      expect(Array.from(oneRecord(2, int24s, le))).toEqual(int24s);
    });
    it(`INT32 (3), ${order}: full 32-bit range`, () => {
      expect(Array.from(oneRecord(3, int32s, le))).toEqual(int32s);
    });
    it(`FLOAT32 (4), ${order}: IEEE single into a Float32Array, bit for bit`, () => {
      const s = oneRecord(4, floats, le);
      expect(s).toBeInstanceOf(Float32Array);
      expect(Array.from(s)).toEqual(floats.map(Math.fround));
    });
    it(`FLOAT64 (5), ${order}: IEEE double into a Float64Array, bit for bit`, () => {
      const s = oneRecord(5, floats, le);
      expect(s).toBeInstanceOf(Float64Array);
      expect(Array.from(s)).toEqual(floats);
    });
  }

  it('INT24 bytes written by hand decode as the manual defines them (0xFFFFFE = -2, 0x800001 = -8388607)', () => {
    const out = new Int32Array(3);
    decodeInt24(new Uint8Array([0xff, 0xff, 0xfe, 0x80, 0x00, 0x01, 0x00, 0x01, 0x00]), 0, 3, false, out, 0);
    expect(Array.from(out)).toEqual([-2, -8388607, 256]);
    decodeInt24(new Uint8Array([0xfe, 0xff, 0xff, 0x01, 0x00, 0x80, 0x00, 0x01, 0x00]), 0, 3, true, out, 0);
    expect(Array.from(out)).toEqual([-2, -8388607, 256]);
  });

  it('fills a 65536-byte record of INT32 to its last data word', () => {
    const n = (65536 - 64) / 4;
    const values = Array.from({ length: n }, (_, i) => (i * 7919) % 100003 - 50000);
    const s = oneRecord(3, values, false, 65536);
    expect(s.length).toBe(n);
    expect(s[n - 1]).toBe(values[n - 1]);
  });

  it('refuses a sample count the data section cannot hold, naming both', () => {
    expect(capacityProblem(3, 200, 448)).toBe('200 INT32 samples need 800 bytes, the data section has 448');
    expect(capacityProblem(11, 1000, 448)).toBe('1000 samples stated, but 7 STEIM2 frames hold at most 735');
    expect(capacityProblem(19, 1, 448)).toMatch(/encoding 19 is not supported/);
    expect(() => decodeSamples(new Uint8Array(512), 64, 448, 1, 300, false, new Int32Array(300), 0)).toThrow(/300 INT16 samples need 600 bytes/);
  });

  it('a record whose count overruns its data is reported with its byte offset, and its neighbours are kept', () => {
    const good = buildRecord({ sampleCount: 4, data: encodeFixed(3, [1, 2, 3, 4], false), recordLength: 512,
      blockettes: [{ type: 1000, encoding: 3, exponent: 9 }] });
    const bad = buildRecord({ sampleCount: 500, data: encodeFixed(3, [1, 2, 3, 4], false), recordLength: 512, second: 1,
      blockettes: [{ type: 1000, encoding: 3, exponent: 9 }] });
    const r = readMiniSeedBuffer(concat(good, bad, good), 'x.mseed');
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: '500 INT32 samples need 2000 bytes, the data section has 448' }]);
    expect(r.files[0].records).toBe(2);
    expect(r.channels[0].duplicatesDropped).toBe(1);
  });
});

describe('ASCII records (encoding 0)', () => {
  it('are kept as text in a log channel, in time order, not as a waveform', () => {
    const text = (s: string, second: number) => buildRecord({
      channel: 'LOG', sampleCount: s.length, factor: 0, multiplier: 0, second, recordLength: 256,
      data: new TextEncoder().encode(s), blockettes: [{ type: 1000, encoding: 0, exponent: 8 }],
    });
    const r = readMiniSeedBuffer(concat(text('GPS lock regained', 30), text('Mass recentre started\n', 5)), 'log.mseed');
    expect(r.channels).toEqual([]);
    expect(r.logs).toHaveLength(1);
    expect(r.logs[0].id.channel).toBe('LOG');
    expect(r.logs[0].entries.map((e) => e.text)).toEqual(['Mass recentre started', 'GPS lock regained']);
    expect(r.logs[0].entries[0].time).toBe(Date.UTC(2024, 0, 1, 0, 0, 5) * 1000);
    expect(r.files[0].records).toBe(2);
  });
});
