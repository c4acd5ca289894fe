/**
 * An automatic origin for a candidate event: its picks located by Geiger's method (core/location)
 * and turned into a QuakeML origin with arrivals, uncertainty and quality (issue 6, Output).
 *
 * Each pick's 1-sigma timing uncertainty for the locator is the mean of its lower and upper
 * uncertainty (the picker's interval is asymmetric; the locator takes one sigma per pick), at least
 * one millisecond. Picks whose records flag questionable timing are passed on as such (the locator
 * down-weights them). Horizontal uncertainty is the 68 % ellipse's semi-major axis.
 */
import { locate, MIN_PHASES, type LocationPick, type LocationStation, type VelocityModel } from '../location';
import type { Pick } from '../pick';
import { originFromHypocentre, type QmlOrigin } from '../quakeml';
import type { Micros } from '../time';

/** Where a site is: degrees north and east, metres above the model's datum (sea level). */
export interface SiteCoordinates {
  readonly latitude: number;
  readonly longitude: number;
  readonly elevationM: number;
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
    const key = `${p.waveformId.network}.${p.waveformId.station}`;
    const s = sites.get(key);
    if (!s) return;
    if (!stations.some((x) => x.key === key)) stations.push({ key, latDeg: s.latitude, lonDeg: s.longitude, elevKm: s.elevationM / 1000 });
    locPicks.push({
      stationKey: key, wave: p.phaseHint, time: p.time,
      uncertaintyS: Math.max(0.001, (p.lowerUncertainty + p.upperUncertainty) / 2),
      timingQuestionable: p.questionableTiming,
    });
    index.push(i);
  });
  let r;
  try {
    r = locate(stations, locPicks, { model });
  } catch (e) {
    return { ok: false, message: (e as Error).message };
  }
  if (!r.ok) return { ok: false, message: r.message };
  const origin = originFromHypocentre(r.value, {
    id: `${eventId}.origin`, pickIdOf: (i) => pickIds[index[i]], evaluationMode: 'automatic', evaluationStatus: 'preliminary', earthModelId: modelId,
  });
  return origin ? { ok: true, origin } : { ok: false, message: 'the solution has a coordinate that is not a number' };
}

/**
 * The earliest origin time an event's P picks allow, for widening the S window of distant events
 * (eventPicks.ts): a P-only location (Geiger, `model`) of the picks whose sites are in `sites`; its
 * origin time less a margin of max(2 s, 3 sigma, 20 % of the first P's travel time), never more than
 * `maxPTravelTime` seconds before the first P. Where the depth is not resolved (the P picks of a
 * distant source sweep the network as one plane wave: an ill-conditioned solution) the depth is held
 * at 10 km; such a solution's origin time is poorly known, so its 3-sigma margin usually reaches the
 * `maxPTravelTime` limit. Null when fewer than four sites have a P (no location) or the location
 * fails or fits badly (RMS residual over 0.5 s: picks that no source explains).
 */
export function earliestOriginFromP(
  pPicks: readonly { readonly pick: Pick }[], sites: ReadonlyMap<string, SiteCoordinates>, model: VelocityModel, maxPTravelTime: number,
): Micros | null {
  if (!(maxPTravelTime > 0 && Number.isFinite(maxPTravelTime))) throw new RangeError(`maxPTravelTime (s) must be > 0, got ${maxPTravelTime}`);
  const stations: LocationStation[] = [];
  const locPicks: LocationPick[] = [];
  for (const { pick: p } of pPicks) {
    if (p.phaseHint !== 'P') continue;
    const key = `${p.waveformId.network}.${p.waveformId.station}`;
    const s = sites.get(key);
    if (!s || stations.some((x) => x.key === key)) continue;
    stations.push({ key, latDeg: s.latitude, lonDeg: s.longitude, elevKm: s.elevationM / 1000 });
    locPicks.push({ stationKey: key, wave: 'P', time: p.time, uncertaintyS: Math.max(0.001, (p.lowerUncertainty + p.upperUncertainty) / 2) });
  }
  if (locPicks.length < MIN_PHASES) return null;
  const first = Math.min(...locPicks.map((p) => p.time));
  let r;
  try {
    r = locate(stations, locPicks, { model });
    // A source far outside the network leaves its depth unresolved (P arrives as one plane wave):
    // hold it at 10 km, as is common practice for an unresolved depth.
    if (!r.ok && r.code === 'ill-conditioned') r = locate(stations, locPicks, { model, fixedDepthKm: 10 });
  } catch {
    return null;
  }
  if (!r.ok || !(r.value.rmsS <= 0.5)) return null;
  const t0 = r.value.originTime;
  const travel = Math.max(0, (first - t0) / 1e6);
  const sigma = Number.isFinite(r.value.originTimeErrorS) ? r.value.originTimeErrorS : 0;
  const margin = Math.max(2, 3 * sigma, 0.2 * travel);
  return Math.max(first - Math.round(maxPTravelTime * 1e6), t0 - Math.round(margin * 1e6));
}
