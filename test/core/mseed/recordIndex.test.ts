import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { indexRecords, rangesForWindow } from '../../../core/mseed/recordIndex';
import { readMiniSeedBuffer } from '../../../core/mseed';
import { microsFromIso } from '../../../core/time';

// Reference file: the real Steim-2 example that libmseed 2.19 ships (Debian libmseed-dev).
const EXAMPLE = '/usr/share/doc/libmseed-dev/examples/test.mseed';

describe('indexRecords', () => {
  it('finds every record of the libmseed example file, back to back, 512 bytes each', () => {
    const bytes = new Uint8Array(readFileSync(EXAMPLE));
    const idx = indexRecords(bytes, EXAMPLE);
    expect(idx.problems).toEqual([]);
    // The example file is a whole number of 512-byte records (its size over 512).
    expect(idx.records.length).toBe(bytes.length / 512);
    idx.records.forEach((r, i) => expect(r.offset).toBe(i * 512));
    // Same first start time as the full reader gives for the file's first segment.
    const full = readMiniSeedBuffer(bytes, EXAMPLE);
    expect(idx.records[0].start).toBe(full.channels[0].segments[0].start);
  });

  it('steps over a damaged stretch and names where it was', () => {
    const bytes = new Uint8Array(readFileSync(EXAMPLE));
    const damaged = bytes.slice();
    damaged.fill(0x41, 1024, 1024 + 512); // overwrite record 2 with text
    const idx = indexRecords(damaged, 'damaged.mseed');
    expect(idx.problems).toEqual([1024]);
    expect(idx.records.length).toBe(bytes.length / 512 - 1);
    expect(idx.records[2].offset).toBe(1536);
  });

  it('gives merged byte ranges of just the records a time window needs', () => {
    const bytes = new Uint8Array(readFileSync(EXAMPLE));
    const idx = indexRecords(bytes, EXAMPLE);
    const ch = new Set([idx.records[0].channel]);
    const mid = idx.records[5];
    const ranges = rangesForWindow(idx, ch, mid.start + 1, mid.end - 1, 0);
    expect(ranges).toEqual([{ offset: 5 * 512, length: 512 }]);
    const all = rangesForWindow(idx, ch, microsFromIso('1900-01-01T00:00:00Z'), microsFromIso('2100-01-01T00:00:00Z'));
    expect(all).toEqual([{ offset: 0, length: bytes.length }]);
    expect(rangesForWindow(idx, new Set(['XX.NONE..HHZ']), mid.start, mid.end)).toEqual([]);
  });
});
