/**
 * Picks that a located event does not fit, read again where the location says their phase arrives.
 *
 * At a site whose P lies in the noise, the site's trigger (and so its "P" pick) often comes with S,
 * and the S window after that P then lands in the S coda: on the generated nights of
 * test/bench/accuracy.bench.ts about one pick in forty was 1-8 s off, most of them such pairs (a "P"
 * within 0.3 s of the true S, at a site whose true P had an SNR near 1). The location leaves them
 * out (eventOrigin.ts) but they stay in the event, where an analyst finds a P on the S wave. Once the
 * event is located from its other picks, each misfit is read again in a narrow window around the
 * arrival time its phase has at the site from the origin (`predictedArrivals`): P by the AIC on the
 * vertical, S by the joint AIC of the horizontals. The new reading replaces the misfit when it lies
 * within the window and its SNR reaches `minSnr`; otherwise the misfit is dropped (the P of such a
 * site lies in the noise, so nothing is read there rather than a wrong phase). Where the data do not
 * cover the window (a gap, the end of the files) the misfit stays as it is.
 *
 * A pick is a misfit when the location left it out as an outlier (arrival weight 0) or its residual
 * exceeds `misfitSeconds` and `misfitShare` of its travel time (model errors grow with distance).
 * Picks whose records flag questionable timing are not read again (their misfit may be the
 * clock's), nor are the picks of a site whose P and S are off by the same time within `sameOffset`
 * (a clock that the records do not flag), unless its P lies within the misfit bound of the
 * predicted S: a P read on S is off by the S-P time, and the S read after it, in a window that
 * follows the P, often by about as much. Nothing is read again unless the used picks fit the origin within `maxRms` (RMS
 * weighted by the arrivals' weights): a poor location predicts nothing. The window is `window`
 * seconds each side of the prediction, at most the misfit bound.
 *
 * The rule and its numbers are Daybreak's (re-reading onsets around a location's predicted times is
 * common practice in automatic processing). The numbers were set before measuring, not tuned; the
 * RMS gate became weighted after nights 101 and 202 (unweighted, S picks with seconds of
 * uncertainty blocked most events), the clock rule came after the demo night and its exception for
 * a P on S after the generated nights; that exception first reached `window` (0.5 s) from the
 * predicted S and was widened to the misfit bound after three sites of those nights whose P lay
 * 0.55-0.74 s after the true S (README, "Automatic locations", for the figures).
 */
import { predictedArrivals, type PredictedArrival, type SiteLocation, type VelocityModel } from '../location';
import { stationKey } from '../model';
import { pickP, pickS, type OnsetOptions, type Pick, type Trace } from '../pick';
import type { QmlOrigin } from '../quakeml';
import type { Micros } from '../time';

export interface RereadOptions {
  /** Residual, s, beyond which a used pick is a misfit (with `misfitShare`). */
  readonly misfitSeconds: number;
  /** Share of the phase's travel time beyond which a used pick is a misfit (with `misfitSeconds`). */
  readonly misfitShare: number;
  /** Largest RMS residual of the origin's used picks, s, for which misfits are read again. */
  readonly maxRms: number;
  /** Half-width of the window around the predicted time, s (at most the misfit bound). */
  readonly window: number;
  /** Smallest SNR of a reading that replaces a misfit. */
  readonly minSnr: number;
  /**
   * A site whose P and S residuals differ by at most this, s, while P's exceeds it, is taken to have
   * a clock error rather than wrong phases: its picks are kept as they are.
   */
  readonly sameOffset: number;
  /** Onset options of the pickers. */
  readonly onset: Partial<OnsetOptions>;
}

export const LOCAL_REREAD: RereadOptions = Object.freeze({
  misfitSeconds: 1,
  misfitShare: 0.05,
  maxRms: 0.5,
  window: 0.5,
  minSnr: 4,
  sameOffset: 0.2,
  onset: {},
});

/** A site's traces for reading again (filtered causally, as for picking), around a time. */
export interface RereadSite {
  readonly location: SiteLocation;
  readonly vertical: (around: Micros) => Trace | null;
  readonly horizontals: ((around: Micros) => readonly [Trace, Trace] | null) | null;
}

/** What happened to one misfit. */
export interface RereadChange {
  /** The misfit pick's id (as given in `pickIds`). */
  readonly id: string;
  readonly phase: 'P' | 'S';
  /** Its residual, s. */
  readonly residual: number;
  /** The new reading, or null when the misfit was dropped. */
  readonly pick: Pick | null;
}

export interface RereadResult {
  /** The event's picks with misfits replaced or dropped, in their order. */
  readonly picks: Pick[];
  readonly changes: RereadChange[];
}

/** Misfits of `picks` (QuakeML ids `pickIds`, same order) against `origin`, read again (module comment). */
export function rereadMisfits(
  picks: readonly Pick[], pickIds: readonly string[], origin: QmlOrigin, sites: ReadonlyMap<string, RereadSite>,
  model: VelocityModel, options: Partial<RereadOptions> = {},
): RereadResult {
  if (picks.length !== pickIds.length) throw new RangeError(`pickIds must match picks one to one (${picks.length}), got ${pickIds.length}`);
  const o = { ...LOCAL_REREAD, ...options };
  const unchanged: RereadResult = { picks: [...picks], changes: [] };
  // The used picks' RMS residual, weighted by the arrivals' weights (a pick the location barely
  // weighs, such as an S with seconds of uncertainty, does not make the fit look poor).
  let sw = 0;
  let swr = 0;
  for (const a of origin.arrivals) {
    if (a.timeResidual === null || !(a.timeWeight === null || a.timeWeight > 0)) continue;
    const w = a.timeWeight ?? 1;
    sw += w;
    swr += w * a.timeResidual ** 2;
  }
  if (!(sw > 0 && Math.sqrt(swr / sw) <= o.maxRms)) return unchanged;
  const locations = new Map<string, SiteLocation>();
  for (const [key, s] of sites) locations.set(key, s.location);
  const predicted = originArrivals(origin, locations, model);
  const arrivalOf = new Map(origin.arrivals.map((a) => [a.pickId, a]));
  // The misfit bound, s, of a phase predicted at `expected` (µs): misfitSeconds, or misfitShare of its travel time.
  const misfitBound = (expected: Micros) => Math.max(o.misfitSeconds, (o.misfitShare * (expected - origin.time)) / 1e6);
  // Sites whose P and S are off by the same time: a clock, not a wrong phase (module comment).
  // A "P" read on S, with the S after it read in the S coda, can be off by about the same time too
  // (the S window follows the P pick): a P that lies within the misfit bound of the predicted S (the
  // S wave's onset, or its first second when the trigger came late in it) is not a clock.
  const offsets = new Map<string, { P?: number; S?: number; onS?: boolean }>();
  picks.forEach((p, i) => {
    const r = arrivalOf.get(pickIds[i])?.timeResidual;
    if (r === null || r === undefined) return;
    const key = stationKey(p.waveformId);
    const pred = predicted.get(key);
    const onS = p.phaseHint !== 'S' && pred !== undefined
      && Math.abs(p.time - pred.s) <= misfitBound(pred.s) * 1e6;
    offsets.set(key, { ...offsets.get(key), [p.phaseHint === 'S' ? 'S' : 'P']: r, ...(onS ? { onS } : {}) });
  });
  const clockLike = new Set<string>();
  for (const [key, r] of offsets) {
    if (r.P !== undefined && r.S !== undefined && !r.onS && Math.abs(r.P - r.S) <= o.sameOffset && Math.abs(r.P) > o.sameOffset) clockLike.add(key);
  }
  const out: Pick[] = [];
  const changes: RereadChange[] = [];
  picks.forEach((p, i) => {
    const a = arrivalOf.get(pickIds[i]);
    const key = stationKey(p.waveformId);
    const pred = predicted.get(key);
    const site = sites.get(key);
    if (!a || a.timeResidual === null || !pred || !site) {
      out.push(p);
      return;
    }
    const phase = p.phaseHint === 'S' ? 'S' : 'P';
    if (p.questionableTiming || clockLike.has(key)) {
      out.push(p);
      return;
    }
    const expected = phase === 'P' ? pred.p : pred.s;
    const bound = misfitBound(expected);
    if (a.timeWeight !== 0 && Math.abs(a.timeResidual) <= bound) {
      out.push(p);
      return;
    }
    const w = Math.min(o.window, bound);
    const again = phase === 'P' ? readP(site, expected, w, o) : readS(site, pred, origin.time, w, o);
    if (again === undefined) {
      out.push(p); // no data around the predicted time: nothing to judge it by, so it stays
      return;
    }
    changes.push({ id: pickIds[i], phase, residual: a.timeResidual, pick: again });
    if (again) out.push(again);
  });
  return { picks: out, changes };
}

/** First P and S times a QuakeML origin predicts at each site (core/location predictedArrivals). */
export function originArrivals(origin: QmlOrigin, sites: ReadonlyMap<string, SiteLocation>, model: VelocityModel): Map<string, PredictedArrival> {
  return predictedArrivals({ originTime: origin.time, latDeg: origin.latitude, lonDeg: origin.longitude, depthKm: origin.depthM / 1000 }, sites, model);
}

/**
 * The reading when it lies within w of the expected time with an SNR of at least minSnr, else null;
 * undefined when the picker had too little data there.
 */
function within(p: Pick | null, expected: Micros, w: number, minSnr: number): Pick | null | undefined {
  if (!p) return undefined;
  return Math.abs(p.time - expected) <= w * 1e6 && p.snr >= minSnr ? p : null;
}

/** The trace covers [from, to] (µs). */
function covers(t: Trace, from: Micros, to: Micros): boolean {
  return t.start <= from && t.start + ((t.samples.length - 1) / t.sampleRate) * 1e6 >= to;
}

/**
 * P by the AIC on the vertical, from w + 0.5 s before the predicted time to w after it; undefined
 * when the data do not cover that window.
 */
function readP(site: RereadSite, expected: Micros, w: number, o: RereadOptions): Pick | null | undefined {
  const z = site.vertical(expected);
  if (!z || !covers(z, expected - Math.round((w + 0.5) * 1e6), expected + Math.round(w * 1e6))) return undefined;
  return within(pickP(z, expected, { ...o.onset, before: w + 0.5, after: w }), expected, w, o.minSnr);
}

/**
 * S by the joint AIC of the horizontals, searched within w of the predicted time (and after P);
 * undefined when the data do not cover that window.
 */
function readS(site: RereadSite, pred: PredictedArrival, originTime: Micros, w: number, o: RereadOptions): Pick | null | undefined {
  const h = site.horizontals?.(pred.s);
  if (!h || !covers(h[0], pred.s - Math.round(w * 1e6), pred.s + Math.round(w * 1e6))) return undefined;
  const tp = (pred.p - originTime) / 1e6;
  if (!(tp > 0)) return undefined;
  // pickS searches [P + (vpVsMin - 1)·tp, P + (vpVsMax - 1)·tp]: set to the predicted S ± w, after P.
  const from = Math.max((pred.s - pred.p) / 1e6 - w, 0.05);
  const to = Math.max((pred.s - pred.p) / 1e6 + w, from + 0.05);
  const s = pickS(h[0], h[1], pred.p, { vpVsMin: 1 + from / tp, vpVsMax: 1 + to / tp, pTravelTime: { min: tp, max: tp } }, o.onset);
  return within(s, pred.s, w, o.minSnr);
}
