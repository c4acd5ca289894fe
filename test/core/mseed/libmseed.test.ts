/**
 * The project's miniSEED reader against libmseed 2.19 (Debian libmseed-dev 2.19.8), the FDSN's
 * reference library: the same files decoded by both must give the same samples, bit for bit, and
 * the same segment and record start times, to the microsecond.
 *
 * Files come from outside the project: the real Steim-2 file libmseed ships
 * (/usr/share/doc/libmseed-dev/examples/test.mseed), records that libmseed's own packer (msr_pack)
 * writes from test signals in every encoding it supports, both byte orders and record lengths from
 * 256 to 65536 bytes, files assembled from those records with gaps, duplicates and overlaps, and
 * the real FLOAT32 records in ../shared/data/real-microseismic/waveforms/.
 */
import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readMiniSeedBuffer } from '../../../core/mseed';
import { channelKey, type Segment } from '../../../core/model';
import {
  libmseedDecode, libmseedDecodeBytes, libmseedPack, type LibmseedReading,
  type LibmseedSegment, intSignal, lcg,
} from '../../ref/libmseed';

const TEST_MSEED = '/usr/share/doc/libmseed-dev/examples/test.mseed';
const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
const REAL_WAVEFORMS = resolve(REPO, '../shared/data/real-microseismic/waveforms');

/** Float test signal with awkward values: signed zeros, subnormals, extremes, small fractions. */
function floatSignal<T extends Float32Array | Float64Array>(make: (n: number) => T, n: number, seed: number): T {
  const rnd = lcg(seed);
  const out = make(n);
  for (let i = 0; i < n; i++) out[i] = Math.sin(i / 17) * 1e-3 + (rnd() - 0.5) * 1e-7;
  out[1] = -0;
  out[2] = out instanceof Float32Array ? 1e-40 : 5e-320;
  out[3] = out instanceof Float32Array ? 3.4e38 : 1.7e308;
  out[4] = out instanceof Float32Array ? -3.4e38 : -1.7e308;
  return out;
}

function bytesOf(a: Int32Array | Float32Array | Float64Array | Uint8Array): Uint8Array {
  return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
}

function firstDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (!Object.is(a[i], b[i])) return i;
  return a.length === b.length ? -1 : n;
}

function byIdThenStart(idA: string, startA: number, idB: string, startB: number): number {
  return idA < idB ? -1 : idA > idB ? 1 : startA - startB;
}

/** All segments the project holds for a file, overlapping ones included, keyed NET.STA.LOC.CHA. */
function projectSegments(bytes: Uint8Array, path: string) {
  const result = readMiniSeedBuffer(bytes, path);
  const segments: { id: string; seg: Segment }[] = [];
  for (const ch of result.channels) {
    for (const seg of ch.segments) segments.push({ id: channelKey(ch.id), seg });
    for (const ov of ch.overlaps) segments.push({ id: channelKey(ch.id), seg: ov.segment });
  }
  segments.sort((a, b) => byIdThenStart(a.id, a.seg.start, b.id, b.seg.start));
  return { result, segments };
}

/** libmseed segments that only repeat samples another segment of the same channel holds at the same times. */
function duplicateSegments(reading: LibmseedReading): Set<LibmseedSegment> {
  const dup = new Set<LibmseedSegment>();
  for (const s of reading.segments) {
    for (const t of reading.segments) {
      if (t === s || dup.has(t) || t.id !== s.id || t.type !== s.type || t.count < s.count) continue;
      const offset = Math.round(((s.start - t.start) * t.rate) / 1e6);
      if (offset < 0 || offset + s.count > t.count || Math.abs(t.start + (offset * 1e6) / t.rate - s.start) > 1e6 / t.rate / 2) continue;
      if (firstDifference(s.samples, t.samples.subarray(offset, offset + s.count)) === -1) {
        dup.add(s);
        break;
      }
    }
  }
  return dup;
}

/**
 * Asserts that the project's reading of `bytes` agrees with libmseed's `reading`: no errors; one
 * project segment per libmseed trace segment (less those that merely duplicate held data), with
 * the same channel, start and end time (µs), rate and samples (bit for bit, same sample type);
 * every project record start equal to a libmseed record's start; and the records count.
 */
function expectAgreement(bytes: Uint8Array, reading: LibmseedReading, path = 'libmseed-packed.mseed') {
  expect(reading.error, 'libmseed read the whole file').toBeNull();
  const { result, segments } = projectSegments(bytes, path);
  expect(result.files[0].errors).toEqual([]);
  expect(result.files[0].records).toBe(reading.records.length);

  const dups = duplicateSegments(reading);
  const wave = reading.segments.filter((s) => s.type !== 'a' && !dups.has(s))
    .sort((a, b) => byIdThenStart(a.id, a.start, b.id, b.start));
  expect(segments.map((s) => `${s.id} ${s.seg.start}`)).toEqual(wave.map((s) => `${s.id} ${s.start}`));
  const typeName = { i: 'Int32Array', f: 'Float32Array', d: 'Float64Array' } as Record<string, string>;
  wave.forEach((ref, k) => {
    const { seg } = segments[k];
    const where = `${ref.id} segment starting ${ref.start}`;
    expect(seg.end, `${where}: end`).toBe(ref.end);
    expect(seg.sampleRate, `${where}: rate`).toBe(ref.rate);
    expect(seg.samples.constructor.name, `${where}: sample type`).toBe(typeName[ref.type]);
    expect(seg.samples.length, `${where}: sample count`).toBe(ref.count);
    const at = firstDifference(seg.samples, ref.samples);
    expect(at, `${where}: first sample that differs (project ${seg.samples[at]}, libmseed ${ref.samples[at]})`).toBe(-1);
    expect(Buffer.compare(bytesOf(seg.samples), bytesOf(ref.samples)), `${where}: bytes`).toBe(0);
  });

  // Records: each one the project keeps starts where libmseed says and holds as many samples.
  const libRecords = new Map<string, number>();
  for (const r of reading.records) if (r.type !== 'a') libRecords.set(`${r.id} ${r.start} ${r.count}`, r.count);
  let projectRecords = 0;
  let dropped = 0;
  for (const { id, seg } of segments) {
    for (let k = 0; k < seg.recordStarts.length; k++) {
      const end = k + 1 < seg.recordStarts.length ? seg.recordFirstSample[k + 1] : seg.samples.length;
      const key = `${id} ${seg.recordStarts[k]} ${end - seg.recordFirstSample[k]}`;
      expect(libRecords.has(key), `project record ${key} (channel, start µs, samples) is one libmseed read`).toBe(true);
      projectRecords++;
    }
  }
  for (const ch of result.channels) dropped += ch.duplicatesDropped;
  // Identical records (same channel, start, samples) beyond the first of each.
  const seen = new Set<string>();
  let dupRecords = 0;
  for (const r of reading.records) {
    if (r.type === 'a') continue;
    const key = `${r.id} ${r.start} ${Buffer.from(bytesOf(r.samples)).toString('base64')}`;
    if (seen.has(key)) dupRecords++;
    seen.add(key);
  }
  expect(dropped, 'duplicate records dropped').toBe(dupRecords);
  expect(projectRecords + dropped).toBe(reading.records.filter((r) => r.type !== 'a').length);

  // ASCII (log) records: the text of each, at its start time.
  const asciiRecords = reading.records.filter((r) => r.type === 'a');
  const entries = result.logs.flatMap((log) => log.entries.map((e) => ({ id: channelKey(log.id), ...e })));
  expect(entries.map((e) => `${e.id} ${e.time}`)).toEqual(asciiRecords.map((r) => `${r.id} ${r.start}`));
  entries.forEach((e, k) => expect(e.text.replace(/[\s\0]+$/, '')).toBe(asciiRecords[k].text.replace(/[\s\0]+$/, '')));
  return { result, segments };
}

const encodingNames: Record<number, string> = { 1: 'INT16', 3: 'INT32', 4: 'FLOAT32', 5: 'FLOAT64', 10: 'Steim-1', 11: 'Steim-2' };

function signalFor(encoding: number, n: number, seed: number): Int32Array | Float32Array | Float64Array {
  if (encoding === 4) return floatSignal((k) => new Float32Array(k), n, seed);
  if (encoding === 5) return floatSignal((k) => new Float64Array(k), n, seed);
  if (encoding === 1) return intSignal(n, seed, 32767);
  return intSignal(n, seed);
}

describe('reader agrees with libmseed 2.19 on the real Steim-2 file it ships (examples/test.mseed)', () => {
  it('same segments, start times to the µs, rate and samples', () => {
    const reading = libmseedDecode(TEST_MSEED);
    expect(reading.records.length).toBe(36);
    expect(reading.segments.map((s) => [s.id, s.count])).toEqual([['IU.COLA.00.LHZ', 4200]]);
    expectAgreement(new Uint8Array(readFileSync(TEST_MSEED)), reading, TEST_MSEED);
  });

  it('keeps every record\'s own start time (they drift by 1-3 µs against start + i / rate)', () => {
    const reading = libmseedDecode(TEST_MSEED);
    const { segments } = projectSegments(new Uint8Array(readFileSync(TEST_MSEED)), TEST_MSEED);
    expect(Array.from(segments[0].seg.recordStarts)).toEqual(reading.records.map((r) => r.start));
  });
});

describe('reader agrees with libmseed 2.19 on records libmseed packs (msr_pack, SEED manual v2.4 ch. 8 and App. B)', () => {
  const cases: [string, number, string, number][] = [];
  for (const encoding of [1, 3, 4, 5, 10, 11]) {
    for (const order of ['little-endian', 'big-endian']) {
      for (const reclen of [256, 512, 4096, 8192, 65536]) cases.push([encodingNames[encoding], encoding, order, reclen]);
    }
  }
  const rates = [100, 40, 200, 500, 0.1, 2.5, 1];
  it.each(cases)('%s (encoding %i), %s, %i-byte records: samples and times agree', (_name, encoding, order, reclen) => {
    const byteorder = order === 'big-endian' ? 1 : 0;
    const k = cases.findIndex((c) => c[1] === encoding && c[2] === order && c[3] === reclen);
    const samples = signalFor(encoding, reclen >= 8192 ? 30000 : 6000, 7 + k);
    const packed = libmseedPack({
      samples, encoding, byteorder, reclen, rate: rates[k % rates.length],
      start: 1_700_000_000_000_000 + k * 1_234_567 + (k % 100), station: 'PACK', channel: 'HHZ', location: '00',
    });
    expect(packed.samples).toBe(samples.length);
    expect(packed.records).toBeGreaterThan(reclen === 65536 ? 0 : 1);
    const reading = libmseedDecodeBytes(packed.bytes);
    // The harness itself: libmseed gives back what it packed.
    expect(reading.segments.length).toBe(1);
    expect(firstDifference(reading.segments[0].samples, samples)).toBe(-1);
    expect(reading.records.every((r) => r.encoding === encoding && r.byteorder === byteorder && r.reclen === reclen)).toBe(true);
    expectAgreement(packed.bytes, reading);
  });

  it.each([[0, 512], [1, 512], [1, 4096]] as const)('ASCII (encoding 0) log records, byte order %i, %i bytes: text and times agree', (byteorder, reclen) => {
    const text = Array.from({ length: 120 }, (_, i) => `2023-11-14 22:13:${String(i % 60).padStart(2, '0')} GPS lock ok, satellites ${i % 12}\n`).join('');
    const packed = libmseedPack({ samples: text, encoding: 0, byteorder, reclen, rate: 0, start: 1_700_000_000_000_000, channel: 'LOG', location: '' });
    const reading = libmseedDecodeBytes(packed.bytes);
    expect(reading.records.length).toBeGreaterThan(1);
    expect(reading.records.map((r) => r.text).join('')).toBe(text);
    const { result } = expectAgreement(packed.bytes, reading);
    expect(result.channels).toEqual([]);
  });
});

describe('reader agrees with libmseed 2.19 on files assembled from libmseed records', () => {
  const rate = 100;
  const start = 1_700_000_000_123_456;
  function records(bytes: Uint8Array, reclen: number): Uint8Array[] {
    const out: Uint8Array[] = [];
    for (let o = 0; o < bytes.length; o += reclen) out.push(bytes.subarray(o, o + reclen));
    return out;
  }
  function concat(parts: Uint8Array[]): Uint8Array {
    const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
    let o = 0;
    for (const p of parts) { out.set(p, o); o += p.length; }
    return out;
  }
  const base = libmseedPack({ samples: intSignal(8000, 11), encoding: 11, byteorder: 1, reclen: 512, rate, start, channel: 'HHZ' });
  const recs = records(base.bytes, 512);

  it('a missing record leaves a gap: two segments, the gap between them', () => {
    const bytes = concat([...recs.slice(0, 5), ...recs.slice(6)]);
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.segments.length).toBe(2);
    const { result } = expectAgreement(bytes, reading);
    const gaps = result.channels[0].gaps;
    expect(gaps.length).toBe(1);
    expect(gaps[0].end).toBe(reading.segments[1].start);
    expect(gaps[0].start).toBeGreaterThan(reading.segments[0].end);
    expect(gaps[0].start).toBeLessThanOrEqual(reading.segments[0].end + 1e6 / rate);
  });

  it('records out of order are put in time order', () => {
    const bytes = concat([recs[3], recs[0], recs[2], recs[1], ...recs.slice(4)]);
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.segments.length).toBe(1);
    expectAgreement(bytes, reading);
  });

  it('a resent (duplicated) record is dropped and counted; libmseed lists it as a segment of its own', () => {
    const bytes = concat([...recs.slice(0, 7), recs[3], ...recs.slice(7), recs[9]]);
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.segments.length).toBe(3);
    const { result } = expectAgreement(bytes, reading);
    expect(result.channels[0].duplicatesDropped).toBe(2);
    expect(result.channels[0].overlaps).toEqual([]);
  });

  it('an overlapping record with other samples is kept apart and listed as an overlap', () => {
    const other = libmseedPack({
      samples: intSignal(100, 99), encoding: 11, byteorder: 1, reclen: 512, rate, start: start + 2_000_000, channel: 'HHZ',
    });
    const bytes = concat([...recs, other.bytes]);
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.segments.length).toBe(2);
    const { result } = expectAgreement(bytes, reading);
    expect(result.channels[0].overlaps.length).toBe(1);
    expect(result.channels[0].overlaps[0].segment.start).toBe(start + 2_000_000);
  });

  it('several thousand records of three channels interleaved, with a resent and a conflicting record late in the file', () => {
    // More records (3 x 900 INT32 records of 256 bytes, 48 samples each) than the collector's record table first
    // allocates rows for (1,024), so its columns grow twice while the file is read.
    const channels = ['HHZ', 'HHN', 'HHE'].map((channel, k) =>
      records(libmseedPack({ samples: intSignal(900 * 48, 20 + k), encoding: 3, byteorder: 1, reclen: 256, rate, start, channel }).bytes, 256));
    expect(channels.map((c) => c.length)).toEqual([900, 900, 900]);
    const parts: Uint8Array[] = [];
    for (let i = 0; i < 900; i++) for (const c of channels) parts.push(c[i]);
    const other = libmseedPack({ samples: intSignal(48, 98), encoding: 3, byteorder: 1, reclen: 256, rate, start: start + 700 * 480_000, channel: 'HHN' });
    parts.push(channels[0][850], other.bytes);
    const bytes = concat(parts);
    const reading = libmseedDecodeBytes(bytes);
    const { result } = expectAgreement(bytes, reading);
    expect(result.files[0].records).toBe(2702);
    expect(result.channels.map((c) => [c.id.channel, c.duplicatesDropped, c.overlaps.length])).toEqual([['HHE', 0, 0], ['HHN', 0, 1], ['HHZ', 1, 0]]);
  });

  it('several channels, encodings, byte orders and record lengths in one file', () => {
    const parts = [
      libmseedPack({ samples: intSignal(3000, 1), encoding: 11, byteorder: 1, reclen: 512, rate: 100, start, channel: 'HHZ' }),
      libmseedPack({ samples: intSignal(3000, 2), encoding: 10, byteorder: 0, reclen: 4096, rate: 100, start, channel: 'HHN' }),
      libmseedPack({ samples: floatSignal((k) => new Float32Array(k), 3000, 3), encoding: 4, byteorder: 1, reclen: 256, rate: 200, start, channel: 'HHE' }),
      libmseedPack({ samples: 'clock locked\nclock unlocked\n', encoding: 0, byteorder: 1, reclen: 512, rate: 0, start, channel: 'LOG' }),
      libmseedPack({ samples: intSignal(500, 4, 30000), encoding: 1, byteorder: 0, reclen: 8192, rate: 1, start, channel: 'LHZ' }),
    ];
    const bytes = concat(parts.map((p) => p.bytes));
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.segments.filter((s) => s.type !== 'a').length).toBe(4);
    expectAgreement(bytes, reading);
  });
});

describe('reader agrees with libmseed 2.19 on header variants (SEED manual v2.4 ch. 8, fixed header and blockettes)', () => {
  const start = 1_700_000_000_654_321;

  it.each([[1, 100.0001234], [0, 99.99931], [1, 1 / 7]] as const)('blockette 100 (actual rate) ahead of blockette 1000 in the chain, byte order %i, %d Hz', (byteorder, rate) => {
    const packed = libmseedPack({ samples: intSignal(5000, 21), encoding: 11, byteorder, reclen: 512, rate, start, blockette100: true });
    const reading = libmseedDecodeBytes(packed.bytes);
    expect(reading.records.every((r) => r.hasB100 && r.rate === Math.fround(rate))).toBe(true);
    expectAgreement(packed.bytes, reading);
  });

  it.each([0, 1] as const)('time correction (field 16, 0.0001 s) applied only when activity flag bit 1 says it was not, byte order %i', (byteorder) => {
    const packed = libmseedPack({ samples: intSignal(6000, 22), encoding: 11, byteorder, reclen: 512, rate: 100, start });
    const bytes = packed.bytes.slice();
    const view = new DataView(bytes.buffer);
    const little = byteorder === 0;
    // Record 0: -0.5 s not yet applied; records 1-5: 0.7777 s already applied (bit 1 set); from
    // record 6 on: growing corrections not yet applied. Records move apart, never onto each other.
    const records = bytes.length / 512;
    expect(records).toBeGreaterThan(8);
    const shift = (k: number) => (k === 0 ? -5000 : k <= 5 ? 0 : (k - 5) * 1234);
    for (let k = 0; k < records; k++) {
      view.setInt32(k * 512 + 40, k >= 1 && k <= 5 ? 7777 : shift(k), little);
      if (k >= 1 && k <= 5) bytes[k * 512 + 36] |= 0x02;
    }
    const reading = libmseedDecodeBytes(bytes);
    // The harness: libmseed moved the records whose correction was not yet applied, and only those.
    const plain = libmseedDecodeBytes(packed.bytes);
    expect(reading.records.map((r, k) => r.start - plain.records[k].start)).toEqual(Array.from({ length: records }, (_, k) => shift(k) * 100));
    expectAgreement(bytes, reading);
  });

  it('records without blockette 1000: length found from the next record header, Steim-1 big-endian assumed (libmseed\'s fallback)', () => {
    const packed = libmseedPack({ samples: intSignal(3000, 23), encoding: 10, byteorder: 1, reclen: 512, rate: 100, start: 1_700_000_000_000_000, blockette1001: false });
    const bytes = packed.bytes.slice();
    for (let o = 0; o < bytes.length; o += 512) {
      bytes[o + 39] = 0; // no blockettes follow
      bytes[o + 46] = 0;
      bytes[o + 47] = 0;
      bytes.fill(0, o + 48, o + 56); // and the blockette 1000 bytes are gone
    }
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.records.length).toBe(packed.records);
    expect(firstDifference(reading.segments[0].samples, intSignal(3000, 23))).toBe(-1);
    expectAgreement(bytes, reading);
  });

  it.each([0, 1] as const)('a BTIME with second 60 (the leap second 2016-12-31T23:59:60) reads as libmseed reads it, byte order %i', (byteorder) => {
    // 2017-01-01T00:00:00 Z, written as 2016 day 366 23:59:60.0000 (SEED manual v2.4: second 0-60).
    const packed = libmseedPack({ samples: intSignal(400, 25), encoding: 11, byteorder, reclen: 512, rate: 1, start: 1_483_228_800_000_000 });
    const bytes = packed.bytes.slice();
    const view = new DataView(bytes.buffer);
    const little = byteorder === 0;
    expect([view.getUint16(20, little), view.getUint16(22, little), bytes[24], bytes[25], bytes[26]]).toEqual([2017, 1, 0, 0, 0]);
    view.setUint16(20, 2016, little);
    view.setUint16(22, 366, little);
    bytes.set([23, 59, 60], 24);
    const reading = libmseedDecodeBytes(bytes);
    expect(reading.records[0].start).toBe(1_483_228_800_000_000);
    const { segments } = expectAgreement(bytes, reading);
    expect(segments[0].seg.timing.leapSecondRecords).toBeGreaterThanOrEqual(1);
  });

  it.each(['R', 'Q', 'M'] as const)('data-quality indicator %s', (quality) => {
    const packed = libmseedPack({ samples: intSignal(3000, 24), encoding: 11, byteorder: 1, reclen: 512, rate: 100, start, quality });
    const reading = libmseedDecodeBytes(packed.bytes);
    expect(reading.records.every((r) => r.quality === quality)).toBe(true);
    const { segments } = expectAgreement(packed.bytes, reading);
    expect(segments[0].seg.quality).toBe(quality);
  });
});

describe('reader agrees with libmseed 2.19 on the real FLOAT32 records (../shared/data/real-microseismic)', () => {
  it('the data folder is present (the tests below need it)', () => {
    expect(existsSync(REAL_WAVEFORMS), `${REAL_WAVEFORMS} is missing: clone the shared data beside the repository`).toBe(true);
  });

  const files = existsSync(REAL_WAVEFORMS) ? readdirSync(REAL_WAVEFORMS).filter((f) => f.endsWith('.mseed')).sort() : [];
  it('holds the five event files its README lists', () => {
    expect(files.length).toBe(5);
  });

  it.each(files)('%s: 36 traces, samples and start times agree', (name) => {
    const path = join(REAL_WAVEFORMS, name);
    const reading = libmseedDecode(path);
    expect(reading.segments.length).toBe(36);
    expect(reading.records.every((r) => r.encoding === 4 && r.reclen === 4096)).toBe(true);
    expectAgreement(new Uint8Array(readFileSync(path)), reading, path);
  });
});
