/**
 * Exact times. Daybreak keeps every instant as an integer number of microseconds since
 * 1970-01-01T00:00:00Z (UTC, leap seconds not counted, as POSIX time). Up to the year 2255 such
 * integers stay below 2^53, so a JavaScript number holds them exactly; arithmetic on them is exact
 * as long as only integers are added. Never accumulate fractional seconds into a time.
 */

/** Microseconds since the epoch, an integer. */
export type Micros = number;

export const MICROS_PER_SECOND = 1_000_000;
const MICROS_PER_DAY = 86_400 * MICROS_PER_SECOND;

/** Days from 1970-01-01 to the first of January of `year` (proleptic Gregorian). */
function daysBeforeYear(year: number): number {
  const y = year - 1;
  return 365 * (year - 1970) + (Math.floor(y / 4) - Math.floor(y / 100) + Math.floor(y / 400)) - 477;
}

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

/**
 * Time from calendar fields as SEED writes them: year, day of year (1-366), hour, minute, second
 * (0-60; 60 is a leap second and lands on the next minute's second 0, the caller flags it) and
 * microseconds. Fields are not range-checked here; record parsers check them where they read them.
 */
export function microsFromYearDay(
  year: number, dayOfYear: number, hour: number, minute: number, second: number, micros: number,
): Micros {
  const days = daysBeforeYear(year) + dayOfYear - 1;
  const secs = ((days * 24 + hour) * 60 + minute) * 60 + second;
  return secs * MICROS_PER_SECOND + micros;
}

/** Time from an ISO 8601 UTC string such as 2026-12-02T03:29:24.123456Z (up to 6 fraction digits kept). */
export function microsFromIso(iso: string): Micros {
  const m = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2}):(\d{2})(?:\.(\d+))?(Z|[+-]00:?00)?$/.exec(iso.trim());
  if (!m) throw new RangeError(`not an ISO 8601 UTC time: "${iso}"`);
  const [, y, mo, d, h, mi, s, frac] = m;
  const ms = Date.UTC(+y, +mo - 1, +d, +h, +mi, +s);
  if (Number.isNaN(ms)) throw new RangeError(`not a valid date: "${iso}"`);
  const digits = (frac ?? '').padEnd(6, '0');
  // Round beyond microseconds: 7th digit and on.
  let us = Number(digits.slice(0, 6));
  if (digits.length > 6 && Number(digits[6]) >= 5) us += 1;
  return ms * 1000 + us;
}

/** ISO 8601 UTC with six fraction digits: 2026-12-02T03:29:24.123456Z. */
export function isoFromMicros(t: Micros): string {
  if (!Number.isSafeInteger(t)) throw new RangeError(`time must be integer microseconds, got ${t}`);
  const days = Math.floor(t / MICROS_PER_DAY);
  const inDay = t - days * MICROS_PER_DAY;
  const date = new Date(days * 86_400_000);
  const sec = Math.floor(inDay / MICROS_PER_SECOND);
  const us = inDay - sec * MICROS_PER_SECOND;
  const hh = Math.floor(sec / 3600);
  const mm = Math.floor((sec % 3600) / 60);
  const ss = sec % 60;
  const p2 = (n: number) => String(n).padStart(2, '0');
  const year = date.getUTCFullYear();
  const ys = year >= 0 && year <= 9999 ? String(year).padStart(4, '0') : String(year);
  return `${ys}-${p2(date.getUTCMonth() + 1)}-${p2(date.getUTCDate())}T${p2(hh)}:${p2(mm)}:${p2(ss)}.${String(us).padStart(6, '0')}Z`;
}

/** Calendar fields of a time, as SEED's BTIME holds them (day of year 1-366). */
export function yearDayFromMicros(t: Micros): {
  year: number; dayOfYear: number; hour: number; minute: number; second: number; micros: number;
} {
  const days = Math.floor(t / MICROS_PER_DAY);
  const inDay = t - days * MICROS_PER_DAY;
  const year = new Date(days * 86_400_000).getUTCFullYear();
  const dayOfYear = days - daysBeforeYear(year) + 1;
  const sec = Math.floor(inDay / MICROS_PER_SECOND);
  return {
    year, dayOfYear,
    hour: Math.floor(sec / 3600), minute: Math.floor((sec % 3600) / 60), second: sec % 60,
    micros: inDay - sec * MICROS_PER_SECOND,
  };
}

/** Start of the UTC day that holds `t`. */
export function utcDayStart(t: Micros): Micros {
  return Math.floor(t / MICROS_PER_DAY) * MICROS_PER_DAY;
}

/** Seconds (floating) from `from` to `to`: for display and arithmetic on short spans only. */
export function secondsBetween(from: Micros, to: Micros): number {
  return (to - from) / MICROS_PER_SECOND;
}

/** `t` plus `seconds`, rounded to the nearest microsecond. */
export function addSeconds(t: Micros, seconds: number): Micros {
  return t + Math.round(seconds * MICROS_PER_SECOND);
}
