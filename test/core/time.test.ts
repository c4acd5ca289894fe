import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { isoFromMicros, microsFromIso, microsFromYearDay, yearDayFromMicros } from '../../core/time';

// Reference: Python's datetime (CPython 3.11 standard library), computed in the same run.
function pythonMicros(isoList: string[]): number[] {
  const script = `
import sys, json, datetime
out = []
for s in json.loads(sys.stdin.read()):
    d = datetime.datetime.fromisoformat(s.replace('Z', '+00:00'))
    delta = d - datetime.datetime(1970, 1, 1, tzinfo=datetime.timezone.utc)
    out.append((delta.days * 86400 + delta.seconds) * 1000000 + delta.microseconds)
print(json.dumps(out))`;
  return JSON.parse(execFileSync('python3', ['-c', script], { input: JSON.stringify(isoList) }).toString());
}

const samples = [
  '1970-01-01T00:00:00.000000Z', '1999-12-31T23:59:59.999999Z', '2000-02-29T12:00:00.500000Z',
  '2016-12-31T23:59:59.000001Z', '2026-12-02T03:29:24.123456Z', '2100-03-01T00:00:00.000000Z',
  '1969-07-20T20:17:40.000000Z',
];

describe('time', () => {
  it('microsFromIso agrees with Python datetime to the microsecond', () => {
    expect(samples.map(microsFromIso)).toEqual(pythonMicros(samples));
  });

  it('isoFromMicros(microsFromIso(s)) returns s', () => {
    for (const s of samples) expect(isoFromMicros(microsFromIso(s))).toBe(s);
  });

  it('microsFromYearDay reads SEED BTIME fields: 2016 day 366 is 31 December (leap year)', () => {
    expect(isoFromMicros(microsFromYearDay(2016, 366, 23, 59, 59, 999_900))).toBe('2016-12-31T23:59:59.999900Z');
    expect(isoFromMicros(microsFromYearDay(2026, 336, 3, 29, 24, 1))).toBe('2026-12-02T03:29:24.000001Z');
  });

  it('yearDayFromMicros inverts microsFromYearDay', () => {
    const f = yearDayFromMicros(microsFromIso('2024-12-31T10:20:30.000040Z'));
    expect(f).toEqual({ year: 2024, dayOfYear: 366, hour: 10, minute: 20, second: 30, micros: 40 });
  });

  it('a second field of 60 (leap second) lands on the next minute', () => {
    expect(isoFromMicros(microsFromYearDay(2016, 366, 23, 59, 60, 0))).toBe('2017-01-01T00:00:00.000000Z');
  });

  it('microsFromIso rejects text that is not a UTC time', () => {
    expect(() => microsFromIso('yesterday')).toThrow(RangeError);
  });
});
