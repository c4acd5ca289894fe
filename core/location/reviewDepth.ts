/**
 * A depth held fixed by the analyst for one review event ("operator assigned" in QuakeML): the edit
 * that sets or frees it (a pure function from one review document to the next, like the edits of
 * core/review/edits.ts, so the desk's History undoes it) and the reading of what the analyst typed.
 *
 * The depth is km below the velocity model's datum, negative above it (sources in a volcano or a
 * mountain). locateReviewEvent (fromReview.ts) holds the event's location at it when it is set.
 */
import type { ReviewDocument } from '../review/types';

/** Shallowest fixed depth accepted, km (10 km above the datum). */
export const FIXED_DEPTH_MIN_KM = -10;
/** Deepest fixed depth accepted, km. */
export const FIXED_DEPTH_MAX_KM = 800;

function checkDepth(depthKm: number): void {
  if (!(typeof depthKm === 'number' && depthKm >= FIXED_DEPTH_MIN_KM && depthKm <= FIXED_DEPTH_MAX_KM)) {
    throw new RangeError(`fixed depth must be ${FIXED_DEPTH_MIN_KM} to ${FIXED_DEPTH_MAX_KM} km, got ${depthKm}`);
  }
}

/**
 * Holds event `eventId`'s depth at `depthKm` (km below the datum), or frees it (null). A new
 * document with the revision counted up (and a fresh event's review started), or `doc` itself when
 * the event already has that depth. Throws a RangeError naming an unknown event or a depth outside
 * [FIXED_DEPTH_MIN_KM, FIXED_DEPTH_MAX_KM].
 */
export function setFixedDepth(doc: ReviewDocument, eventId: string, depthKm: number | null): ReviewDocument {
  if (depthKm !== null) checkDepth(depthKm);
  const i = doc.events.findIndex((e) => e.id === eventId);
  if (i < 0) throw new RangeError(`no event "${eventId}" in the review`);
  const ev = doc.events[i];
  if ((ev.fixedDepthKm ?? null) === depthKm) return doc;
  const { fixedDepthKm: _old, ...rest } = ev;
  const changed = depthKm === null ? rest : { ...rest, fixedDepthKm: depthKm };
  const events = doc.events.slice();
  events[i] = changed.state === 'todo' ? { ...changed, state: 'started' } : changed;
  return { ...doc, revision: doc.revision + 1, events };
}

export type DepthInput = { ok: true; depthKm: number | null } | { ok: false; message: string };

/**
 * What the analyst typed in the depth field: empty or "free" frees the depth; a number is km below
 * the datum, optionally followed by "km", or by "m" for metres ("5", "5.5 km", "-0.3", "350 m").
 */
export function parseDepthInput(text: string): DepthInput {
  const t = text.trim().toLowerCase();
  if (t === '' || t === 'free') return { ok: true, depthKm: null };
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+))\s*(km|m)?$/.exec(t);
  if (!m) return { ok: false, message: `depth: type km below the datum (e.g. 5 or 5.5 km, 350 m) or "free", got "${text.trim()}"` };
  const km = m[2] === 'm' ? Number(m[1]) / 1000 : Number(m[1]);
  if (!(km >= FIXED_DEPTH_MIN_KM && km <= FIXED_DEPTH_MAX_KM)) {
    return { ok: false, message: `depth must be ${FIXED_DEPTH_MIN_KM} to ${FIXED_DEPTH_MAX_KM} km, got ${km} km` };
  }
  return { ok: true, depthKm: km };
}
