import { describe, expect, it } from 'vitest';
import { measurePeak, reachesFullScale, windowFromOrigin, windowFromPicks, windowIndices } from '../../../core/magnitude/amplitude';

const T = 1_700_000_000_000_000;

describe('measurePeak', () => {
  it('zero-to-peak is the largest |x| in the window and its time (hand-checked sequence)', () => {
    const x = new Float64Array([0, 3, 0, -1, 0, -5, 0, 2]);
    const p = measurePeak(x, 10, T, { start: T, end: T + 400_000 });
    expect(p?.amplitude).toBe(3);
    expect(p?.time).toBe(T + 100_000);
    const q = measurePeak(x, 10, T, { start: T, end: T + 700_000 });
    expect(q?.amplitude).toBe(5);
    expect(q?.time).toBe(T + 500_000);
  });
  it('half peak-to-peak is half the largest swing between adjacent extrema: (3 - (-1))/2 = 2 and (2 - (-5))/2 = 3.5', () => {
    const x = new Float64Array([0, 3, 0, -1, 0, -5, 0, 2]);
    expect(measurePeak(x, 10, T, { start: T, end: T + 400_000 }, 'halfPeakToPeak')?.amplitude).toBe(2);
    expect(measurePeak(x, 10, T, { start: T, end: T + 700_000 }, 'halfPeakToPeak')?.amplitude).toBe(3.5);
  });
  it('half peak-to-peak of a 1 Hz unit sine sampled on its crests is 1, with a period of 1 s', () => {
    const x = new Float64Array(400);
    for (let i = 0; i < 400; i++) x[i] = Math.sin((2 * Math.PI * i) / 100);
    const p = measurePeak(x, 100, T, { start: T + 500_000, end: T + 3_000_000 }, 'halfPeakToPeak');
    expect(p?.amplitude).toBeCloseTo(1, 12);
    expect(p?.periodS).toBeCloseTo(1, 12);
  });
  it('returns null when the window holds fewer than 2 samples of the trace', () => {
    expect(measurePeak(new Float64Array(10), 10, T, { start: T + 5_000_000, end: T + 6_000_000 })).toBeNull();
  });
});

describe('amplitude windows', () => {
  it('from picks run from P to S + max(10 s, 2·(S - P))', () => {
    expect(windowFromPicks({ p: T, s: T + 5e6 })).toEqual({ start: T, end: T + 15e6 });
    expect(windowFromPicks({ p: T, s: T + 8e6 })).toEqual({ start: T, end: T + 24e6 });
    expect(windowFromPicks({ s: T + 8e6 })).toEqual({ start: T + 7e6, end: T + 18e6 });
  });
  it('from origin and distance predict P at R/6 and S at R/3.5 km/s', () => {
    const w = windowFromOrigin({ origin: T, distanceKm: 35 });
    expect(w.start).toBe(T + Math.round((35 / 6) * 1e6));
    expect(w.end).toBe(T + 10e6 + Math.round(Math.max(10, 2 * (10 - 35 / 6)) * 1e6));
  });
  it('index ranges include both window ends and clamp to the trace', () => {
    expect(windowIndices({ start: T + 1e6, end: T + 2e6 }, T, 100, 1000)).toEqual([100, 201]);
    expect(windowIndices({ start: T - 1e6, end: T + 20e6 }, T, 100, 1000)).toEqual([0, 1000]);
  });
  it('reject P after S', () => {
    expect(() => windowFromPicks({ p: T + 9e6, s: T + 8e6 })).toThrow(/P time must be before S time/);
  });
});

describe('reachesFullScale', () => {
  it('flags counts at or beyond 98 % of full scale inside the range only', () => {
    const c = new Int32Array([0, 100, 8_300_000, 5]);
    expect(reachesFullScale(c, 8_388_607)).toBe(true);
    expect(reachesFullScale(c, 8_388_607, 3, 4)).toBe(false);
    expect(reachesFullScale(c, 8_388_607, 0, 4, 1)).toBe(false);
  });
});
