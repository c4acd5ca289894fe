import { describe, expect, it } from 'vitest';
import type { QmlEvent, QmlOrigin, QmlPick } from '../../../core/quakeml';
import { JOIN_S, leaveOutDuplicates, leaveOutOthersOnsets, originPredictor, type ArrivalPredictor } from '../../../core/scan/duplicates';

// The origin test of core/scan/duplicates.ts: a candidate made of another event's later onsets (far
// sites triggering on its S) is left out when half of its picks lie within 0.5 s of the P or S time
// the better copy's origin predicts. Which copy is kept and which picks move over are worked by hand
// from that rule (Daybreak's own rule: no outside reference decides them). The candidates mirror the
// demo night's 00:31 pair (picks at the two copies' shared site, an S the better copy lacks, a "P"
// read on S, an S read in the coda), with times made up for the test.
//
// Predicted times: straight rays in a half-space with vp 6.0 and vs 3.5 km/s (values chosen for the
// test), source 8 km deep, stations at the datum, t = sqrt(d^2 + 8^2) / v, worked by hand:
//   NN  d 10 km: sqrt(164)  = 12.80625 km -> P  2.13437 s, S  3.65893 s
//   FF  d 40 km: sqrt(1664) = 40.79216 km -> P  6.79869 s, S 11.65490 s
//   GG  d 50 km: sqrt(2564) = 50.63596 km -> P  8.43933 s, S 14.46742 s
//   HH  d 55 km: sqrt(3089) = 55.57877 km -> P  9.26313 s, S 15.87965 s
// (seconds after each origin's time).

const T0 = 1_794_702_706_970_000;
const at = (s: number) => T0 + Math.round(s * 1e6);

const TRAVEL: Record<string, { P: number; S: number }> = {
  'XX.NN': { P: 2.13437, S: 3.65893 },
  'XX.FF': { P: 6.79869, S: 11.65490 },
  'XX.GG': { P: 8.43933, S: 14.46742 },
  'XX.HH': { P: 9.26313, S: 15.87965 },
};

/** The table above from each event's own origin time. */
const predict: ArrivalPredictor = (e, site) => {
  const o = e.origins[0];
  const t = TRAVEL[site];
  return o && t ? { P: o.time + Math.round(t.P * 1e6), S: o.time + Math.round(t.S * 1e6) } : null;
};

function pick(station: string, phase: 'P' | 'S', s: number): QmlPick {
  return {
    id: `${station}.${phase}.${s}`, waveformId: { network: 'XX', station, location: '00', channel: phase === 'P' ? 'HHZ' : 'HHN' }, time: at(s),
    lowerUncertainty: 0.05, upperUncertainty: 0.02, phaseHint: phase, onset: 'emergent', polarity: null,
    evaluationMode: 'automatic', evaluationStatus: 'preliminary', comment: 'SNR 6.0',
  };
}

function event(id: string, picks: QmlPick[], originSeconds: number, standardError: number): QmlEvent {
  const origin: QmlOrigin = {
    id: `${id}.origin`, time: at(originSeconds), timeUncertainty: 0.1, latitude: 43.6445, longitude: 2.8798, depthM: 8000, depthUncertaintyM: 500,
    depthType: 'from location', ellipse: null, horizontalUncertaintyM: 300,
    quality: { usedPhaseCount: picks.length, usedStationCount: 3, standardError, azimuthalGap: 180 }, arrivals: [],
    evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  };
  return { id, type: null, typeCertainty: null, picks, origins: [origin], preferredOriginId: origin.id };
}

/** The better copy: every pick within 0.02 s of the table's times from its origin at 0 s. */
const better = (standardError: number) => event('a', [
  pick('NN', 'P', 2.15), pick('NN', 'S', 3.67), pick('FF', 'P', 6.82), pick('GG', 'P', 8.45), pick('GG', 'S', 14.48),
], 0, standardError);

/**
 * The second copy, located 8.6 s later with a poor fit. Against a's origin: GG P 0.011 s and GG S
 * 0.013 s off (both also a's own picks), FF S 0.045 s off S, HH "P" 0.030 s off S (6.59 s off P),
 * HH S 3.32 s off S (coda): 4 of 5 within 0.5 s of a predicted P or S. Only 2 of 5 lie within 0.15 s
 * of a's picks at the same sites (GG P, GG S), under the shared test's half.
 */
const second = () => event('b', [
  pick('GG', 'P', 8.45), pick('GG', 'S', 14.48), pick('FF', 'S', 11.70), pick('HH', 'P', 15.85), pick('HH', 'S', 19.2),
], 8.6, 2.29);

describe('leaveOutDuplicates, origin test', () => {
  it('leaves out a copy whose picks fit the better copy\'s predicted P or S, and moves over the pick it lacks', () => {
    const a = better(0.27);
    const r = leaveOutDuplicates([a, second()], predict);
    expect(r.kept.map((e) => e.id)).toEqual(['a']);
    expect(r.dropped).toEqual([{ id: 'b', duplicateOf: 'a', reason: 'fits origin' }]);
    // Joining goes by phase hint: FF S (0.045 s off a's S) joins; HH "P" is 6.59 s off a's P and HH
    // S 3.32 s off its S, so neither does; GG's P and S are a's already.
    expect(a.picks.map((p) => `${p.waveformId.station} ${p.phaseHint} ${(p.time - T0) / 1e6}`)).toEqual([
      'NN P 2.15', 'NN S 3.67', 'FF P 6.82', 'GG P 8.45', 'GG S 14.48', 'FF S 11.7',
    ]);
    expect(a.picks[5].comment).toBe('SNR 6.0; from candidate b, the same event read twice');
  });

  it('uses no origin that fits its own picks worse than 0.5 s, and none without a predictor', () => {
    // a still ranks first (0.51 < 2.29 s) but predicts nothing: 2 of 5 shared picks keep both.
    const poor = leaveOutDuplicates([better(0.51), second()], predict);
    expect(poor.kept.map((e) => e.id)).toEqual(['a', 'b']);
    expect(poor.kept[0].picks).toHaveLength(5);
    expect(leaveOutDuplicates([better(0.5), second()], predict).dropped.map((d) => d.id)).toEqual(['b']);
    expect(leaveOutDuplicates([better(0.27), second()]).kept.map((e) => e.id)).toEqual(['a', 'b']);
  });

  it('needs half of the other copy\'s picks, and at least two, within 0.5 s of a predicted time', () => {
    // One fits (GG P 0.011 s off); FF S 12.26 (0.605 s off S), HH S 16.48 (0.600 s off S) and NN S
    // 4.26 (0.601 s off S) do not: kept.
    const oneFits = event('c', [pick('GG', 'P', 8.45), pick('FF', 'S', 12.26), pick('HH', 'S', 16.48), pick('NN', 'S', 4.26)], 9, 1.5);
    expect(leaveOutDuplicates([better(0.27), oneFits], predict).kept.map((e) => e.id)).toEqual(['a', 'c']);
    // Two of four fit (GG P, and FF S 11.70 at 0.045 s): half, so left out.
    const twoFit = event('d', [pick('GG', 'P', 8.45), pick('FF', 'S', 11.70), pick('HH', 'S', 16.48), pick('NN', 'S', 4.26)], 9, 1.5);
    expect(leaveOutDuplicates([better(0.27), twoFit], predict).dropped).toEqual([{ id: 'd', duplicateOf: 'a', reason: 'fits origin' }]);
    // A "P" read on S counts: GG P and HH "P" 15.85 (0.030 s off S, 6.59 s off P) of four.
    const onS = event('f', [pick('GG', 'P', 8.45), pick('HH', 'P', 15.85), pick('HH', 'S', 16.48), pick('NN', 'S', 4.26)], 9, 1.5);
    expect(leaveOutDuplicates([better(0.27), onS], predict).dropped.map((d) => d.id)).toEqual(['f']);
    // A lone candidate pick that fits is not enough: 1 of 1.
    const lone = event('e', [pick('FF', 'S', 11.70)], 9, 1.5);
    expect(leaveOutDuplicates([better(0.27), lone], predict).kept.map((x) => x.id)).toEqual(['a', 'e']);
  });

  it('tries only the worse copy\'s picks against the better copy\'s origin', () => {
    // c fits its own picks better (0.1 s) than a (0.27 s), so a is the copy tried, against c's origin
    // 9 s later: a's picks lie 2.96-8.99 s from c's predicted P and S (GG S 14.48 against GG P
    // 17.439 the nearest), none within 0.5 s, and only GG P is shared: both kept, although two of
    // c's four picks (GG P, FF S 11.70) fit a's origin.
    const c = event('c', [pick('GG', 'P', 8.45), pick('FF', 'S', 11.70), pick('HH', 'S', 24.88), pick('NN', 'S', 12.66)], 9, 0.1);
    expect(leaveOutDuplicates([better(0.27), c], predict).kept.map((e) => e.id)).toEqual(['a', 'c']);
  });
});

describe('originPredictor', () => {
  it('predicts P and S from the preferred origin in the velocity model', () => {
    // A site at the epicentre, at the datum, over a source 8 km deep in a half-space of vp 6.0 and
    // vs 3.5 km/s: a vertical ray, P 8 / 6 = 1.333333 s and S 8 / 3.5 = 2.285714 s after the origin.
    const sites = new Map([['XX.AA', { latitude: 43.6445, longitude: 2.8798, elevation: 0 }]]);
    const p = originPredictor(sites, { layers: [{ topKm: 0, vp: 6.0, vs: 3.5 }] });
    const t = p(better(0.27), 'XX.AA');
    expect(t).not.toBeNull();
    expect((t!.P - T0) / 1e6).toBeCloseTo(1.333333, 5);
    expect((t!.S - T0) / 1e6).toBeCloseTo(2.285714, 5);
    expect(p(better(0.27), 'XX.ZZ')).toBeNull();
  });
});

// A candidate found inside another's coincidence window (core/pick unexplainedTriggers) keeps only
// the picks that are not the first event's onsets: a pick within JOIN_S (0.5 s) of the P or S time
// the first event's origin predicts at its site is the first event's. Daybreak's own rule: the
// expected picks are worked by hand from it and the table above (first event's origin at 0 s).
describe('leaveOutOthersOnsets: a second event\'s picks less the first event\'s onsets', () => {
  const first = better(0.05);
  const picks = [
    pick('NN', 'P', 3.70), // 3.70 - 3.65893 = 0.041 s after the first's S: the first's S read as P, left out
    pick('NN', 'S', 5.00), // 5.00 - 3.65893 = 1.341 s after it: kept
    pick('FF', 'P', 7.30), // 7.30 - 6.79869 = 0.50131 s after the first's P: just outside 0.5 s, kept
    pick('FF', 'S', 12.15), // 12.15 - 11.65490 = 0.4951 s after the first's S: left out
    pick('ZZ', 'P', 4.00), // no prediction at ZZ: kept
  ];
  const names = (list: readonly QmlPick[]) => list.map((p) => `${p.waveformId.station} ${p.phaseHint}`);

  it('drops the picks within 0.5 s of the first origin\'s predicted P or S at their site, whatever their phase', () => {
    expect(JOIN_S).toBe(0.5);
    expect(names(leaveOutOthersOnsets(picks, [first], predict))).toEqual(['NN S', 'FF P', 'ZZ P']);
  });

  it('takes the bound as given, and keeps everything when there is no earlier event', () => {
    expect(names(leaveOutOthersOnsets(picks, [first], predict, 0.502))).toEqual(['NN S', 'ZZ P']);
    expect(names(leaveOutOthersOnsets(picks, [first], predict, 0.04))).toEqual(['NN P', 'NN S', 'FF P', 'FF S', 'ZZ P']);
    expect(leaveOutOthersOnsets(picks, [], predict).length).toBe(5);
    expect(() => leaveOutOthersOnsets(picks, [first], predict, -0.1)).toThrow(/joinSeconds must be >= 0, got -0.1/);
  });
});
