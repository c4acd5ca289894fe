/**
 * What the spectrum panel measures, without the DOM: the signal span (the time span in view), the
 * noise span of the same length before the event's first pick (or before the signal span when the
 * event has no pick, or none is open), the samples of a channel inside a span, and the pair of
 * amplitude spectra (core/dsp/spectrum: Hann window, mean removed, zero-padded to a power of two;
 * amplitudes in counts, scaled so a sinusoid at a bin frequency reads its amplitude).
 */
import { amplitudeSpectrum, type AmplitudeSpectrum, type WindowName } from '../../core/dsp/spectrum';
import type { FilterRequest } from '../../core/dsp';
import type { SampleArray } from '../../core/model';
import type { Micros } from '../../core/time';

/** The window function the panel uses (named on the panel). */
export const SPECTRUM_WINDOW: WindowName = 'hann';

/** The noise span ends this long before the first pick, µs (0.5 s: keeps an emergent onset picked late out of it; our own choice). */
export const NOISE_GAP_MICROS = 500_000;

export interface SpectrumSpans {
  /** The span analysed, µs [start, end). */
  signal: [Micros, Micros];
  /** The noise span, µs [start, end): as long as the signal span. */
  noise: [Micros, Micros];
  /** What the noise span ends before. */
  noiseBefore: 'first pick' | 'span';
}

/**
 * The signal span and the noise span for it: the noise span has the signal span's length and ends
 * NOISE_GAP_MICROS before `firstPick` (µs, the event's earliest pick), or at the signal span's start
 * when there is no pick. It may overlap the signal span (a view that starts well before the pick).
 */
export function spectrumSpans(signal: readonly [Micros, Micros], firstPick: Micros | null): SpectrumSpans {
  const [a, b] = signal;
  if (!Number.isFinite(a) || !Number.isFinite(b) || !(b > a)) throw new RangeError(`signal span must be finite with its end after its start, got [${a}, ${b}] µs`);
  if (firstPick !== null && !Number.isFinite(firstPick)) throw new RangeError(`firstPick must be a finite time in µs or null, got ${firstPick}`);
  const end = firstPick === null ? a : firstPick - NOISE_GAP_MICROS;
  return { signal: [a, b], noise: [end - (b - a), end], noiseBefore: firstPick === null ? 'span' : 'first pick' };
}

/** A continuous piece of a channel: sample i at start + i·1e6/sampleRate µs. */
export interface SamplePiece { start: Micros; sampleRate: number; samples: SampleArray }

export interface SpanRun {
  /** The samples inside the span (a view of the piece's array). */
  samples: SampleArray;
  /** Time of samples[0], µs. */
  start: Micros;
  sampleRate: number;
}

/**
 * The longest gap-free run of samples whose times t fall in [span[0], span[1]): the piece with most
 * samples in the span (the first of equals), or null when no piece has 2 samples there.
 */
export function runInSpan(pieces: readonly SamplePiece[], span: readonly [Micros, Micros]): SpanRun | null {
  let best: SpanRun | null = null;
  for (const p of pieces) {
    const n = p.samples.length;
    const perMicro = p.sampleRate / 1e6;
    // First index with t >= span[0], first index with t >= span[1] (times rounded to the µs as core/model keeps them).
    const i0 = Math.min(n, Math.max(0, Math.ceil((span[0] - p.start) * perMicro - 1e-9)));
    const i1 = Math.min(n, Math.max(0, Math.ceil((span[1] - p.start) * perMicro - 1e-9)));
    if (i1 - i0 < 2 || (best && i1 - i0 <= best.samples.length)) continue;
    best = { samples: p.samples.subarray(i0, i1), start: p.start + Math.round((i0 * 1e6) / p.sampleRate), sampleRate: p.sampleRate };
  }
  return best;
}

export interface ChannelSpectra {
  channel: string;
  sampleRate: number;
  /** Spectrum of the signal run, or null when the channel has under 2 samples in the signal span. */
  signal: AmplitudeSpectrum | null;
  /** Spectrum of the noise run, or null likewise. */
  noise: AmplitudeSpectrum | null;
  /** Seconds the runs cover (samples / rate; shorter than the span where a gap or the data's end cuts it). */
  signalSeconds: number;
  noiseSeconds: number;
}

/**
 * Amplitude spectra of one channel's raw samples over the two spans (each the longest gap-free run
 * inside its span, mean removed, SPECTRUM_WINDOW applied).
 */
export function channelSpectra(channel: string, pieces: readonly SamplePiece[], spans: SpectrumSpans): ChannelSpectra {
  const s = runInSpan(pieces, spans.signal);
  const n = runInSpan(pieces, spans.noise);
  const of = (r: SpanRun | null) => (r ? amplitudeSpectrum(r.samples, r.sampleRate, { window: SPECTRUM_WINDOW }) : null);
  return {
    channel, sampleRate: s?.sampleRate ?? n?.sampleRate ?? 0,
    signal: of(s), noise: of(n),
    signalSeconds: s ? s.samples.length / s.sampleRate : 0, noiseSeconds: n ? n.samples.length / n.sampleRate : 0,
  };
}

/** Frequency (Hz) of the largest amplitude at or above `fromHz` (bin 0, the removed mean, always skipped); NaN when none. */
export function peakFrequency(s: Pick<AmplitudeSpectrum, 'frequencies' | 'amplitudes'>, fromHz = 0): number {
  let best = -1;
  let at = NaN;
  for (let k = 1; k < s.frequencies.length; k++) {
    if (s.frequencies[k] >= fromHz && s.amplitudes[k] > best) { best = s.amplitudes[k]; at = s.frequencies[k]; }
  }
  return at;
}

/**
 * The pass band a filter request lets through on a channel of `sampleRate` Hz, [low, high] Hz: a
 * high-pass reaches the Nyquist frequency, a low-pass starts at 0. Null for no filter.
 */
export function passBand(filter: FilterRequest | null, sampleRate: number): [number, number] | null {
  if (!filter) return null;
  const nyquist = sampleRate / 2;
  const c = filter.corners;
  if (filter.kind === 'bandpass') {
    const [lo, hi] = c as readonly [number, number];
    return [lo, Math.min(hi, nyquist)];
  }
  const f = c as number;
  return filter.kind === 'highpass' ? [f, nyquist] : [0, Math.min(f, nyquist)];
}

/**
 * How the spectra's amplitude units are named from the components' recorded units (StationXML output
 * units, null when not given): "counts" for count(s), one named unit when all agree, else "the units
 * recorded" with what is known. `short` labels an axis or a readout.
 */
export function amplitudeUnits(units: (string | null)[]): { long: string; short: string } {
  const known = [...new Set(units.filter((u): u is string => u !== null).map((u) => (/^counts?$/i.test(u) ? 'counts' : u)))];
  if (known.length === 1 && units.every((u) => u !== null)) return { long: known[0], short: known[0] };
  if (known.length === 0) return { long: 'the units recorded (the StationXML gives none)', short: 'recorded units' };
  return { long: `the units recorded (${known.join(', ')})`, short: 'recorded units' };
}
