import { describe, expect, it } from 'vitest';
import { RecordTable } from '../../../core/mseed/recordTable';

// The table only stores what the collector gives it; the collector's use of it is checked against
// libmseed 2.19 in libmseed.test.ts ("several thousand records of three channels interleaved").

function addRow(t: RecordTable, k: number): number {
  return t.add(k % 3, k * 4096, 1_700_000_000_000_000 + k * 40_950_000 + 0.5, 100 + k / 1e4, 4000 + (k % 97), 11, k % 2 === 1,
    4096, 64, k % 8, k % 5 === 0 ? -1 : k % 101, 0x44, k % 7);
}

describe('record table (one row of columns per record)', () => {
  it('numbers rows in the order they are added and keeps every field through two growths of its columns', () => {
    const t = new RecordTable();
    const n = 2500; // past 1,024 and 2,048 rows
    for (let k = 0; k < n; k++) expect(addRow(t, k)).toBe(k);
    expect(t.length).toBe(n);
    for (const k of [0, 1, 1023, 1024, 2047, 2048, 2499]) {
      expect([t.file[k], t.offset[k], t.start[k], t.rate[k], t.count[k], t.encoding[k], t.littleEndian[k], t.recordLength[k],
        t.dataOffset[k], t.flags[k], t.timingQuality[k], t.quality[k], t.channel[k]]).toEqual([
        k % 3, k * 4096, 1_700_000_000_000_000 + k * 40_950_000 + 0.5, 100 + k / 1e4, 4000 + (k % 97), 11, k % 2, 4096, 64, k % 8,
        k % 5 === 0 ? -1 : k % 101, 0x44, k % 7]);
    }
  });

  it('starts a row unplaced (at and seg -1) and undecoded (skip, held index, status, decoded, verdict 0)', () => {
    const t = new RecordTable();
    for (let k = 0; k < 1100; k++) addRow(t, k);
    for (const k of [0, 1099]) {
      expect([t.at[k], t.seg[k], t.skip[k], t.heldAt[k], t.status[k], t.decoded[k], t.verdict[k]]).toEqual([-1, -1, 0, 0, 0, 0, 0]);
    }
    expect(t.head.size).toBe(0);
  });

  it('keeps values set after adding when the columns grow', () => {
    const t = new RecordTable();
    for (let k = 0; k < 1024; k++) addRow(t, k);
    t.at[1000] = 123_456;
    t.skip[1000] = 7;
    t.status[1000] = 2;
    addRow(t, 1024); // the 1,025th row doubles every column
    expect([t.at[1000], t.skip[1000], t.status[1000]]).toEqual([123_456, 7, 2]);
  });
});
