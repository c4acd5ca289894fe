/**
 * Candidate events that are one event read twice. The network coincidence cuts an event into two
 * candidates when its triggers straggle (an event outside the network, whose sites trigger seconds
 * apart), or when its S waves trigger the sites again (a regional event: Sn 25-30 s after Pn). The
 * pickers then read the same onsets for both: on the demo night three events were listed twice, the
 * second copy with a location residual RMS of 2.3-3.6 s.
 *
 * A candidate duplicates another when at least half of its picks (and two or more) lie within
 * `sameSeconds` of a pick of the other at the same site, whatever their phases. Of such a pair the
 * one whose preferred origin fits better (smaller standard error; a located one before one that is
 * not; then the one with more picks, then the earlier) is kept and the other left out. The copy left
 * out may hold picks at sites or of phases the kept one lacks: each such pick joins the kept copy
 * when it lies within `joinSeconds` of the time the kept copy's origin predicts for its phase at its
 * site (`predict`), and is named in the pick's comment; the kept origin is not recomputed (the pick
 * has no arrival in it). Daybreak's rule, with numbers set by looking at the demo night's three
 * pairs, whose shared picks lie within 0.00-0.11 s of each other.
 */
import { stationKey } from '../model';
import type { SiteLocation, VelocityModel } from '../location';
import type { QmlEvent, QmlOrigin } from '../quakeml';
import type { Micros } from '../time';
import { originArrivals } from './reread';

/** Picks this close (s) at the same site are the same onset read twice. */
export const SAME_ONSET_S = 0.15;

export interface DuplicateCheck {
  /** The candidates kept, in their order. */
  readonly kept: QmlEvent[];
  /** Each candidate left out, with the one it duplicates. */
  readonly dropped: { readonly id: string; readonly duplicateOf: string }[];
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

/** A pick of the copy left out this close (s) to the kept copy's predicted time joins it. */
export const JOIN_S = 0.5;

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

function preferredOrigin(e: QmlEvent): QmlOrigin | undefined {
  return e.origins.find((x) => x.id === e.preferredOriginId) ?? e.origins[0];
}

/** Leaves out candidates that duplicate another, moving their fitting extra picks over (module comment). */
export function leaveOutDuplicates(
  events: readonly QmlEvent[], predict: ArrivalPredictor | null = null, sameSeconds = SAME_ONSET_S, joinSeconds = JOIN_S,
): DuplicateCheck {
  const order = new Map(events.map((e, i) => [e, i]));
  const out = new Set<QmlEvent>();
  const dropped: { id: string; duplicateOf: string }[] = [];
  // Best copies first, so each is compared with the copies already kept.
  const ranked = [...events].sort((a, b) => (better(a, b, order) ? -1 : better(b, a, order) ? 1 : 0));
  const kept: QmlEvent[] = [];
  for (const e of ranked) {
    const twin = kept.find((k) => sharedShare(e, k, sameSeconds) >= 0.5 || sharedShare(k, e, sameSeconds) >= 0.5);
    if (twin) {
      out.add(e);
      dropped.push({ id: e.id, duplicateOf: twin.id });
      if (predict) joinPicks(twin, e, predict, joinSeconds);
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
