import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { FIXED_DEPTH_MAX_KM, FIXED_DEPTH_MIN_KM, parseDepthInput, setFixedDepth } from '../../../core/location/reviewDepth';
import { History } from '../../../core/review/edits';
import { parseReview, serializeReview } from '../../../core/review/format';
import type { ReviewDocument, ReviewEvent } from '../../../core/review/types';

const T0 = 1_764_633_600_000_000; // 2025-12-02T00:00:00Z, µs
const ev = (id: string, state: ReviewEvent['state'] = 'todo'): ReviewEvent => ({
  id, source: 'detector', start: T0, end: T0 + 60e6, state, type: null, typeCertainty: null, note: '', picks: [],
});
const DOC: ReviewDocument = { revision: 3, nextSerial: 5, events: [ev('a'), ev('b', 'done')] };

describe('setFixedDepth', () => {
  it('holds one event at a depth, counts the revision up, starts a fresh event and leaves the others and the input alone', () => {
    const d = setFixedDepth(DOC, 'a', 5.5);
    expect(d.revision).toBe(4);
    expect(d.events[0]).toMatchObject({ id: 'a', fixedDepthKm: 5.5, state: 'started' });
    expect(d.events[1]).toBe(DOC.events[1]);
    expect(DOC.events[0].fixedDepthKm).toBeUndefined();
    // a finished event stays finished
    expect(setFixedDepth(DOC, 'b', 0).events[1]).toMatchObject({ state: 'done', fixedDepthKm: 0 });
  });

  it('frees the depth (null) by removing the field, and returns the same document when nothing changes', () => {
    const held = setFixedDepth(DOC, 'a', 7);
    const freed = setFixedDepth(held, 'a', null);
    expect('fixedDepthKm' in freed.events[0]).toBe(false);
    expect(setFixedDepth(held, 'a', 7)).toBe(held);
    expect(setFixedDepth(DOC, 'a', null)).toBe(DOC);
  });

  it('is undone and redone by the review History like any edit', () => {
    const h = new History(DOC);
    h.apply(setFixedDepth(h.doc, 'a', 12));
    expect(h.doc.events[0].fixedDepthKm).toBe(12);
    expect(h.undo()?.events[0].fixedDepthKm).toBeUndefined();
    expect(h.redo()?.events[0].fixedDepthKm).toBe(12);
  });

  it('survives the review file: written as a number Python json reads, read back the same; absent when free', () => {
    const d = setFixedDepth(DOC, 'a', -0.35);
    const text = serializeReview(d);
    // reference reader: CPython's json module
    const py = execFileSync('python3', ['-c', 'import json,sys; e=json.load(sys.stdin)["events"]; print(repr(e[0]["fixedDepthKm"]), "fixedDepthKm" in e[1])'], { input: text }).toString().trim();
    expect(py).toBe('-0.35 False');
    const back = parseReview(text, 'review.json');
    expect(back.events[0].fixedDepthKm).toBe(-0.35);
    expect('fixedDepthKm' in back.events[1]).toBe(false);
    const bad = text.replace('"fixedDepthKm": -0.35', '"fixedDepthKm": 9000');
    expect(() => parseReview(bad, 'review.json')).toThrow(`review.json: $.events[0].fixedDepthKm: expected km from ${FIXED_DEPTH_MIN_KM} to ${FIXED_DEPTH_MAX_KM}`);
  });

  it('rejects unknown events and depths out of range, naming them', () => {
    expect(() => setFixedDepth(DOC, 'nope', 5)).toThrow('no event "nope" in the review');
    expect(() => setFixedDepth(DOC, 'a', 801)).toThrow('fixed depth must be -10 to 800 km, got 801');
    expect(() => setFixedDepth(DOC, 'a', Number.NaN)).toThrow('fixed depth must be -10 to 800 km, got NaN');
  });
});

describe('parseDepthInput', () => {
  it('reads km, metres (1 km = 1000 m, SI), "free" and an empty field', () => {
    expect(parseDepthInput('5')).toEqual({ ok: true, depthKm: 5 });
    expect(parseDepthInput(' 5.5 km ')).toEqual({ ok: true, depthKm: 5.5 });
    expect(parseDepthInput('350 m')).toEqual({ ok: true, depthKm: 0.35 });
    expect(parseDepthInput('-0.3')).toEqual({ ok: true, depthKm: -0.3 });
    expect(parseDepthInput('.5')).toEqual({ ok: true, depthKm: 0.5 });
    expect(parseDepthInput('Free')).toEqual({ ok: true, depthKm: null });
    expect(parseDepthInput('')).toEqual({ ok: true, depthKm: null });
  });

  it('says what to type when it cannot read the text or the depth is out of range', () => {
    expect(parseDepthInput('deep')).toEqual({ ok: false, message: 'depth: type km below the datum (e.g. 5 or 5.5 km, 350 m) or "free", got "deep"' });
    expect(parseDepthInput('900')).toEqual({ ok: false, message: 'depth must be -10 to 800 km, got 900 km' });
  });
});
