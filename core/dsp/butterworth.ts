/**
 * Butterworth low-pass, high-pass and band-pass filters of order 1 to 8 as second-order sections,
 * designed in the steps scipy.signal's `butter(N, Wn, btype, fs=fs, output='sos')` takes: analog
 * prototype, pre-warp of the corners, band transform, bilinear transform, pairing into sections.
 */
import { type Zpk, bilinear, butterworthPrototype, lowpassToBandpass, lowpassToHighpass, lowpassToLowpass, prewarp } from './zpk';
import { zpkToSos } from './zpkToSos';

export type FilterKind = 'lowpass' | 'highpass' | 'bandpass';

/** Corner frequency in Hz (low- and high-pass), or [low, high] in Hz (band-pass). */
export type Corners = number | readonly [number, number];

export const MIN_ORDER = 1;
export const MAX_ORDER = 8;

const KINDS: readonly FilterKind[] = ['lowpass', 'highpass', 'bandpass'];

/** Throws unless `sampleRate` (Hz) is a finite number above zero. */
export function checkSampleRate(sampleRate: number): void {
  if (typeof sampleRate !== 'number' || !Number.isFinite(sampleRate) || sampleRate <= 0) {
    throw new RangeError(`sample rate must be a finite number of Hz above 0, got ${sampleRate}`);
  }
}

/**
 * Checks a filter specification against a sample rate and returns the corners as a list (Hz).
 * Throws a TypeError for a wrong kind or shape and a RangeError for an order outside 1-8 or a corner
 * outside 0 < f < Nyquist, naming the value and the allowed range.
 */
export function checkFilterSpec(order: number, corners: Corners, kind: FilterKind, sampleRate: number): number[] {
  if (!KINDS.includes(kind)) throw new TypeError(`filter kind must be one of ${KINDS.join(', ')}, got ${String(kind)}`);
  if (!Number.isInteger(order) || order < MIN_ORDER || order > MAX_ORDER) {
    throw new RangeError(`filter order must be an integer from ${MIN_ORDER} to ${MAX_ORDER}, got ${order}`);
  }
  checkSampleRate(sampleRate);
  const list = typeof corners === 'number' ? [corners] : Array.isArray(corners) ? [...corners] : null;
  const want = kind === 'bandpass' ? 2 : 1;
  if (!list || list.length !== want || list.some((c) => typeof c !== 'number')) {
    throw new TypeError(`a ${kind} filter needs ${want === 2 ? 'two corner frequencies [low, high]' : 'one corner frequency'} in Hz, got ${JSON.stringify(corners)}`);
  }
  const nyquist = sampleRate / 2;
  for (const c of list) {
    if (!(c > 0 && c < nyquist)) {
      throw new RangeError(`corner frequency ${c} Hz is outside the allowed range 0 < f < ${nyquist} Hz (the Nyquist frequency of ${sampleRate} Hz sampling)`);
    }
  }
  if (want === 2 && !(list[0] < list[1])) {
    throw new RangeError(`band-pass corners must be increasing, got [${list[0]}, ${list[1]}] Hz`);
  }
  return list;
}

/** The digital Butterworth filter as zeros, poles (z-plane) and gain. Arguments as {@link butterworth}. */
export function butterworthZpk(order: number, corners: Corners, kind: FilterKind, sampleRate: number): Zpk {
  const c = checkFilterSpec(order, corners, kind, sampleRate);
  const proto = butterworthPrototype(order);
  let analog: Zpk;
  if (kind === 'bandpass') {
    const lo = prewarp(c[0], sampleRate);
    const hi = prewarp(c[1], sampleRate);
    analog = lowpassToBandpass(proto, Math.sqrt(lo * hi), hi - lo);
  } else if (kind === 'highpass') {
    analog = lowpassToHighpass(proto, prewarp(c[0], sampleRate));
  } else {
    analog = lowpassToLowpass(proto, prewarp(c[0], sampleRate));
  }
  return bilinear(analog, sampleRate);
}

/**
 * Butterworth filter as second-order sections: a Float64Array of 6 numbers per section,
 * b0 b1 b2 a0 a1 a2 (a0 = 1), the gain in the first section, as scipy's
 * `butter(order, corners, kind, fs=sampleRate, output='sos')`.
 * A low- or high-pass of order N has ceil(N/2) sections; a band-pass of order N has N sections.
 *
 * @param order 1 to 8 (a band-pass of order N rolls off as order N on each side).
 * @param corners Hz: one corner for low- and high-pass, [low, high] for band-pass (-3 dB points),
 *   each above 0 and below the Nyquist frequency sampleRate/2 (else RangeError; see
 *   `designForChannel` to clamp instead).
 * @param sampleRate samples per second (Hz).
 */
export function butterworth(order: number, corners: Corners, kind: FilterKind, sampleRate: number): Float64Array {
  return zpkToSos(butterworthZpk(order, corners, kind, sampleRate));
}
