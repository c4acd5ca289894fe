/**
 * Every change the analyst can make to a review, as pure functions from one document to the next.
 * They check their arguments (an edit that names a missing event or pick throws a RangeError naming
 * it) and never mutate their input, so the app keeps old documents for undo.
 */
import type { Micros } from '../time';
import type { PickOnset, PickPolarity, PhaseHint } from '../pick/types';
import type { AmplitudeEdit, EventType, EventTypeCertainty, ReviewDocument, ReviewEvent, ReviewState } from './types';

function eventIndex(doc: ReviewDocument, eventId: string): number {
  const i = doc.events.findIndex((e) => e.id === eventId);
  if (i < 0) throw new RangeError(`no event "${eventId}" in the review`);
  return i;
}

function pickIndex(ev: ReviewEvent, pickId: string): number {
  const i = ev.picks.findIndex((p) => p.id === pickId);
  if (i < 0) throw new RangeError(`no pick "${pickId}" in event "${ev.id}"`);
  return i;
}

function withEvent(doc: ReviewDocument, eventId: string, change: (ev: ReviewEvent) => ReviewEvent, serialUsed = 0): ReviewDocument {
  const i = eventIndex(doc, eventId);
  const events = doc.events.slice();
  const changed = change(events[i]);
  // Any edit of a fresh event starts its review.
  events[i] = changed.state === 'todo' ? { ...changed, state: 'started' } : changed;
  return { revision: doc.revision + 1, events, nextSerial: doc.nextSerial + serialUsed };
}

function checkUncertainty(name: string, v: number): void {
  if (!(v >= 0 && v <= 60)) throw new RangeError(`${name} uncertainty must be 0 to 60 s, got ${v}`);
}

export interface NewPick {
  phase: PhaseHint;
  channel: string;
  time: Micros;
  lower?: number;
  upper?: number;
  onset?: PickOnset;
  polarity?: PickPolarity | null;
}

/** Default uncertainty of a pick placed by hand, s (each side). */
export const MANUAL_PICK_UNCERTAINTY = 0.05;

/**
 * Places a manual pick. An event holds at most one pick per phase and site: a P placed where the
 * site already has a P replaces it (the analyst re-picked).
 */
export function placePick(doc: ReviewDocument, eventId: string, p: NewPick): { doc: ReviewDocument; pickId: string } {
  if (p.phase !== 'P' && p.phase !== 'S') throw new RangeError(`phase must be P or S, got ${String(p.phase)}`);
  if (!Number.isSafeInteger(p.time)) throw new RangeError(`pick time must be integer microseconds, got ${p.time}`);
  const lower = p.lower ?? MANUAL_PICK_UNCERTAINTY;
  const upper = p.upper ?? MANUAL_PICK_UNCERTAINTY;
  checkUncertainty('lower', lower);
  checkUncertainty('upper', upper);
  const pickId = `pick-${doc.nextSerial}`;
  const site = siteOf(p.channel);
  const next = withEvent(doc, eventId, (ev) => ({
    ...ev,
    picks: [
      ...ev.picks.filter((q) => !(q.phase === p.phase && siteOf(q.channel) === site)),
      {
        id: pickId, phase: p.phase, channel: p.channel, time: p.time, lower, upper,
        onset: p.onset ?? 'questionable', polarity: p.polarity ?? (p.phase === 'P' ? 'undecidable' : null),
        mode: 'manual', status: 'preliminary', snr: null, questionableTiming: false,
      },
    ],
  }), 1);
  return { doc: next, pickId };
}

/**
 * Moves a pick to a new time; it becomes a manual pick (the analyst set its time) and is used in the
 * location again if it was left out (a moved pick is a new reading: mostly an automatic outlier put
 * where it belongs).
 */
export function movePick(doc: ReviewDocument, eventId: string, pickId: string, time: Micros): ReviewDocument {
  if (!Number.isSafeInteger(time)) throw new RangeError(`pick time must be integer microseconds, got ${time}`);
  return withEvent(doc, eventId, (ev) => {
    const i = pickIndex(ev, pickId);
    const picks = ev.picks.slice();
    const { excluded: _wasExcluded, ...kept } = picks[i];
    picks[i] = { ...kept, time, mode: 'manual', status: 'preliminary', snr: null };
    return { ...ev, picks };
  });
}

/** Sets a pick's uncertainty (seconds before and after its time). */
export function setUncertainty(doc: ReviewDocument, eventId: string, pickId: string, lower: number, upper: number): ReviewDocument {
  checkUncertainty('lower', lower);
  checkUncertainty('upper', upper);
  return withEvent(doc, eventId, (ev) => {
    const i = pickIndex(ev, pickId);
    const picks = ev.picks.slice();
    picks[i] = { ...picks[i], lower, upper };
    return { ...ev, picks };
  });
}

/** Sets onset and/or polarity. */
export function setPickAttributes(doc: ReviewDocument, eventId: string, pickId: string, attrs: { onset?: PickOnset; polarity?: PickPolarity | null }): ReviewDocument {
  return withEvent(doc, eventId, (ev) => {
    const i = pickIndex(ev, pickId);
    const picks = ev.picks.slice();
    picks[i] = { ...picks[i], ...attrs };
    return { ...ev, picks };
  });
}

/**
 * Leaves a pick out of the location and the Wadati fit (`excluded` true) or uses it again (false).
 * The pick stays in the event, keeps its mode and status, and is exported with time weight 0.
 */
export function setExcluded(doc: ReviewDocument, eventId: string, pickId: string, excluded: boolean): ReviewDocument {
  return withEvent(doc, eventId, (ev) => {
    const i = pickIndex(ev, pickId);
    const picks = ev.picks.slice();
    const { excluded: _was, ...rest } = picks[i];
    picks[i] = excluded ? { ...rest, excluded: true } : rest;
    return { ...ev, picks };
  });
}

export function deletePick(doc: ReviewDocument, eventId: string, pickId: string): ReviewDocument {
  return withEvent(doc, eventId, (ev) => {
    pickIndex(ev, pickId);
    return { ...ev, picks: ev.picks.filter((p) => p.id !== pickId) };
  });
}

/** Accepts every automatic pick of the event: they stay automatic, with status confirmed. */
export function acceptAutomatic(doc: ReviewDocument, eventId: string): ReviewDocument {
  return withEvent(doc, eventId, (ev) => ({
    ...ev,
    picks: ev.picks.map((p) => (p.mode === 'automatic' && p.status === 'preliminary' ? { ...p, status: 'confirmed' } : p)),
  }));
}

export function setState(doc: ReviewDocument, eventId: string, state: ReviewState): ReviewDocument {
  const i = eventIndex(doc, eventId);
  const events = doc.events.slice();
  events[i] = { ...events[i], state };
  return { ...doc, revision: doc.revision + 1, events };
}

export function setEventType(doc: ReviewDocument, eventId: string, type: EventType | null, certainty: EventTypeCertainty | null): ReviewDocument {
  return withEvent(doc, eventId, (ev) => ({ ...ev, type, typeCertainty: type ? certainty ?? 'known' : null }));
}

export function setNote(doc: ReviewDocument, eventId: string, note: string): ReviewDocument {
  if (typeof note !== 'string' || note.length > 10_000) throw new RangeError('a note is text of at most 10,000 characters');
  return withEvent(doc, eventId, (ev) => ({ ...ev, note }));
}

/** Adds an event the detector missed, over [start, end) µs. */
export function addEvent(doc: ReviewDocument, start: Micros, end: Micros): { doc: ReviewDocument; eventId: string } {
  if (!(Number.isSafeInteger(start) && Number.isSafeInteger(end) && end > start)) {
    throw new RangeError(`an event needs integer start < end (µs), got ${start}..${end}`);
  }
  const eventId = `added-${doc.nextSerial}`;
  const ev: ReviewEvent = { id: eventId, source: 'analyst', start, end, state: 'started', type: null, typeCertainty: null, note: '', picks: [] };
  const events = [...doc.events, ev].sort((a, b) => a.start - b.start);
  return { doc: { revision: doc.revision + 1, events, nextSerial: doc.nextSerial + 1 }, eventId };
}

/**
 * Merges event `b` into event `a` (two candidates that are one event): the span covers both, picks
 * are pooled (where both have the same phase at a site, `a`'s pick is kept), notes are joined.
 */
export function mergeEvents(doc: ReviewDocument, aId: string, bId: string): ReviewDocument {
  if (aId === bId) throw new RangeError('cannot merge an event with itself');
  const a = doc.events[eventIndex(doc, aId)];
  const b = doc.events[eventIndex(doc, bId)];
  const taken = new Set(a.picks.map((p) => `${p.phase}|${siteOf(p.channel)}`));
  let merged: ReviewEvent = {
    ...a,
    start: Math.min(a.start, b.start),
    end: Math.max(a.end, b.end),
    state: a.state === 'todo' ? 'started' : a.state,
    note: [a.note, b.note].filter(Boolean).join('\n'),
    picks: [...a.picks, ...b.picks.filter((p) => !taken.has(`${p.phase}|${siteOf(p.channel)}`))],
  };
  // Amplitude edits are pooled the same way: where both edited a channel, `a`'s edit is kept.
  const aEdits = a.amplitudeEdits ?? [];
  const bEdits = (b.amplitudeEdits ?? []).filter((e) => !aEdits.some((x) => x.channel === e.channel));
  if (aEdits.length + bEdits.length > 0) merged = { ...merged, amplitudeEdits: [...aEdits, ...bEdits] };
  const events = doc.events.filter((e) => e.id !== bId).map((e) => (e.id === aId ? merged : e));
  return { ...doc, revision: doc.revision + 1, events };
}

/**
 * Splits an event at time `at` (it held two): picks before `at` stay, picks from `at` on go to a new
 * event spanning [at, end).
 */
export function splitEvent(doc: ReviewDocument, eventId: string, at: Micros): { doc: ReviewDocument; newEventId: string } {
  const ev = doc.events[eventIndex(doc, eventId)];
  if (!(at > ev.start && at < ev.end)) throw new RangeError(`split time must fall inside the event's span`);
  const newEventId = `${ev.id}-split-${doc.nextSerial}`;
  let first: ReviewEvent = { ...ev, end: at, state: ev.state === 'todo' ? 'started' : ev.state, picks: ev.picks.filter((p) => p.time < at) };
  let second: ReviewEvent = { ...ev, id: newEventId, source: 'analyst', start: at, state: 'started', note: '', picks: ev.picks.filter((p) => p.time >= at) };
  // A moved amplitude goes with the part its time falls in; a removal stays with the original event
  // (it keeps its identifier; the new part's magnitude starts from the automatic amplitudes).
  const edits = ev.amplitudeEdits;
  if (edits !== undefined) {
    const later = edits.filter((e) => e.kind === 'moved' && e.time >= at);
    const earlier = edits.filter((e) => !later.includes(e));
    first = withAmplitudeEdits(first, earlier);
    second = withAmplitudeEdits(second, later);
  }
  const events = doc.events.flatMap((e) => (e.id === eventId ? [first, second] : [e]));
  return { doc: { revision: doc.revision + 1, events, nextSerial: doc.nextSerial + 1 }, newEventId };
}

// ----- amplitude picks ---------------------------------------------------------------------------

/** Allowed half-width of a moved amplitude's search window, s: from 1 ms to 2 s. */
export const AMPLITUDE_HALF_WIDTH_MIN = 0.001;
export const AMPLITUDE_HALF_WIDTH_MAX = 2;

const CHANNEL_KEY = /^[^.]*\.[^.]+\.[^.]*\.[^.]+$/;

function checkChannelKey(channel: string): void {
  if (typeof channel !== 'string' || !CHANNEL_KEY.test(channel)) throw new RangeError(`channel must be "NET.STA.LOC.CHA", got ${JSON.stringify(channel)}`);
}

/** `ev` with `edits` as its amplitude edits (the field left out when there are none). */
function withAmplitudeEdits(ev: ReviewEvent, edits: readonly AmplitudeEdit[]): ReviewEvent {
  if (edits.length > 0) return { ...ev, amplitudeEdits: edits };
  if (ev.amplitudeEdits === undefined) return ev;
  const copy: { -readonly [K in keyof ReviewEvent]?: ReviewEvent[K] } = { ...ev };
  delete copy.amplitudeEdits;
  return copy as ReviewEvent;
}

/** The event's edit of `channel`'s amplitude, or undefined (the automatic measurement stands). */
export function amplitudeEditOf(ev: ReviewEvent, channel: string): AmplitudeEdit | undefined {
  return ev.amplitudeEdits?.find((e) => e.channel === channel);
}

/**
 * Moves a channel's amplitude pick: its peak is measured again within ±`halfWidth` s of `time` (µs,
 * where the analyst dropped it), replacing any earlier edit of the channel. The amplitude becomes
 * manual (see core/review/reviewMagnitude).
 */
export function moveAmplitude(doc: ReviewDocument, eventId: string, channel: string, time: Micros, halfWidth: number): ReviewDocument {
  checkChannelKey(channel);
  if (!Number.isSafeInteger(time)) throw new RangeError(`amplitude time must be integer microseconds, got ${time}`);
  if (!(halfWidth >= AMPLITUDE_HALF_WIDTH_MIN && halfWidth <= AMPLITUDE_HALF_WIDTH_MAX)) {
    throw new RangeError(`amplitude half width must be ${AMPLITUDE_HALF_WIDTH_MIN} to ${AMPLITUDE_HALF_WIDTH_MAX} s, got ${halfWidth}`);
  }
  return withEvent(doc, eventId, (ev) => withAmplitudeEdits(ev, [
    ...(ev.amplitudeEdits ?? []).filter((e) => e.channel !== channel),
    { channel, kind: 'moved', time, halfWidth },
  ]));
}

/** Leaves the amplitudes of `channels` out of the event's magnitude (a moved one is removed too). */
export function removeAmplitudes(doc: ReviewDocument, eventId: string, channels: readonly string[]): ReviewDocument {
  if (!Array.isArray(channels) || channels.length === 0) throw new RangeError('name at least one channel whose amplitude to remove');
  for (const c of channels) checkChannelKey(c);
  const set = new Set(channels);
  return withEvent(doc, eventId, (ev) => withAmplitudeEdits(ev, [
    ...(ev.amplitudeEdits ?? []).filter((e) => !set.has(e.channel)),
    ...[...set].map((channel): AmplitudeEdit => ({ channel, kind: 'removed' })),
  ]));
}

/** Drops the edits of `channels`: their automatic amplitudes count again. A channel without an edit is a RangeError. */
export function restoreAmplitudes(doc: ReviewDocument, eventId: string, channels: readonly string[]): ReviewDocument {
  if (!Array.isArray(channels) || channels.length === 0) throw new RangeError('name at least one channel whose amplitude to restore');
  const set = new Set(channels);
  return withEvent(doc, eventId, (ev) => {
    for (const c of set) if (!amplitudeEditOf(ev, c)) throw new RangeError(`the amplitude of ${c} in event "${ev.id}" is not edited`);
    return withAmplitudeEdits(ev, (ev.amplitudeEdits ?? []).filter((e) => !set.has(e.channel)));
  });
}

/** "NET.STA" of a "NET.STA.LOC.CHA" key. */
export function siteOf(channel: string): string {
  const parts = channel.split('.');
  return `${parts[0]}.${parts[1]}`;
}

/** Undo/redo over whole documents (cheap: documents share their unchanged parts). */
export class History {
  private past: ReviewDocument[] = [];
  private future: ReviewDocument[] = [];
  constructor(private current: ReviewDocument, private readonly limit = 500) {}

  get doc(): ReviewDocument { return this.current; }
  get canUndo(): boolean { return this.past.length > 0; }
  get canRedo(): boolean { return this.future.length > 0; }

  apply(next: ReviewDocument): ReviewDocument {
    this.past.push(this.current);
    if (this.past.length > this.limit) this.past.shift();
    this.future = [];
    this.current = next;
    return next;
  }

  /** Undo gives back the older document with a new revision number (the file moves forward). */
  undo(): ReviewDocument | null {
    const prev = this.past.pop();
    if (!prev) return null;
    this.future.push(this.current);
    this.current = { ...prev, revision: this.current.revision + 1 };
    return this.current;
  }

  redo(): ReviewDocument | null {
    const next = this.future.pop();
    if (!next) return null;
    this.past.push(this.current);
    this.current = { ...next, revision: this.current.revision + 1 };
    return this.current;
  }
}
