/**
 * A candidate that holds two events: the part one P wave front can hold, and the triggers after it.
 *
 * Two earthquakes seconds apart, the first the weaker, make one candidate: the coincidence's bound
 * (its slowest P velocity, 3 km/s, plus slack across the network) spans both, and the triggers of
 * both join it. Its origin then fits neither (a standard error of seconds), so `unexplainedTriggers`
 * (coincidence.ts), which needs an origin that predicts, has nothing to judge by. The stricter bound
 * within which two P onsets of one event agree - the sites' distance at the rays' slowest average P
 * speed plus slack, as the picker's network first P uses (eventSites.ts networkFirst, tooLateForP:
 * the difference of two hypocentral distances is at most the sites' distance) - tells the first
 * event's P wave front from what comes after it (Daybreak's rule; README, "Automatic locations"):
 *  - `earliestFront`: the member triggers taken in time order from the earliest, each kept when it
 *    agrees with every one kept so far. Picked and located alone, it may give the first event an
 *    origin that fits; the triggers that origin does not explain are then the second's.
 *  - `afterFront`: the candidate's other triggers (members outside the front and secondary ones)
 *    that come later than more than half of the front's triggers allow for a P: the later waves, S
 *    of the first event and P and S of the second, for the coincidence again when the front gives
 *    no origin that fits either.
 */
import { stationKey } from '../model';
import type { SitePosition } from './coincidence';
import { pSpread, tooLateForP } from './eventSites';
import type { CandidateEvent, StationTrigger } from './types';

function check(speed: number, slack: number): void {
  if (!(speed > 0 && Number.isFinite(speed))) throw new RangeError(`speed (km/s) must be > 0, got ${speed}`);
  if (!(slack >= 0 && Number.isFinite(slack))) throw new RangeError(`slack (s) must be >= 0, got ${slack}`);
}

/**
 * The candidate's member triggers that one P wave front can hold (module comment), as a candidate
 * with the same identifier and no secondary triggers; null when every member fits (nothing to
 * separate) or when the front holds fewer than `minSites` sites. Members of sites without a
 * position are left out.
 */
export function earliestFront(
  event: CandidateEvent, positions: ReadonlyMap<string, SitePosition>, speed: number, slack: number, minSites: number,
): CandidateEvent | null {
  check(speed, slack);
  const bound = { firstPSpeed: speed, slack };
  if (!Number.isInteger(minSites) || minSites < 1) throw new RangeError(`minSites must be an integer >= 1, got ${minSites}`);
  const list = event.triggers.filter((t) => positions.has(stationKey(t.id))).sort((a, b) => a.on - b.on);
  const kept: StationTrigger[] = [];
  for (const t of list) {
    const p = positions.get(stationKey(t.id))!;
    if (kept.some((k) => stationKey(k.id) === stationKey(t.id))) continue;
    if (kept.every((k) => Math.abs(t.on - k.on) <= pSpread(p, positions.get(stationKey(k.id))!, bound))) kept.push(t);
  }
  if (kept.length === event.triggers.length || new Set(kept.map((t) => stationKey(t.id))).size < minSites) return null;
  return {
    ...event,
    time: kept[0].on,
    start: Math.min(...kept.map((t) => t.start)),
    end: Math.max(...kept.map((t) => t.end)),
    sites: kept.map((t) => stationKey(t.id)),
    triggers: kept,
    secondary: [],
  };
}

/**
 * The triggers of `event` (members and secondary) outside `front` that come later than more than
 * half of the front's triggers allow for a P (eventSites.ts tooLateForP, with `speed` and `slack`). In time order. Triggers of sites without a
 * position are left out.
 */
export function afterFront(
  event: CandidateEvent, front: CandidateEvent, positions: ReadonlyMap<string, SitePosition>, speed: number, slack: number,
): StationTrigger[] {
  check(speed, slack);
  const inFront = new Set(front.triggers);
  const judges = front.triggers.filter((t) => positions.has(stationKey(t.id))).map((t) => ({ time: t.on, position: positions.get(stationKey(t.id))! }));
  return [...event.triggers, ...event.secondary]
    .filter((t) => {
      const p = positions.get(stationKey(t.id));
      return p !== undefined && !inFront.has(t) && tooLateForP({ time: t.on, position: p }, judges, { firstPSpeed: speed, slack });
    })
    .sort((a, b) => a.on - b.on);
}
