/**
 * Measuring a Wood-Anderson amplitude: the window around S and the peak in it.
 *
 * Two measures:
 * - 'zeroToPeak': the largest |x| in the window, the "maximum trace amplitude" of Richter (1935) and
 *   of the IASPEI (2013) ML standard (deflection from the zero line; the trace has its mean removed).
 * - 'halfPeakToPeak': half the largest difference between a peak and the adjacent trough (or trough
 *   and adjacent peak), the measure the IASPEI (2013) recommendations use for the body- and
 *   surface-wave magnitudes; selectable here for networks calibrated that way.
 */
import type { Micros } from '../time';

export type AmplitudeMeasure = 'zeroToPeak' | 'halfPeakToPeak';

export interface TimeWindow {
  readonly start: Micros;
  readonly end: Micros;
}

export interface PeakAmplitude {
  /** Amplitude in the trace's units (≥ 0). */
  amplitude: number;
  /** Time of the largest deflection (zeroToPeak) or of the later extremum of the pair (halfPeakToPeak), µs. */
  time: Micros;
  /** Twice the time between the pair's extrema, s (halfPeakToPeak), or null (zeroToPeak). */
  periodS: number | null;
  measure: AmplitudeMeasure;
}

export interface WindowFromPicks {
  /** P pick time, µs (optional). */
  p?: Micros | null;
  /** S pick time, µs. */
  s: Micros;
  /** Seconds before S the window opens when there is no P; default 1. */
  beforeS?: number;
  /** Window length after S as a multiple of S − P; default 2 (common practice: the S wave and its early coda). */
  sMinusPFactor?: number;
  /** Least length after S, s; default 10. */
  minAfterS?: number;
}

/** Amplitude window from picks: from P (or S − beforeS) to S + max(minAfterS, factor·(S − P)). */
export function windowFromPicks(w: WindowFromPicks): TimeWindow {
  if (!Number.isFinite(w.s)) throw new RangeError(`S time must be finite, got ${w.s}`);
  const before = w.beforeS ?? 1, factor = w.sMinusPFactor ?? 2, minAfter = w.minAfterS ?? 10;
  if (!(before >= 0) || !(factor >= 0) || !(minAfter > 0)) {
    throw new RangeError(`window needs beforeS >= 0, sMinusPFactor >= 0, minAfterS > 0 s; got ${before}, ${factor}, ${minAfter}`);
  }
  const p = w.p ?? null;
  if (p !== null && !(p < w.s)) throw new RangeError(`P time must be before S time, got P ${p} and S ${w.s} µs`);
  const sp = p === null ? 0 : (w.s - p) / 1e6;
  const start = p === null ? w.s - Math.round(before * 1e6) : p;
  return { start, end: w.s + Math.round(Math.max(minAfter, factor * sp) * 1e6) };
}

export interface WindowFromOrigin {
  /** Origin time, µs. */
  origin: Micros;
  /** Hypocentral distance, km. */
  distanceKm: number;
  /** Average P and S speeds, km/s; defaults 6.0 and 3.5 (crustal, common practice). */
  vp?: number;
  vs?: number;
  /** Same meaning as in WindowFromPicks; defaults 2 and 10 s. */
  sMinusPFactor?: number;
  minAfterS?: number;
}

/** Amplitude window from origin time and distance: predicted P and S, then as windowFromPicks. */
export function windowFromOrigin(w: WindowFromOrigin): TimeWindow {
  const vp = w.vp ?? 6.0, vs = w.vs ?? 3.5;
  if (!(w.distanceKm >= 0) || !Number.isFinite(w.distanceKm)) throw new RangeError(`distance must be >= 0 km, got ${w.distanceKm}`);
  if (!(vp > vs && vs > 0)) throw new RangeError(`speeds must satisfy vp > vs > 0 km/s, got vp ${vp}, vs ${vs}`);
  const p = w.origin + Math.round((w.distanceKm / vp) * 1e6);
  const s = w.origin + Math.round((w.distanceKm / vs) * 1e6);
  return windowFromPicks({ p: s > p ? p : null, s, sMinusPFactor: w.sMinusPFactor, minAfterS: w.minAfterS });
}

/** Sample index range [from, to) of `window` in a trace starting at `start` µs with `sampleRate` Hz, clamped to [0, n]. */
export function windowIndices(window: TimeWindow, start: Micros, sampleRate: number, n: number): [number, number] {
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`sample count must be a non-negative integer, got ${n}`);
  const from = Math.max(0, Math.ceil(((window.start - start) * sampleRate) / 1e6 - 1e-9));
  const to = Math.min(n, Math.floor(((window.end - start) * sampleRate) / 1e6 + 1e-9) + 1);
  return [from, Math.max(from, to)];
}

/**
 * The peak of `x` (trace units) in `window`, for a trace whose first sample is at `start` µs.
 * Null when the window holds fewer than 2 samples of the trace.
 */
export function measurePeak(
  x: Float64Array, sampleRate: number, start: Micros, window: TimeWindow, measure: AmplitudeMeasure = 'zeroToPeak',
): PeakAmplitude | null {
  if (!(x instanceof Float64Array)) throw new TypeError('trace must be a Float64Array');
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be > 0 Hz, got ${sampleRate}`);
  if (measure !== 'zeroToPeak' && measure !== 'halfPeakToPeak') throw new RangeError(`measure must be zeroToPeak or halfPeakToPeak, got ${String(measure)}`);
  if (!(window.end > window.start)) throw new RangeError(`window end must be after its start, got ${window.start} to ${window.end} µs`);
  const [from, to] = windowIndices(window, start, sampleRate, x.length);
  if (to - from < 2) return null;
  const timeOf = (i: number): Micros => start + Math.round((i * 1e6) / sampleRate);
  if (measure === 'zeroToPeak') {
    let best = -1, at = from;
    for (let i = from; i < to; i++) {
      const a = Math.abs(x[i]);
      if (a > best) { best = a; at = i; }
    }
    return { amplitude: best, time: timeOf(at), periodS: null, measure };
  }
  // Successive extrema (turning points); the window's ends count as extrema.
  let prevIdx = from, prevVal = x[from];
  let best = -1, bestA = from, bestB = from;
  for (let i = from + 1; i < to; i++) {
    const last = i === to - 1;
    const turning = last || (x[i] - x[i - 1]) * (x[i + 1] - x[i]) < 0;
    if (!turning) continue;
    const d = Math.abs(x[i] - prevVal);
    if (d > best) { best = d; bestA = prevIdx; bestB = i; }
    prevIdx = i;
    prevVal = x[i];
  }
  return { amplitude: best / 2, time: timeOf(bestB), periodS: (2 * (bestB - bestA)) / sampleRate, measure };
}

/**
 * Whether a trace's counts reach the digitizer's full scale in [from, to): any |count| ≥
 * `fraction`·fullScale (default fraction 0.98: a margin below the rails where digitizers already
 * distort, common practice).
 */
export function reachesFullScale(counts: ArrayLike<number>, fullScale: number, from = 0, to = counts.length, fraction = 0.98): boolean {
  if (!(fullScale > 0)) throw new RangeError(`full scale must be > 0 counts, got ${fullScale}`);
  if (!(fraction > 0 && fraction <= 1)) throw new RangeError(`full-scale fraction must be in (0, 1], got ${fraction}`);
  const lim = fraction * fullScale;
  const a = Math.max(0, from), b = Math.min(counts.length, to);
  for (let i = a; i < b; i++) if (Math.abs(counts[i]) >= lim) return true;
  return false;
}
