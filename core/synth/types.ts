/**
 * What a synthetic scenario is made of: a network of stations and channels, a velocity model, the
 * events and the faults of the recording. Everything the generator draws is fixed by these values and
 * the seed, so a scenario always produces the same bytes.
 */
import type { VelocityModel } from '../location/velocityModel';
import type { Micros } from '../time';
import type { Mechanism } from './radiation';
import type { Instrument } from './response';

export interface ChannelSpec {
  /** SEED location code ('' allowed). */
  readonly location: string;
  /** SEED channel code, e.g. 'HHZ'. */
  readonly code: string;
  /** Degrees clockwise from north (SEED/StationXML convention). */
  readonly azimuth: number;
  /** Degrees down from horizontal; -90 is up. */
  readonly dip: number;
  /** Samples per second. */
  readonly sampleRate: number;
  readonly instrument: Instrument;
}

export interface StationNoise {
  /** RMS ground velocity of the site band (0.5-15 Hz) in the quiet of the night, m/s. */
  readonly siteMs: number;
  /** How much of the scenario's evening rise this site gets: 0 none, 1 all of it (urban sites more). */
  readonly eveningWeight: number;
  /** RMS ground velocity of the microseism, m/s. */
  readonly microseismMs: number;
  /** Upper corner of the site band, Hz (lower is 0.5 Hz). */
  readonly siteTopHz: number;
}

export interface StationSpec {
  readonly code: string;
  /** Site name (invented). */
  readonly site: string;
  /** Degrees north. */
  readonly latitude: number;
  /** Degrees east. */
  readonly longitude: number;
  /** Metres above sea level (the velocity model's datum). */
  readonly elevationM: number;
  readonly channels: readonly ChannelSpec[];
  readonly noise: StationNoise;
  /** Site attenuation κ0, s (Anderson & Hough 1984). */
  readonly kappaS: number;
  /** Station amplitude term, log10 units, applied to every amplitude at this station (0: none). */
  readonly amplitudeTermLog10: number;
}

export type EventType = 'earthquake' | 'explosion';

export interface EventSpec {
  /** Identifier, unique in the scenario. */
  readonly id: string;
  /** QuakeML event type: 'earthquake' or 'explosion'. */
  readonly type: EventType;
  /** Origin time, µs. */
  readonly origin: Micros;
  readonly latitude: number;
  readonly longitude: number;
  /** Km below the model's datum (sea level). */
  readonly depthKm: number;
  /** Local magnitude ML (the amplitudes follow the scenario's ML law). */
  readonly magnitude: number;
  /** Double couple for earthquakes; null for explosions. */
  readonly mechanism: Mechanism | null;
  /** Why the event is there (e.g. "regional, beyond the network"). */
  readonly note?: string;
}

/** A fault of the recording. Channel keys are "NET.STA.LOC.CHA". */
export type FaultSpec =
  | { readonly kind: 'spike'; readonly channel: string; readonly time: Micros; readonly counts: number }
  | { readonly kind: 'culturalBurst'; readonly station: string; readonly start: Micros; readonly end: Micros; readonly velocityMs: number; readonly toneHz: number }
  | { readonly kind: 'gap'; readonly station: string; readonly start: Micros; readonly end: Micros }
  | { readonly kind: 'duplicateRecords'; readonly station: string; readonly start: Micros; readonly end: Micros }
  | { readonly kind: 'deadChannel'; readonly channel: string; readonly value: number }
  | { readonly kind: 'reversedPolarity'; readonly channel: string }
  | { readonly kind: 'clockOffset'; readonly station: string; readonly start: Micros; readonly end: Micros; readonly offsetMicros: number; readonly timingQuality: number };

export interface Attenuation {
  /** Quality factors of P and S along the path (frequency independent). */
  readonly qP: number;
  readonly qS: number;
  /** Coda Q: Qc(f) = q0 · f^eta (Aki & Chouet 1975 single back-scattering). */
  readonly codaQ0: number;
  readonly codaEta: number;
}

export interface Scenario {
  readonly name: string;
  readonly seed: number;
  readonly network: { readonly code: string; readonly description: string };
  /** First and one-past-last sample time of the recording, µs. */
  readonly start: Micros;
  readonly end: Micros;
  readonly model: VelocityModel;
  readonly stations: readonly StationSpec[];
  readonly events: readonly EventSpec[];
  readonly faults: readonly FaultSpec[];
  /** The evening-to-night site-noise curve: factor at given times, linear between (constant outside). */
  readonly noiseCurve: readonly { readonly time: Micros; readonly factor: number }[];
  readonly attenuation: Attenuation;
  /** Brune stress drop, Pa. */
  readonly stressDropPa: number;
}
