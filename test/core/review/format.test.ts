import { describe, expect, it } from 'vitest';
import { EMPTY_REVIEW, addEvent, parseReview, placePick, serializeReview, setEventType, ReviewFileError } from '../../../core/review';
import { microsFromIso } from '../../../core/time';

function sample() {
  const added = addEvent(EMPTY_REVIEW, microsFromIso('2026-12-01T23:59:50.000001Z'), microsFromIso('2026-12-02T00:00:40Z'));
  const { eventId } = added;
  const doc = placePick(added.doc, eventId, { phase: 'S', channel: 'ZZ.QRS..HH1', time: microsFromIso('2026-12-02T00:00:03.123456Z'), lower: 0.1, upper: 0.25 }).doc;
  return setEventType(doc, eventId, 'earthquake', 'known');
}

describe('review file', () => {
  it('reads back exactly what it wrote, times to the microsecond across midnight', () => {
    const doc = sample();
    expect(parseReview(serializeReview(doc), 'r.json')).toEqual(doc);
  });

  it('carries the format name, version and the preliminary-results caution', () => {
    const raw = JSON.parse(serializeReview(sample()));
    expect(raw.format).toBe('daybreak-review');
    expect(raw.version).toBe(1);
    expect(raw.caution).toMatch(/preliminary/);
    expect(raw.events[0].picks[0].time).toBe('2026-12-02T00:00:03.123456Z');
  });

  it('refuses a file from a newer version instead of dropping what it does not know', () => {
    const raw = JSON.parse(serializeReview(sample()));
    raw.version = 2;
    expect(() => parseReview(JSON.stringify(raw), 'r.json')).toThrow(/version 2 was written by a newer Daybreak/);
  });

  it('names the file and the JSON path of a bad value', () => {
    const raw = JSON.parse(serializeReview(sample()));
    raw.events[0].picks[0].onset = 'sudden';
    try {
      parseReview(JSON.stringify(raw), 'night.review.json');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ReviewFileError);
      expect((e as Error).message).toBe('night.review.json: $.events[0].picks[0].onset: expected one of impulsive, emergent, questionable, got "sudden"');
    }
    expect(() => parseReview('{"format":', 'x.json')).toThrow(/x.json: whole file: not JSON/);
  });
});
