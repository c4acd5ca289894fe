/**
 * One filter request for a whole network, designed per channel: a network that mixes 40, 100 and
 * 200 Hz channels cannot use a 1-45 Hz band-pass on its 40 Hz channels (Nyquist 20 Hz). Corners at
 * or above a channel's Nyquist frequency are pulled down to a fixed fraction of it, and the result
 * says so; a request that cannot be met at all (a high-pass corner, or a band-pass's low corner, at
 * or above the clamped limit) is refused with a RangeError.
 */
import { type Corners, type FilterKind, butterworth, checkSampleRate } from './butterworth';

/** What the analyst asked for, independent of a channel. */
export interface FilterRequest {
  readonly kind: FilterKind;
  /** 1 to 8. */
  readonly order: number;
  /** Hz: one corner for low- and high-pass, [low, high] for band-pass. */
  readonly corners: Corners;
}

/** A request made fit for one sample rate. */
export interface ChannelFilter {
  /** Second-order sections for this sample rate (see `butterworth`). */
  readonly sos: Float64Array;
  /** The corners used, Hz (a copy of the request's unless clamped). */
  readonly corners: Corners;
  readonly sampleRate: number;
  /** True when a corner was lowered below the Nyquist frequency. */
  readonly clamped: boolean;
  /** What was changed and why, for the log and the screen; null when nothing was. */
  readonly note: string | null;
}

/** Default highest corner as a fraction of the Nyquist frequency when clamping (common practice: stay clear of the anti-alias roll-off). */
export const DEFAULT_NYQUIST_FRACTION = 0.9;

/**
 * Designs `request` for a channel sampled at `sampleRate` (Hz). Corners at or above the Nyquist
 * frequency fs/2 become `nyquistFraction`·fs/2 (default 0.9, so 18 Hz at 40 Hz sampling);
 * `clamped` and `note` report it. Other invalid requests throw as `butterworth` does.
 */
export function designForChannel(request: FilterRequest, sampleRate: number, nyquistFraction = DEFAULT_NYQUIST_FRACTION): ChannelFilter {
  checkSampleRate(sampleRate);
  if (!(nyquistFraction > 0 && nyquistFraction < 1)) {
    throw new RangeError(`nyquistFraction must be above 0 and below 1, got ${nyquistFraction}`);
  }
  const { kind, order, corners } = request;
  const nyquist = sampleRate / 2;
  const limit = nyquistFraction * nyquist;
  const at = `the Nyquist frequency ${nyquist} Hz of a ${sampleRate} Hz channel`;
  let used: Corners = corners;
  let note: string | null = null;
  if (kind === 'lowpass' && typeof corners === 'number' && corners >= nyquist) {
    used = limit;
    note = `low-pass corner ${corners} Hz is at or above ${at}; used ${limit} Hz`;
  } else if (kind === 'highpass' && typeof corners === 'number' && corners >= nyquist) {
    throw new RangeError(`high-pass corner ${corners} Hz is at or above ${at}: nothing would pass; allowed 0 < f < ${nyquist} Hz`);
  } else if (kind === 'bandpass' && Array.isArray(corners) && corners.length === 2 && corners[1] >= nyquist) {
    const [lo, hi] = corners as readonly [number, number];
    if (!(lo < limit)) {
      throw new RangeError(`band-pass ${lo}-${hi} Hz cannot be applied to a ${sampleRate} Hz channel: its low corner must be below ${limit} Hz (${nyquistFraction} of the Nyquist frequency ${nyquist} Hz)`);
    }
    used = [lo, limit];
    note = `band-pass high corner ${hi} Hz is at or above ${at}; used ${lo}-${limit} Hz`;
  }
  return { sos: butterworth(order, used, kind, sampleRate), corners: used, sampleRate, clamped: note !== null, note };
}
