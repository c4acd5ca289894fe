/**
 * The review as the outside world takes it: QuakeML 1.2 and a CSV table of picks. The review state
 * of each event maps to the QuakeML evaluationStatus of its picks as follows (pick status kept when
 * it says more, e.g. a confirmed automatic pick of an event still in review):
 *   todo, started -> the pick's own status (preliminary / confirmed)
 *   done          -> reviewed
 *   discarded     -> rejected, and the event's type becomes "not existing" unless the analyst typed it
 */
import { CAUTION } from '../caution';
import { parseChannelKey } from '../model';
import { isoFromMicros } from '../time';
import { writeQuakeMl, type QuakeMlWriteOptions } from '../quakeml/write';
import type { QmlEvent, QmlOrigin } from '../quakeml/types';
import { originFromHypocentre } from '../quakeml/fromHypocentre';
import { pickComment } from '../quakeml/pickComment';
import type { ReviewLocation } from '../location/fromReview';
import { quakemlStatus } from './types';
import type { EvaluationStatus } from '../pick/types';
import type { ReviewDocument, ReviewEvent, ReviewPick } from './types';

function pickStatus(ev: ReviewEvent, p: ReviewPick): EvaluationStatus {
  if (ev.state === 'done') return 'reviewed';
  if (ev.state === 'discarded') return 'rejected';
  return p.status;
}

/**
 * The origin of a located review event: manual when the analyst has set any pick or finished the
 * event, with the event's review state as its evaluationStatus; its arrivals point at the event's
 * exported picks.
 */
export function reviewOrigin(ev: ReviewEvent, loc: ReviewLocation, earthModelId?: string): QmlOrigin | null {
  const byIndex = new Map<number, string>();
  loc.hypocentre.arrivals.forEach((a, k) => byIndex.set(a.pickIndex, loc.arrivals[k].pickId));
  const manual = ev.state === 'done' || ev.picks.some((p) => p.mode === 'manual');
  return originFromHypocentre(loc.hypocentre, {
    id: `${ev.id}.origin`,
    pickIdOf: (i) => `${ev.id}.${byIndex.get(i) ?? `unknown-${i}`}`,
    evaluationMode: manual ? 'manual' : 'automatic',
    evaluationStatus: quakemlStatus(ev.state),
    earthModelId,
  });
}

/** Review events as QuakeML events; `locations` (by event id) adds each located event's preferred origin. */
export function reviewEventsToQuakeMl(doc: ReviewDocument, locations?: ReadonlyMap<string, ReviewLocation>, earthModelId?: string): QmlEvent[] {
  return doc.events.map((ev) => {
    const loc = locations?.get(ev.id);
    const origin = loc ? reviewOrigin(ev, loc, earthModelId) : null;
    return {
      id: ev.id,
      type: ev.type ?? (ev.state === 'discarded' ? 'not existing' : null),
      typeCertainty: ev.type ? ev.typeCertainty : ev.state === 'discarded' ? 'known' : null,
      comment: ev.note || undefined,
      picks: ev.picks.map((p) => ({
        id: `${ev.id}.${p.id}`,
        waveformId: parseChannelKey(p.channel),
        time: p.time,
        lowerUncertainty: p.lower,
        upperUncertainty: p.upper,
        phaseHint: p.phase,
        onset: p.onset,
        polarity: p.polarity,
        evaluationMode: p.mode,
        evaluationStatus: pickStatus(ev, p),
        comment: pickComment(p.snr, p.questionableTiming),
      })),
      origins: origin ? [origin] : [],
      preferredOriginId: origin ? origin.id : null,
    };
  });
}

export function reviewToQuakeMl(doc: ReviewDocument, opts: QuakeMlWriteOptions, locations?: ReadonlyMap<string, ReviewLocation>, earthModelId?: string): string {
  return writeQuakeMl({ events: reviewEventsToQuakeMl(doc, locations, earthModelId) }, opts);
}

/** A CSV field (RFC 4180 quoting); null is empty. */
export function csvField(v: string | number | null): string {
  if (v === null) return '';
  const s = String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const PICK_CSV_COLUMNS = [
  'event_id', 'event_state', 'event_type', 'network', 'station', 'location', 'channel', 'phase', 'time',
  'lower_uncertainty_s', 'upper_uncertainty_s', 'onset', 'polarity', 'evaluation_mode', 'evaluation_status', 'snr', 'questionable_timing',
  'excluded_from_location',
] as const;

/**
 * One row per pick; the first line is a comment with the caution (lines starting with #).
 * `excluded_from_location` is true for a pick kept in the event but left out of its location.
 */
export function reviewToCsv(doc: ReviewDocument): string {
  const lines = [`# ${CAUTION}`, PICK_CSV_COLUMNS.join(',')];
  for (const ev of doc.events) {
    for (const p of ev.picks) {
      const id = parseChannelKey(p.channel);
      lines.push([
        ev.id, ev.state, ev.type, id.network, id.station, id.location, id.channel, p.phase, isoFromMicros(p.time),
        p.lower, p.upper, p.onset, p.polarity, p.mode, pickStatus(ev, p), p.snr, p.questionableTiming ? 'true' : 'false',
        p.excluded ? 'true' : 'false',
      ].map(csvField).join(','));
    }
  }
  return `${lines.join('\n')}\n`;
}
