import { describe, expect, it } from 'vitest';
import { channelFiles, RECORD_LENGTH } from '../../../core/synth/files';
import { renderStation } from '../../../core/synth/render';
import type { FaultSpec } from '../../../core/synth/types';
import { microsFromIso } from '../../../core/time';
import { libmseedDecodeBytes } from '../../ref/libmseed';
import { ringStations, tinyScenario } from './scenarioFixtures';

// Reference reader: libmseed 2.19 (Debian libmseed-dev), through test/ref/libmseed/msdecode.c.
const start = microsFromIso('2026-03-01T23:58:00Z');
const t = (iso: string) => microsFromIso(iso);

function scenario(faults: FaultSpec[]) {
  const [st] = ringStations(1, 10);
  return { ...tinyScenario([st], [], 300, faults), start, end: start + 300e6 };
}

describe('channelFiles', () => {
  it('splits a channel at midnight into one Steim-2 file per UTC day that libmseed decodes back to the same samples', () => {
    const sc = scenario([]);
    const rs = renderStation(sc, 'T00');
    const z = rs.channels[0];
    const files = channelFiles(sc, z);
    expect(files.map((f) => f.name)).toEqual(['XX.T00.00.HHZ.2026-03-01.mseed', 'XX.T00.00.HHZ.2026-03-02.mseed']);
    const day1 = libmseedDecodeBytes(files[0].bytes), day2 = libmseedDecodeBytes(files[1].bytes);
    expect(day1.error).toBeNull();
    expect(day1.records.every((r) => r.encoding === 11 && r.reclen === RECORD_LENGTH && r.byteorder === 1)).toBe(true);
    expect(day1.segments).toHaveLength(1);
    expect(day1.segments[0].start).toBe(start);
    expect(day1.segments[0].count).toBe(120 * 100);
    expect(day2.segments[0].start).toBe(t('2026-03-02T00:00:00Z'));
    const joined = [...day1.segments[0].samples as Int32Array, ...day2.segments[0].samples as Int32Array];
    expect(joined).toEqual([...z.samples]);
  });

  it('leaves a gap out, writes a duplicated span twice, and tags a clock-offset span late with low timing quality and the clock unlocked', () => {
    const faults: FaultSpec[] = [
      { kind: 'gap', station: 'T00', start: t('2026-03-02T00:00:30Z'), end: t('2026-03-02T00:01:00Z') },
      { kind: 'duplicateRecords', station: 'T00', start: t('2026-03-01T23:58:30Z'), end: t('2026-03-01T23:59:00Z') },
      { kind: 'clockOffset', station: 'T00', start: t('2026-03-02T00:01:30Z'), end: t('2026-03-02T00:02:30Z'), offsetMicros: 750_000, timingQuality: 10 },
    ];
    const sc = scenario(faults);
    const z = renderStation(sc, 'T00').channels[0];
    const [f1, f2] = channelFiles(sc, z);
    const d1 = libmseedDecodeBytes(f1.bytes), d2 = libmseedDecodeBytes(f2.bytes);
    // Duplicates: the 30 s span appears twice, with identical bytes.
    const dupStarts = d1.records.map((r) => r.start).filter((s) => s >= t('2026-03-01T23:58:30Z') && s < t('2026-03-01T23:59:00Z'));
    expect(new Set(dupStarts).size * 2).toBe(dupStarts.length);
    // Gap: nothing between 00:00:30 and 00:01:00 true time.
    const covered = (a: number, b: number) => d2.records.some((r) => r.start < b && r.start + (r.count * 1e6) / r.rate > a);
    expect(covered(t('2026-03-02T00:00:31Z'), t('2026-03-02T00:00:59Z'))).toBe(false);
    // Clock: the span's records start 0.75 s late, say timing quality 10 %, clock not locked (I/O flag bit 5) and time questionable (data-quality bit 7).
    const late = d2.records.filter((r) => r.timingQuality === 10);
    expect(late.length).toBeGreaterThan(0);
    expect(late[0].start).toBe(t('2026-03-02T00:01:30Z') + 750_000);
    expect(late.every((r) => (r.ioFlags & 0x20) === 0 && (r.dqFlags & 0x80) !== 0)).toBe(true);
    const good = d2.records.filter((r) => r.timingQuality !== 10);
    expect(good.every((r) => r.timingQuality === 100 && (r.ioFlags & 0x20) !== 0)).toBe(true);
    // The late span's samples are the true ones (only the tags are wrong).
    const i0 = (t('2026-03-02T00:01:30Z') - start) / 1e4;
    expect(Array.from((late[0].samples as Int32Array).slice(0, 50))).toEqual(Array.from(z.samples.slice(i0, i0 + 50)));
  });
});
