/**
 * What Daybreak writes to and reads from QuakeML 1.2 (Basic Event Description): events with their
 * picks, and (from the location and magnitude work) origins with arrivals. Enumerations use the
 * QuakeML words.
 */
import type { ChannelId } from '../model';
import type { Micros } from '../time';
import type { EvaluationMode, EvaluationStatus, PickOnset, PickPolarity } from '../pick/types';

export interface QmlPick {
  /** Unique within the document; becomes the end of the pick's publicID. */
  id: string;
  waveformId: ChannelId;
  time: Micros;
  /** Seconds; null when not known. */
  lowerUncertainty: number | null;
  upperUncertainty: number | null;
  phaseHint: string;
  onset: PickOnset | null;
  polarity: PickPolarity | null;
  evaluationMode: EvaluationMode;
  evaluationStatus: EvaluationStatus;
  /** Free text, e.g. the picker's SNR. */
  comment?: string;
}

export interface QmlArrival {
  pickId: string;
  phase: string;
  /** Epicentral distance, degrees. */
  distanceDeg: number | null;
  /** Source-to-station azimuth, degrees from north. */
  azimuth: number | null;
  /** Observed minus computed, s. */
  timeResidual: number | null;
  timeWeight: number | null;
}

export interface QmlOrigin {
  id: string;
  time: Micros;
  timeUncertainty: number | null;
  latitude: number;
  longitude: number;
  /** Metres below the datum (negative above it), as QuakeML's depth. */
  depthM: number;
  depthUncertaintyM: number | null;
  depthType: 'from location' | 'operator assigned' | null;
  /** 68 % confidence ellipse, metres. */
  ellipse: { semiMajorM: number; semiMinorM: number; azimuthMajor: number } | null;
  horizontalUncertaintyM: number | null;
  quality: { usedPhaseCount: number; usedStationCount: number; standardError: number; azimuthalGap: number | null } | null;
  arrivals: QmlArrival[];
  evaluationMode: EvaluationMode;
  evaluationStatus: EvaluationStatus;
  methodId?: string;
  earthModelId?: string;
}

export interface QmlEvent {
  /** Unique within the document and stable across runs; becomes the end of the event's publicID. */
  id: string;
  type: string | null;
  typeCertainty: 'known' | 'suspected' | null;
  description?: string;
  comment?: string;
  picks: QmlPick[];
  origins: QmlOrigin[];
  preferredOriginId: string | null;
}

export interface QmlDocument {
  events: QmlEvent[];
}
