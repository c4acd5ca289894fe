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
import type { QmlEvent } from '../quakeml/types';
import type { EvaluationStatus } from '../pick/types';
import type { ReviewDocument, ReviewEvent, ReviewPick } from './types';

function pickStatus(ev: ReviewEvent, p: ReviewPick): EvaluationStatus {
  if (ev.state === 'done') return 'reviewed';
  if (ev.state === 'discarded') return 'rejected';
  return p.status;
}

export function reviewEventsToQuakeMl(doc: ReviewDocument): QmlEvent[] {
  return doc.events.map((ev) => ({
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
      comment: p.snr !== null ? `snr ${p.snr.toFixed(1)}${p.questionableTiming ? '; record timing questionable' : ''}` : p.questionableTiming ? 'record timing questionable' : undefined,
    })),
    origins: [],
    preferredOriginId: null,
  }));
}

export function reviewToQuakeMl(doc: ReviewDocument, opts: QuakeMlWriteOptions): string {
  return writeQuakeMl({ events: reviewEventsToQuakeMl(doc) }, opts);
}

function csvField(v: string | number | null): string {
  if (v === null) return '';
  const s = String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const PICK_CSV_COLUMNS = [
  'event_id', 'event_state', 'event_type', 'network', 'station', 'location', 'channel', 'phase', 'time',
  'lower_uncertainty_s', 'upper_uncertainty_s', 'onset', 'polarity', 'evaluation_mode', 'evaluation_status', 'snr', 'questionable_timing',
] as const;

/** One row per pick; the first line is a comment with the caution (lines starting with #). */
export function reviewToCsv(doc: ReviewDocument): string {
  const lines = [`# ${CAUTION}`, PICK_CSV_COLUMNS.join(',')];
  for (const ev of doc.events) {
    for (const p of ev.picks) {
      const id = parseChannelKey(p.channel);
      lines.push([
        ev.id, ev.state, ev.type, id.network, id.station, id.location, id.channel, p.phase, isoFromMicros(p.time),
        p.lower, p.upper, p.onset, p.polarity, p.mode, pickStatus(ev, p), p.snr, p.questionableTiming ? 'true' : 'false',
      ].map(csvField).join(','));
    }
  }
  return `${lines.join('\n')}\n`;
}
