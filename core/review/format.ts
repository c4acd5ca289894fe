/**
 * The review file: Daybreak's own versioned JSON, one per dataset, rewritten whole (atomically, by
 * the host) after every edit. Layout, version 3:
 *
 *   {
 *     "format": "daybreak-review",
 *     "version": 3,
 *     "caution": "<the preliminary-results caution>",
 *     "revision": 17,                       // increments with every change
 *     "nextSerial": 42,                     // behind new pick/event identifiers
 *     "events": [{
 *       "id": "...", "source": "detector" | "analyst",
 *       "start": "2026-12-01T21:04:10.000000Z", "end": "...",     // ISO 8601 UTC, microseconds
 *       "state": "todo" | "started" | "done" | "discarded",
 *       "type": "earthquake" | ... | null, "typeCertainty": "known" | "suspected" | null,
 *       "note": "",
 *       "picks": [{
 *         "id": "pick-3", "phase": "P" | "S", "channel": "NET.STA.LOC.CHA",
 *         "time": "...", "lower": 0.05, "upper": 0.05,           // seconds
 *         "onset": "impulsive" | "emergent" | "questionable",
 *         "polarity": "positive" | "negative" | "undecidable" | null,
 *         "mode": "automatic" | "manual",
 *         "status": "preliminary" | "confirmed" | "reviewed" | "final" | "rejected",
 *         "snr": 12.5 | null, "questionableTiming": false,
 *         "excluded": true                                         // optional (absent: used)
 *       }],
 *       "amplitudeEdits": [                                         // optional (absent: none)
 *         { "channel": "NET.STA.LOC.CHA", "kind": "moved",
 *           "time": "...", "halfWidth": 0.08 },                     // ISO time; seconds, 0.001 to 2
 *         { "channel": "NET.STA.LOC.CHA", "kind": "removed" }
 *       ],
 *       "fixedDepthKm": 5.0                                         // optional (absent: depth solved for)
 *     }]
 *   }
 *
 * `amplitudeEdits` (version 2) holds the analyst's changes to the event's amplitude picks, the
 * Wood-Anderson peaks its local magnitude is computed from, at most one per channel (a horizontal):
 * - `moved`: the analyst dragged the channel's amplitude mark; its peak is measured again within
 *   `halfWidth` seconds either side of `time` (where the mark was dropped) and exported as a manual
 *   amplitude;
 * - `removed`: the channel's amplitude is left out of the magnitude (and out of the exports).
 * A channel without an edit keeps the automatic measurement. The amplitudes themselves are not
 * stored: they are measured again from the waveforms and the StationXML whenever they are needed.
 *
 * `fixedDepthKm` (version 2): the depth, km below the velocity model's datum (negative above it),
 * at which the analyst holds the event's location (QuakeML depthType "operator assigned").
 *
 * `excluded` (version 3): the pick is left out of the location and the Wadati fit but kept, with
 * its residual, in the event and its exports (QuakeML: an arrival with time weight 0). The analyst
 * sets it; a detector candidate's pick comes in with it when the candidate's automatic origin gave it
 * weight 0.
 *
 * Versions: 1 (no amplitude edits) and 2 (no `excluded`) are still read, as version 3 files without
 * those fields; this version always writes 3. A reader of a newer version refuses it rather than dropping what it
 * does not know.
 */
import { CAUTION } from '../caution';
import { isoFromMicros, microsFromIso } from '../time';
import { AMPLITUDE_HALF_WIDTH_MAX, AMPLITUDE_HALF_WIDTH_MIN } from './edits';
import { FIXED_DEPTH_MAX_KM, FIXED_DEPTH_MIN_KM } from '../location/reviewDepth';
import { EVENT_TYPES, REVIEW_STATES, type AmplitudeEdit, type ReviewDocument, type ReviewEvent, type ReviewPick } from './types';

export const REVIEW_FORMAT = 'daybreak-review';
/** The version written; every version from 1 up to it is read. */
export const REVIEW_VERSION = 3;

export class ReviewFileError extends Error {
  constructor(readonly file: string, readonly where: string, readonly reason: string) {
    super(`${file}: ${where}: ${reason}`);
    this.name = 'ReviewFileError';
  }
}

export function serializeReview(doc: ReviewDocument): string {
  return JSON.stringify({
    format: REVIEW_FORMAT,
    version: REVIEW_VERSION,
    caution: CAUTION,
    revision: doc.revision,
    nextSerial: doc.nextSerial,
    events: doc.events.map((e) => ({
      id: e.id, source: e.source, start: isoFromMicros(e.start), end: isoFromMicros(e.end), state: e.state,
      type: e.type, typeCertainty: e.typeCertainty, note: e.note,
      picks: e.picks.map((p) => ({
        id: p.id, phase: p.phase, channel: p.channel, time: isoFromMicros(p.time), lower: p.lower, upper: p.upper,
        onset: p.onset, polarity: p.polarity, mode: p.mode, status: p.status, snr: p.snr, questionableTiming: p.questionableTiming,
        ...(p.excluded ? { excluded: true } : {}),
      })),
      ...(e.amplitudeEdits?.length ? {
        amplitudeEdits: e.amplitudeEdits.map((a) => (a.kind === 'moved'
          ? { channel: a.channel, kind: a.kind, time: isoFromMicros(a.time), halfWidth: a.halfWidth }
          : { channel: a.channel, kind: a.kind })),
      } : {}),
      ...(e.fixedDepthKm !== undefined ? { fixedDepthKm: e.fixedDepthKm } : {}),
    })),
  }, null, 1);
}

const ONSETS = ['impulsive', 'emergent', 'questionable'];
const POLARITIES = ['positive', 'negative', 'undecidable'];
const STATUSES = ['preliminary', 'confirmed', 'reviewed', 'final', 'rejected'];

export function parseReview(text: string, file: string): ReviewDocument {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new ReviewFileError(file, 'whole file', `not JSON (${e instanceof Error ? e.message : e})`);
  }
  const fail = (where: string, reason: string): never => { throw new ReviewFileError(file, where, reason); };
  const obj = (v: unknown, where: string): Record<string, unknown> =>
    typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Record<string, unknown>) : fail(where, 'expected an object');
  const top = obj(raw, '$');
  if (top.format !== REVIEW_FORMAT) fail('$.format', `expected "${REVIEW_FORMAT}", got ${JSON.stringify(top.format)}`);
  const version = top.version;
  if (!(Number.isInteger(version) && (version as number) >= 1 && (version as number) <= REVIEW_VERSION)) {
    fail('$.version', typeof top.version === 'number' && top.version > REVIEW_VERSION
      ? `version ${top.version} was written by a newer Daybreak; this one reads version ${REVIEW_VERSION}`
      : `unknown version ${JSON.stringify(top.version)}`);
  }
  const int = (v: unknown, where: string): number => (Number.isSafeInteger(v) && (v as number) >= 0 ? (v as number) : fail(where, 'expected a non-negative integer'));
  const str = (v: unknown, where: string): string => (typeof v === 'string' ? v : fail(where, 'expected text'));
  const oneOf = <T extends string>(v: unknown, allowed: readonly string[], where: string, nullable = false): T | null =>
    (nullable && v === null) ? null : allowed.includes(v as string) ? (v as T) : fail(where, `expected one of ${allowed.join(', ')}${nullable ? ' or null' : ''}, got ${JSON.stringify(v)}`);
  const time = (v: unknown, where: string): number => {
    try { return microsFromIso(str(v, where)); } catch (e) { return fail(where, e instanceof Error ? e.message : String(e)); }
  };
  const secs = (v: unknown, where: string): number => (typeof v === 'number' && v >= 0 && v <= 60 ? v : fail(where, 'expected seconds from 0 to 60'));
  const depthKm = (v: unknown, where: string): number => (typeof v === 'number' && v >= FIXED_DEPTH_MIN_KM && v <= FIXED_DEPTH_MAX_KM ? v : fail(where, `expected km from ${FIXED_DEPTH_MIN_KM} to ${FIXED_DEPTH_MAX_KM}`));
  const channelKey = (v: unknown, where: string): string => (/^[^.]*\.[^.]+\.[^.]*\.[^.]+$/.test(str(v, where)) ? (v as string) : fail(where, 'expected NET.STA.LOC.CHA'));
  if (!Array.isArray(top.events)) fail('$.events', 'expected a list');
  const events: ReviewEvent[] = (top.events as unknown[]).map((ev, i) => {
    const w = `$.events[${i}]`;
    const e = obj(ev, w);
    if (!Array.isArray(e.picks)) fail(`${w}.picks`, 'expected a list');
    const picks: ReviewPick[] = (e.picks as unknown[]).map((pk, j) => {
      const pw = `${w}.picks[${j}]`;
      const p = obj(pk, pw);
      if (p.excluded !== undefined && (version as number) < 3) fail(`${pw}.excluded`, `not part of version ${version} files`);
      if (p.excluded !== undefined && typeof p.excluded !== 'boolean') fail(`${pw}.excluded`, 'expected true or false');
      return {
        id: str(p.id, `${pw}.id`),
        phase: oneOf<'P' | 'S'>(p.phase, ['P', 'S'], `${pw}.phase`)!,
        channel: channelKey(p.channel, `${pw}.channel`),
        time: time(p.time, `${pw}.time`),
        lower: secs(p.lower, `${pw}.lower`),
        upper: secs(p.upper, `${pw}.upper`),
        onset: oneOf<ReviewPick['onset']>(p.onset, ONSETS, `${pw}.onset`)!,
        polarity: oneOf<NonNullable<ReviewPick['polarity']>>(p.polarity, POLARITIES, `${pw}.polarity`, true),
        mode: oneOf<ReviewPick['mode']>(p.mode, ['automatic', 'manual'], `${pw}.mode`)!,
        status: oneOf<ReviewPick['status']>(p.status, STATUSES, `${pw}.status`)!,
        snr: p.snr === null ? null : typeof p.snr === 'number' && p.snr >= 0 ? p.snr : fail(`${pw}.snr`, 'expected a non-negative number or null'),
        questionableTiming: typeof p.questionableTiming === 'boolean' ? p.questionableTiming : fail(`${pw}.questionableTiming`, 'expected true or false'),
        ...(p.excluded === true ? { excluded: true } : {}),
      };
    });
    let amplitudeEdits: AmplitudeEdit[] | undefined;
    if (e.amplitudeEdits !== undefined) {
      if (version === 1) fail(`${w}.amplitudeEdits`, 'not part of version 1 files');
      if (!Array.isArray(e.amplitudeEdits)) fail(`${w}.amplitudeEdits`, 'expected a list');
      const seen = new Set<string>();
      amplitudeEdits = (e.amplitudeEdits as unknown[]).map((ae, j): AmplitudeEdit => {
        const aw = `${w}.amplitudeEdits[${j}]`;
        const a = obj(ae, aw);
        const channel = channelKey(a.channel, `${aw}.channel`);
        if (seen.has(channel)) fail(`${aw}.channel`, `${channel} is edited twice`);
        seen.add(channel);
        const kind = oneOf<AmplitudeEdit['kind']>(a.kind, ['moved', 'removed'], `${aw}.kind`)!;
        if (kind === 'removed') return { channel, kind };
        const hw = a.halfWidth;
        if (!(typeof hw === 'number' && hw >= AMPLITUDE_HALF_WIDTH_MIN && hw <= AMPLITUDE_HALF_WIDTH_MAX)) {
          fail(`${aw}.halfWidth`, `expected seconds from ${AMPLITUDE_HALF_WIDTH_MIN} to ${AMPLITUDE_HALF_WIDTH_MAX}`);
        }
        return { channel, kind, time: time(a.time, `${aw}.time`), halfWidth: hw as number };
      });
    }
    const start = time(e.start, `${w}.start`);
    const end = time(e.end, `${w}.end`);
    if (end <= start) fail(`${w}.end`, 'must be after start');
    return {
      id: str(e.id, `${w}.id`),
      source: oneOf<ReviewEvent['source']>(e.source, ['detector', 'analyst'], `${w}.source`)!,
      start, end,
      state: oneOf<ReviewEvent['state']>(e.state, REVIEW_STATES, `${w}.state`)!,
      type: oneOf<NonNullable<ReviewEvent['type']>>(e.type, EVENT_TYPES, `${w}.type`, true),
      typeCertainty: oneOf<NonNullable<ReviewEvent['typeCertainty']>>(e.typeCertainty, ['known', 'suspected'], `${w}.typeCertainty`, true),
      note: str(e.note, `${w}.note`),
      picks,
      ...(amplitudeEdits?.length ? { amplitudeEdits } : {}),
      ...(e.fixedDepthKm !== undefined ? { fixedDepthKm: depthKm(e.fixedDepthKm, `${w}.fixedDepthKm`) } : {}),
    };
  });
  const ids = new Set<string>();
  events.forEach((e, i) => {
    if (ids.has(e.id)) fail(`$.events[${i}].id`, `"${e.id}" appears twice`);
    ids.add(e.id);
  });
  return { revision: int(top.revision, '$.revision'), nextSerial: int(top.nextSerial, '$.nextSerial'), events };
}
