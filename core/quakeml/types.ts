/**
 * What Daybreak writes to and reads from QuakeML 1.2 (Basic Event Description): events with their
 * picks, and (from the location and magnitude work) origins with arrivals. Enumerations use the
 * QuakeML words. Amplitudes, station magnitudes and magnitudes follow the BED's Amplitude,
 * StationMagnitude and Magnitude classes.
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
  /** Free text written as the origin's comment (e.g. how its uncertainties were obtained). */
  comment?: string;
}

/** QuakeML Amplitude: a measured amplitude (e.g. the Wood-Anderson peak for a local magnitude). */
export interface QmlAmplitude {
  id: string;
  /** genericAmplitude value in `unit` (Daybreak writes metres). */
  value: number;
  /** Amplitude type, e.g. "IAML" (IASPEI 2013 name of the Wood-Anderson amplitude for ML). */
  type: string;
  /** QuakeML AmplitudeUnit: "m", "s", "m/s", "m/(s*s)", "m*s", "dimensionless" or "other". */
  unit: 'm' | 's' | 'm/s' | 'm/(s*s)' | 'm*s' | 'dimensionless' | 'other';
  /** Dominant period, s, or null. */
  periodS: number | null;
  /** Signal-to-noise ratio, or null. */
  snr: number | null;
  /** Window of the measurement: reference time (µs) and seconds before (begin ≥ 0) and after (end ≥ 0) it. */
  timeWindow: { reference: Micros; beginS: number; endS: number } | null;
  /** Time of the peak, µs (written as scalingTime), or null. */
  time: Micros | null;
  waveformId: ChannelId | null;
  /** Local id of the pick the amplitude belongs to, or null. */
  pickId: string | null;
  /** Magnitude type the amplitude is meant for, e.g. "ML". */
  magnitudeHint: string | null;
  methodId?: string;
  evaluationMode: EvaluationMode;
  evaluationStatus: EvaluationStatus;
}

/** QuakeML StationMagnitude. */
export interface QmlStationMagnitude {
  id: string;
  /** Local id of the origin it was computed for, or null. */
  originId: string | null;
  mag: number;
  type: string;
  /** Local id of the amplitude it was computed from, or null. */
  amplitudeId: string | null;
  methodId?: string;
  waveformId: ChannelId | null;
}

/** One QuakeML StationMagnitudeContribution. */
export interface QmlStationMagnitudeContribution {
  stationMagnitudeId: string;
  /** Station magnitude minus network magnitude, magnitude units, or null. */
  residual: number | null;
  /** Weight in the network value, 0 to 1, or null. */
  weight: number | null;
}

/** QuakeML Magnitude: the event's network magnitude. */
export interface QmlMagnitude {
  id: string;
  mag: number;
  /** Magnitude uncertainty (Daybreak: the network spread), magnitude units, or null. */
  uncertainty: number | null;
  type: string;
  originId: string | null;
  methodId?: string;
  stationCount: number | null;
  azimuthalGap: number | null;
  contributions: QmlStationMagnitudeContribution[];
  evaluationMode: EvaluationMode | null;
  evaluationStatus: EvaluationStatus | null;
  comment?: string;
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
  /** Magnitudes, station magnitudes and amplitudes; absent means none. */
  magnitudes?: QmlMagnitude[];
  stationMagnitudes?: QmlStationMagnitude[];
  amplitudes?: QmlAmplitude[];
  /** Local id of the preferred magnitude, or null / absent. */
  preferredMagnitudeId?: string | null;
}

export interface QmlDocument {
  events: QmlEvent[];
}
