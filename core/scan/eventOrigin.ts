/**
 * An automatic origin for a candidate event: its picks located by Geiger's method (core/location)
 * and turned into a QuakeML origin with arrivals, uncertainty and quality (issue 6, Output).
 *
 * Each pick's 1-sigma timing uncertainty for the locator is the mean of its lower and upper
 * uncertainty (the picker's interval is asymmetric; the locator takes one sigma per pick), at least
 * one millisecond. Picks whose records flag questionable timing are passed on as such (the locator
 * down-weights them). Horizontal uncertainty is the 68 % ellipse's semi-major axis.
 *
 * Outliers: an automatic event often holds a pick read on noise or on the wrong phase, seconds off,
 * and least squares lets it pull the whole solution (on the generated nights of
 * test/bench/accuracy.bench.ts, one event in ten ended over 0.45 km from its true epicentre, several
 * with residual RMS near 1 s). So after each location the used pick with the largest residual in its
 * own sigmas is left out (kept in the event and reported with its residual, weight 0) and the event
 * located again, while that residual exceeds OUTLIER_SIGMAS and OUTLIER_SPREAD times the median of
 * the used picks' (or, for a pick whose record flags questionable timing, while its residual exceeds
 * FLAGGED_MISFIT_S), at most a third of the picks and never below MIN_PHASES + 1 used. Daybreak's rule
 * (leaving out the worst residual and locating again is common practice in automatic location; the
 * thresholds are ours, not tuned): on those nights the 90th percentile of the epicentral error fell
 * from 0.47 to 0.20 km and of the depth error from 0.99 to 0.24-0.33 km (README).
 */
import {
  locate, MIN_PHASES, QUESTIONABLE_FACTOR, type LocateResult, type LocationPick, type LocationStation, type SiteLocation, type VelocityModel,
} from '../location';
import type { Pick } from '../pick';
import { originFromHypocentre, type QmlOrigin } from '../quakeml';
import type { Micros } from '../time';
import { stationKey } from '../model';
import { LOCAL_REREAD } from './reread';

/** Where a site is: degrees north and east, metres above the model's datum (sea level). */
export interface SiteCoordinates {
  readonly latitude: number;
  readonly longitude: number;
  readonly elevationM: number;
}

/** A site as core/location's predictions take it. */
export function siteLocation(s: SiteCoordinates): SiteLocation {
  return { latitude: s.latitude, longitude: s.longitude, elevation: s.elevationM };
}

/** The locator's station for a site. */
function locationStation(key: string, s: SiteCoordinates): LocationStation {
  return { key, latDeg: s.latitude, lonDeg: s.longitude, elevKm: s.elevationM / 1000 };
}

export type OriginOutcome = { ok: true; origin: QmlOrigin } | { ok: false; message: string };

/**
 * Locates `picks` (with their QuakeML ids `pickIds`, same order) of event `eventId`. `sites` maps
 * "NET.STA" to coordinates; `modelId` names the model in earthModelID.
 */
export function eventOrigin(
  eventId: string, picks: readonly Pick[], pickIds: readonly string[], sites: ReadonlyMap<string, SiteCoordinates>,
  model: VelocityModel, modelId: string,
): OriginOutcome {
  if (picks.length !== pickIds.length) throw new RangeError(`pickIds must match picks one to one (${picks.length}), got ${pickIds.length}`);
  const stations: LocationStation[] = [];
  const locPicks: LocationPick[] = [];
  const index: number[] = [];
  picks.forEach((p, i) => {
    const key = stationKey(p.waveformId);
    const s = sites.get(key);
    if (!s) return;
    if (!stations.some((x) => x.key === key)) stations.push(locationStation(key, s));
    locPicks.push({
      stationKey: key, wave: p.phaseHint, time: p.time,
      uncertaintyS: Math.max(0.001, (p.lowerUncertainty + p.upperUncertainty) / 2),
      timingQuestionable: p.questionableTiming,
    });
    index.push(i);
  });
  type Attempt = LocateResult | { ok: false; message: string };
  const tryLocate = (list: readonly LocationPick[]): Attempt => {
    try {
      return locate(stations, list, { model });
    } catch (e) {
      return { ok: false, message: (e as Error).message };
    }
  };
  const usedCount = (list: readonly LocationPick[]) => list.filter((p) => p.use !== false).length;
  let picksNow: LocationPick[] = locPicks;
  let r = tryLocate(picksNow);
  // One wild pick can keep the solution from converging at all: then each pick is left out in turn,
  // and the best-fitting solution is kept when the pick left out is an outlier to it.
  if (!r.ok && usedCount(picksNow) - 1 >= MIN_PHASES + 1) {
    let best: { r: Attempt & { ok: true }; list: LocationPick[] } | null = null;
    for (let i = 0; i < picksNow.length; i++) {
      const list = picksNow.map((p, j) => (j === i ? { ...p, use: false } : p));
      const got = tryLocate(list);
      if (got.ok && outlierZ(got.value.arrivals, list, i) && (!best || got.value.rmsS < best.r.value.rmsS)) best = { r: got, list };
    }
    if (best) {
      r = best.r;
      picksNow = best.list;
    }
  }
  // Outliers (see the module comment): the worst pick is left out and the event located again.
  for (let dropped = 0; r.ok && dropped < Math.floor(picksNow.length / 3); dropped++) {
    const worst = worstOutlier(r.value.arrivals, picksNow);
    if (worst < 0 || usedCount(picksNow) - 1 < MIN_PHASES + 1) break;
    const next = picksNow.map((p, i) => (i === worst ? { ...p, use: false } : p));
    const again = tryLocate(next);
    if (!again.ok) break; // the picks left no longer fix the hypocentre: keep the last solution
    picksNow = next;
    r = again;
  }
  if (!r.ok) return { ok: false, message: r.message };
  const origin = originFromHypocentre(r.value, {
    id: `${eventId}.origin`, pickIdOf: (i) => pickIds[index[i]], evaluationMode: 'automatic', evaluationStatus: 'preliminary', earthModelId: modelId,
  });
  if (!origin) return { ok: false, message: 'the solution has a coordinate that is not a number' };
  const left = picksNow.map((p, i) => (p.use === false ? pickIds[index[i]] : null)).filter((id): id is string => id !== null);
  if (left.length) {
    origin.comment = `${origin.comment ? `${origin.comment}; ` : ''}${left.length} pick${left.length > 1 ? 's' : ''} left out as outlier${left.length > 1 ? 's' : ''} `
      + `(residual over ${OUTLIER_SIGMAS} sigma and ${OUTLIER_SPREAD} times the median, or over ${FLAGGED_MISFIT_S} s on a record with questionable timing), `
      + `kept as arrivals of weight 0: ${left.join(', ')}`;
  }
  return { ok: true, origin };
}

/** A used pick whose residual, in its own sigmas, exceeds this and OUTLIER_SPREAD times the median is an outlier. */
export const OUTLIER_SIGMAS = 5;
export const OUTLIER_SPREAD = 5;

/** The sigma the locator gives a pick (questionable timing widens it, core/location/geiger.ts). */
function sigmaOf(p: LocationPick): number {
  return p.uncertaintyS * (p.timingQuestionable ? QUESTIONABLE_FACTOR : 1);
}

type Residuals = readonly { pickIndex: number; used: boolean; residualS: number }[];

/** Each arrival's |residual| in its pick's sigmas (by pick index), and their median over the used picks. */
function residualSigmas(arrivals: Residuals, picks: readonly LocationPick[]): { z: Map<number, number>; median: number } {
  const z = new Map(arrivals.map((a) => [a.pickIndex, Math.abs(a.residualS) / sigmaOf(picks[a.pickIndex])]));
  const used = arrivals.filter((a) => a.used).map((a) => z.get(a.pickIndex)!).sort((x, y) => x - y);
  return { z, median: used.length ? used[used.length >> 1] : NaN };
}

/** Whether a residual of `z` sigmas is an outlier among residuals of median `median` sigmas (the module comment's rule). */
function isOutlier(z: number | undefined, median: number): boolean {
  return z !== undefined && z > OUTLIER_SIGMAS && z > OUTLIER_SPREAD * median;
}

/** Whether pick `i`'s residual is an outlier to the used picks'. */
function outlierZ(arrivals: Residuals, picks: readonly LocationPick[], i: number): boolean {
  const { z, median } = residualSigmas(arrivals, picks);
  return isOutlier(z.get(i), median);
}

/**
 * A used pick on a record that flags questionable timing is also left out when its residual exceeds
 * this, s, however wide its sigma: the down-weighting (sigma x QUESTIONABLE_FACTOR) allows for a clock
 * off by a fraction of a second, not for a wrong reading seconds off, which then sets the origin's RMS
 * alone. The number is core/scan/reread.ts's misfit bound (LOCAL_REREAD.misfitSeconds).
 */
export const FLAGGED_MISFIT_S = LOCAL_REREAD.misfitSeconds;

/**
 * Index of the used pick with the largest residual in its own sigmas among the outliers (the module
 * comment's rule, or a pick with questionable timing off by more than FLAGGED_MISFIT_S), else -1.
 */
function worstOutlier(arrivals: Residuals, picks: readonly LocationPick[]): number {
  const { z, median } = residualSigmas(arrivals, picks);
  let worst = -1;
  for (const a of arrivals) {
    if (!a.used) continue;
    const out = isOutlier(z.get(a.pickIndex), median) || (picks[a.pickIndex].timingQuestionable === true && Math.abs(a.residualS) > FLAGGED_MISFIT_S);
    if (out && (worst < 0 || z.get(a.pickIndex)! > z.get(worst)!)) worst = a.pickIndex;
  }
  return worst;
}

/** A least-squares plane wave through arrival times: t = t0 + sx x + sy y. */
export interface PlaneWaveFit {
  /** Time at the local origin, s (relative to the times given). */
  readonly t0: number;
  /** Slowness east and north, s/km. */
  readonly sx: number;
  readonly sy: number;
  /** Apparent velocity 1 / |s|, km/s (Infinity for a wave arriving everywhere at once). */
  readonly velocity: number;
  /** RMS residual, s. */
  readonly rmsS: number;
}

/**
 * Fits a plane wave to arrival times `t` (s) at flat positions `x` east, `y` north (km): ordinary least
 * squares for t0, sx, sy by the normal equations (3 x 3, Cramer's rule). Null with fewer than three
 * points or when the points lie on a line (no unique slowness).
 */
export function planeWaveFit(x: ArrayLike<number>, y: ArrayLike<number>, t: ArrayLike<number>): PlaneWaveFit | null {
  const n = t.length;
  if (x.length !== n || y.length !== n) throw new RangeError(`x, y and t must have the same length, got ${x.length}, ${y.length}, ${n}`);
  if (n < 3) return null;
  // Centred coordinates keep the normal equations well conditioned.
  let mx = 0, my = 0, mt = 0;
  for (let i = 0; i < n; i++) { mx += x[i]; my += y[i]; mt += t[i]; }
  mx /= n; my /= n; mt /= n;
  let sxx = 0, sxy = 0, syy = 0, sxt = 0, syt = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx, dy = y[i] - my, dt = t[i] - mt;
    sxx += dx * dx; sxy += dx * dy; syy += dy * dy; sxt += dx * dt; syt += dy * dt;
  }
  const det = sxx * syy - sxy * sxy;
  if (!(Math.abs(det) > 1e-9 * Math.max(1e-300, sxx * syy))) return null;
  const sx = (sxt * syy - syt * sxy) / det;
  const sy = (syt * sxx - sxt * sxy) / det;
  const t0 = mt - sx * mx - sy * my;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const r = t[i] - (t0 + sx * x[i] + sy * y[i]);
    ss += r * r;
  }
  const slow = Math.hypot(sx, sy);
  return { t0, sx, sy, velocity: slow > 0 ? 1 / slow : Infinity, rmsS: Math.sqrt(ss / n) };
}

/**
 * Apparent velocities (km/s) of a P plane wave that say "a source beyond the network": 5 km/s (crustal
 * P, Pg, near 6 km/s, arriving almost horizontally) to 10 km/s (Pn near 8 km/s; faster means steeper
 * incidence, i.e. a source below the network). Daybreak's choice from those common crustal values.
 */
export const DISTANT_APPARENT_VELOCITY: readonly [number, number] = [5, 10];

/**
 * Largest RMS misfit of that plane wave, s: a few times the P pick error on records like the demo's,
 * and well under the misfit of a source inside a network some tens of km across (Daybreak's choice).
 */
export const PLANE_RMS_S = 0.2;

/**
 * The earliest origin time an event's P picks allow, for widening the S window of distant events
 * (eventPicks.ts), or null when the picks give no reason to widen it. Two readings of the P picks of
 * the sites in `sites` (at least four):
 *
 * - A plane wave (planeWaveFit on the sites' positions projected onto a plane tangent at their mean,
 *   km): a source far beyond the network sends P across it as a nearly plane wave at a crustal or
 *   upper-mantle apparent velocity (DISTANT_APPARENT_VELOCITY). When the plane fits within
 *   PLANE_RMS_S, the source is taken as distant and its distance as unknown: the origin may be up to
 *   `maxPTravelTime` seconds before the first P. (A source inside the network gives a cone of
 *   arrival times, which no plane fits; one right below it gives an apparent velocity above 10 km/s.)
 * - Else a P-only location (Geiger, `model`): its origin time less a margin of max(2 s, 3 sigma, 20 %
 *   of the first P's travel time), never more than `maxPTravelTime` before the first P; where the
 *   free solution fails (depth not resolved), the depth is held at 10 km as is common practice. A
 *   location whose RMS residual exceeds 0.5 s (picks no source explains) gives null.
 *
 * (A P-only location of a distant source is weak: the plane wavefront leaves distance and origin time
 * traded off, and Geiger's iterations can settle near the network; hence the plane-wave test first.)
 */
export function earliestOriginFromP(
  pPicks: readonly { readonly pick: Pick }[], sites: ReadonlyMap<string, SiteCoordinates>, model: VelocityModel, maxPTravelTime: number,
): Micros | null {
  if (!(maxPTravelTime > 0 && Number.isFinite(maxPTravelTime))) throw new RangeError(`maxPTravelTime (s) must be > 0, got ${maxPTravelTime}`);
  const stations: LocationStation[] = [];
  const locPicks: LocationPick[] = [];
  for (const { pick: p } of pPicks) {
    if (p.phaseHint !== 'P') continue;
    const key = stationKey(p.waveformId);
    const s = sites.get(key);
    if (!s || stations.some((x) => x.key === key)) continue;
    stations.push(locationStation(key, s));
    locPicks.push({ stationKey: key, wave: 'P', time: p.time, uncertaintyS: Math.max(0.001, (p.lowerUncertainty + p.upperUncertainty) / 2) });
  }
  if (locPicks.length < MIN_PHASES) return null;
  const first = Math.min(...locPicks.map((p) => p.time));
  const limit = first - Math.round(maxPTravelTime * 1e6);
  let r;
  try {
    r = locate(stations, locPicks, { model });
    if (!r.ok && r.code !== 'too-few-phases') r = locate(stations, locPicks, { model, fixedDepthKm: 10 });
  } catch {
    r = null;
  }
  // Plane wave on a tangent plane (equirectangular about the mean position; ample over a network).
  const lat0 = stations.reduce((a, s) => a + s.latDeg, 0) / stations.length;
  const lon0 = stations.reduce((a, s) => a + s.lonDeg, 0) / stations.length;
  const kmPerDeg = (Math.PI / 180) * 6371.0;
  const plane = planeWaveFit(
    stations.map((s) => (s.lonDeg - lon0) * kmPerDeg * Math.cos((lat0 * Math.PI) / 180)),
    stations.map((s) => (s.latDeg - lat0) * kmPerDeg),
    locPicks.map((p) => (p.time - first) / 1e6),
  );
  const [vLo, vHi] = DISTANT_APPARENT_VELOCITY;
  if (plane && plane.rmsS <= PLANE_RMS_S && plane.velocity >= vLo && plane.velocity <= vHi) return limit;
  if (!r || !r.ok || !(r.value.rmsS <= 0.5)) return null;
  const t0 = r.value.originTime;
  const travel = Math.max(0, (first - t0) / 1e6);
  const sigma = Number.isFinite(r.value.originTimeErrorS) ? r.value.originTimeErrorS : 0;
  const margin = Math.max(2, 3 * sigma, 0.2 * travel);
  return Math.max(limit, t0 - Math.round(margin * 1e6));
}
