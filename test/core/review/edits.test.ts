import { describe, expect, it } from 'vitest';
import {
  EMPTY_REVIEW, History, acceptAutomatic, addEvent, deletePick, mergeEvents, movePick, placePick, quakemlStatus,
  setEventType, setExcluded, setPickAttributes, setState, setUncertainty, splitEvent, type ReviewDocument, type ReviewPick,
  moveAmplitude, removeAmplitudes, restoreAmplitudes, amplitudeEditOf,
} from '../../../core/review';
import { microsFromIso } from '../../../core/time';

const T = (s: string) => microsFromIso(`2026-12-01T21:04:${s}Z`);

function withOneEvent(): { doc: ReviewDocument; id: string } {
  const { doc, eventId } = addEvent(EMPTY_REVIEW, T('00.000000'), T('50.000000'));
  return { doc, id: eventId };
}

const automatic = (id: string, channel: string, time: number): ReviewPick => ({
  id, phase: 'P', channel, time, lower: 0.02, upper: 0.03, onset: 'impulsive', polarity: 'positive',
  mode: 'automatic', status: 'preliminary', snr: 14, questionableTiming: false,
});

describe('review edits', () => {
  it('placePick adds a manual pick with the default uncertainty and undecidable polarity for P', () => {
    const { doc, id } = withOneEvent();
    const { doc: d2, pickId } = placePick(doc, id, { phase: 'P', channel: 'ZZ.QRS.00.HHZ', time: T('10.250000') });
    const p = d2.events[0].picks.find((x) => x.id === pickId)!;
    expect(p).toMatchObject({ mode: 'manual', status: 'preliminary', lower: 0.05, upper: 0.05, polarity: 'undecidable', onset: 'questionable' });
    expect(d2.revision).toBe(doc.revision + 1);
    expect(doc.events[0].picks).toEqual([]); // input untouched
  });

  it('placing a second P at the same site replaces the first; an S is kept beside it', () => {
    let { doc } = withOneEvent();
    const id = doc.events[0].id;
    doc = placePick(doc, id, { phase: 'P', channel: 'ZZ.QRS.00.HHZ', time: T('10.000000') }).doc;
    doc = placePick(doc, id, { phase: 'S', channel: 'ZZ.QRS.00.HHN', time: T('12.000000') }).doc;
    doc = placePick(doc, id, { phase: 'P', channel: 'ZZ.QRS.00.HHZ', time: T('10.500000') }).doc;
    expect(doc.events[0].picks.map((p) => [p.phase, p.time])).toEqual([['S', T('12.000000')], ['P', T('10.500000')]]);
  });

  it('moving an automatic pick makes it manual; accepting keeps it automatic with status confirmed', () => {
    let { doc } = withOneEvent();
    const id = doc.events[0].id;
    doc = { ...doc, events: [{ ...doc.events[0], picks: [automatic('a1', 'ZZ.A..HHZ', T('05.000000')), automatic('a2', 'ZZ.B..HHZ', T('06.000000'))] }] };
    const moved = movePick(doc, id, 'a1', T('05.120000'));
    expect(moved.events[0].picks[0]).toMatchObject({ mode: 'manual', time: T('05.120000'), snr: null });
    const accepted = acceptAutomatic(moved, id);
    expect(accepted.events[0].picks.map((p) => [p.mode, p.status])).toEqual([['manual', 'preliminary'], ['automatic', 'confirmed']]);
  });

  it('leaves a pick out of the location and takes it back, keeping its mode and status; moving it uses it again', () => {
    const { doc: d0, id } = withOneEvent();
    const doc = { ...d0, events: [{ ...d0.events[0], state: 'todo' as const, picks: [automatic('a1', 'ZZ.QRS.00.HHZ', T('10.000000')), automatic('a2', 'ZZ.TUV.00.HHZ', T('11.000000'))] }] };
    const out = setExcluded(doc, id, 'a2', true);
    expect(out.events[0].picks[1]).toEqual({ ...automatic('a2', 'ZZ.TUV.00.HHZ', T('11.000000')), excluded: true });
    expect(out.events[0].picks[0]).toBe(doc.events[0].picks[0]);
    expect(out.events[0].state).toBe('started');
    expect(out.revision).toBe(doc.revision + 1);
    expect(doc.events[0].picks[1].excluded).toBeUndefined(); // input untouched
    // taken back: the field is gone, the pick is as it was
    expect(setExcluded(out, id, 'a2', false).events[0].picks[1]).toEqual(automatic('a2', 'ZZ.TUV.00.HHZ', T('11.000000')));
    // a moved pick is a new reading: manual, and used again
    const moved = movePick(out, id, 'a2', T('11.250000')).events[0].picks[1];
    expect(moved).toMatchObject({ mode: 'manual', time: T('11.250000') });
    expect('excluded' in moved).toBe(false);
    expect(() => setExcluded(out, id, 'nope', true)).toThrow('no pick "nope" in event');
  });

  it('sets uncertainty, onset and polarity, and refuses an uncertainty outside 0-60 s', () => {
    const { doc, id } = withOneEvent();
    const { doc: d1, pickId } = placePick(doc, id, { phase: 'P', channel: 'ZZ.A..HHZ', time: T('05.000000') });
    const d2 = setPickAttributes(setUncertainty(d1, id, pickId, 0.01, 0.2), id, pickId, { onset: 'impulsive', polarity: 'negative' });
    expect(d2.events[0].picks[0]).toMatchObject({ lower: 0.01, upper: 0.2, onset: 'impulsive', polarity: 'negative' });
    expect(() => setUncertainty(d1, id, pickId, -1, 0.1)).toThrow(/lower uncertainty must be 0 to 60 s, got -1/);
  });

  it('names the missing event or pick', () => {
    const { doc, id } = withOneEvent();
    expect(() => deletePick(doc, id, 'nope')).toThrow(`no pick "nope" in event "${id}"`);
    expect(() => setState(doc, 'ghost', 'done')).toThrow('no event "ghost" in the review');
  });

  it('merges two candidates into one and splits one into two at a time', () => {
    let doc = addEvent(EMPTY_REVIEW, T('00.000000'), T('20.000000')).doc;
    doc = addEvent(doc, T('15.000000'), T('40.000000')).doc;
    const [a, b] = doc.events.map((e) => e.id);
    doc = placePick(doc, a, { phase: 'P', channel: 'ZZ.A..HHZ', time: T('05.000000') }).doc;
    doc = placePick(doc, b, { phase: 'P', channel: 'ZZ.A..HHZ', time: T('30.000000') }).doc;
    doc = placePick(doc, b, { phase: 'P', channel: 'ZZ.B..HHZ', time: T('31.000000') }).doc;
    const merged = mergeEvents(doc, a, b);
    expect(merged.events).toHaveLength(1);
    expect(merged.events[0]).toMatchObject({ start: T('00.000000'), end: T('40.000000') });
    // Site A's P from the first event is kept; site B's comes over.
    expect(merged.events[0].picks.map((p) => p.time)).toEqual([T('05.000000'), T('31.000000')]);
    const split = splitEvent(merged, a, T('20.000000'));
    expect(split.doc.events.map((e) => [e.start, e.end, e.picks.length])).toEqual([
      [T('00.000000'), T('20.000000'), 1], [T('20.000000'), T('40.000000'), 1],
    ]);
  });

  it('gives a type with certainty and maps review states to QuakeML evaluationStatus', () => {
    const { doc, id } = withOneEvent();
    expect(setEventType(doc, id, 'quarry blast', 'suspected').events[0]).toMatchObject({ type: 'quarry blast', typeCertainty: 'suspected' });
    // QuakeML 1.2 EvaluationStatus values: preliminary, confirmed, reviewed, final, rejected.
    expect(['todo', 'started', 'done', 'discarded'].map((s) => quakemlStatus(s as never))).toEqual(['preliminary', 'preliminary', 'reviewed', 'rejected']);
  });

  it('undo and redo walk the edits back and forth, each step a new revision', () => {
    const { doc, id } = withOneEvent();
    const h = new History(doc);
    const { doc: d1, pickId } = placePick(h.doc, id, { phase: 'P', channel: 'ZZ.A..HHZ', time: T('05.000000') });
    h.apply(d1);
    h.apply(movePick(h.doc, id, pickId, T('05.500000')));
    expect(h.undo()!.events[0].picks[0].time).toBe(T('05.000000'));
    expect(h.undo()!.events[0].picks).toEqual([]);
    expect(h.undo()).toBeNull();
    expect(h.redo()!.events[0].picks[0].time).toBe(T('05.000000'));
    // move, undo, undo, redo: four changes after d1, each saved as a newer revision.
    expect(h.doc.revision).toBe(d1.revision + 4);
    h.apply(deletePick(h.doc, id, pickId));
    expect(h.canRedo).toBe(false);
  });

  it('moving an amplitude records where it was dropped and the search half-width, replacing an earlier edit of the channel', () => {
    const { doc, id } = withOneEvent();
    const d1 = moveAmplitude(doc, id, 'ZZ.A.00.HHN', T('12.000000'), 0.08);
    const d2 = moveAmplitude(d1, id, 'ZZ.A.00.HHN', T('12.400000'), 0.05);
    expect(d2.events[0].amplitudeEdits).toEqual([{ channel: 'ZZ.A.00.HHN', kind: 'moved', time: T('12.400000'), halfWidth: 0.05 }]);
    expect(d2.events[0].state).toBe('started');
    expect(d2.revision).toBe(doc.revision + 2);
    expect(doc.events[0].amplitudeEdits).toBeUndefined(); // input untouched
    expect(() => moveAmplitude(doc, id, 'ZZ.A.00.HHN', T('12.000000'), 0)).toThrow('amplitude half width must be 0.001 to 2 s, got 0');
    expect(() => moveAmplitude(doc, id, 'HHN', T('12.000000'), 0.1)).toThrow('channel must be "NET.STA.LOC.CHA", got "HHN"');
    expect(() => moveAmplitude(doc, id, 'ZZ.A.00.HHN', 1.5, 0.1)).toThrow('amplitude time must be integer microseconds, got 1.5');
  });

  it('removing a station\'s amplitudes replaces a move of the same channel; restoring drops the edits and names a channel without one', () => {
    const { doc, id } = withOneEvent();
    let d = moveAmplitude(doc, id, 'ZZ.A.00.HHN', T('12.000000'), 0.08);
    d = moveAmplitude(d, id, 'ZZ.B.00.HHE', T('13.000000'), 0.08);
    d = removeAmplitudes(d, id, ['ZZ.A.00.HHN', 'ZZ.A.00.HHE']);
    expect(d.events[0].amplitudeEdits).toEqual([
      { channel: 'ZZ.B.00.HHE', kind: 'moved', time: T('13.000000'), halfWidth: 0.08 },
      { channel: 'ZZ.A.00.HHN', kind: 'removed' }, { channel: 'ZZ.A.00.HHE', kind: 'removed' },
    ]);
    expect(amplitudeEditOf(d.events[0], 'ZZ.A.00.HHE')).toEqual({ channel: 'ZZ.A.00.HHE', kind: 'removed' });
    const r = restoreAmplitudes(d, id, ['ZZ.A.00.HHN', 'ZZ.A.00.HHE']);
    expect(r.events[0].amplitudeEdits).toEqual([{ channel: 'ZZ.B.00.HHE', kind: 'moved', time: T('13.000000'), halfWidth: 0.08 }]);
    // The last edit restored leaves no field behind: the event is as if never edited.
    expect('amplitudeEdits' in restoreAmplitudes(r, id, ['ZZ.B.00.HHE']).events[0]).toBe(false);
    expect(() => restoreAmplitudes(r, id, ['ZZ.A.00.HHN'])).toThrow(`the amplitude of ZZ.A.00.HHN in event "${id}" is not edited`);
    expect(() => removeAmplitudes(r, id, [])).toThrow('name at least one channel whose amplitude to remove');
  });

  it('undo brings a removed amplitude back and redo removes it again', () => {
    const { doc, id } = withOneEvent();
    const h = new History(doc);
    h.apply(removeAmplitudes(h.doc, id, ['ZZ.A.00.HHN']));
    expect(h.doc.events[0].amplitudeEdits).toEqual([{ channel: 'ZZ.A.00.HHN', kind: 'removed' }]);
    expect(h.undo()!.events[0].amplitudeEdits).toBeUndefined();
    expect(h.redo()!.events[0].amplitudeEdits).toEqual([{ channel: 'ZZ.A.00.HHN', kind: 'removed' }]);
  });

  it('merging pools amplitude edits (the first event\'s win); splitting sends a moved amplitude to the part holding its time', () => {
    let doc = addEvent(EMPTY_REVIEW, T('00.000000'), T('20.000000')).doc;
    doc = addEvent(doc, T('15.000000'), T('40.000000')).doc;
    const [a, b] = doc.events.map((e) => e.id);
    doc = moveAmplitude(doc, a, 'ZZ.A.00.HHN', T('08.000000'), 0.1);
    doc = removeAmplitudes(doc, a, ['ZZ.C.00.HHN']);
    doc = moveAmplitude(doc, b, 'ZZ.A.00.HHN', T('33.000000'), 0.1);
    doc = moveAmplitude(doc, b, 'ZZ.B.00.HHE', T('35.000000'), 0.1);
    const merged = mergeEvents(doc, a, b);
    expect(merged.events[0].amplitudeEdits!.map((e) => [e.channel, e.kind === 'moved' ? e.time : 'removed'])).toEqual([
      ['ZZ.A.00.HHN', T('08.000000')], ['ZZ.C.00.HHN', 'removed'], ['ZZ.B.00.HHE', T('35.000000')],
    ]);
    const split = splitEvent(merged, a, T('20.000000')).doc;
    expect(split.events[0].amplitudeEdits!.map((e) => e.channel)).toEqual(['ZZ.A.00.HHN', 'ZZ.C.00.HHN']);
    expect(split.events[1].amplitudeEdits!.map((e) => e.channel)).toEqual(['ZZ.B.00.HHE']);
  });
});
