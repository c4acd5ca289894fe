import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { MiniSeedError, parseRecordHeader, nominalRate, looksLikeRecordStart, isMiniSeed3 } from '../../../core/mseed/index';
import { isoFromMicros, microsFromIso } from '../../../core/time';
import { buildRecord, concat, encodeFixed } from '../../support/mseedRecord';

// References: FDSN SEED Reference Manual v2.4, chapter 8 "Fixed Section of Data Header" (field
// layout, flags, BTIME, time correction, sample rate factor/multiplier) and chapter 9 blockettes
// 100, 1000 and 1001. Records are built byte by byte from those definitions (test/support/mseedRecord.ts).

const int32Data = encodeFixed(3, [1, 2, 3, 4], false);
const b1000 = (exponent = 9, encoding = 3, wordOrder = 1) => ({ type: 1000 as const, encoding, exponent, wordOrder });

function header(spec: Partial<Parameters<typeof buildRecord>[0]> = {}) {
  const rec = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()], ...spec });
  return parseRecordHeader(rec, 0, 'built.mseed');
}

function errorOf(f: () => unknown): MiniSeedError {
  try { f(); } catch (e) { if (e instanceof MiniSeedError) return e; throw e; }
  throw new Error('expected a MiniSeedError');
}

describe('parseRecordHeader: fixed section (SEED manual v2.4, chapter 8)', () => {
  it('reads the codes, quality, sequence, sample count and BTIME start of a built record', () => {
    const h = header({ network: 'GE', station: 'WLF', location: '00', channel: 'BHZ', quality: 'Q', sequence: '000123',
      year: 2016, day: 366, hour: 23, minute: 59, second: 59, fract: 9999 });
    expect(h.id).toEqual({ network: 'GE', station: 'WLF', location: '00', channel: 'BHZ' });
    expect(h.quality).toBe('Q');
    expect(h.sequence).toBe('000123');
    expect(h.sampleCount).toBe(4);
    expect(isoFromMicros(h.start)).toBe('2016-12-31T23:59:59.999900Z');
    expect(h.encoding).toBe(3);
    expect(h.recordLength).toBe(512);
    expect(h.dataOffset).toBe(64);
    expect(h.littleEndian).toBe(false);
    expect(h.headerLittleEndian).toBe(false);
  });

  it('detects a little-endian header from the year and day fields and reads it the same', () => {
    const be = header({ year: 2021, day: 45, hour: 6 });
    const le = header({ year: 2021, day: 45, hour: 6, littleEndian: true, blockettes: [b1000(9, 3, 0)] });
    expect(le.headerLittleEndian).toBe(true);
    expect(le.littleEndian).toBe(true);
    expect(le.start).toBe(be.start);
    expect(le.sampleCount).toBe(4);
  });

  it('sample rate from factor and multiplier follows the manual\'s four sign cases (field 10/11 notes)', () => {
    // factor > 0, mult > 0: factor * mult; factor > 0, mult < 0: -factor / mult;
    // factor < 0, mult > 0: -mult / factor; both < 0: 1 / (factor * mult).
    expect(nominalRate(20, 5)).toBe(100);
    expect(nominalRate(1, -10)).toBeCloseTo(0.1, 15);
    expect(nominalRate(-10, 1)).toBeCloseTo(0.1, 15);
    expect(nominalRate(-10, -10)).toBeCloseTo(0.01, 15);
    expect(nominalRate(0, 0)).toBe(0);
    expect(header({ factor: -60, multiplier: 1 }).sampleRate).toBeCloseTo(1 / 60, 15);
  });

  it('applies the time correction (units of 0.0001 s) only when activity flag bit 1 is not set', () => {
    const base = header({ second: 10 }).start;
    expect(header({ second: 10, timeCorrection: 12345 }).start - base).toBe(1_234_500);
    expect(header({ second: 10, timeCorrection: -5 }).start - base).toBe(-500);
    const applied = header({ second: 10, timeCorrection: 12345, activity: 0x02 });
    expect(applied.start).toBe(base);
    expect(applied.timeCorrection).toBe(1_234_500);
    expect(applied.timeCorrectionAdded).toBe(false);
  });

  it('keeps the clock-locked (I/O bit 5), questionable-time (quality bit 7) and leap-second (activity bits 4/5) flags', () => {
    const h = header({ ioClock: 0x20, dataQuality: 0x80, activity: 0x10 });
    expect([h.clockLocked, h.questionableTime, h.leapSecond]).toEqual([true, true, true]);
    expect(h.ioClockFlags).toBe(0x20);
    expect(h.dataQualityFlags).toBe(0x80);
    expect(header({ activity: 0x20 }).leapSecond).toBe(true);
    const plain = header();
    expect([plain.clockLocked, plain.questionableTime, plain.leapSecond]).toEqual([false, false, false]);
  });

  it('reads a start second of 60 as the leap second, landing on the next minute, and flags it', () => {
    const h = header({ year: 2016, day: 366, hour: 23, minute: 59, second: 60, fract: 5000 });
    expect(isoFromMicros(h.start)).toBe('2017-01-01T00:00:00.500000Z');
    expect(h.secondIs60).toBe(true);
    expect(h.leapSecond).toBe(true);
  });

  it('rejects out-of-range time fields with the file, byte offset and field named', () => {
    const good = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()] });
    const bad = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()], hour: 24 });
    const e = errorOf(() => parseRecordHeader(concat(good, bad), 512, 'day.mseed'));
    expect(e.file).toBe('day.mseed');
    expect(e.offset).toBe(512);
    expect(e.reason).toMatch(/hour 24 out of range 0-23/);
    expect(e.message).toBe(`day.mseed: byte 512: ${e.reason}`);
    expect(errorOf(() => header({ fract: 10000 })).reason).toMatch(/fraction 10000/);
    expect(errorOf(() => header({ second: 61 })).reason).toMatch(/second 61/);
  });

  it('rejects bytes that are not a record header (quality indicator, sequence digits)', () => {
    const rec = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()] });
    const text = new TextEncoder().encode('<?xml version="1.0"?><FDSNStationXML>'.padEnd(600, ' '));
    expect(errorOf(() => parseRecordHeader(text, 0, 'inv.xml')).reason).toMatch(/not a miniSEED record/);
    const noQ = rec.slice(); noQ[6] = 0x58;
    expect(errorOf(() => parseRecordHeader(noQ, 0)).reason).toMatch(/quality indicator/);
    expect(looksLikeRecordStart(rec, 0)).toBe(true);
    expect(looksLikeRecordStart(noQ, 0)).toBe(false);
  });

  it('reports a truncated header or record with the bytes left', () => {
    const rec = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()] });
    expect(errorOf(() => parseRecordHeader(rec.subarray(0, 30), 0)).reason).toMatch(/truncated: 30 bytes left/);
    expect(errorOf(() => parseRecordHeader(rec.subarray(0, 300), 0)).reason).toMatch(/record length is 512 bytes but only 300 remain/);
  });

  it('checks its arguments', () => {
    expect(() => parseRecordHeader([] as unknown as Uint8Array, 0)).toThrow(TypeError);
    expect(() => parseRecordHeader(new Uint8Array(10), -1)).toThrow(/offset must be an integer in 0..10, got -1/);
  });
});

describe('parseRecordHeader: blockettes (SEED manual v2.4, chapter 9)', () => {
  it('blockette 1000 gives encoding, word order and record length 2^exponent from 256 to 65536', () => {
    for (const exp of [8, 12, 16]) {
      const h = header({ recordLength: 2 ** exp, blockettes: [b1000(exp, 3, 0)] });
      expect(h.recordLength).toBe(2 ** exp);
      expect(h.littleEndian).toBe(true);
    }
    expect(errorOf(() => header({ blockettes: [b1000(17)] })).reason).toMatch(/exponent 17 out of range 7-16/);
  });

  it('blockette 100 replaces the nominal rate with the actual rate (float32)', () => {
    const h = header({ factor: 100, multiplier: 1, blockettes: [b1000(), { type: 100, rate: 100.00123 }] });
    expect(h.nominalSampleRate).toBe(100);
    expect(h.sampleRate).toBe(Math.fround(100.00123));
  });

  it('blockette 1001 adds its microseconds (signed) to the start and gives the timing quality', () => {
    const h = header({ fract: 1234, blockettes: [b1000(), { type: 1001, timingQuality: 87, micros: -7 }] });
    expect(h.start % 1_000_000).toBe(123_393);
    expect(h.timingQuality).toBe(87);
    expect(header().timingQuality).toBeNull();
  });

  it('steps over blockettes it does not use (e.g. 500 timing, 2000 opaque)', () => {
    const h = header({ blockettes: [{ type: 500, raw: new Uint8Array(196) }, b1000(), { type: 1001, timingQuality: 50, micros: 3 }] });
    expect(h.blockettes).toEqual([500, 1000, 1001]);
    expect(h.encoding).toBe(3);
    expect(h.timingQuality).toBe(50);
  });

  it('detects a blockette chain that loops back instead of following it forever', () => {
    const rec = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000(), { type: 1001, timingQuality: 1, micros: 0 }] });
    new DataView(rec.buffer).setUint16(56 + 2, 48); // 1001's "next" points back at 1000
    expect(errorOf(() => parseRecordHeader(rec, 0)).reason).toMatch(/blockette chain loops back/);
    const self = buildRecord({ sampleCount: 4, data: int32Data, recordLength: 512, blockettes: [b1000()] });
    new DataView(self.buffer).setUint16(48 + 2, 48);
    expect(errorOf(() => parseRecordHeader(self, 0)).reason).toMatch(/loops back/);
  });

  it('without blockette 1000 finds the record length from the next record header (or the end of the data), Steim-1 big-endian assumed as libmseed does', () => {
    const rec = buildRecord({ sampleCount: 0, data: new Uint8Array(0), recordLength: 1024 });
    const two = concat(rec, rec);
    const h = parseRecordHeader(two, 0);
    expect(h.hasBlockette1000).toBe(false);
    expect(h.recordLength).toBe(1024);
    expect(h.encoding).toBe(10);
    expect(parseRecordHeader(two, 1024).recordLength).toBe(1024);
    expect(errorOf(() => parseRecordHeader(concat(rec, new Uint8Array(100)), 0)).reason).toMatch(/no blockette 1000/);
  });

  it('recognises a miniSEED 3 record and refuses it with "miniSEED 3 is not supported yet"', () => {
    // FDSN miniSEED 3 (2023): "MS", format version 3, 40-byte fixed header.
    const ms3 = new Uint8Array(64);
    ms3.set([0x4d, 0x53, 3], 0);
    const e = errorOf(() => parseRecordHeader(concat(new Uint8Array(512), ms3), 512, 'new.mseed'));
    expect(e.reason).toBe('miniSEED 3 is not supported yet');
    expect(e.message).toBe('new.mseed: byte 512: miniSEED 3 is not supported yet');
    expect(isMiniSeed3(ms3, 0)).toBe(true);
  });
});

describe('parseRecordHeader on a real record', () => {
  it('reads the first record of libmseed\'s test.mseed as the header bytes state (IU.COLA.00.LHZ, 1 Hz)', () => {
    // Values read off the file's bytes with xxd by hand: year 0x07da = 2010, day 0x3a = 58, 06:50:00,
    // fraction 0x02b7 = 695 (0.0695 s), 0x70 = 112 samples, factor 1, multiplier 1, I/O flags 0x20,
    // blockette 1000 (Steim-2, big-endian, 2^9), blockette 1001 (timing quality 0x64 = 100, 0x27 = 39 µs).
    const bytes = new Uint8Array(readFileSync('/usr/share/doc/libmseed-dev/examples/test.mseed'));
    const h = parseRecordHeader(bytes, 0, 'test.mseed');
    expect(h.id).toEqual({ network: 'IU', station: 'COLA', location: '00', channel: 'LHZ' });
    expect(h.quality).toBe('M');
    expect(h.sampleCount).toBe(112);
    expect(h.sampleRate).toBe(1);
    expect(h.encoding).toBe(11);
    expect(h.recordLength).toBe(512);
    expect(h.timingQuality).toBe(100);
    expect(h.clockLocked).toBe(true);
    // libmseed 2.19.8 reports this record's start as 2010-02-27T06:50:00.069539 (checked in steim.test.ts).
    expect(h.start).toBe(microsFromIso('2010-02-27T06:50:00.069539Z'));
  });
});
