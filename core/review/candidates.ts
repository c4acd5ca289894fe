/**
 * Bringing the detector's candidate events (from `daybreak scan`'s QuakeML, or from a scan run in
 * the app) into a review without losing the analyst's work. Events are matched by their stable
 * identifier:
 * - a new identifier adds an event in state `todo` with the candidate's picks;
 * - a known event still in `todo` (nobody has touched it) takes the new automatic picks (a re-scan
 *   after late data) and keeps any manual ones;
 * - a known event the analyst has started, finished or discarded is left exactly as it is.
 * A candidate's pick that its preferred origin gave time weight 0 (the scan's location left it out,
 * as an outlier or a pick on a record with questionable timing) comes in `excluded`, so the desk
 * locates the candidate with the picks the scan used and shows the others with their residuals.
 */
import { channelKey } from '../model';
import { readPickComment } from '../quakeml/pickComment';
import { preferredOrigin } from '../quakeml/preferred';
import type { QmlEvent } from '../quakeml/types';
import type { ReviewDocument, ReviewEvent, ReviewPick } from './types';

/** Seconds shown before the first pick and after the last one of a candidate. */
export const CANDIDATE_PAD_BEFORE_S = 20;
export const CANDIDATE_PAD_AFTER_S = 40;

export interface CandidateMerge {
  doc: ReviewDocument;
  added: number;
  refreshed: number;
  keptAsReviewed: number;
}

/** QuakeML ids of the picks the event's preferred origin (else its first) gave time weight 0. */
function leftOutByOrigin(e: QmlEvent): Set<string> {
  const origin = preferredOrigin(e);
  return new Set((origin?.arrivals ?? []).filter((a) => a.timeWeight === 0).map((a) => a.pickId));
}

function picksOf(e: QmlEvent): ReviewPick[] {
  const leftOut = leftOutByOrigin(e);
  return e.picks
    .filter((p) => p.phaseHint === 'P' || p.phaseHint === 'S')
    .map((p) => ({
      id: `${e.id}.${p.id}`,
      phase: p.phaseHint as 'P' | 'S',
      channel: channelKey(p.waveformId),
      time: p.time,
      lower: Math.min(60, Math.max(0, p.lowerUncertainty ?? 0.05)),
      upper: Math.min(60, Math.max(0, p.upperUncertainty ?? 0.05)),
      onset: p.onset ?? 'questionable',
      polarity: p.phaseHint === 'P' ? p.polarity ?? 'undecidable' : p.polarity,
      mode: p.evaluationMode,
      status: p.evaluationStatus,
      ...commentFlags(p.comment),
      ...(leftOut.has(p.id) ? { excluded: true } : {}),
    }));
}

/** SNR and the timing flag from a pick's comment (core/quakeml pickComment); a non-finite SNR as null. */
function commentFlags(comment: string | undefined): { snr: number | null; questionableTiming: boolean } {
  const { snr, questionableTiming } = readPickComment(comment);
  return { snr: snr !== null && Number.isFinite(snr) ? snr : null, questionableTiming };
}

function span(picks: readonly ReviewPick[], fallback: [number, number]): [number, number] {
  if (picks.length === 0) return fallback;
  let lo = Infinity;
  let hi = -Infinity;
  for (const p of picks) { lo = Math.min(lo, p.time); hi = Math.max(hi, p.time); }
  return [lo - CANDIDATE_PAD_BEFORE_S * 1e6, hi + CANDIDATE_PAD_AFTER_S * 1e6];
}

export function mergeCandidates(doc: ReviewDocument, candidates: readonly QmlEvent[]): CandidateMerge {
  const byId = new Map(doc.events.map((e) => [e.id, e]));
  let added = 0;
  let refreshed = 0;
  let keptAsReviewed = 0;
  for (const c of candidates) {
    const picks = picksOf(c);
    const had = byId.get(c.id);
    if (!had) {
      const origin = preferredOrigin(c);
      const [start, end] = span(picks, origin ? [origin.time - 10e6, origin.time + 60e6] : [0, 0]);
      if (end <= start) continue;
      const ev: ReviewEvent = { id: c.id, source: 'detector', start, end, state: 'todo', type: null, typeCertainty: null, note: '', picks };
      byId.set(c.id, ev);
      added++;
    } else if (had.state === 'todo') {
      const manual = had.picks.filter((p) => p.mode === 'manual');
      const all = [...manual, ...picks.filter((p) => !manual.some((m) => m.phase === p.phase && m.channel.split('.').slice(0, 2).join('.') === p.channel.split('.').slice(0, 2).join('.')))];
      const [start, end] = span(all, [had.start, had.end]);
      byId.set(c.id, { ...had, start, end, picks: all });
      refreshed++;
    } else {
      keptAsReviewed++;
    }
  }
  const events = [...byId.values()].sort((a, b) => a.start - b.start);
  return { doc: { ...doc, revision: doc.revision + 1, events }, added, refreshed, keptAsReviewed };
}
