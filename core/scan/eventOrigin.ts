/**
 * An automatic origin for a candidate event: its picks located by Geiger's method (core/location)
 * and turned into a QuakeML origin with arrivals, uncertainty and quality (issue 6, Output).
 *
 * Each pick's 1-sigma timing uncertainty for the locator is the mean of its lower and upper
 * uncertainty (the picker's interval is asymmetric; the locator takes one sigma per pick), at least
 * one millisecond. Picks whose records flag questionable timing are passed on as such (the locator
 * down-weights them). Horizontal uncertainty is the 68 % ellipse's semi-major axis.
 */
import { locate, type LocationPick, type LocationStation, type VelocityModel } from '../location';
import type { Pick } from '../pick';
import { originFromHypocentre, type QmlOrigin } from '../quakeml';

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
