/**
 * A located hypocentre (core/location) as a QuakeML origin: time, position, depth with its type, the
 * 68 % epicentral ellipse (originUncertainty, confidenceLevel 68; horizontalUncertainty its
 * semi-major axis), quality (used phases and stations, RMS as standardError, azimuthal gap) and one
 * arrival per located pick. Shared by `daybreak scan` and the review desk's export.
 *
 * Depth: a depth held fixed in the location (GeigerOptions.fixedDepthKm, e.g. set by the analyst)
 * is written with depthType "operator assigned" and no depth uncertainty; a solved depth as "from
 * location". The origin's comment says how the uncertainties were obtained: from the pick
 * uncertainties alone, or widened by the a-posteriori variance factor (geiger.ts), with the factor,
 * its degrees of freedom and the a-priori semi-major axis, and whether the depth was held.
 */
import type { Hypocentre } from '../location/geiger';
import type { EvaluationMode, EvaluationStatus } from '../pick/types';
import type { QmlArrival, QmlOrigin } from './types';

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

export interface OriginLabels {
  /** Origin identifier (end of its publicID). */
  id: string;
  /** QuakeML pick id of the hypocentre's arrival number `pickIndex` (the locator's pick order). */
  pickIdOf: (pickIndex: number) => string;
  evaluationMode: EvaluationMode;
  evaluationStatus: EvaluationStatus;
  earthModelId?: string;
}

export function originFromHypocentre(h: Hypocentre, labels: OriginLabels): QmlOrigin | null {
  if (![h.latDeg, h.lonDeg, h.depthKm, h.rmsS].every(Number.isFinite)) return null;
  const arrivals: QmlArrival[] = h.arrivals.map((a) => ({
    pickId: labels.pickIdOf(a.pickIndex),
    phase: a.phase,
    distanceDeg: finiteOrNull(a.distanceDeg),
    azimuth: finiteOrNull(a.azimuthDeg),
    timeResidual: finiteOrNull(a.residualS),
    timeWeight: finiteOrNull(a.weight),
  }));
  const e = h.ellipse;
  const ellipseOk = Number.isFinite(e.semiMajorKm) && Number.isFinite(e.semiMinorKm) && Number.isFinite(e.majorAzimuthDeg);
  return {
    id: labels.id,
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
    evaluationMode: labels.evaluationMode,
    evaluationStatus: labels.evaluationStatus,
    methodId: 'geiger',
    earthModelId: labels.earthModelId,
    comment: originComment(h),
  };
}

/** How the origin's uncertainties came about, in words (QuakeML origin comment). */
export function originComment(h: Hypocentre): string {
  const parts: string[] = [];
  const vf = h.varianceFactor.toFixed(2);
  if (h.errorsScaled) {
    const aprioriM = (h.ellipse.semiMajorKm / h.errorScale) * 1000;
    parts.push(`uncertainties widened by ${h.errorScale.toFixed(2)}, the square root of the a-posteriori variance factor ${vf} `
      + `(chi-square of the weighted residuals over ${h.dof} degrees of freedom); the pick uncertainties alone give a `
      + `${aprioriM.toFixed(0)} m semi-major axis`);
  } else if (h.dof > 0) {
    parts.push(`uncertainties from the pick uncertainties as stated (a-posteriori variance factor ${vf} over ${h.dof} degrees of freedom, not above 1)`);
  } else {
    parts.push('uncertainties from the pick uncertainties as stated (no degrees of freedom left to estimate a variance factor)');
  }
  if (h.depthFixed) parts.push(`depth held fixed at ${(h.depthKm * 1000).toFixed(0)} m, not solved for`);
  return parts.join('; ');
}
