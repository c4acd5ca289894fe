import { describe, expect, it } from 'vitest';
import { EMPTY_REVIEW, addEvent, parseReview, placePick, serializeReview, setEventType, setExcluded, ReviewFileError, moveAmplitude, removeAmplitudes } from '../../../core/review';
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
    expect(raw.version).toBe(3);
    expect(raw.caution).toMatch(/preliminary/);
    expect(raw.events[0].picks[0].time).toBe('2026-12-02T00:00:03.123456Z');
  });

  it('refuses a file from a newer version instead of dropping what it does not know', () => {
    const raw = JSON.parse(serializeReview(sample()));
    raw.version = 4;
    expect(() => parseReview(JSON.stringify(raw), 'r.json')).toThrow(/version 4 was written by a newer Daybreak; this one reads version 3/);
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

  it('stores amplitude edits (moved: time to the microsecond and half-width; removed) and reads them back exactly', () => {
    const doc0 = sample();
    const id = doc0.events[0].id;
    const doc = removeAmplitudes(moveAmplitude(doc0, id, 'ZZ.QRS..HH1', microsFromIso('2026-12-02T00:00:05.432109Z'), 0.075), id, ['ZZ.QRS..HH2']);
    const text = serializeReview(doc);
    expect(JSON.parse(text).events[0].amplitudeEdits).toEqual([
      { channel: 'ZZ.QRS..HH1', kind: 'moved', time: '2026-12-02T00:00:05.432109Z', halfWidth: 0.075 },
      { channel: 'ZZ.QRS..HH2', kind: 'removed' },
    ]);
    expect(parseReview(text, 'r.json')).toEqual(doc);
    // An event without edits has no amplitudeEdits field in the file.
    expect('amplitudeEdits' in JSON.parse(serializeReview(doc0)).events[0]).toBe(false);
  });

  it('still reads a version 1 file (written before amplitude edits), as the same document', () => {
    const raw = JSON.parse(serializeReview(sample()));
    raw.version = 1;
    expect(parseReview(JSON.stringify(raw), 'old.json')).toEqual(sample());
    raw.events[0].amplitudeEdits = [{ channel: 'ZZ.QRS..HH1', kind: 'removed' }];
    expect(() => parseReview(JSON.stringify(raw), 'old.json')).toThrow('old.json: $.events[0].amplitudeEdits: not part of version 1 files');
  });

  it('stores a pick left out of the location (excluded) only when it is, and reads it back exactly', () => {
    const doc0 = sample();
    const ev = doc0.events[0];
    const doc = setExcluded(doc0, ev.id, ev.picks[0].id, true);
    const text = serializeReview(doc);
    expect(JSON.parse(text).events[0].picks[0].excluded).toBe(true);
    expect(parseReview(text, 'r.json')).toEqual(doc);
    expect('excluded' in JSON.parse(serializeReview(doc0)).events[0].picks[0]).toBe(false);
    const raw = JSON.parse(text);
    raw.events[0].picks[0].excluded = 'yes';
    expect(() => parseReview(JSON.stringify(raw), 'r.json')).toThrow('r.json: $.events[0].picks[0].excluded: expected true or false');
    raw.events[0].picks[0].excluded = true;
    raw.version = 2;
    expect(() => parseReview(JSON.stringify(raw), 'old.json')).toThrow('old.json: $.events[0].picks[0].excluded: not part of version 2 files');
  });

  it('still reads a version 2 file (written before picks could be left out) as the same document', () => {
    const raw = JSON.parse(serializeReview(sample()));
    raw.version = 2;
    expect(parseReview(JSON.stringify(raw), 'old.json')).toEqual(sample());
  });

  it('names a bad amplitude edit: unknown kind, half-width out of range, a channel edited twice', () => {
    const raw = JSON.parse(serializeReview(sample()));
    const bad = (edits: unknown[]) => { raw.events[0].amplitudeEdits = edits; return () => parseReview(JSON.stringify(raw), 'r.json'); };
    expect(bad([{ channel: 'ZZ.QRS..HH1', kind: 'nudged' }])).toThrow('r.json: $.events[0].amplitudeEdits[0].kind: expected one of moved, removed, got "nudged"');
    expect(bad([{ channel: 'ZZ.QRS..HH1', kind: 'moved', time: '2026-12-02T00:00:05Z', halfWidth: 3 }])).toThrow('$.events[0].amplitudeEdits[0].halfWidth: expected seconds from 0.001 to 2');
    expect(bad([{ channel: 'ZZ.QRS..HH1', kind: 'removed' }, { channel: 'ZZ.QRS..HH1', kind: 'removed' }])).toThrow('$.events[0].amplitudeEdits[1].channel: ZZ.QRS..HH1 is edited twice');
  });
});
