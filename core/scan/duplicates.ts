/**
 * Candidate events that are one event read twice. The network coincidence cuts an event into two
 * candidates when its triggers straggle (an event outside the network, whose sites trigger seconds
 * apart), when its S waves trigger the sites again (a regional event: Sn 25-30 s after Pn), or when
 * the sites far from a local event, whose P lies in the noise, trigger on its S after the near
 * sites' coincidence has closed (three such sites make a candidate of their own). The pickers then
 * read the same onsets, or onsets of the same wave train, for both: on the demo night four events
 * were listed twice, the second copy with a location residual RMS of 2.3-3.6 s.
 *
 * Of two candidates, the one whose preferred origin fits better (smaller standard error; a located
 * one before one that is not; then the one with more picks, then the earlier) is the better copy.
 * The two are one event read twice, and the better copy is kept and the other left out, when
 *  - at least half of either's picks (and two or more) lie within `sameSeconds` of a pick of the
 *    other at the same site, whatever their phases ('same picks'); or
 *  - at least half of the other copy's picks (and two or more) lie within `joinSeconds` of the P or
 *    the S time that the better copy's preferred origin predicts at their site (`predict`), whatever
 *    their phase hints (a "P" read on S is common at a site whose P lies in the noise), and that
 *    origin fits its own picks within `fitSeconds` (standard error), as a poor origin predicts
 *    nothing ('fits origin').
 * The copy left out may hold picks at sites or of phases the kept one lacks: each such pick joins
 * the kept copy when it lies within `joinSeconds` of the time the kept copy's origin predicts for
 * its phase at its site, and is named in the pick's comment; the kept origin is not recomputed (the
 * pick has no arrival in it).
 *
 * Daybreak's rule. The shared-pick test and its numbers (half, 0.15 s) were set by looking at the
 * demo night's first three pairs, whose shared picks lie within 0.00-0.11 s of each other. The
 * origin test came from looking at the fourth (00:31, whose second copy shares 2 of its 6 picks);
 * its numbers were taken from rules already there (half and two picks from the shared test, 0.5 s
 * from joining a pick, 0.5 s from the fit below which core/scan/reread.ts reads misfits again)
 * before measuring it, not tuned.
 */
import { stationKey, type ChannelId } from '../model';
import type { SiteLocation, VelocityModel } from '../location';
import type { QmlEvent } from '../quakeml';
import { preferredOrigin } from '../quakeml/preferred';
import type { Micros } from '../time';
import { originArrivals } from './reread';

/** Picks this close (s) at the same site are the same onset read twice. */
export const SAME_ONSET_S = 0.15;

/** Why a candidate was taken for another read twice: the same picks, or picks at the other's predicted times. */
export type DuplicateReason = 'same picks' | 'fits origin';

export interface DuplicateCheck {
  /** The candidates kept, in their order. */
  readonly kept: QmlEvent[];
  /** Each candidate left out, with the one it duplicates and why (module comment). */
  readonly dropped: { readonly id: string; readonly duplicateOf: string; readonly reason: DuplicateReason }[];
}

/** Share of a's picks (at least 2 of them) lying within `seconds` of a pick of b at the same site. */
function sharedShare(a: QmlEvent, b: QmlEvent, seconds: number): number {
  if (a.picks.length === 0) return 0;
  let shared = 0;
  for (const p of a.picks) {
    const site = stationKey(p.waveformId);
    if (b.picks.some((q) => stationKey(q.waveformId) === site && Math.abs(q.time - p.time) <= seconds * 1e6)) shared++;
  }
  return shared >= 2 ? shared / a.picks.length : 0;
}

/**
 * Share of a's picks (at least 2 of them) lying within `seconds` of the P or the S time b's preferred
 * origin predicts at their site, whatever their phase hints; 0 when b's origin does not fit its picks
 * within `fitSeconds` (standard error) or b is not located.
 */
function fitShare(a: QmlEvent, b: QmlEvent, predict: ArrivalPredictor, seconds: number, fitSeconds: number): number {
  if (a.picks.length === 0 || !(fit(b) <= fitSeconds)) return 0;
  let fitting = 0;
  for (const p of a.picks) {
    const t = predict(b, stationKey(p.waveformId));
    if (t && (Math.abs(p.time - t.P) <= seconds * 1e6 || Math.abs(p.time - t.S) <= seconds * 1e6)) fitting++;
  }
  return fitting >= 2 ? fitting / a.picks.length : 0;
}

/** Why candidate e and the better copy k are one event read twice (module comment), or null when they are not. */
function duplicateReason(
  e: QmlEvent, k: QmlEvent, predict: ArrivalPredictor | null, sameSeconds: number, joinSeconds: number, fitSeconds: number,
): DuplicateReason | null {
  if (sharedShare(e, k, sameSeconds) >= 0.5 || sharedShare(k, e, sameSeconds) >= 0.5) return 'same picks';
  if (predict && fitShare(e, k, predict, joinSeconds, fitSeconds) >= 0.5) return 'fits origin';
  return null;
}

/** The preferred origin's standard error, s; Infinity when not located. */
function fit(e: QmlEvent): number {
  const o = preferredOrigin(e);
  return o?.quality?.standardError ?? (o ? 1e6 : Infinity);
}

/** Whether a is the better copy of an event read twice (module comment). */
function better(a: QmlEvent, b: QmlEvent, order: ReadonlyMap<QmlEvent, number>): boolean {
  const fa = fit(a), fb = fit(b);
  if (fa !== fb) return fa < fb;
  if (a.picks.length !== b.picks.length) return a.picks.length > b.picks.length;
  return order.get(a)! < order.get(b)!;
}

/**
 * A pick of the copy left out this close (s) to the kept copy's predicted time joins it; as close to
 * the other's predicted P or S, it counts towards the origin test (module comment).
 */
export const JOIN_S = 0.5;

/**
 * Largest standard error (s) of an origin whose predicted times the origin test uses: the bound
 * below which core/scan/reread.ts reads misfits again (LOCAL_REREAD.maxRms).
 */
export const FIT_S = 0.5;

/** Predicted P and S times (µs) of an event's preferred origin at a site ("NET.STA"), or null. */
export type ArrivalPredictor = (e: QmlEvent, site: string) => { P: Micros; S: Micros } | null;

/** The predictor from each event's preferred origin, for sites at `locations`, in `model`. */
export function originPredictor(locations: ReadonlyMap<string, SiteLocation>, model: VelocityModel): ArrivalPredictor {
  return (e, site) => {
    const o = preferredOrigin(e);
    const loc = locations.get(site);
    if (!o || !loc) return null;
    const at = originArrivals(o, new Map([[site, loc]]), model).get(site);
    return at ? { P: at.p, S: at.s } : null;
  };
}

/**
 * Leaves out candidates that duplicate another, moving their fitting extra picks over (module comment).
 * `distinct`: pairs of candidates already told apart as two events (a first event located again
 * without the onsets of the event split from it, electron/host/cli/scan.ts), never compared.
 */
export function leaveOutDuplicates(
  events: readonly QmlEvent[], predict: ArrivalPredictor | null = null, sameSeconds = SAME_ONSET_S, joinSeconds = JOIN_S, fitSeconds = FIT_S,
  distinct: readonly (readonly [QmlEvent, QmlEvent])[] = [],
): DuplicateCheck {
  const apart = (a: QmlEvent, b: QmlEvent) => distinct.some(([x, y]) => (x === a && y === b) || (x === b && y === a));
  const order = new Map(events.map((e, i) => [e, i]));
  const out = new Set<QmlEvent>();
  const dropped: { id: string; duplicateOf: string; reason: DuplicateReason }[] = [];
  // Best copies first, so each is compared with the copies already kept.
  const ranked = [...events].sort((a, b) => (better(a, b, order) ? -1 : better(b, a, order) ? 1 : 0));
  const kept: QmlEvent[] = [];
  for (const e of ranked) {
    let twin: { k: QmlEvent; reason: DuplicateReason } | null = null;
    for (const k of kept) {
      if (apart(e, k)) continue;
      const reason = duplicateReason(e, k, predict, sameSeconds, joinSeconds, fitSeconds);
      if (reason) {
        twin = { k, reason };
        break;
      }
    }
    if (twin) {
      out.add(e);
      dropped.push({ id: e.id, duplicateOf: twin.k.id, reason: twin.reason });
      if (predict) joinPicks(twin.k, e, predict, joinSeconds);
    } else kept.push(e);
  }
  return { kept: events.filter((e) => !out.has(e)), dropped };
}

/** Moves the picks of `from` that `to` lacks (by site and phase) and that fit `to`'s origin over to `to`. */
function joinPicks(to: QmlEvent, from: QmlEvent, predict: ArrivalPredictor, joinSeconds: number): void {
  for (const p of from.picks) {
    const phase = p.phaseHint === 'S' ? 'S' : p.phaseHint === 'P' ? 'P' : null;
    if (!phase) continue;
    const site = stationKey(p.waveformId);
    if (to.picks.some((q) => q.phaseHint === phase && stationKey(q.waveformId) === site)) continue;
    const t = predict(to, site);
    if (!t || !(Math.abs(p.time - t[phase]) <= joinSeconds * 1e6)) continue;
    to.picks.push({ ...p, comment: `${p.comment ? `${p.comment}; ` : ''}from candidate ${from.id}, the same event read twice` });
  }
}

/**
 * The picks of a candidate found inside other events' coincidence window (core/pick
 * unexplainedTriggers) less those that are the other events' onsets: a pick lying within
 * `joinSeconds` of the P or the S time an earlier event's origin predicts at its site (`predict`),
 * whatever its phase hint, is that event's (the same bound by which a pick joins a kept copy
 * above). The second event's picker searches its sites from its own first P, and where the first
 * event's S or coda lies there it may read that instead.
 */
export function leaveOutOthersOnsets<T extends { readonly time: Micros; readonly waveformId: ChannelId }>(
  picks: readonly T[], others: readonly QmlEvent[], predict: ArrivalPredictor, joinSeconds = JOIN_S,
): T[] {
  if (!(joinSeconds >= 0 && Number.isFinite(joinSeconds))) throw new RangeError(`joinSeconds must be >= 0, got ${joinSeconds}`);
  const near = Math.round(joinSeconds * 1e6);
  return picks.filter((p) => !others.some((e) => {
    const t = predict(e, stationKey(p.waveformId));
    return t !== null && (Math.abs(p.time - t.P) <= near || Math.abs(p.time - t.S) <= near);
  }));
}
