/**
 * Station metadata as read from FDSN StationXML (schema versions 1.0, 1.1 and 1.2; namespace
 * http://www.fdsn.org/xml/station/1). Element names in the comments are the schema's.
 *
 * Units: angles in degrees, distances in metres, frequencies in Hz, sample rates in samples per
 * second, times in integer microseconds since the epoch (core/time.ts).
 */
import type { ChannelId } from '../model';
import type { Micros } from '../time';

/** A complex number: a pole or zero (`Real`, `Imaginary`). */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** `PzTransferFunctionType` values allowed by the schema. */
export type PzTransferFunction = 'LAPLACE (RADIANS/SECOND)' | 'LAPLACE (HERTZ)' | 'DIGITAL (Z-TRANSFORM)';

/** `CfTransferFunctionType` values allowed by the schema. */
export type CfTransferFunction = 'ANALOG (RADIANS/SECOND)' | 'ANALOG (HERTZ)' | 'DIGITAL';

/** A `PolesZeros` stage filter. */
export interface PolesZerosFilter {
  readonly kind: 'polesZeros';
  readonly transferFunction: PzTransferFunction;
  /** `NormalizationFactor` (A0): scales the poles-and-zeros ratio to 1 at the normalization frequency. */
  readonly normalizationFactor: number;
  /** `NormalizationFrequency`, Hz. */
  readonly normalizationFrequency: number;
  /** `Zero` elements in document order (rad/s or Hz as `transferFunction` says). */
  readonly zeros: readonly Complex[];
  /** `Pole` elements in document order. */
  readonly poles: readonly Complex[];
}

/** A `Coefficients` stage filter (numerator and denominator of a rational transfer function). */
export interface CoefficientsFilter {
  readonly kind: 'coefficients';
  readonly transferFunction: CfTransferFunction;
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
}

/** A `FIR` stage filter. With symmetry EVEN or ODD only the first half of the coefficients is stored (as in the file). */
export interface FirFilter {
  readonly kind: 'fir';
  readonly symmetry: 'NONE' | 'EVEN' | 'ODD';
  readonly coefficients: readonly number[];
}

/** A `ResponseList` stage filter: amplitude (dimensionless gain) and phase (degrees) at given frequencies (Hz). */
export interface ResponseListFilter {
  readonly kind: 'responseList';
  readonly points: readonly { readonly frequency: number; readonly amplitude: number; readonly phase: number }[];
}

/** A `Polynomial` stage: Maclaurin coefficients only (non-linear sensors; not used by seismic channels). */
export interface PolynomialFilter {
  readonly kind: 'polynomial';
  readonly coefficients: readonly number[];
}

export type StageFilter = PolesZerosFilter | CoefficientsFilter | FirFilter | ResponseListFilter | PolynomialFilter;

/** `Decimation`: input rate in Hz, factor and offset in samples, delay and correction in seconds. */
export interface Decimation {
  readonly inputSampleRate: number;
  readonly factor: number;
  readonly offset: number;
  readonly delay: number;
  readonly correction: number;
}

/** `StageGain` (or any `GainType`): gain `value` (output units per input unit) valid at `frequency` Hz. */
export interface Gain {
  readonly value: number;
  readonly frequency: number;
}

/** One `Stage` of a channel's `Response`, in stage-number order. */
export interface ResponseStage {
  /** The `number` attribute (1 is the sensor). */
  readonly number: number;
  /** The filter's `InputUnits`/`Name` (e.g. "m/s", "V", "count"), or null for a gain-only stage. */
  readonly inputUnits: string | null;
  /** The filter's `OutputUnits`/`Name`, or null for a gain-only stage. */
  readonly outputUnits: string | null;
  /** The stage's filter, or null when the stage has only a gain. */
  readonly filter: StageFilter | null;
  readonly decimation: Decimation | null;
  /** `StageGain`; null when absent (allowed for Polynomial stages). */
  readonly gain: Gain | null;
}

/** `InstrumentSensitivity`: the whole channel's gain from input units to counts at one frequency. */
export interface Sensitivity {
  /** `Value`, output units per input unit (counts per m/s for a velocity sensor). Negative when the polarity is reversed. */
  readonly value: number;
  /** `Frequency`, Hz. */
  readonly frequency: number;
  /** `InputUnits`/`Name`: ground motion units, e.g. "m/s" or "M/S". */
  readonly inputUnits: string;
  /** `OutputUnits`/`Name`: usually "count" or "COUNTS". */
  readonly outputUnits: string;
  /** Sign of `value`: -1 means the channel records ground motion with reversed polarity. */
  readonly sign: 1 | -1;
}

/** One epoch of one channel. */
export interface ChannelMeta {
  readonly id: ChannelId;
  /** `startDate`; null when the file gives none (then the epoch is taken as open towards the past). */
  readonly start: Micros | null;
  /** `endDate`; null when open (absent, or a placeholder after the year 2200). */
  readonly end: Micros | null;
  /** Degrees north (WGS84 unless the file says otherwise). */
  readonly latitude: number;
  /** Degrees east. */
  readonly longitude: number;
  /** Sensor elevation, metres above sea level. */
  readonly elevation: number;
  /** Sensor depth below the local ground surface, metres. */
  readonly depth: number;
  /** Degrees clockwise from true north, in [0, 360); null when the file gives none. */
  readonly azimuth: number | null;
  /** Degrees down from horizontal in [-90, 90] (-90 is up, the usual vertical); null when the file gives none. */
  readonly dip: number | null;
  /** Samples per second; null when the file gives none. */
  readonly sampleRate: number | null;
  /** `Sensor`/`Description` (or `Model`), when given. */
  readonly sensor?: string;
  readonly sensitivity?: Sensitivity;
  /** Response stages in document order; empty when the file has none. */
  readonly stages: readonly ResponseStage[];
}

export interface StationMeta {
  readonly code: string;
  readonly start: Micros | null;
  readonly end: Micros | null;
  /** Degrees north. */
  readonly latitude: number;
  /** Degrees east. */
  readonly longitude: number;
  /** Metres above sea level. */
  readonly elevation: number;
  /** `Site`/`Name`. */
  readonly site?: string;
  readonly channels: readonly ChannelMeta[];
}

export interface NetworkMeta {
  readonly code: string;
  readonly description?: string;
  readonly start: Micros | null;
  readonly end: Micros | null;
  readonly stations: readonly StationMeta[];
}

/** A whole StationXML document. */
export interface Inventory {
  /** The root's `schemaVersion` attribute as written ("1.0", "1.1", "1.2"), or null when missing. */
  readonly schemaVersion: string | null;
  readonly source?: string;
  readonly sender?: string;
  readonly module?: string;
  /** `Created`, or null when absent. */
  readonly created: Micros | null;
  readonly networks: readonly NetworkMeta[];
}

/**
 * A StationXML document that cannot be read. The message names the file, the line (when known) and
 * the XML path of the element, e.g.
 * `inv.xml line 40: /FDSNStationXML/Network[XX]/Station[ABC]/Channel[00.HHZ]/Azimuth: not a number: "x"`.
 */
export class StationXmlError extends Error {
  override readonly name = 'StationXmlError';
  constructor(
    /** The file name given to the reader. */
    readonly file: string,
    /** 1-based line of the element (or of its nearest enclosing element), or null when unknown. */
    readonly line: number | null,
    /** XML path of the element, with codes in brackets. */
    readonly path: string,
    readonly reason: string,
  ) {
    super(`${file}${line === null ? '' : ` line ${line}`}: ${path}: ${reason}`);
  }
}
