import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { isoFromMicros, microsFromIso } from '../../../../core/time';
import { libmseedDecode, libmseedPack, type LibmseedReading } from '../../../ref/libmseed';
import type { InfoJson } from '../../../../electron/host/cli/info';

// Every expected number below comes from libmseed 2.19 (Debian libmseed-dev), through the C
// programs in test/ref/libmseed/ built with gcc during the run: msdecode reads files (records and
// its trace list), mspack writes the small test files. The command itself runs as a child process,
// exactly as a user runs it.

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../../..');
const EXAMPLE = '/usr/share/doc/libmseed-dev/examples/test.mseed';

function daybreak(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(root, 'bin/daybreak.mjs'), ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function infoJson(...paths: string[]): { code: number | null; json: InfoJson } {
  const r = daybreak('info', '--json', ...paths);
  if (r.stderr) throw new Error(`daybreak info wrote to stderr: ${r.stderr}`);
  return { code: r.code, json: JSON.parse(r.stdout) as InfoJson };
}

/** Time of the last sample from libmseed's own record list: the last record's start + (n - 1) periods. */
function lastSampleTime(reading: LibmseedReading): number {
  const last = reading.records[reading.records.length - 1];
  return last.start + Math.round(((last.count - 1) * 1e6) / last.rate);
}

function randomWalk(n: number, seed: number): Int32Array {
  const out = new Int32Array(n);
  let s = seed;
  let v = 0;
  for (let i = 0; i < n; i++) {
    s = (s * 1103515245 + 12345) >>> 0;
    v += (s >>> 16) % 201 - 100;
    out[i] = v;
  }
  return out;
}

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'daybreak-info-'));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('daybreak info --json on the libmseed example file (examples/test.mseed)', () => {
  it('reports the channel, segment, sample count, times, encoding and record length libmseed reads', () => {
    const ref = libmseedDecode(EXAMPLE);
    expect(ref.error).toBeNull();
    const { code, json } = infoJson(EXAMPLE);
    expect(code).toBe(0);
    expect(json.version).toBe(1);
    expect(json.files).toEqual([{ path: EXAMPLE, records: ref.records.length, errors: [] }]);
    expect(ref.records.length).toBe(36);
    expect(json.channels).toHaveLength(1);
    const c = json.channels[0];
    expect(c.id).toBe(ref.segments[0].id);
    expect(c.id).toBe('IU.COLA.00.LHZ');
    expect(c.gaps).toEqual([]);
    expect(c.overlaps).toEqual([]);
    expect(c.segments).toHaveLength(ref.segments.length);
    const s = c.segments[0];
    expect(s.samples).toBe(ref.segments[0].count);
    expect(s.samples).toBe(4200);
    expect(s.start).toBe(isoFromMicros(ref.segments[0].start));
    expect(s.start).toBe('2010-02-27T06:50:00.069539Z');
    expect(s.end).toBe(isoFromMicros(lastSampleTime(ref)));
    // libmseed's trace list computes the end in floating point and may truncate 1 µs.
    expect(Math.abs(microsFromIso(s.end) - ref.segments[0].end)).toBeLessThanOrEqual(1);
    expect(s.sampleRate).toBe(ref.segments[0].rate);
    expect(s.encoding).toBe('STEIM2');
    expect(ref.records.every((r) => r.encoding === 11 && r.reclen === 512)).toBe(true);
    expect(s.recordLength).toBe(512);
    expect(s.records).toBe(36);
    expect(s.quality).toBe(ref.records[0].quality);
    const tq = ref.records.map((r) => r.timingQuality);
    expect(s.timingQuality).toEqual({ min: Math.min(...tq), max: Math.max(...tq) });
    // I/O and clock flags bit 5: clock locked (SEED manual v2.4, fixed header field 14).
    expect(s.flags.clockLocked).toBe(ref.records.filter((r) => (r.ioFlags & 0x20) !== 0).length);
  });
});

describe('daybreak info --json on a real FLOAT32 file (../shared/data/real-microseismic)', () => {
  it('reports the 36 traces with the ids, start times, sample counts and rate libmseed reads', () => {
    const file = join(root, '../shared/data/real-microseismic/waveforms/2018-05-22T17-02-16.mseed');
    if (!existsSync(file)) throw new Error(`the real test data is missing: ${file} (expected ../shared beside the repository)`);
    const ref = libmseedDecode(file);
    expect(ref.error).toBeNull();
    const { code, json } = infoJson(file);
    expect(code).toBe(0);
    expect(json.files[0].records).toBe(ref.records.length);
    const expected = [...ref.segments].sort((a, b) => (a.id < b.id ? -1 : 1))
      .map((s) => [s.id, isoFromMicros(s.start), s.count, s.rate, 'FLOAT32', 4096]);
    expect(expected).toHaveLength(36);
    expect(json.channels.map((c) => {
      expect(c.segments).toHaveLength(1);
      const s = c.segments[0];
      return [c.id, s.start, s.samples, s.sampleRate, s.encoding, s.recordLength];
    })).toEqual(expected);
  });
});

describe('daybreak info on small files packed by libmseed', () => {
  const start = microsFromIso('2026-12-01T22:00:00.000000Z');
  let gapFile = '';
  let gapRef: LibmseedReading;
  let badFile = '';
  let badRef: LibmseedReading;
  let folder = '';

  beforeAll(() => {
    // Two stretches of one channel 10 s apart, and a second channel, in one file.
    const a = libmseedPack({ samples: randomWalk(3000, 1), station: 'ALFA', channel: 'HHZ', start, rate: 100, encoding: 11, byteorder: 1, reclen: 512 });
    const b = libmseedPack({ samples: randomWalk(2000, 2), station: 'ALFA', channel: 'HHZ', start: start + 40_000_000, rate: 100, encoding: 11, byteorder: 1, reclen: 512 });
    const c = libmseedPack({ samples: randomWalk(1500, 3), station: 'ALFA', channel: 'HHN', start, rate: 100, encoding: 10, byteorder: 0, reclen: 1024 });
    gapFile = join(dir, 'gap.mseed');
    writeFileSync(gapFile, Buffer.concat([a.bytes, b.bytes, c.bytes]));
    gapRef = libmseedDecode(gapFile);

    // Four records; the third one's header overwritten with text.
    const d = libmseedPack({ samples: randomWalk(1600, 4), station: 'BRAV', channel: 'EHZ', start, rate: 100, encoding: 11, byteorder: 1, reclen: 512 });
    badRef = libmseedDecode((() => { const p = join(dir, 'good.mseed'); writeFileSync(p, d.bytes); return p; })());
    const broken = new Uint8Array(d.bytes);
    broken.set(new TextEncoder().encode('not a miniSEED header, just text!'), 1024);
    badFile = join(dir, 'bad.mseed');
    writeFileSync(badFile, broken);

    // A folder tree: data in a sub-folder, a text file beside it.
    folder = join(dir, 'archive');
    mkdirSync(join(folder, '2026', '335'), { recursive: true });
    writeFileSync(join(folder, 'README.txt'), 'This folder holds test data.\n');
    writeFileSync(join(folder, '2026', '335', 'ALFA.HHZ'), a.bytes);
    writeFileSync(join(folder, '2026', '335', 'ALFA.HHN'), c.bytes);
  });

  it('lists each channel with its segments, and the gap between them, as libmseed sees them', () => {
    const { code, json } = infoJson(gapFile);
    expect(code).toBe(0);
    expect(json.files[0].records).toBe(gapRef.records.length);
    expect(json.channels.map((c) => c.id)).toEqual(['XX.ALFA..HHN', 'XX.ALFA..HHZ']);
    const refZ = gapRef.segments.filter((s) => s.id === 'XX.ALFA..HHZ');
    expect(refZ).toHaveLength(2);
    const z = json.channels[1];
    expect(z.segments.map((s) => [s.start, s.samples, s.sampleRate, s.encoding, s.recordLength]))
      .toEqual(refZ.map((s) => [isoFromMicros(s.start), s.count, 100, 'STEIM2', 512]));
    // Gap: from the time after the last sample of the first stretch to the first sample of the next.
    expect(z.gaps).toEqual([{ start: isoFromMicros(refZ[0].end + 10_000), end: isoFromMicros(refZ[1].start) }]);
    expect(z.gaps[0]).toEqual({ start: '2026-12-01T22:00:30.000000Z', end: '2026-12-01T22:00:40.000000Z' });
    const n = json.channels[0];
    const refN = gapRef.segments.find((s) => s.id === 'XX.ALFA..HHN');
    expect(n.segments.map((s) => [s.start, s.end, s.samples, s.encoding, s.recordLength]))
      .toEqual([[isoFromMicros(refN!.start), isoFromMicros(refN!.end), refN!.count, 'STEIM1', 1024]]);
  });

  it('reports a bad record by file and byte offset, keeps the records around it, and exits 1', () => {
    const { code, json } = infoJson(badFile);
    expect(code).toBe(1);
    expect(json.files).toHaveLength(1);
    expect(json.files[0].path).toBe(badFile);
    expect(json.files[0].records).toBe(badRef.records.length - 1);
    expect(json.files[0].errors.map((e) => e.offset)).toEqual([1024]);
    expect(json.files[0].errors[0].reason.length).toBeGreaterThan(0);
    const lost = badRef.records[2];
    const samples = json.channels[0].segments.reduce((m, s) => m + s.samples, 0);
    expect(samples).toBe(badRef.records.reduce((m, r) => m + r.count, 0) - lost.count);
    expect(json.channels[0].gaps).toEqual([{ start: isoFromMicros(lost.start), end: isoFromMicros(badRef.records[3].start) }]);
  });

  it('searches folders recursively, reading miniSEED files and passing over other files', () => {
    const { code, json } = infoJson(folder);
    expect(code).toBe(0);
    expect(json.files.map((f) => f.path)).toEqual([join(folder, '2026', '335', 'ALFA.HHN'), join(folder, '2026', '335', 'ALFA.HHZ')]);
    expect(json.channels.map((c) => [c.id, c.segments[0].samples])).toEqual([['XX.ALFA..HHN', 1500], ['XX.ALFA..HHZ', 3000]]);
  });

  it('prints a table per station with each segment and the gaps in the human-readable form', () => {
    const r = daybreak('info', gapFile);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toBe('2 channels at 1 station, 6,500 samples in ' + `${gapRef.records.length} records from 1 file; times UTC`);
    expect(lines).toContain('== XX.ALFA');
    const row = lines.find((l) => l.startsWith('  .HHZ'));
    expect(row?.split(/\s{2,}/)).toEqual(['', '.HHZ', '2026-12-01 22:00:00.000000', '2026-12-01 22:00:29.990000', '100', '3,000', 'STEIM2', '512', 'D',
      String(gapRef.records[0].timingQuality)]);
    expect(gapRef.records[0].timingQuality).toBe(0); // mspack's blockette 1001 carries timing quality 0
    expect(lines.some((l) => /^ {2}\.HHZ gap {6}2026-12-01 22:00:30\.000000 \.\. 2026-12-01 22:00:40\.000000 {2}\(10\.0 s\)$/.test(l))).toBe(true);
  });
});

describe('daybreak info arguments', () => {
  it('exits 2 without a path', () => {
    const r = daybreak('info');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no PATH given/);
  });

  it('exits 2 for a path that does not exist, naming it', () => {
    const r = daybreak('info', '--json', join(dir, 'nowhere.mseed'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('nowhere.mseed');
    expect(r.stdout).toBe('');
  });

  it('exits 2 for an unknown option, naming it', () => {
    const r = daybreak('info', '--verbose', EXAMPLE);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/unknown option "--verbose"/);
  });
});
