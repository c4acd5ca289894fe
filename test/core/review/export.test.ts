import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { EMPTY_REVIEW, addEvent, placePick, setState, setNote, reviewToCsv, reviewToQuakeMl } from '../../../core/review';
import { readQuakeMl } from '../../../core/quakeml';
import { microsFromIso } from '../../../core/time';

function doc() {
  let r = addEvent(EMPTY_REVIEW, microsFromIso('2026-11-14T20:41:00Z'), microsFromIso('2026-11-14T20:42:30Z'));
  const a = r.eventId;
  let d = placePick(r.doc, a, { phase: 'P', channel: 'XX.BRAE.00.HHZ', time: microsFromIso('2026-11-14T20:41:19.870000Z'), polarity: 'positive', onset: 'impulsive' }).doc;
  d = placePick(d, a, { phase: 'S', channel: 'XX.BRAE.00.HHN', time: microsFromIso('2026-11-14T20:41:23.5Z'), lower: 0.1, upper: 0.2 }).doc;
  d = setNote(setState(d, a, 'done'), a, 'felt, "weak"');
  r = addEvent(d, microsFromIso('2026-11-14T22:00:00Z'), microsFromIso('2026-11-14T22:01:00Z'));
  d = placePick(r.doc, r.eventId, { phase: 'P', channel: 'XX.CALD..EHZ', time: microsFromIso('2026-11-14T22:00:10Z') }).doc;
  return { doc: setState(d, r.eventId, 'discarded'), done: a, discarded: r.eventId };
}
const opts = { authority: 'daybreak.test', agencyId: 'XX', author: 'duty analyst', creationTime: microsFromIso('2026-11-15T07:00:00Z') };

describe('review export', () => {
  it('maps review states to QuakeML evaluationStatus: done -> reviewed, discarded -> rejected and type "not existing"', () => {
    const { doc: d } = doc();
    const q = readQuakeMl(reviewToQuakeMl(d, opts), 'x.xml');
    expect(q.events.map((e) => [e.type, e.picks.map((p) => p.evaluationStatus)])).toEqual([
      [null, ['reviewed', 'reviewed']],
      ['not existing', ['rejected']],
    ]);
    expect(q.events[0].picks[0]).toMatchObject({ phaseHint: 'P', onset: 'impulsive', polarity: 'positive', evaluationMode: 'manual', lowerUncertainty: 0.05 });
  });

  it('writes a CSV that Python\'s csv module reads back with the same values', () => {
    // Reference reader: CPython 3.11 csv module.
    const csv = reviewToCsv(doc().doc);
    expect(csv.split('\n')[0]).toMatch(/^# .*preliminary/);
    const out = execFileSync('python3', ['-c', `
import sys, csv, json
rows = list(csv.DictReader(l for l in sys.stdin if not l.startswith('#')))
print(json.dumps([[r['station'], r['phase'], r['time'], r['upper_uncertainty_s'], r['evaluation_status'], r['location']] for r in rows]))`], { input: csv }).toString();
    expect(JSON.parse(out)).toEqual([
      ['BRAE', 'P', '2026-11-14T20:41:19.870000Z', '0.05', 'reviewed', '00'],
      ['BRAE', 'S', '2026-11-14T20:41:23.500000Z', '0.2', 'reviewed', '00'],
      ['CALD', 'P', '2026-11-14T22:00:10.000000Z', '0.05', 'rejected', ''],
    ]);
  });
});
