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
import type { QmlArrival, QmlOrigin } from '../quakeml';

/** Where a site is: degrees north and east, metres above the model's datum (sea level). */
export interface SiteCoordinates {
  readonly latitude: number;
  readonly longitude: number;
  readonly elevationM: number;
}

export type OriginOutcome = { ok: true; origin: QmlOrigin } | { ok: false; message: string };

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

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
  const h = r.value;
  const values = [h.latDeg, h.lonDeg, h.depthKm, h.rmsS];
  if (!values.every(Number.isFinite)) return { ok: false, message: 'the solution has a coordinate that is not a number' };
  const arrivals: QmlArrival[] = h.arrivals.map((a) => ({
    pickId: pickIds[index[a.pickIndex]],
    phase: a.phase,
    distanceDeg: finiteOrNull(a.distanceDeg),
    azimuth: finiteOrNull(a.azimuthDeg),
    timeResidual: finiteOrNull(a.residualS),
    timeWeight: finiteOrNull(a.weight),
  }));
  const e = h.ellipse;
  const ellipseOk = Number.isFinite(e.semiMajorKm) && Number.isFinite(e.semiMinorKm) && Number.isFinite(e.majorAzimuthDeg);
  return {
    ok: true,
    origin: {
      id: `${eventId}.origin`,
      time: h.originTime,
      timeUncertainty: finiteOrNull(h.originTimeErrorS),
      latitude: h.latDeg,
      longitude: h.lonDeg,
      depthM: h.depthKm * 1000,
      depthUncertaintyM: h.depthFixed ? null : finiteOrNull(h.depthErrorKm * 1000),
      depthType: h.depthFixed ? 'operator assigned' : 'from location',
      ellipse: ellipseOk ? { semiMajorM: e.semiMajorKm * 1000, semiMinorM: e.semiMinorKm * 1000, azimuthMajor: e.majorAzimuthDeg } : null,
      horizontalUncertaintyM: ellipseOk ? e.semiMajorKm * 1000 : null,
      quality: { usedPhaseCount: h.phaseCount, usedStationCount: h.stationCount, standardError: h.rmsS, azimuthalGap: finiteOrNull(h.gapDeg) },
      arrivals,
      evaluationMode: 'automatic',
      evaluationStatus: 'preliminary',
      methodId: 'geiger',
      earthModelId: modelId,
    },
  };
}
