import { describe, expect, it } from 'vitest';
import type { QmlEvent, QmlOrigin, QmlPick } from '../../../core/quakeml';
import { leaveOutDuplicates, type ArrivalPredictor } from '../../../core/scan/duplicates';

// Candidates made by hand; which copy is kept and which picks move over are worked from the rule in
// core/scan/duplicates.ts (Daybreak's own rule: no outside reference decides which copy to keep).

const T0 = 1_794_694_650_000_000;
const at = (s: number) => T0 + Math.round(s * 1e6);

function pick(station: string, phase: 'P' | 'S', s: number): QmlPick {
  return {
    id: `${station}.${phase}`, waveformId: { network: 'XX', station, location: '00', channel: phase === 'P' ? 'HHZ' : 'HHN' }, time: at(s),
    lowerUncertainty: 0.05, upperUncertainty: 0.02, phaseHint: phase, onset: 'emergent', polarity: null,
    evaluationMode: 'automatic', evaluationStatus: 'preliminary', comment: 'SNR 8.0',
  };
}

function event(id: string, picks: QmlPick[], standardError: number | null): QmlEvent {
  const origin: QmlOrigin | null = standardError === null ? null : {
    id: `${id}.origin`, time: at(0), timeUncertainty: 0.1, latitude: 43.3, longitude: 2.9, depthM: 3000, depthUncertaintyM: 500,
    depthType: 'from location', ellipse: null, horizontalUncertaintyM: 300,
    quality: { usedPhaseCount: picks.length, usedStationCount: 3, standardError, azimuthalGap: 180 }, arrivals: [],
    evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  };
  return { id, type: null, typeCertainty: null, picks, origins: origin ? [origin] : [], preferredOriginId: origin ? origin.id : null };
}

/** Predicted times at every site (s after T0), the same for every event: P at 2 s, S at 3.5 s. */
const predict: ArrivalPredictor = () => ({ P: at(2), S: at(3.5) });

describe('leaveOutDuplicates', () => {
  it('keeps the better-fitting copy of an event read twice and moves over the extra picks that fit its origin', () => {
    const a = event('a', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5), pick('CC', 'P', 2.0), pick('CC', 'S', 3.4)], 0.05);
    // b: three of its five picks within 0.15 s of a's at the same site (CC's S read as P: any phase counts).
    const b = event('b', [pick('BB', 'P', 1.55), pick('CC', 'P', 3.45), pick('AA', 'S', 1.1), pick('DD', 'S', 3.7), pick('EE', 'P', 4.0)], 3.0);
    const r = leaveOutDuplicates([b, a], predict);
    expect(r.kept.map((e) => e.id)).toEqual(['a']);
    expect(r.dropped).toEqual([{ id: 'b', duplicateOf: 'a', reason: 'same picks' }]);
    // DD's S (3.7 s) lies 0.2 s from a's predicted S: it joins; EE's P (4.0 s) lies 2 s from the
    // predicted P: it does not; AA's S (1.1 s) is 2.4 s from the predicted S: it does not.
    const moved = a.picks.slice(4);
    expect(moved.map((p) => [p.waveformId.station, p.phaseHint])).toEqual([['DD', 'S']]);
    expect(moved[0].comment).toBe('SNR 8.0; from candidate b, the same event read twice');
  });

  it('needs half of one copy\'s picks, and at least two, to lie within 0.15 s of the other\'s at the same sites', () => {
    const a = event('a', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5), pick('CC', 'P', 2.0), pick('DD', 'P', 2.5)], 0.05);
    const one = event('one', [pick('AA', 'P', 1.05), pick('EE', 'P', 9), pick('FF', 'P', 9.5)], 0.1); // one shared of three
    const far = event('far', [pick('AA', 'P', 1.2), pick('BB', 'P', 1.7), pick('CC', 'P', 2.2)], 0.1); // 0.2 s apart
    // No predictor: the shared-pick test alone (this predictor, P at 2 s at every site, would find
    // far's BB and CC picks within 0.5 s of a's origin; the origin test is duplicatesOrigin.test.ts's).
    expect(leaveOutDuplicates([a, one, far]).kept.map((e) => e.id)).toEqual(['a', 'one', 'far']);
    const two = event('two', [pick('AA', 'P', 1.05), pick('BB', 'P', 1.45), pick('FF', 'P', 9.5), pick('GG', 'P', 9.9)], 0.1); // two of four
    expect(leaveOutDuplicates([a, two], predict).dropped).toEqual([{ id: 'two', duplicateOf: 'a', reason: 'same picks' }]);
  });

  it('prefers a located copy to one that is not, then the one with more picks', () => {
    const located = event('located', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5)], 2.5);
    const bare = event('bare', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5), pick('CC', 'P', 2.0)], null);
    expect(leaveOutDuplicates([bare, located]).kept.map((e) => e.id)).toEqual(['located']);
    const small = event('small', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5)], null);
    expect(leaveOutDuplicates([small, bare]).kept.map((e) => e.id)).toEqual(['bare']);
  });

  it('never compares two candidates already told apart as two events', () => {
    // first: a first event located again without second's onsets; second: the event split from it.
    // Two of first's four picks lie within 0.15 s of second's at the same sites (AA 0.05 s, BB 0.1 s
    // apart), so without the pair the better-fitting second keeps them both as one event read twice.
    const first = event('first', [pick('AA', 'P', 1.0), pick('BB', 'P', 1.5), pick('CC', 'P', 6.0), pick('EE', 'S', 6.5)], 0.3);
    const second = event('second', [pick('AA', 'P', 1.05), pick('BB', 'P', 1.6), pick('DD', 'P', 8.0)], 0.05);
    expect(leaveOutDuplicates([first, second], predict).dropped).toEqual([{ id: 'first', duplicateOf: 'second', reason: 'same picks' }]);
    const told = leaveOutDuplicates([first, second], predict, undefined, undefined, undefined, [[first, second]]);
    expect(told.kept.map((e) => e.id)).toEqual(['first', 'second']);
    expect(told.dropped).toEqual([]);
    // The pair is one way round or the other; a copy of first (two of its three picks within 0.15 s
    // of first's CC and EE, none near second's or the predicted 2 / 3.5 s) is still left out.
    const copy = event('copy', [pick('CC', 'P', 6.05), pick('EE', 'S', 6.45), pick('FF', 'P', 7.0)], 0.4);
    expect(leaveOutDuplicates([first, second, copy], predict, undefined, undefined, undefined, [[second, first]]).dropped)
      .toEqual([{ id: 'copy', duplicateOf: 'first', reason: 'same picks' }]);
  });
});
