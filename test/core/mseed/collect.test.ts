import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { MiniSeedCollector, readMiniSeedBuffer, SCAN_LOOKAHEAD, type MiniSeedReadResult } from '../../../core/mseed/index';
import { sampleTime } from '../../../core/model';
import { buildRecord, concat, encodeFixed, encodeSteim1Plain, type Blockette } from '../../support/mseedRecord';

// References: record times from the SEED Reference Manual v2.4 (chapter 8 BTIME, blockette 100);
// merge tolerances as libmseed 2.19.8 applies them by default when it assembles traces (time tear up
// to half a sample period; rates equal when |1 - a/b| < 0.0001, its MS_ISRATETOLERABLE), which is
// common practice. Expected times below are worked out from the header fields by hand.

const T0 = Date.UTC(2024, 0, 1) * 1000; // 2024-01-01T00:00:00Z in µs, the builder's default day

interface Rec {
  values: number[];
  /** Start in µs after T0 (whole 100 µs units plus blockette 1001 µs). */
  at: number;
  channel?: string;
  recordLength?: number;
  encoding?: 3 | 4;
  rate?: number;
}

function rec({ values, at, channel = 'HHZ', recordLength = 512, encoding = 3, rate }: Rec): Uint8Array {
  const sec = Math.floor(at / 1e6);
  const rest = at - sec * 1e6;
  const fract = Math.floor(rest / 100);
  const blockettes: Blockette[] = [{ type: 1000, encoding, exponent: Math.log2(recordLength) },
    { type: 1001, timingQuality: 90, micros: rest - fract * 100 }];
  if (rate !== undefined) blockettes.push({ type: 100, rate });
  return buildRecord({
    channel, sampleCount: values.length, hour: Math.floor(sec / 3600), minute: Math.floor(sec / 60) % 60, second: sec % 60,
    fract, data: encodeFixed(encoding, values, false), recordLength, blockettes,
  });
}

const ramp = (from: number, n = 10) => Array.from({ length: n }, (_, i) => from + i);

function read(...records: Uint8Array[]): MiniSeedReadResult {
  const r = readMiniSeedBuffer(concat(...records), 'merge.mseed');
  return r;
}

describe('assembling records into segments (100 Hz, 10 samples = 100 ms per record)', () => {
  it('joins records that continue each other into one segment and keeps each record\'s own start', () => {
    const r = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 100_000 }), rec({ values: ramp(20), at: 200_000 }));
    expect(r.files[0]).toEqual({ path: 'merge.mseed', records: 3, errors: [] });
    const ch = r.channels[0];
    expect(ch.segments).toHaveLength(1);
    const s = ch.segments[0];
    expect(Array.from(s.samples)).toEqual(ramp(0, 30));
    expect(s.start).toBe(T0);
    expect(s.end).toBe(T0 + 290_000);
    expect(Array.from(s.recordStarts)).toEqual([T0, T0 + 100_000, T0 + 200_000]);
    expect(Array.from(s.recordFirstSample)).toEqual([0, 10, 20]);
    expect(s.timing).toMatchObject({ qualityMin: 90, qualityMax: 90, records: 3 });
    expect(ch.gaps).toEqual([]);
    expect(ch.overlaps).toEqual([]);
    expect(ch.duplicatesDropped).toBe(0);
  });

  it('sorts records by time whatever their order in the file', () => {
    const r = read(rec({ values: ramp(20), at: 200_000 }), rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 100_000 }));
    expect(Array.from(r.channels[0].segments[0].samples)).toEqual(ramp(0, 30));
  });

  it('merges a time tear under half a sample (4 ms at 100 Hz) and keeps the drifted record time for its samples', () => {
    const r = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 104_000 }));
    const s = r.channels[0].segments[0];
    expect(r.channels[0].segments).toHaveLength(1);
    expect(sampleTime(s, 10)).toBe(T0 + 104_000);
    expect(sampleTime(s, 19)).toBe(T0 + 194_000);
    expect(r.channels[0].gaps).toEqual([]);
  });

  it('lists a gap from the sample after the last one to the next segment\'s first sample', () => {
    const r = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 1_000_000 }));
    const ch = r.channels[0];
    expect(ch.segments.map((s) => [s.start, s.end, s.samples.length])).toEqual([[T0, T0 + 90_000, 10], [T0 + 1_000_000, T0 + 1_090_000, 10]]);
    expect(ch.gaps).toEqual([{ start: T0 + 100_000, end: T0 + 1_000_000 }]);
  });

  it('a tear of more than half a sample (6 ms) starts a new segment', () => {
    const ch = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 106_000 })).channels[0];
    expect(ch.segments).toHaveLength(2);
    expect(ch.gaps).toEqual([{ start: T0 + 100_000, end: T0 + 106_000 }]);
  });

  it('merges rates that differ by less than 1e-4 relative (blockette 100) and splits beyond', () => {
    const close = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 100_000, rate: 100.005 })).channels[0];
    expect(close.segments).toHaveLength(1);
    expect(close.segments[0].samples.length).toBe(20);
    const far = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 100_000, rate: 100.02 })).channels[0];
    expect(far.segments.map((s) => s.sampleRate)).toEqual([100, Math.fround(100.02)]);
    expect(far.gaps).toEqual([]);
  });

  it('drops a duplicate record (same time and samples) quietly and counts it', () => {
    const a = rec({ values: ramp(0), at: 0 });
    const b = rec({ values: ramp(10), at: 100_000 });
    const ch = read(a, b, a, b, a).channels[0];
    expect(ch.duplicatesDropped).toBe(3);
    expect(ch.segments).toHaveLength(1);
    expect(Array.from(ch.segments[0].samples)).toEqual(ramp(0, 20));
    expect(ch.overlaps).toEqual([]);
  });

  it('keeps an overlap whose samples conflict apart from the segment and lists it with the later data', () => {
    const ch = read(rec({ values: ramp(0, 20), at: 0 }), rec({ values: ramp(500), at: 50_000 })).channels[0];
    expect(ch.segments).toHaveLength(1);
    expect(Array.from(ch.segments[0].samples)).toEqual(ramp(0, 20));
    expect(ch.overlaps).toHaveLength(1);
    const o = ch.overlaps[0];
    expect([o.start, o.end]).toEqual([T0 + 50_000, T0 + 140_000]);
    expect(Array.from(o.segment.samples)).toEqual(ramp(500));
    expect(ch.duplicatesDropped).toBe(0);
  });

  it('joins a record that overlaps with the same samples and runs past the end (resent data repacked)', () => {
    const ch = read(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(5), at: 50_000 })).channels[0];
    expect(ch.segments).toHaveLength(1);
    expect(Array.from(ch.segments[0].samples)).toEqual(ramp(0, 15));
    expect(Array.from(ch.segments[0].recordStarts)).toEqual([T0, T0 + 100_000]);
    expect(ch.overlaps).toEqual([]);
  });

  it('compares overlapping records the same whichever comes first in the file', () => {
    const a = rec({ values: ramp(0), at: 0 });
    const same = rec({ values: ramp(5), at: 50_000 });
    const differs = rec({ values: ramp(900), at: 50_000 });
    for (const order of [[a, same], [same, a]]) {
      const ch = read(...order).channels[0];
      expect(Array.from(ch.segments[0].samples)).toEqual(ramp(0, 15));
      expect(ch.overlaps).toEqual([]);
    }
    for (const order of [[a, differs], [differs, a]]) {
      const ch = read(...order).channels[0];
      expect(ch.overlaps.map((o) => Array.from(o.segment.samples))).toEqual([ramp(900, 5)]);
      expect(Array.from(ch.segments[0].samples)).toEqual([...ramp(0), ...ramp(905, 5)]);
    }
  });

  it('keeps integer and float records of one channel in separate segments', () => {
    const ch = read(rec({ values: ramp(0), at: 0 }), rec({ values: [0.5, 1.5], at: 100_000, encoding: 4 })).channels[0];
    expect(ch.segments.map((s) => s.samples.constructor.name)).toEqual(['Int32Array', 'Float32Array']);
  });

  it('reads a file that mixes channels and record lengths', () => {
    const r = read(
      rec({ values: ramp(0), at: 0, channel: 'HHZ', recordLength: 512 }),
      rec({ values: ramp(100, 300), at: 0, channel: 'HHN', recordLength: 4096 }),
      rec({ values: ramp(10), at: 100_000, channel: 'HHZ', recordLength: 256 }),
    );
    expect(r.channels.map((c) => [c.id.channel, c.segments.length, c.segments[0].samples.length, c.segments[0].recordLength]))
      .toEqual([['HHN', 1, 300, 4096], ['HHZ', 1, 20, 512]]);
  });
});

describe('bad input never loses the good records around it', () => {
  it('steps over a corrupt stretch, names its byte offset, and reads the records on both sides', () => {
    const junk = new Uint8Array(700).fill(0x41);
    const r = read(rec({ values: ramp(0), at: 0 }), junk, rec({ values: ramp(10), at: 100_000 }));
    expect(r.files[0].records).toBe(2);
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: 'not a miniSEED record: the sequence number field (bytes 0-5) is not digits; 700 bytes skipped to the next record header' }]);
    expect(Array.from(r.channels[0].segments[0].samples)).toEqual(ramp(0, 20));
  });

  it('a record whose data cannot be decoded splits its segment and leaves a gap where it was', () => {
    // Steim-2 frame whose words 1-15 all have code 2 but data words with sub-code 0, undefined in appendix B.
    const frame = new Uint8Array(448);
    new DataView(frame.buffer).setUint32(0, 0x2aaaaaaa);
    const broken = buildRecord({ second: 0, fract: 1000, sampleCount: 5, recordLength: 512, data: frame,
      blockettes: [{ type: 1000, encoding: 11, exponent: 9 }] });
    const r = read(rec({ values: ramp(0), at: 0 }), broken, rec({ values: ramp(15), at: 150_000 }), rec({ values: ramp(25), at: 250_000 }));
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: 'STEIM2 frame has an undefined difference code' }]);
    expect(r.files[0].records).toBe(3);
    const ch = r.channels[0];
    expect(ch.segments.map((s) => Array.from(s.samples))).toEqual([ramp(0), ramp(15, 20)]);
    expect(ch.gaps).toEqual([{ start: T0 + 100_000, end: T0 + 150_000 }]);
  });

  it('refuses a float record holding NaN or infinity, names it, and leaves a gap where it was', () => {
    // IEEE 754 single precision has NaN and infinities; a filter would carry them on through its
    // state, so the record is left out and reported instead of blanking the rest of the trace.
    const withNaN = ramp(10).map((x, i) => (i === 3 ? Number.NaN : x));
    const r = read(rec({ values: ramp(0), at: 0, encoding: 4 }), rec({ values: withNaN, at: 100_000, encoding: 4 }),
      rec({ values: ramp(20), at: 200_000, encoding: 4 }));
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: '1 of 10 samples are not finite numbers (NaN or infinity; the first is sample 3 of the record); record left out' }]);
    expect(r.files[0].records).toBe(2);
    const ch = r.channels[0];
    expect(ch.segments.map((s) => Array.from(s.samples))).toEqual([ramp(0), ramp(20)]);
    expect(ch.gaps).toEqual([{ start: T0 + 100_000, end: T0 + 200_000 }]);
    const inf = read(rec({ values: [1, 2, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 5], at: 0, encoding: 4 }));
    expect(inf.files[0].errors.map((e) => e.reason)).toEqual(['2 of 5 samples are not finite numbers (NaN or infinity; the first is sample 2 of the record); record left out']);
    expect(inf.channels).toEqual([]);
  });

  it('reports a file that is not miniSEED at all clearly, once', () => {
    const xml = new TextEncoder().encode('<?xml version="1.0" encoding="UTF-8"?>\n<FDSNStationXML schemaVersion="1.2"></FDSNStationXML>\n');
    const r = readMiniSeedBuffer(xml, 'inv.xml');
    expect(r.files[0].records).toBe(0);
    expect(r.files[0].errors).toHaveLength(1);
    expect(r.files[0].errors[0].offset).toBe(0);
    expect(r.files[0].errors[0].reason).toBe(`not a miniSEED file: no record found in its ${xml.length} bytes (at byte 0: not a miniSEED record: the sequence number field (bytes 0-5) is not digits)`);
    expect(readMiniSeedBuffer(new Uint8Array(0), 'empty').files[0].errors).toEqual([{ offset: 0, reason: 'empty file' }]);
  });

  it('reports a truncated last record with its offset and keeps the records before it', () => {
    const whole = concat(rec({ values: ramp(0), at: 0 }), rec({ values: ramp(10), at: 100_000 }));
    const r = readMiniSeedBuffer(whole.subarray(0, 512 + 300), 'cut.mseed');
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: 'truncated: record length is 512 bytes but only 300 remain; the remaining 300 bytes hold no record header' }]);
    expect(Array.from(r.channels[0].segments[0].samples)).toEqual(ramp(0));
  });

  it('refuses miniSEED 3 records with "miniSEED 3 is not supported yet" and still reads the miniSEED 2 records after them', () => {
    // FDSN miniSEED 3: 40-byte header, identifier length at byte 33, extra-header length (u16 LE) at 34,
    // data length (u32 LE) at 36.
    const ms3 = new Uint8Array(40 + 10 + 0 + 50);
    ms3.set([0x4d, 0x53, 3]);
    ms3[33] = 10;
    ms3[36] = 50;
    const r = read(ms3, ms3, rec({ values: ramp(0), at: 0 }));
    expect(r.files[0].errors).toEqual([{ offset: 0, reason: 'miniSEED 3 is not supported yet (2 miniSEED 3 records skipped)' }]);
    expect(r.channels[0].segments[0].samples.length).toBe(10);
  });

  it('a record length field made too long (the next header lies inside) costs that record only', () => {
    const a = rec({ values: ramp(0), at: 0 });
    const b = rec({ values: ramp(10), at: 100_000 });
    const c = rec({ values: ramp(20), at: 200_000 });
    b[48 + 6] = 11; // blockette 1000 exponent 9 -> 11 (2048 bytes)
    const r = read(a, b, c, rec({ values: ramp(30), at: 300_000 }), rec({ values: ramp(40), at: 400_000 }));
    expect(r.files[0].errors).toEqual([{ offset: 512, reason: 'record length 2048 stated, but the next record header starts 512 bytes on; record skipped' }]);
    expect(r.channels[0].segments.map((s) => s.samples.length)).toEqual([10, 30]);
  });
});

describe('MiniSeedCollector in chunks', () => {
  it('gives the same result fed in chunks as the whole buffer at once, with a corrupt stretch across a chunk border', () => {
    const real = new Uint8Array(readFileSync('/usr/share/doc/libmseed-dev/examples/test.mseed'));
    const parts: Uint8Array[] = [];
    for (let k = 0; k < 12; k++) parts.push(real);
    parts.splice(5, 0, new Uint8Array(3000).fill(7));
    // Records without blockette 1000 (length from the next header), one at a chunk border or two.
    for (let k = 0; k < 40; k++) {
      parts.push(buildRecord({ channel: 'SHZ', second: k, sampleCount: 3, data: encodeSteim1Plain([k, k + 1, k + 2], 3), recordLength: 1024 }));
    }
    const bytes = concat(...parts);
    const whole = readMiniSeedBuffer(bytes, 'f');
    const c = new MiniSeedCollector();
    const f = c.addFile('f');
    const chunk = SCAN_LOOKAHEAD + 5000;
    let pos = 0;
    while (pos < bytes.length) {
      const end = Math.min(bytes.length, pos + chunk);
      pos = c.scan(f, bytes.subarray(pos, end), pos, end === bytes.length);
      if (end === bytes.length) break;
    }
    c.plan();
    let need = c.decodeNeeds(f);
    while (need >= 0) need = c.decode(f, bytes.subarray(need, Math.min(bytes.length, need + chunk)), need);
    const chunked = c.finish();
    expect(chunked.files).toEqual(whole.files);
    expect(whole.files[0].errors).toHaveLength(1);
    expect(whole.files[0].errors[0].offset).toBe(5 * real.length);
    expect(whole.channels[0].duplicatesDropped).toBe(11 * 36);
    expect(chunked.channels[0].duplicatesDropped).toBe(11 * 36);
    expect(Array.from(chunked.channels[0].segments[0].samples)).toEqual(Array.from(whole.channels[0].segments[0].samples));
    const noB1000 = chunked.channels[1];
    expect(noB1000.id.channel).toBe('SHZ');
    expect(noB1000.segments.map((s) => Array.from(s.samples))).toEqual(whole.channels[1].segments.map((s) => Array.from(s.samples)));
    expect(noB1000.segments).toHaveLength(40);
    expect(Array.from(noB1000.segments[39].samples)).toEqual([39, 40, 41]);
  });
});
