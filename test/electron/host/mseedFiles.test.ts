import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readMiniSeedFiles, listFiles } from '../../../electron/host/mseedFiles';
import { readMiniSeedBuffer, SCAN_LOOKAHEAD } from '../../../core/mseed/index';
import { channelKey } from '../../../core/model';

// References: the real-microseismic README (../shared/data/real-microseismic/README.md: each file
// holds 36 traces x 7501 samples, network "1", location "1", FLOAT32, 4096-byte records, all five
// decoded by libmseed 2.19) and libmseed's test.mseed (36 Steim-2 records, 4200 samples; see
// test/core/mseed/steim.test.ts for the sample-by-sample libmseed check). The streamed read is
// also compared with the in-memory read of the same bytes.

const DATA = '../shared/data/real-microseismic/waveforms';
const REAL = ['2018-05-22T17-02-16.mseed', '2018-05-24T18-50-32.mseed'].map((f) => join(DATA, f));
const TEST_MSEED = '/usr/share/doc/libmseed-dev/examples/test.mseed';
let dir = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'daybreak-mseed-'));
  mkdirSync(join(dir, 'night', 'deeper'), { recursive: true });
  writeFileSync(join(dir, 'night', 'a.mseed'), readFileSync(REAL[0]));
  writeFileSync(join(dir, 'night', 'deeper', 'b.mseed'), readFileSync(REAL[1]));
  writeFileSync(join(dir, 'night', 'inv.xml'), '<?xml version="1.0"?>\n<FDSNStationXML schemaVersion="1.2"/>\n');
  writeFileSync(join(dir, 'night', 'picks.json'), '{"picks": []}\n');
  writeFileSync(join(dir, 'night', 'notes.txt'), 'station 7 was noisy after midnight\n');
  // A file larger than several chunks: real FLOAT32 records, Steim-2 records of another length,
  // a corrupt stretch, then more FLOAT32 records.
  const big = [readFileSync(REAL[0]), readFileSync(TEST_MSEED), Buffer.alloc(5000, 0x33), readFileSync(REAL[1])];
  writeFileSync(join(dir, 'big.mseed'), Buffer.concat(big));
});

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('readMiniSeedFiles', () => {
  it('reads a folder recursively: the real files as the README describes them, other files reported once each', async () => {
    const r = await readMiniSeedFiles([join(dir, 'night')]);
    expect(r.files.map((f) => f.path.slice(dir.length + 1))).toEqual([
      'night/a.mseed', 'night/deeper/b.mseed', 'night/inv.xml', 'night/notes.txt', 'night/picks.json',
    ]);
    expect(r.files[0]).toMatchObject({ records: 288, errors: [] });
    expect(r.files[1]).toMatchObject({ records: 288, errors: [] });
    for (const f of r.files.slice(2)) {
      expect(f.records).toBe(0);
      expect(f.errors).toHaveLength(1);
      expect(f.errors[0].offset).toBe(0);
      expect(f.errors[0].reason).toMatch(/^not a miniSEED file: no record found in its \d+ bytes/);
    }
    // 36 traces per file (README); the two events are hours apart, so each channel has two segments.
    expect(r.channels).toHaveLength(36);
    for (const ch of r.channels) {
      expect(ch.id.network).toBe('1');
      expect(ch.id.location).toBe('1');
      expect(ch.segments.map((s) => s.samples.length)).toEqual([7501, 7501]);
      expect(ch.segments.every((s) => s.samples instanceof Float32Array && s.sampleRate === 500 && s.recordLength === 4096)).toBe(true);
      expect(ch.gaps).toHaveLength(1);
    }
  });

  it('streams a file larger than its chunk size and gets exactly what the in-memory reader gets', async () => {
    const path = join(dir, 'big.mseed');
    const chunkBytes = SCAN_LOOKAHEAD + 4096;
    const seen: [number, number][] = [];
    const streamed = await readMiniSeedFiles([path], { chunkBytes, onProgress: (d, t) => seen.push([d, t]) });
    const bytes = new Uint8Array(readFileSync(path));
    expect(bytes.length).toBeGreaterThan(30 * chunkBytes);
    const whole = readMiniSeedBuffer(bytes, path);
    expect(streamed.files).toEqual(whole.files);
    expect(streamed.files[0].records).toBe(288 + 36 + 288);
    expect(streamed.files[0].errors).toHaveLength(1);
    expect(streamed.files[0].errors[0].offset).toBe(1179648 + 18432);
    expect(streamed.channels.map((c) => channelKey(c.id))).toEqual(whole.channels.map((c) => channelKey(c.id)));
    for (let i = 0; i < whole.channels.length; i++) {
      const a = streamed.channels[i].segments;
      const b = whole.channels[i].segments;
      expect(a.map((s) => [s.start, s.end, s.samples.length])).toEqual(b.map((s) => [s.start, s.end, s.samples.length]));
      for (let k = 0; k < a.length; k++) expect(Array.from(a[k].samples)).toEqual(Array.from(b[k].samples));
    }
    const cola = streamed.channels.find((c) => c.id.station === 'COLA');
    expect(cola?.segments[0].samples.length).toBe(4200);
    // Progress covers both passes and never goes back.
    expect(seen.length).toBeGreaterThan(30);
    for (let i = 1; i < seen.length; i++) expect(seen[i][0]).toBeGreaterThanOrEqual(seen[i - 1][0]);
    expect(seen[seen.length - 1]).toEqual([2 * bytes.length, 2 * bytes.length]);
  });

  it('an empty file is reported, and a missing path fails naming it', async () => {
    writeFileSync(join(dir, 'empty.mseed'), '');
    const r = await readMiniSeedFiles([join(dir, 'empty.mseed')]);
    expect(r.files[0].errors).toEqual([{ offset: 0, reason: 'empty file' }]);
    await expect(readMiniSeedFiles([join(dir, 'nowhere.mseed')])).rejects.toThrow(/nowhere\.mseed/);
  });

  it('checks its arguments', async () => {
    await expect(readMiniSeedFiles('x' as unknown as string[])).rejects.toThrow(TypeError);
    await expect(readMiniSeedFiles([TEST_MSEED], { chunkBytes: 1000 })).rejects.toThrow(/chunkBytes must be an integer >= /);
  });

  it('listFiles skips hidden entries and sorts each folder', async () => {
    writeFileSync(join(dir, 'night', '.hidden.mseed'), 'x');
    const files = await listFiles([join(dir, 'night')]);
    expect(files.map((f) => f.path.slice(dir.length + 1))).toEqual([
      'night/a.mseed', 'night/deeper/b.mseed', 'night/inv.xml', 'night/notes.txt', 'night/picks.json',
    ]);
  });
});
