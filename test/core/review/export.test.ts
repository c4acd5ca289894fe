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

describe('review export with locations', () => {
  it('adds each located event\'s origin as the preferred one, its arrivals pointing at the exported picks', async () => {
    const { DEFAULT_MODEL, firstArrival, locateReviewEvent } = await import('../../../core/location');
    const { toLocalKm, localProjection } = await import('../../../core/location/projection');
    // Sites on a 20 km ring; times from the textbook-checked travel times (travelTime.test.ts) over the
    // project's local projection (checked against Vincenty in projection.test.ts).
    const centre = { latitude: 45, longitude: 7 };
    const proj = localProjection(centre.latitude, centre.longitude);
    const sites = new Map<string, { latitude: number; longitude: number; elevation: number }>();
    for (let i = 0; i < 6; i++) {
      const a = (i * Math.PI) / 3;
      sites.set(`XX.R${i}`, { latitude: 45 + (0.18 * Math.cos(a)), longitude: 7 + (0.25 * Math.sin(a)), elevation: 0 });
    }
    const t0 = microsFromIso('2026-11-14T21:00:00Z');
    let r = addEvent(EMPTY_REVIEW, t0 - 10e6, t0 + 60e6);
    let d = r.doc;
    for (const [key, s] of sites) {
      const [e, n] = toLocalKm(proj, s.latitude, s.longitude);
      const dist = Math.hypot(e, n);
      for (const w of ['P', 'S'] as const) {
        const tt = firstArrival(DEFAULT_MODEL, w, dist, 10, 0).time;
        d = placePick(d, r.eventId, { phase: w, channel: `${key}.00.${w === 'P' ? 'HHZ' : 'HHN'}`, time: t0 + Math.round(tt * 1e6) }).doc;
      }
    }
    d = setState(d, r.eventId, 'done');
    const ev = d.events[0];
    const loc = locateReviewEvent(ev, sites, DEFAULT_MODEL);
    if (!loc.ok) throw new Error(loc.message);
    const q = readQuakeMl(reviewToQuakeMl(d, opts, new Map([[ev.id, loc.value]]), 'iasp91-crust'), 'x.xml');
    const qe = q.events[0];
    expect(qe.preferredOriginId).toBe(`${ev.id}.origin`);
    const o = qe.origins[0];
    expect(o).toMatchObject({ evaluationMode: 'manual', evaluationStatus: 'reviewed', depthType: 'from location' });
    expect(o.latitude).toBeCloseTo(loc.value.hypocentre.latDeg, 9);
    expect(Math.abs(o.time - t0)).toBeLessThan(5_000);
    const pickIds = new Set(qe.picks.map((p) => p.id));
    expect(o.arrivals).toHaveLength(12);
    for (const a of o.arrivals) expect(pickIds.has(a.pickId)).toBe(true);
    r = addEvent(d, t0 + 100e6, t0 + 160e6);
    expect(readQuakeMl(reviewToQuakeMl(r.doc, opts), 'y.xml').events.every((e) => e.origins.length === 0)).toBe(true);
  });

  it('exports a pick left out of the location with time weight 0 and its residual; read back as candidates it is left out again', async () => {
    const { DEFAULT_MODEL, firstArrival, locateReviewEvent } = await import('../../../core/location');
    const { toLocalKm, localProjection } = await import('../../../core/location/projection');
    const { mergeCandidates, setExcluded } = await import('../../../core/review');
    // Same geometry and travel times as the test above; one S pick 1.2 s late is left out.
    const proj = localProjection(45, 7);
    const sites = new Map<string, { latitude: number; longitude: number; elevation: number }>();
    for (let i = 0; i < 6; i++) sites.set(`XX.R${i}`, { latitude: 45 + (0.18 * Math.cos((i * Math.PI) / 3)), longitude: 7 + (0.25 * Math.sin((i * Math.PI) / 3)), elevation: 0 });
    const t0 = microsFromIso('2026-11-14T21:00:00Z');
    const r = addEvent(EMPTY_REVIEW, t0 - 10e6, t0 + 60e6);
    let d = r.doc;
    for (const [key, s] of sites) {
      const [e, n] = toLocalKm(proj, s.latitude, s.longitude);
      for (const w of ['P', 'S'] as const) {
        const late = key === 'XX.R2' && w === 'S' ? 1_200_000 : 0;
        d = placePick(d, r.eventId, { phase: w, channel: `${key}.00.${w === 'P' ? 'HHZ' : 'HHN'}`, time: t0 + late + Math.round(firstArrival(DEFAULT_MODEL, w, Math.hypot(e, n), 10, 0).time * 1e6) }).doc;
      }
    }
    const late = d.events[0].picks.find((p) => p.channel === 'XX.R2.00.HHN')!;
    d = setExcluded(d, r.eventId, late.id, true);
    const loc = locateReviewEvent(d.events[0], sites, DEFAULT_MODEL);
    if (!loc.ok) throw new Error(loc.message);
    const qe = readQuakeMl(reviewToQuakeMl(d, opts, new Map([[r.eventId, loc.value]])), 'x.xml').events[0];
    const arrival = qe.origins[0].arrivals.find((a) => a.pickId === `${r.eventId}.${late.id}`)!;
    expect(arrival.timeWeight).toBe(0);
    expect(arrival.timeResidual).toBeCloseTo(1.2, 2);
    expect(qe.origins[0].quality?.usedPhaseCount).toBe(11);
    const back = mergeCandidates(EMPTY_REVIEW, [qe]).doc.events[0].picks;
    expect(back.filter((p) => p.excluded).map((p) => p.channel)).toEqual(['XX.R2.00.HHN']);
  });
});
