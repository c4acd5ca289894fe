/**
 * Local magnitude of an event from its stations' horizontal Wood-Anderson amplitudes: per-channel
 * amplitude measurement (simulation, window, peak, clipping), channel and station magnitudes with
 * station corrections, and the network value (median) with its spread and count.
 *
 * How the two horizontals count ('combine'):
 * - 'each' (default): every horizontal channel's amplitude is one datum, as the IASPEI (2013) ML
 *   standard says ("amplitudes are measured independently from each horizontal component, and each
 *   amplitude is treated as a single datum"); the station magnitude shown is their mean.
 * - 'max': the larger of the station's horizontal amplitudes is the station's datum.
 * - 'mean': the mean of the channels' magnitudes (mean log amplitude) is the station's datum.
 * With 'max' and 'mean' a station with a clipped horizontal gives no datum (the unclipped one alone
 * would understate it); with 'each' its unclipped horizontals still count.
 */
import { channelKey, stationKey, type ChannelId, type SampleArray } from '../model';
import type { Micros } from '../time';
import { measurePeak, reachesFullScale, windowIndices, type AmplitudeMeasure, type TimeWindow } from './amplitude';
import type { ChannelResponse } from './response';
import { distanceCorrection, localMagnitudeOf, type MagnitudeScale } from './scales';
import { simulateWoodAnderson } from './woodAnderson';

/** One horizontal channel's records around the event. */
export interface HorizontalTrace {
  readonly channel: ChannelId;
  /** Counts as recorded, one continuous run. */
  readonly counts: SampleArray;
  /** Samples per second. */
  readonly sampleRate: number;
  /** Time of counts[0], µs. */
  readonly start: Micros;
  readonly response: ChannelResponse;
  /** True when the caller knows the trace clipped (e.g. the digitizer flagged it). */
  readonly clipped?: boolean;
  /** Digitizer full scale, counts; the window is checked against it when given. */
  readonly fullScaleCounts?: number;
}

export interface AmplitudeOptions {
  /** The magnitude scale: its Wood-Anderson parameter set is simulated. */
  scale: MagnitudeScale;
  /** Default 'zeroToPeak' (IASPEI 2013 ML "maximum trace amplitude"; Richter 1935). */
  measure?: AmplitudeMeasure;
  /** Prefilter corners, Hz; default as simulateWoodAnderson. */
  preFilter?: readonly [number, number, number, number] | null;
  waterLevelDb?: number | null;
  taperFraction?: number;
  /** Fraction of full scale that counts as clipped; default 0.98. */
  fullScaleFraction?: number;
  /** A window of noise before the event (e.g. the 10 s before P) measured the same way, for the signal-to-noise ratio. */
  noiseWindow?: TimeWindow;
}

/** A measured Wood-Anderson amplitude. */
export interface WoodAndersonAmplitude {
  readonly channel: ChannelId;
  /** "NET.STA.LOC.CHA". */
  readonly key: string;
  /** Peak in metres of ground-equivalent Wood-Anderson displacement (static magnification 1). */
  readonly amplitudeM: number;
  /** Time of the peak, µs. */
  readonly time: Micros;
  /** Period of the peak, s, when the measure gives one. */
  readonly periodS: number | null;
  readonly measure: AmplitudeMeasure;
  /** Name of the Wood-Anderson parameter set simulated. */
  readonly standard: string;
  readonly window: TimeWindow;
  /** True when flagged by the caller or the counts reached full scale in the window. */
  readonly clipped: boolean;
  /** Amplitude over the same measure in the noise window, or null when no noise window was measured. */
  readonly snr: number | null;
}

/**
 * Simulates the scale's Wood-Anderson on `trace` and measures the peak in `window`. Null when the
 * window holds fewer than 2 samples of the trace. Pass a stretch around the event, not hours (the
 * whole trace is transformed); the window and the noise window must lie clear of the tapered ends
 * (5 % of the trace at each end by default), or a RangeError says so.
 */
export function measureWoodAndersonAmplitude(trace: HorizontalTrace, window: TimeWindow, opts: AmplitudeOptions): WoodAndersonAmplitude | null {
  const measure = opts.measure ?? 'zeroToPeak';
  if (!(trace.counts instanceof Int32Array || trace.counts instanceof Float32Array || trace.counts instanceof Float64Array)) {
    throw new TypeError(`${channelKey(trace.channel)}: counts must be an Int32Array, Float32Array or Float64Array`);
  }
  if (!(trace.sampleRate > 0) || !Number.isFinite(trace.sampleRate)) throw new RangeError(`${channelKey(trace.channel)}: sample rate must be > 0 Hz, got ${trace.sampleRate}`);
  if (!Number.isFinite(trace.start)) throw new RangeError(`${channelKey(trace.channel)}: start time must be finite µs, got ${trace.start}`);
  if (!(window.end > window.start)) throw new RangeError(`window end must be after its start, got ${window.start} to ${window.end} µs`);
  const n = trace.counts.length;
  const [from, to] = windowIndices(window, trace.start, trace.sampleRate, n);
  if (to - from < 2) return null;
  // The taper (core/dsp cosineTaperWeights) scales floor(fraction·(n − 1)) samples at each end.
  const tapered = Math.floor((opts.taperFraction ?? 0.05) * (n - 1));
  for (const [name, w] of [['window', window], ['noise window', opts.noiseWindow]] as const) {
    if (!w) continue;
    const [a, b] = windowIndices(w, trace.start, trace.sampleRate, n);
    const wantA = Math.ceil(((w.start - trace.start) * trace.sampleRate) / 1e6 - 1e-9);
    const wantB = Math.floor(((w.end - trace.start) * trace.sampleRate) / 1e6 + 1e-9) + 1;
    if (a !== wantA || b !== wantB || a < tapered || b > n - tapered) {
      throw new RangeError(`${channelKey(trace.channel)}: the ${name} (samples ${wantA} to ${wantB}) must lie inside the trace clear of its tapered ends (samples ${tapered} to ${n - tapered}); give a longer trace`);
    }
  }
  let clipped = trace.clipped === true;
  if (!clipped && trace.fullScaleCounts !== undefined) {
    clipped = reachesFullScale(trace.counts, trace.fullScaleCounts, from, to, opts.fullScaleFraction ?? 0.98);
  }
  const wa = simulateWoodAnderson(trace.counts, trace.sampleRate, trace.response, {
    standard: opts.scale.standard, magnification: 1, preFilter: opts.preFilter, waterLevelDb: opts.waterLevelDb, taperFraction: opts.taperFraction,
  });
  const peak = measurePeak(wa, trace.sampleRate, trace.start, window, measure);
  if (!peak) return null;
  const noise = opts.noiseWindow ? measurePeak(wa, trace.sampleRate, trace.start, opts.noiseWindow, measure) : null;
  return {
    channel: trace.channel, key: channelKey(trace.channel), amplitudeM: peak.amplitude, time: peak.time, periodS: peak.periodS,
    measure, standard: opts.scale.standard.name, window, clipped,
    snr: noise ? (noise.amplitude > 0 ? peak.amplitude / noise.amplitude : Infinity) : null,
  };
}

/** Epicentral and hypocentral distances of a station, km. */
export interface StationDistance {
  readonly epicentralKm: number;
  readonly hypocentralKm: number;
}

export interface MagnitudeOptions {
  scale: MagnitudeScale;
  /** Default 'each'. */
  combine?: 'each' | 'max' | 'mean';
  /** Additive corrections, magnitude units, by "NET.STA.LOC.CHA" or "NET.STA" (the channel's own wins). */
  stationCorrections?: Readonly<Record<string, number>>;
  /** Leave out amplitudes whose signal-to-noise ratio is below this (those without one are kept); default none. */
  minSnr?: number;
}

export interface ChannelMagnitude {
  readonly key: string;
  readonly amplitude: WoodAndersonAmplitude;
  /** ML with the correction, or null when not used. */
  readonly magnitude: number | null;
  /** Correction applied, magnitude units. */
  readonly correction: number;
  /**
   * Why the channel gives no magnitude, or null: 'clipped', 'another horizontal clipped' (combine
   * 'max' or 'mean': the station's datum needs all its horizontals), 'distance out of range',
   * 'low signal-to-noise' (below minSnr), 'amplitude not positive'.
   */
  readonly excluded: string | null;
}

export interface StationMagnitude {
  /** "NET.STA". */
  readonly station: string;
  /** Distance the scale used, km. */
  readonly distanceKm: number;
  readonly channels: readonly ChannelMagnitude[];
  /** The station's magnitude (see 'combine'), or null when no channel gives one. */
  readonly magnitude: number | null;
}

export interface NetworkMagnitude {
  readonly scale: string;
  /** Median of the data (channels for 'each', stations otherwise), or null when none. */
  readonly value: number | null;
  /** Median absolute deviation from the median, magnitude units (null when no data). */
  readonly mad: number | null;
  /** Sample standard deviation, magnitude units (null with fewer than 2 data). */
  readonly std: number | null;
  /** Data used. */
  readonly count: number;
  /** Stations with at least one unclipped channel magnitude. */
  readonly stationCount: number;
  readonly stations: readonly StationMagnitude[];
}

/** The median of a non-empty list (mean of the two middle values for an even count). */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('median needs at least one value, got none');
  const v = [...values].sort((a, b) => a - b);
  const m = v.length >> 1;
  return v.length % 2 ? v[m] : (v[m - 1] + v[m]) / 2;
}

function correctionFor(key: string, corrections: Readonly<Record<string, number>> | undefined): number {
  if (!corrections) return 0;
  const station = key.split('.').slice(0, 2).join('.');
  const c = corrections[key] ?? corrections[station] ?? 0;
  if (!Number.isFinite(c)) throw new RangeError(`station correction for ${key} must be finite, got ${c}`);
  return c;
}

/**
 * Channel, station and network magnitudes from measured amplitudes. `distances` gives each
 * station's distances by "NET.STA"; a station missing from it throws RangeError.
 */
export function localMagnitude(
  amplitudes: readonly WoodAndersonAmplitude[],
  distances: ReadonlyMap<string, StationDistance> | Readonly<Record<string, StationDistance>>,
  opts: MagnitudeOptions,
): NetworkMagnitude {
  const combine = opts.combine ?? 'each';
  if (opts.minSnr !== undefined && !(opts.minSnr >= 0)) throw new RangeError(`minSnr must be >= 0, got ${opts.minSnr}`);
  if (combine !== 'each' && combine !== 'max' && combine !== 'mean') throw new RangeError(`combine must be each, max or mean, got ${String(combine)}`);
  const scale = opts.scale;
  const get = (k: string): StationDistance | undefined => (distances instanceof Map ? distances.get(k) : (distances as Record<string, StationDistance>)[k]);
  const byStation = new Map<string, WoodAndersonAmplitude[]>();
  for (const a of amplitudes) {
    if (a.standard !== scale.standard.name) {
      throw new RangeError(`${a.key}: amplitude simulated with Wood-Anderson ${a.standard}, but scale ${scale.name} needs ${scale.standard.name}`);
    }
    const k = stationKey(a.channel);
    const list = byStation.get(k) ?? [];
    list.push(a);
    byStation.set(k, list);
  }
  const stations: StationMagnitude[] = [];
  const data: number[] = [];
  for (const [st, list] of byStation) {
    const d = get(st);
    if (!d) throw new RangeError(`no distance given for station ${st}`);
    const km = scale.distance === 'hypocentral' ? d.hypocentralKm : d.epicentralKm;
    let inRange = true;
    try { distanceCorrection(scale, km); } catch { inRange = false; }
    // With 'max' or 'mean' the station's datum needs all its horizontals: one clipped spoils it.
    const siblingClipped = combine !== 'each' && list.some((a) => a.clipped);
    const minSnr = opts.minSnr ?? 0;
    const channels: ChannelMagnitude[] = list.map((a) => {
      const correction = correctionFor(a.key, opts.stationCorrections);
      let excluded: string | null = null;
      if (a.clipped) excluded = 'clipped';
      else if (siblingClipped) excluded = 'another horizontal clipped';
      else if (!inRange) excluded = 'distance out of range';
      else if (a.snr !== null && a.snr < minSnr) excluded = 'low signal-to-noise';
      else if (!(a.amplitudeM > 0)) excluded = 'amplitude not positive';
      const magnitude = excluded ? null : localMagnitudeOf(scale, a.amplitudeM, km, correction);
      return { key: a.key, amplitude: a, magnitude, correction, excluded };
    });
    const used = channels.filter((c) => c.magnitude !== null);
    let magnitude: number | null = null;
    if (used.length > 0) {
      const ms = used.map((c) => c.magnitude as number);
      const mean = ms.reduce((s, m) => s + m, 0) / ms.length;
      if (combine === 'max') {
        let best = used[0];
        for (const c of used) if (c.amplitude.amplitudeM * 10 ** c.correction > best.amplitude.amplitudeM * 10 ** best.correction) best = c;
        magnitude = best.magnitude;
      } else {
        magnitude = mean;
      }
      if (combine === 'each') data.push(...ms);
      else data.push(magnitude as number);
    }
    stations.push({ station: st, distanceKm: km, channels, magnitude });
  }
  stations.sort((a, b) => a.distanceKm - b.distanceKm);
  const stationCount = stations.filter((s) => s.magnitude !== null).length;
  if (data.length === 0) return { scale: scale.name, value: null, mad: null, std: null, count: 0, stationCount, stations };
  const value = median(data);
  const mad = median(data.map((m) => Math.abs(m - value)));
  let std: number | null = null;
  if (data.length > 1) {
    const mean = data.reduce((s, m) => s + m, 0) / data.length;
    std = Math.sqrt(data.reduce((s, m) => s + (m - mean) ** 2, 0) / (data.length - 1));
  }
  return { scale: scale.name, value, mad, std, count: data.length, stationCount, stations };
}
