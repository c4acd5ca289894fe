/**
 * A generated dataset with as many sites as asked (core/synth), for the desk benchmark and the
 * end-to-end tests of the event list and the sheet's site limits: N three-component 100 Hz sites on
 * a sunflower spiral around the demo area (site i at 8·sqrt(i + 0.5) km), a short recording with a
 * few local earthquakes, and optionally a review file whose events carry picks at the true arrival
 * times of the sites asked for (as an analyst would have set them).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { demoScenario, DEMO_CENTRE, DEMO_START, type EventSpec, type Scenario, type StationSpec, type Truth } from '../../core/synth';
import { offsetPoint } from '../../core/synth/geometry';
import { EMPTY_REVIEW, addEvent, placePick, serializeReview, setState, type ReviewDocument, type ReviewState } from '../../core/review';
import { writeScenario } from '../../electron/host/scenario';
import { REVIEW_FILE_NAME } from '../../electron/host/reviewStore';

/** Station codes of the network, in spiral order (nearest the centre first). */
export const siteCode = (i: number): string => `S${String(i + 1).padStart(3, '0')}`;

/** The scenario: `sites` sites, `seconds` of recording from the demo's start, events at the given offsets (s). */
export function networkScenario(sites: number, seconds: number, events: { at: number; north: number; east: number; magnitude: number }[]): Scenario {
  const demo = demoScenario();
  const template = demo.stations.find((s) => s.code === 'BRAE');
  if (!template) throw new Error('the demo no longer has station BRAE to copy');
  const stations: StationSpec[] = [];
  for (let i = 0; i < sites; i++) {
    const r = 8 * Math.sqrt(i + 0.5);
    const a = i * 2.399963; // the golden angle, radians
    const p = offsetPoint(DEMO_CENTRE.latitude, DEMO_CENTRE.longitude, r * Math.cos(a), r * Math.sin(a));
    stations.push({
      ...template, code: siteCode(i), site: `generated site ${i + 1}`,
      latitude: Math.round(p.latitude * 1e5) / 1e5, longitude: Math.round(p.longitude * 1e5) / 1e5,
    });
  }
  const specs: EventSpec[] = events.map((e, i) => ({
    id: `g${i + 1}`, type: 'earthquake', origin: DEMO_START + e.at * 1e6,
    ...offsetPoint(DEMO_CENTRE.latitude, DEMO_CENTRE.longitude, e.north, e.east),
    depthKm: 8, magnitude: e.magnitude, mechanism: { strike: 30 + 40 * i, dip: 70, rake: 10 },
  }));
  return { ...demo, name: `generated network of ${sites} sites (invented)`, stations, start: DEMO_START, end: DEMO_START + seconds * 1e6, faults: [], events: specs };
}

export interface ReviewedEvent {
  /** Index into the scenario's events. */
  event: number;
  /** Seconds before the origin the event's window starts, and its length. */
  before: number;
  length: number;
  /** Sites (indices) given a P pick on HHZ and (unless `pOnly`) an S pick on HHN at the true arrival times. */
  sites: number[];
  pOnly?: boolean;
  state: ReviewState;
}

/**
 * Writes the scenario into `root` and, when `reviewed` is given, a review file with those events
 * (picks at the true arrival times). Returns the truth and the review document written.
 */
export async function writeNetworkDataset(root: string, sc: Scenario, reviewed: ReviewedEvent[] = []): Promise<{ truth: Truth; review: ReviewDocument | null }> {
  await writeScenario(root, { scenario: sc });
  const { readFileSync } = await import('node:fs');
  const truth = JSON.parse(readFileSync(join(root, 'truth.json'), 'utf8')) as Truth;
  if (reviewed.length === 0) return { truth, review: null };
  let doc = EMPTY_REVIEW;
  for (const r of reviewed) {
    const te = truth.events[r.event];
    const start = te.origin.timeMicros - Math.round(r.before * 1e6);
    const added = addEvent(doc, start, start + Math.round(r.length * 1e6));
    doc = added.doc;
    for (const i of r.sites) {
      const code = siteCode(i);
      for (const wave of r.pOnly ? ['P' as const] : ['P', 'S'] as const) {
        const a = te.arrivals.find((x) => x.station === code && x.wave === wave);
        if (!a) throw new Error(`no true ${wave} arrival at ${code} for event ${te.id}`);
        doc = placePick(doc, added.eventId, { phase: wave, channel: `${sc.network.code}.${code}.00.${wave === 'P' ? 'HHZ' : 'HHN'}`, time: a.timeMicros }).doc;
      }
    }
    doc = setState(doc, added.eventId, r.state);
  }
  writeFileSync(join(root, REVIEW_FILE_NAME), serializeReview(doc));
  return { truth, review: doc };
}
