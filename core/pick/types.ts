/**
 * Types shared by detection and picking, and by everything downstream that shows or saves picks (the
 * QuakeML writer, the review app). Enumerations use the QuakeML 1.2 words (QuakeML 1.2 basic event
 * description: PickOnset, PickPolarity, EvaluationMode, EvaluationStatus).
 */
import type { ChannelId, SampleArray } from '../model';
import type { Micros } from '../time';

/** QuakeML PickOnset. */
export type PickOnset = 'impulsive' | 'emergent' | 'questionable';
/** QuakeML PickPolarity. */
export type PickPolarity = 'positive' | 'negative' | 'undecidable';
/** QuakeML EvaluationMode. */
export type EvaluationMode = 'automatic' | 'manual';
/** QuakeML EvaluationStatus. */
export type EvaluationStatus = 'preliminary' | 'confirmed' | 'reviewed' | 'final' | 'rejected';
/** Phases the picker sets (QuakeML phaseHint is free text; Daybreak uses these two). */
export type PhaseHint = 'P' | 'S';

/** One arrival time read on one channel. */
export interface Pick {
  readonly phaseHint: PhaseHint;
  /** The channel the time was read on (for S: the horizontal named by the picker). */
  readonly waveformId: ChannelId;
  /** Arrival time, integer microseconds since the epoch. */
  readonly time: Micros;
  /** How much earlier the arrival may be, seconds (>= 0). */
  readonly lowerUncertainty: number;
  /** How much later the arrival may be, seconds (>= 0). */
  readonly upperUncertainty: number;
  /** RMS amplitude after the pick over RMS amplitude before it (amplitude ratio, not dB). */
  readonly snr: number;
  readonly onset: PickOnset;
  /** First-motion polarity; null where none is read (S picks). */
  readonly polarity: PickPolarity | null;
  readonly evaluationMode: EvaluationMode;
  readonly evaluationStatus: EvaluationStatus;
  /** True when the record the pick was read on carried questionable timing (given by the caller). */
  readonly questionableTiming: boolean;
}

/** A contiguous run of samples of one channel: what the picker reads. */
export interface Trace {
  readonly id: ChannelId;
  /** Samples, evenly spaced (physical units or counts; the picker only uses ratios). */
  readonly samples: SampleArray;
  /** Samples per second. */
  readonly sampleRate: number;
  /** Time of samples[0], integer microseconds. */
  readonly start: Micros;
  /** True when the record's timing is questionable (e.g. SEED data-quality flag bit 7, clock unlocked). */
  readonly questionableTiming?: boolean;
}

/** How a station trigger ended. */
export type TriggerEnd = 'ratio' | 'gap' | 'end';

/** One channel's STA/LTA trigger. */
export interface StationTrigger {
  readonly id: ChannelId;
  /** First sample whose ratio reached the trigger-on level, µs. */
  readonly on: Micros;
  /** First sample whose ratio fell below the trigger-off level (or the last sample before a gap / the data's end), µs. */
  readonly off: Micros;
  /** Highest STA/LTA ratio between on and off. */
  readonly peakRatio: number;
  /** Time of that highest ratio, µs. */
  readonly peakTime: Micros;
  /** on minus the pre-event time, µs: where an event cut around this trigger starts. */
  readonly start: Micros;
  /** off plus the post-event time, µs: where an event cut around this trigger ends. */
  readonly end: Micros;
  /** What closed the trigger: the ratio fell below the off level, a gap, or the end of the data. */
  readonly endedBy: TriggerEnd;
}

/** Station triggers that agree in time across a network: one candidate event. */
export interface CandidateEvent {
  /** Stable identifier (see coincidence.ts for the rule). */
  readonly id: string;
  /** Earliest trigger-on time among the member sites, µs. */
  readonly time: Micros;
  /** Earliest trigger start (on minus pre-event time), µs. */
  readonly start: Micros;
  /** Latest trigger end (off plus post-event time), µs. */
  readonly end: Micros;
  /** "NET.STA" of each member site, in trigger order. */
  readonly sites: string[];
  /** The member triggers, one per site (that site's earliest), in time order. */
  readonly triggers: StationTrigger[];
  /** Later triggers of member sites inside the event's span (e.g. on S), kept for reference. */
  readonly secondary: StationTrigger[];
}
