import { describe, expect, it } from 'vitest';
import { EMPTY_REVIEW, mergeCandidates, movePick, setState } from '../../../core/review';
import type { QmlEvent } from '../../../core/quakeml';
import { microsFromIso } from '../../../core/time';

const T = (s: string) => microsFromIso(`2026-11-14T20:41:${s}Z`);

function candidate(id: string, times: [string, string, 'P' | 'S'][]): QmlEvent {
  return {
    id, type: null, typeCertainty: null, origins: [], preferredOriginId: null,
    picks: times.map(([sta, t, phase], i) => ({
      id: `p${i}`, waveformId: { network: 'XX', station: sta, location: '00', channel: phase === 'P' ? 'HHZ' : 'HHN' },
      time: T(t), lowerUncertainty: 0.03, upperUncertainty: 0.04, phaseHint: phase, onset: 'impulsive', polarity: phase === 'P' ? 'positive' : null,
      evaluationMode: 'automatic', evaluationStatus: 'preliminary', comment: 'snr 12.5',
    })),
  };
}

describe('mergeCandidates', () => {
  it('adds new candidates as events to do, spanning their picks with margins', () => {
    const r = mergeCandidates(EMPTY_REVIEW, [candidate('ev-a', [['BRAE', '19.87', 'P'], ['CALD', '21.00', 'P'], ['BRAE', '23.50', 'S']])]);
    expect(r.added).toBe(1);
    const ev = r.doc.events[0];
    expect(ev).toMatchObject({ id: 'ev-a', source: 'detector', state: 'todo', start: T('19.87') - 20e6, end: T('23.50') + 40e6 });
    expect(ev.picks.map((p) => [p.channel, p.mode, p.snr])).toEqual([['XX.BRAE.00.HHZ', 'automatic', 12.5], ['XX.CALD.00.HHZ', 'automatic', 12.5], ['XX.BRAE.00.HHN', 'automatic', 12.5]]);
  });

  it('refreshes an untouched event after a re-scan with late data, keeping its identity', () => {
    const first = mergeCandidates(EMPTY_REVIEW, [candidate('ev-a', [['BRAE', '19.87', 'P']])]).doc;
    const again = mergeCandidates(first, [candidate('ev-a', [['BRAE', '19.86', 'P'], ['DUNM', '22.10', 'P']])]);
    expect(again.refreshed).toBe(1);
    expect(again.doc.events).toHaveLength(1);
    expect(again.doc.events[0].picks.map((p) => p.time)).toEqual([T('19.86'), T('22.10')]);
  });

  it('leaves an event the analyst has worked on exactly as it is', () => {
    let doc = mergeCandidates(EMPTY_REVIEW, [candidate('ev-a', [['BRAE', '19.87', 'P']])]).doc;
    doc = movePick(doc, 'ev-a', doc.events[0].picks[0].id, T('19.90'));
    doc = setState(doc, 'ev-a', 'done');
    const before = doc.events[0];
    const r = mergeCandidates(doc, [candidate('ev-a', [['BRAE', '19.80', 'P'], ['CALD', '21.0', 'P']]), candidate('ev-b', [['CALD', '40.0', 'P']])]);
    expect(r).toMatchObject({ added: 1, refreshed: 0, keptAsReviewed: 1 });
    expect(r.doc.events.find((e) => e.id === 'ev-a')).toBe(before);
  });
});

describe('candidates from daybreak scan\'s own QuakeML', () => {
  it('keep the SNR and the questionable-timing flag the scan wrote in each pick\'s comment', async () => {
    const { toQmlEvent } = await import('../../../electron/host/cli/scan');
    const { readQuakeMl, writeQuakeMl } = await import('../../../core/quakeml');
    const base = {
      waveformId: { network: 'XX', station: 'MARW', location: '00', channel: 'HHZ' }, lowerUncertainty: 0.05, upperUncertainty: 0.02,
      onset: 'emergent', polarity: 'positive', evaluationMode: 'automatic', evaluationStatus: 'preliminary',
    } as const;
    const ev = toQmlEvent(
      { id: 'XX.20261115T030133', time: T('10.00'), start: T('10.00'), end: T('20.00'), sites: ['XX.MARW', 'XX.DUNM', 'XX.RAVN'], triggers: [], secondary: [] },
      [
        { ...base, phaseHint: 'P', time: T('12.00'), snr: 2.84, questionableTiming: true },
        { ...base, phaseHint: 'P', waveformId: { ...base.waveformId, station: 'DUNM' }, time: T('11.00'), snr: 47.3, questionableTiming: false },
      ],
    );
    const xml = writeQuakeMl({ events: [ev] }, { authority: 'daybreak.test', agencyId: 'XX', author: 'test', creationTime: 0, version: 'test' });
    const picks = mergeCandidates(EMPTY_REVIEW, readQuakeMl(xml, 'scan.xml').events).doc.events[0].picks;
    expect(picks.map((p) => [p.channel, p.snr, p.questionableTiming])).toEqual([['XX.MARW.00.HHZ', 2.8, true], ['XX.DUNM.00.HHZ', 47.3, false]]);
  });

  it('bring in the picks the scan\'s origin left out (time weight 0) as excluded, which the CSV export then names', async () => {
    const { readQuakeMl, writeQuakeMl } = await import('../../../core/quakeml');
    const { reviewToQuakeMl } = await import('../../../core/review');
    const c = candidate('ev-w', [['BRAE', '19.87', 'P'], ['CALD', '21.00', 'P'], ['DUNM', '22.10', 'P'], ['BRAE', '23.50', 'S']]);
    const arrival = (pickId: string, timeWeight: number, timeResidual: number) => ({ pickId, phase: 'P', distanceDeg: 0.1, azimuth: 10, timeResidual, timeWeight });
    c.origins = [{
      id: 'ev-w.o1', time: T('17.00'), timeUncertainty: 0.1, latitude: 46, longitude: 8, depthM: 5000, depthUncertaintyM: 900, depthType: 'from location',
      ellipse: null, horizontalUncertaintyM: 500, quality: null, evaluationMode: 'automatic', evaluationStatus: 'preliminary',
      arrivals: [arrival('p0', 1, 0.01), arrival('p1', 0, 2.4), arrival('p2', 0.8, -0.02), arrival('p3', 1, 0.03)],
    }];
    c.preferredOriginId = 'ev-w.o1';
    const xml = writeQuakeMl({ events: [c] }, { authority: 'daybreak.test', agencyId: 'XX', author: 'test', creationTime: 0, version: 'test' });
    const doc = mergeCandidates(EMPTY_REVIEW, readQuakeMl(xml, 'scan.xml').events).doc;
    expect(doc.events[0].picks.map((p) => [p.channel, p.excluded ?? false])).toEqual([
      ['XX.BRAE.00.HHZ', false], ['XX.CALD.00.HHZ', true], ['XX.DUNM.00.HHZ', false], ['XX.BRAE.00.HHN', false],
    ]);
    // The desk's export without a location keeps the picks; a CSV row says which one is left out.
    const { reviewToCsv } = await import('../../../core/review');
    const rows = reviewToCsv(doc).split('\n').filter((l) => l && !l.startsWith('#'));
    expect(rows[0].split(',').at(-1)).toBe('excluded_from_location');
    expect(rows.slice(1).map((r) => r.split(',').at(-1))).toEqual(['false', 'true', 'false', 'false']);
    expect(readQuakeMl(reviewToQuakeMl(doc, { authority: 'daybreak.test', agencyId: 'XX', author: 'test', creationTime: 0 }), 'x.xml').events[0].picks).toHaveLength(4);
  });
});
