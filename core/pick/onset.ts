/**
 * Onset refinement: from a trigger time to P and S picks with uncertainty, SNR, onset class and
 * first-motion polarity.
 *
 * P (`pickP`): Maeda's AIC (aic.ts) on the vertical in a window from `before` seconds ahead of the
 * trigger to `after` seconds past it. Give it raw or causally filtered samples: zero-phase filtering
 * moves energy ahead of the onset.
 *
 * S (`pickS`): the joint AIC of the two horizontals (sum of their AIC curves), its minimum sought only
 * where a plausible Vp/Vs puts S. With P travel time Tp, tS - tP = (Vp/Vs - 1) Tp, so for Vp/Vs in
 * [vpVsMin, vpVsMax] (default 1.5 to 2.0, spanning crustal rocks; 1.73 for a Poisson solid) and Tp in
 * [TpMin, TpMax]: S lies in [tP + (vpVsMin - 1) TpMin, tP + (vpVsMax - 1) TpMax]. Tp comes from an
 * origin-time estimate (Tp = tP - t0), from bounds the caller knows (network geometry), or else from
 * [0, maxPTravelTime]. The AIC window starts a quarter of the span (at least 0.1 s) before the range,
 * but never before the P pick, and ends just after the largest horizontal energy (N^2 + E^2) in the
 * range: the onset comes before the maximum, and a coda dying into noise later in the range would
 * otherwise be a change point as strong as S. The pick names the horizontal with the higher SNR.
 *
 * Rules (Daybreak's, documented here and in the tests):
 * - Uncertainty: lower (earlier) and upper (later) bounds on where the onset lies, in the sense of an
 *   earliest and a latest possible onset (the reading of pick uncertainty in Diehl, Kissling and
 *   Bormann, 2012, NMSOP-2 IS 11.4, from memory). Two parts:
 *   - The AIC minimum's width: the samples whose AIC lies within 2 tau of the minimum, contiguous with
 *     it, give a lower and an upper width. 2 is the usual "Delta AIC <= 2: comparable support" level
 *     (Burnham and Anderson, 2002, Model Selection and Multimodel Inference, 2nd ed., sect. 2.6 - from
 *     memory); tau is the integrated autocorrelation time of the noise ahead of the onset (aic.ts):
 *     AIC treats samples as independent, so band-limited noise makes its curve tau times too sharp.
 *     Each side is at least one sample period (the onset lies somewhere between two samples). A low
 *     SNR widens the curve by itself, so SNR enters through it. The upper uncertainty is this width.
 *   - The hidden rise: a wave's first swing grows out of the noise, and the AIC names the sample where
 *     it stands out, not where it began; the part of the rise below the noise lies before the pick and
 *     lasts longer the slower the swing rises (attenuated, distant or filtered onsets). So the lower
 *     uncertainty adds `riseP` (P) or `riseS` (S) times the first swing's length, from the pick to the
 *     swing's extreme (searched over `riseWindow`; for S on the horizontal the pick names).
 *   - The lead (below), added to the upper side: the AIC minimum itself stays a plausible onset.
 *   Daybreak's rule. The factors 1 and 2 are the smallest of a grid (steps of 0.25) under which the
 *   bounds held the generator's true onset for at least 90 % of the P and of the S picks with SNR 4-10
 *   and >= 10 on the generated nights 101 and 202 (test/support/pickingAccuracy.ts); the AIC width
 *   alone held 9-20 % of P and 1-4 % of S there. Checked apart from that choice on the held-out
 *   nights, the demo night with its regional event, and the analysts' manual picks of the real
 *   records (README, "Pick uncertainty").
 * - Lead of slow onsets: when the first swing takes longer than `impulsiveWidth` to reach its extreme
 *   (an emergent rise: attenuated, distant onsets), the pick is set `leadP` (P) or `leadS` (S) times
 *   the time from the AIC minimum to the swing's steepest step ahead of the minimum. A rise still
 *   steepening after the AIC's sample began before it, the earlier the longer it steepens; a sudden
 *   onset (steepest at once) keeps the AIC's sample. Daybreak's rule. The factors 1 (P) and 1.5 (S)
 *   are the smallest of a grid (steps of 0.25) that gave the most picks within 0.05 s (P) and 0.10 s
 *   (S), SNR >= 4, on the generated nights 101 and 202 and the generated regional events of seeds
 *   31-33 together (test/core/scan/regionalEvents.ts). Applied to every onset instead, it also moved
 *   fast local ones by whole samples, which spread their errors (P 9.7 to 14.7 ms) and cost the
 *   locations accuracy; kept to slow onsets it leaves local picks as they were and brought the demo
 *   night's regional S from a median 0.19 s to 0.04 s after the true onset.
 * - SNR: RMS in `snrSignal` seconds from the AIC minimum over RMS in `snrNoise` seconds ending at the
 *   minimum less its lower width, both about the noise window's mean.
 * - Onset: questionable when SNR < `questionableSnr`; impulsive when SNR >= `impulsiveSnr`, the AIC
 *   width (lower + upper) <= `impulsiveWidth` seconds and the first swing reaches its extreme within
 *   `impulsiveWidth` too (a sharp change that also rises fast); emergent otherwise. (Impulsive onsets
 *   read to a few hundredths of a second and emergent ones worse is common practice for local events.)
 * - Polarity (P only): the first swing is the run from the sample before the onset to the first turning
 *   point (a reversal larger than the noise RMS ends it), searched at most `polarityWindow` seconds.
 *   Positive or negative by the swing's sign when its size is at least `polarityNoise` times the noise
 *   RMS; undecidable when it is smaller (not clearly above noise) or no turning point is found.
 */
import type { SampleArray } from '../model';
import type { Micros } from '../time';
import { autocorrelationTime, jointAic, maedaAic, meanRms } from './aic';
import type { Pick, PickOnset, PickPolarity, Trace } from './types';

export interface OnsetOptions {
  /** P: AIC window start, seconds before the trigger time. */
  readonly before: number;
  /** P: AIC window end, seconds after the trigger time. */
  readonly after: number;
  /** SNR noise window, seconds before the pick. */
  readonly snrNoise: number;
  /** SNR signal window, seconds from the pick. */
  readonly snrSignal: number;
  /** AIC level above the minimum, per autocorrelation time, that bounds the uncertainty. */
  readonly aicLevel: number;
  readonly impulsiveSnr: number;
  /** Largest lower + upper uncertainty of an impulsive onset, seconds. */
  readonly impulsiveWidth: number;
  readonly questionableSnr: number;
  /** Smallest first swing, in noise RMS, that gives a polarity. */
  readonly polarityNoise: number;
  /** Longest search for the first swing's turning point, seconds. */
  readonly polarityWindow: number;
  /** P: the lower uncertainty adds this many times the first swing's length to the AIC width. */
  readonly riseP: number;
  /** S: the lower uncertainty adds this many times the first swing's length to the AIC width. */
  readonly riseS: number;
  /** P, slow onsets: the pick is set this many times the time to the swing's steepest step ahead of the AIC minimum. */
  readonly leadP: number;
  /** S, slow onsets: as leadP. */
  readonly leadS: number;
  /** Longest first swing measured for the uncertainty and the onset class, seconds. */
  readonly riseWindow: number;
}

/** Defaults for local earthquakes at 100-200 Hz (Daybreak's choices; see the module comment). */
export const LOCAL_EARTHQUAKE_ONSET: OnsetOptions = Object.freeze({
  before: 1.0,
  after: 0.5,
  snrNoise: 5,
  snrSignal: 1,
  aicLevel: 2,
  impulsiveSnr: 10,
  impulsiveWidth: 0.05,
  questionableSnr: 3,
  polarityNoise: 3,
  polarityWindow: 0.2,
  riseP: 1,
  riseS: 2,
  leadP: 1,
  leadS: 1.5,
  riseWindow: 1,
});

export interface SWindowOptions {
  readonly vpVsMin: number;
  readonly vpVsMax: number;
  /** Origin-time estimate (µs); gives the P travel time at this station. */
  readonly originTime?: Micros;
  /** Bounds on the P travel time at this station, seconds (used when no origin time is given). */
  readonly pTravelTime?: { readonly min: number; readonly max: number };
  /** Largest P travel time considered when neither of the above is given, seconds. */
  readonly maxPTravelTime: number;
}

/** Vp/Vs 1.5-2.0; P travel times up to 20 s (about 120 km at 6 km/s: a local network). */
export const LOCAL_EARTHQUAKE_S_WINDOW: SWindowOptions = Object.freeze({
  vpVsMin: 1.5,
  vpVsMax: 2.0,
  maxPTravelTime: 20,
});

function positive(name: string, v: number): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a finite number > 0, got ${v}`);
}

/** Options that may be 0 (0 turns the lead or the rise's share of the lower uncertainty off). */
const ZERO_ALLOWED: ReadonlySet<keyof OnsetOptions> = new Set(['riseP', 'riseS', 'leadP', 'leadS']);

export function resolveOnsetOptions(options: Partial<OnsetOptions> = {}): OnsetOptions {
  const o = { ...LOCAL_EARTHQUAKE_ONSET, ...options };
  for (const k of Object.keys(LOCAL_EARTHQUAKE_ONSET) as (keyof OnsetOptions)[]) {
    if (ZERO_ALLOWED.has(k)) {
      if (!(Number.isFinite(o[k]) && o[k] >= 0)) throw new RangeError(`${k} must be a finite number >= 0, got ${o[k]}`);
    } else positive(`${k}`, o[k]);
  }
  if (o.questionableSnr > o.impulsiveSnr) {
    throw new RangeError(`questionableSnr must be at most impulsiveSnr (${o.impulsiveSnr}), got ${o.questionableSnr}`);
  }
  return o;
}

function checkTrace(name: string, t: Trace): void {
  if (!t || typeof t !== 'object') throw new TypeError(`${name} must be a Trace, got ${String(t)}`);
  positive(`${name}.sampleRate (Hz)`, t.sampleRate);
  if (!Number.isSafeInteger(t.start)) throw new RangeError(`${name}.start must be integer microseconds, got ${t.start}`);
}

/** Sample index nearest to time t (may lie outside the trace). */
function indexAt(t: Trace, time: Micros): number {
  return Math.round(((time - t.start) * t.sampleRate) / 1e6);
}
function timeAt(t: Trace, i: number): Micros {
  return t.start + Math.round((i * 1e6) / t.sampleRate);
}

/** RMS below which a horizontal counts as dead beside the other one (in pickS; a ratio of RMS). */
const DEAD_RATIO = 1e-6;

/** RMS of x[from..to) about `base`. */
function rmsAbout(x: SampleArray, from: number, to: number, base: number): number {
  const n = to - from;
  if (n <= 0) return 0;
  let s = 0;
  for (let i = from; i < to; i++) {
    const v = x[i] - base;
    s += v * v;
  }
  return Math.sqrt(s / n);
}

/** Samples left and right of the minimum k whose AIC stays within `level` of it (contiguous). */
function minimumWidth(aic: Float64Array, k: number, level: number): [number, number] {
  const lim = aic[k] + level;
  let l = k;
  while (l > 0 && aic[l - 1] <= lim) l--;
  let r = k;
  while (r < aic.length - 1 && aic[r + 1] <= lim) r++;
  return [k - l, r - k];
}

interface Measured {
  readonly snr: number;
  readonly noiseMean: number;
  readonly noiseRms: number;
}

/** SNR of an onset at index k (see the module comment). */
function measureSnr(x: SampleArray, k: number, lowerSamples: number, fs: number, o: OnsetOptions): Measured {
  const noiseEnd = Math.max(0, k - lowerSamples);
  const noiseStart = Math.max(0, noiseEnd - Math.round(o.snrNoise * fs));
  const [noiseMean, noiseRms] = meanRms(x, noiseStart, noiseEnd);
  const sigEnd = Math.min(x.length, k + Math.max(1, Math.round(o.snrSignal * fs)));
  const sig = rmsAbout(x, k, sigEnd, noiseMean);
  const snr = noiseRms > 0 ? sig / noiseRms : (sig > 0 ? Infinity : 0);
  return { snr, noiseMean, noiseRms };
}

function classify(snr: number, width: number, rise: number, o: OnsetOptions): PickOnset {
  if (snr < o.questionableSnr) return 'questionable';
  if (snr >= o.impulsiveSnr && width <= o.impulsiveWidth && rise <= o.impulsiveWidth) return 'impulsive';
  return 'emergent';
}

/** The first swing of an onset: its direction (+1 up, -1 down, 0 none found), size and length. */
export interface FirstSwing {
  readonly direction: 1 | -1 | 0;
  /** Size of the swing from the sample before the onset to its extreme, in the trace's units. */
  readonly size: number;
  /** Samples from the onset to the swing's extreme (inclusive); `maxSamples` when none was found. */
  readonly samples: number;
  /**
   * Samples from the onset sample to the swing's steepest step (0: the step into the onset sample
   * itself is the steepest, a sudden onset); 0 when no swing was found.
   */
  readonly steepest: number;
}

/**
 * The first swing of an onset at index k of x: the run from the sample before the onset to the
 * first turning point, where the trace comes back by more than `noiseRms` from its extreme (see the
 * module comment), searched over at most `maxSamples` samples.
 */
export function firstSwing(x: SampleArray, k: number, noiseRms: number, maxSamples: number): FirstSwing {
  const none: FirstSwing = { direction: 0, size: 0, samples: maxSamples, steepest: 0 };
  if (k < 1 || k >= x.length || !(noiseRms > 0)) return none;
  const ref = x[k - 1];
  const end = Math.min(x.length, k + maxSamples);
  let hi = ref;
  let lo = ref;
  let hiAt = k;
  let loAt = k;
  for (let j = k; j < end; j++) {
    const v = x[j];
    // The swing has turned once the trace comes back by more than the noise RMS from its extreme.
    // The extremes are those before this sample: a record sampled coarsely can swing from the top
    // of the first motion past the reference in one step, and that step must end the first swing.
    if (hi - v > noiseRms && hi > ref && (hi - ref) >= (ref - lo)) return swingOf(x, k, 1, hi - ref, hiAt);
    if (v - lo > noiseRms && lo < ref && (ref - lo) > (hi - ref)) return swingOf(x, k, -1, ref - lo, loAt);
    if (v > hi) {
      hi = v;
      hiAt = j;
    }
    if (v < lo) {
      lo = v;
      loAt = j;
    }
  }
  return none;
}

/** A found first swing from onset sample k to its extreme at `extremeAt`, with its steepest step. */
function swingOf(x: SampleArray, k: number, direction: 1 | -1, size: number, extremeAt: number): FirstSwing {
  let steepest = 0;
  let best = -Infinity;
  for (let j = k; j <= extremeAt; j++) {
    const step = direction * (x[j] - x[j - 1]);
    if (step > best) {
      best = step;
      steepest = j - k;
    }
  }
  return { direction, size, samples: extremeAt - k + 1, steepest };
}

/**
 * The first swing's length and, for a slow onset (a swing longer than `impulsiveWidth`), the lead
 * that sets the pick ahead of the AIC minimum at index k (the module comment's rules), both seconds.
 */
function riseAndLead(x: SampleArray, k: number, noiseRms: number, fs: number, o: OnsetOptions, leadFactor: number): { rise: number; lead: number } {
  const swing = firstSwing(x, k, noiseRms, Math.max(1, Math.round(o.riseWindow * fs)));
  const rise = swing.samples / fs;
  return { rise, lead: rise > o.impulsiveWidth ? (leadFactor * swing.steepest) / fs : 0 };
}

/**
 * First-motion polarity of an onset at index k of x (see the module comment for the rule).
 * `noiseRms` is the RMS of the noise ahead of the onset.
 */
export function firstMotion(x: SampleArray, k: number, noiseRms: number, factor: number, maxSamples: number): PickPolarity {
  const s = firstSwing(x, k, noiseRms, maxSamples);
  if (s.direction === 0 || s.size < factor * noiseRms) return 'undecidable';
  return s.direction > 0 ? 'positive' : 'negative';
}

/**
 * P pick on a vertical near a trigger time (µs). Returns null when the trace holds too little data
 * around the trigger for an AIC window (fewer than 16 samples).
 */
export function pickP(trace: Trace, triggerTime: Micros, options: Partial<OnsetOptions> = {}): Pick | null {
  checkTrace('trace', trace);
  if (!Number.isSafeInteger(triggerTime)) throw new RangeError(`triggerTime must be integer microseconds, got ${triggerTime}`);
  const o = resolveOnsetOptions(options);
  const x = trace.samples;
  const fs = trace.sampleRate;
  const it = indexAt(trace, triggerTime);
  const from = Math.max(0, it - Math.round(o.before * fs));
  const to = Math.min(x.length, it + Math.round(o.after * fs) + 1);
  if (to - from < 16) return null;
  const res = maedaAic(x, from, to);
  const k = from + res.k;
  const tau = autocorrelationTime(x, from, Math.max(from, k - 1));
  const [left, right] = minimumWidth(res.aic, res.k, o.aicLevel * tau);
  const lower = Math.max(left, 1) / fs;
  const upper = Math.max(right, 1) / fs;
  const m = measureSnr(x, k, Math.max(left, 1), fs, o);
  const { rise, lead } = riseAndLead(x, k, m.noiseRms, fs, o, o.leadP);
  return {
    phaseHint: 'P',
    waveformId: trace.id,
    time: timeAt(trace, k) - Math.round(lead * 1e6),
    lowerUncertainty: lower + o.riseP * rise,
    upperUncertainty: upper + lead,
    snr: m.snr,
    onset: classify(m.snr, lower + upper, rise, o),
    polarity: firstMotion(x, k, m.noiseRms, o.polarityNoise, Math.max(2, Math.round(o.polarityWindow * fs))),
    evaluationMode: 'automatic',
    evaluationStatus: 'preliminary',
    questionableTiming: trace.questionableTiming === true,
  };
}

/** The S search range [from, to] in µs after a P pick at pTime (see the module comment). */
export function sWindow(pTime: Micros, options: Partial<SWindowOptions> = {}): { from: Micros; to: Micros } {
  const o = { ...LOCAL_EARTHQUAKE_S_WINDOW, ...options };
  positive('vpVsMin', o.vpVsMin);
  positive('vpVsMax', o.vpVsMax);
  if (!(o.vpVsMin > 1 && o.vpVsMax >= o.vpVsMin)) {
    throw new RangeError(`Vp/Vs bounds must satisfy 1 < vpVsMin <= vpVsMax, got ${o.vpVsMin}..${o.vpVsMax}`);
  }
  let tMin: number;
  let tMax: number;
  if (o.originTime !== undefined) {
    if (!Number.isSafeInteger(o.originTime)) throw new RangeError(`originTime must be integer microseconds, got ${o.originTime}`);
    if (o.originTime >= pTime) throw new RangeError(`originTime must precede the P pick (${pTime} µs), got ${o.originTime}`);
    tMin = tMax = (pTime - o.originTime) / 1e6;
  } else if (o.pTravelTime !== undefined) {
    tMin = o.pTravelTime.min;
    tMax = o.pTravelTime.max;
    if (!(Number.isFinite(tMin) && Number.isFinite(tMax) && tMin >= 0 && tMax > 0 && tMax >= tMin)) {
      throw new RangeError(`pTravelTime must satisfy 0 <= min <= max, max > 0 (s), got ${tMin}..${tMax}`);
    }
  } else {
    positive('maxPTravelTime (s)', o.maxPTravelTime);
    tMin = 0;
    tMax = o.maxPTravelTime;
  }
  return {
    from: pTime + Math.round((o.vpVsMin - 1) * tMin * 1e6),
    to: pTime + Math.round((o.vpVsMax - 1) * tMax * 1e6),
  };
}

/**
 * S pick on two horizontals (same sample rate) after a P pick at pTime (µs). Returns null when the
 * traces do not cover the S window or hold too little data there.
 */
export function pickS(
  north: Trace, east: Trace, pTime: Micros,
  window: Partial<SWindowOptions> = {}, options: Partial<OnsetOptions> = {},
): Pick | null {
  checkTrace('north', north);
  checkTrace('east', east);
  if (north.sampleRate !== east.sampleRate) {
    throw new RangeError(`horizontals must share a sample rate, got ${north.sampleRate} and ${east.sampleRate} Hz`);
  }
  if (!Number.isSafeInteger(pTime)) throw new RangeError(`pTime must be integer microseconds, got ${pTime}`);
  const o = resolveOnsetOptions(options);
  const w = sWindow(pTime, window);
  const fs = north.sampleRate;
  const span = (w.to - w.from) / 1e6;
  const margin = Math.max(0.25 * span, 0.1);
  // Window in north's indices; east's by the same times.
  const pIdx = indexAt(north, pTime);
  const searchFrom = Math.max(pIdx + 2, indexAt(north, w.from));
  const searchTo = indexAt(north, w.to);
  let from = Math.max(pIdx + 1, searchFrom - Math.round(margin * fs));
  let to = searchTo + Math.round(margin * fs) + 1;
  const shift = indexAt(east, timeAt(north, 0)); // east index of north's sample 0
  from = Math.max(from, 0, -shift);
  to = Math.min(to, north.samples.length, east.samples.length - shift);
  if (to - from < 16 || searchTo < from || searchFrom >= to) return null;
  // The onset precedes the largest horizontal amplitude: the AIC window ends just after it, so a
  // later drop of energy (a coda dying into noise) cannot pose as the change point.
  const sn = north.samples;
  const se = east.samples;
  let peak = Math.max(searchFrom, from);
  let peakEnergy = -1;
  for (let i = peak, last = Math.min(searchTo, to - 1); i <= last; i++) {
    const v = sn[i] * sn[i] + se[i + shift] * se[i + shift];
    if (v > peakEnergy) {
      peakEnergy = v;
      peak = i;
    }
  }
  to = Math.min(to, peak + Math.max(8, Math.round(0.1 * margin * fs)) + 1);
  if (to - from < 16) return null;
  const n = to - from;
  const xn = sn.subarray(from, to);
  const xe = se.subarray(from + shift, to + shift);
  // A dead horizontal (a digitiser stuck at one value) holds after filtering only the filter's dying
  // start-up, many orders of magnitude below the other: its variance still changes by orders of
  // magnitude along the window, which would pull the joint AIC, and its "SNR" means nothing. Such a
  // channel (RMS under DEAD_RATIO of the other's: our own rule) is left out of the AIC and never named.
  const rn = rmsAbout(xn, 0, n, 0);
  const re = rmsAbout(xe, 0, n, 0);
  const northDead = !(rn > DEAD_RATIO * re);
  const eastDead = !(re > DEAD_RATIO * rn);
  if (northDead && eastDead) return null;
  const live = northDead ? [xe] : eastDead ? [xn] : [xn, xe];
  const res = jointAic(live, 0, n);
  // Minimum restricted to the search range, up to the peak.
  let k = -1;
  let best = Infinity;
  const k0 = Math.max(2, searchFrom - from);
  const k1 = Math.min(n - 2, searchTo - from, peak - from);
  for (let j = k0; j <= k1; j++) {
    if (res.aic[j] < best) {
      best = res.aic[j];
      k = j;
    }
  }
  if (k < 0) return null;
  const tau = live.reduce((s, x) => s + autocorrelationTime(x, 0, Math.max(0, k - 1)), 0) / live.length;
  const [left, right] = minimumWidth(res.aic, k, o.aicLevel * tau);
  const lower = Math.max(left, 1) / fs;
  const upper = Math.max(right, 1) / fs;
  const mn = measureSnr(north.samples, from + k, Math.max(left, 1), fs, o);
  const me = measureSnr(east.samples, from + k + shift, Math.max(left, 1), fs, o);
  const useNorth = eastDead || (!northDead && mn.snr >= me.snr);
  const snr = useNorth ? mn.snr : me.snr;
  const trace = useNorth ? north : east;
  const { rise, lead } = riseAndLead(trace.samples, useNorth ? from + k : from + k + shift, useNorth ? mn.noiseRms : me.noiseRms, fs, o, o.leadS);
  return {
    phaseHint: 'S',
    waveformId: trace.id,
    time: timeAt(north, from + k) - Math.round(lead * 1e6),
    lowerUncertainty: lower + o.riseS * rise,
    upperUncertainty: upper + lead,
    snr,
    onset: classify(snr, lower + upper, rise, o),
    polarity: null,
    evaluationMode: 'automatic',
    evaluationStatus: 'preliminary',
    questionableTiming: north.questionableTiming === true || east.questionableTiming === true,
  };
}

/** One site's traces for picking: the vertical, and the two horizontals when the site has them. */
export interface StationTraces {
  readonly vertical: Trace;
  readonly horizontals?: readonly [Trace, Trace] | null;
}

/**
 * Picks one site from a trigger time (µs): P on the vertical, then S on the horizontals after that P
 * (a vertical-only site gets P only). Returns the picks made, [] when no P could be read.
 */
export function pickStation(
  traces: StationTraces, triggerTime: Micros,
  options: { readonly onset?: Partial<OnsetOptions>; readonly sWindow?: Partial<SWindowOptions> } = {},
): Pick[] {
  if (!traces || typeof traces !== 'object' || !traces.vertical) throw new TypeError('traces must hold at least a vertical Trace');
  const p = pickP(traces.vertical, triggerTime, options.onset);
  if (!p) return [];
  const h = traces.horizontals;
  if (!h) return [p];
  const s = pickS(h[0], h[1], p.time, options.sWindow, options.onset);
  return s ? [p, s] : [p];
}
