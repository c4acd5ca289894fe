/**
 * The analyst's review of a dataset: candidate events (from the detector or added by hand), their
 * picks, each event's review state, type and note. This is what the review file stores (see
 * format.ts) and what every edit changes. Values are plain data, never mutated: an edit makes a new
 * document that shares the unchanged parts, so undo keeps the old one.
 */
import type { Micros } from '../time';
import type { EvaluationMode, EvaluationStatus, PhaseHint, PickOnset, PickPolarity } from '../pick/types';

/**
 * Where an event is in the morning's work (Daybreak's own states; export maps them to QuakeML
 * evaluationStatus, see `quakemlStatus`):
 * - `todo`: nobody has looked at it;
 * - `started`: opened or edited, not finished;
 * - `done`: the analyst has finished it;
 * - `discarded`: not an event worth keeping (noise, spike, duplicate).
 */
export type ReviewState = 'todo' | 'started' | 'done' | 'discarded';

export const REVIEW_STATES: readonly ReviewState[] = ['todo', 'started', 'done', 'discarded'];

/** QuakeML 1.2 EventType values offered (a subset of the enumeration, the ones a local network meets). */
export const EVENT_TYPES = [
  'earthquake', 'induced or triggered event', 'explosion', 'quarry blast', 'mining explosion', 'rock burst',
  'landslide', 'volcanic eruption', 'sonic boom', 'other event', 'not existing', 'not reported',
] as const;
export type EventType = (typeof EVENT_TYPES)[number];

/** QuakeML 1.2 EventTypeCertainty. */
export type EventTypeCertainty = 'known' | 'suspected';

export interface ReviewPick {
  /** Stable within the review file. */
  readonly id: string;
  readonly phase: PhaseHint;
  /** "NET.STA.LOC.CHA" the time was read on. */
  readonly channel: string;
  readonly time: Micros;
  /** Seconds earlier / later the arrival may be (>= 0). */
  readonly lower: number;
  readonly upper: number;
  readonly onset: PickOnset;
  /** First-motion polarity (P); null when not read. */
  readonly polarity: PickPolarity | null;
  /** automatic: made by the picker (and at most accepted); manual: placed or moved by the analyst. */
  readonly mode: EvaluationMode;
  readonly status: EvaluationStatus;
  /** Signal-to-noise ratio from the picker, null for manual picks. */
  readonly snr: number | null;
  readonly questionableTiming: boolean;
  /**
   * Left out of the location and the Wadati fit, but kept (with its residual) and exported; absent
   * or false: used. Set by the analyst, or on a detector candidate's pick that its automatic origin
   * left out (arrival weight 0, e.g. an outlier or a pick on a bad clock).
   */
  readonly excluded?: boolean;
}

export interface ReviewEvent {
  /** Stable identifier: the detector's candidate id, or one made when the analyst adds the event. */
  readonly id: string;
  readonly source: 'detector' | 'analyst';
  /** The time span the event sheet shows, µs. */
  readonly start: Micros;
  readonly end: Micros;
  readonly state: ReviewState;
  readonly type: EventType | null;
  readonly typeCertainty: EventTypeCertainty | null;
  readonly note: string;
  readonly picks: readonly ReviewPick[];
  /**
   * The analyst's changes to the event's amplitude picks (the Wood-Anderson peaks behind ML), at most
   * one per channel; absent or empty when every amplitude is the automatic measurement.
   */
  readonly amplitudeEdits?: readonly AmplitudeEdit[];
  /** Depth the analyst holds the event's location at, km below the model's datum; absent: solved for. */
  readonly fixedDepthKm?: number;
}

/**
 * One analyst change to a channel's amplitude pick:
 * - `moved`: the peak is measured again in [time − halfWidth, time + halfWidth] (where the analyst
 *   dropped the mark) instead of the automatic window; the amplitude becomes manual;
 * - `removed`: the channel's amplitude is left out of the magnitude.
 * Deleting the edit restores the automatic measurement.
 */
export type AmplitudeEdit =
  | { readonly channel: string; readonly kind: 'moved'; readonly time: Micros; readonly halfWidth: number }
  | { readonly channel: string; readonly kind: 'removed' };

export interface ReviewDocument {
  /** Increments with every saved change; a reader can tell a newer file. */
  readonly revision: number;
  readonly events: readonly ReviewEvent[];
  /** Counter behind new pick and event identifiers. */
  readonly nextSerial: number;
}

export const EMPTY_REVIEW: ReviewDocument = { revision: 0, events: [], nextSerial: 1 };

/** QuakeML evaluationStatus for an event in a review state. */
export function quakemlStatus(state: ReviewState): EvaluationStatus {
  switch (state) {
    case 'todo': return 'preliminary';
    case 'started': return 'preliminary';
    case 'done': return 'reviewed';
    case 'discarded': return 'rejected';
  }
}
