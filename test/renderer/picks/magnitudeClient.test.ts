import { describe, expect, it } from 'vitest';
import { MagnitudeWorker } from '../../../renderer/picks/magnitudeClient';
import { MagnitudeJobs } from '../../../renderer/picks/magnitudeJobs';
import type { MagnitudeRequest } from '../../../renderer/picks/magnitudeProtocol';
import type { WorkerPort } from '../../../renderer/workerPort';
import { magnitudeRead, reviewMagnitude, type RawPiece } from '../../../core/review/reviewMagnitude';
import { addEvent, moveAmplitude, placePick } from '../../../core/review/edits';
import { EMPTY_REVIEW } from '../../../core/review/types';
import { locateReviewEvent, siteLocations } from '../../../core/location';
import { channelKey } from '../../../core/model';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { scenarioInventory } from '../../../core/synth/inventory';
import { renderStation, type RenderedChannel } from '../../../core/synth/render';
import { quake, ringStations, tinyScenario } from '../../core/synth/scenarioFixtures';

/**
 * A worker as the browser gives it, minus the thread: messages are structured-cloned both ways with
 * the transfer list honoured (transferred buffers are detached here, as postMessage does), and
 * answered by MagnitudeJobs on a later task.
 */
class CloningWorker implements WorkerPort {
  onmessage: ((e: MessageEvent) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  readonly received: MagnitudeRequest[] = [];
  readonly jobs = new MagnitudeJobs();
  postMessage(message: unknown, transfer: Transferable[] = []): void {
    const req = structuredClone(message, { transfer }) as MagnitudeRequest;
    this.received.push(req);
    setTimeout(() => this.onmessage?.({ data: structuredClone(this.jobs.answer(req)) } as MessageEvent), 0);
  }
  terminate(): void {}
}

// A generated event (core/synth, ML 2.3 at 7 sites) with picks at the true arrivals, located; the
// reference is core/review/reviewMagnitude called directly on the same pieces.
function magnitudeCase() {
  const stations = ringStations(7, 20);
  const sc = tinyScenario(stations, [quake('a', 15, 2.3, 7, { strike: 120, dip: 60, rake: 30 }, -2, 4)], 90);
  const metas: ChannelMeta[] = scenarioInventory(sc).networks[0].stations.flatMap((s) => s.channels);
  const byKey = new Map(metas.map((m) => [channelKey(m.id), m]));
  const sites = siteLocations(metas);
  const ev0 = sc.events[0];
  const r = addEvent(EMPTY_REVIEW, ev0.origin - 10e6, ev0.origin + 60e6);
  let d = r.doc;
  const rendered: RenderedChannel[] = [];
  for (const st of stations) {
    const rs = renderStation(sc, st.code);
    rendered.push(...rs.channels);
    const loc = st.channels[0].location;
    const z = rs.channels.find((c) => c.id.location === loc && c.spec.dip !== 0)!;
    d = placePick(d, r.eventId, { phase: 'P', channel: channelKey(z.id), time: rs.events[0].p.time }).doc;
    const h = rs.channels.find((c) => c.id.location === loc && c.spec.dip === 0);
    if (h) d = placePick(d, r.eventId, { phase: 'S', channel: channelKey(h.id), time: rs.events[0].s.time }).doc;
  }
  const ev = d.events[0];
  const located = locateReviewEvent(ev, sites, sc.model);
  if (!located.ok) throw new Error(located.message);
  const loc = located.value;
  const rd = magnitudeRead(ev, loc, metas, sites)!;
  const pieces = (): RawPiece[] => {
    const want = new Set(rd.channels);
    return rendered.filter((c) => want.has(channelKey(c.id))).map((c) => {
      const a = Math.max(0, Math.ceil(((rd.from - c.start) * c.sampleRate) / 1e6));
      const b = Math.min(c.samples.length, Math.floor(((rd.to - c.start) * c.sampleRate) / 1e6));
      return { key: channelKey(c.id), start: c.start + Math.round((a * 1e6) / c.sampleRate), sampleRate: c.sampleRate, samples: Float32Array.from(c.samples.subarray(a, b)), clipped: false };
    });
  };
  const direct = (e = ev) => reviewMagnitude(e, loc, pieces(), (k) => byKey.get(k), sites, undefined, { evaluationStatus: 'preliminary' });
  return { d, ev, loc, metas, sites, pieces, direct, readKey: `${rd.channels.join(',')}|${rd.from}|${rd.to}` };
}

describe('MagnitudeWorker: magnitudes through the worker\'s messages', () => {
  const c = magnitudeCase();
  const input = { loc: c.loc, evaluationStatus: 'preliminary' as const, metas: () => c.metas, sites: () => c.sites };

  it('measures the list\'s and exports\' magnitude exactly as reviewMagnitude called directly, moving the pieces to the worker', async () => {
    const w = new CloningWorker();
    const mw = new MagnitudeWorker(w);
    const pieces = c.pieces();
    const got = await mw.measure({ ...input, ev: c.ev, pieces });
    const want = c.direct();
    expect(want?.magnitude).not.toBeNull();
    expect(got).toEqual(want);
    expect(Object.is(got!.magnitude!.mag, want!.magnitude!.mag)).toBe(true);
    expect(got!.stationMagnitudes.map((s) => s.mag)).toStrictEqual(want!.stationMagnitudes.map((s) => s.mag));
    expect(pieces.every((p) => p.samples.byteLength === 0)).toBe(true);
  });

  it('keeps the open event\'s pieces (moved to it) across edits, and a list job in between leaves them alone', async () => {
    const w = new CloningWorker();
    const mw = new MagnitudeWorker(w);
    let reads = 0;
    let given: RawPiece[] = [];
    const read = async () => { reads++; given = c.pieces(); return given; };
    const first = await mw.compute({ ...input, ev: c.ev, readKey: c.readKey, read });
    expect(first.value).toEqual(c.direct());
    // moved to the worker, not copied
    expect(given.every((p) => p.samples.byteLength === 0)).toBe(true);
    await mw.measure({ ...input, ev: c.ev, pieces: c.pieces() });
    // an amplitude moved by the analyst: the same pieces, measured again where it was dropped
    const a = first.value!.amplitudes[0];
    const moved = moveAmplitude(c.d, c.ev.id, channelKey(a.waveformId!), a.time! + 1_500_000, 0.5).events[0];
    const second = await mw.compute({ ...input, ev: moved, readKey: c.readKey, read });
    expect(second.value).toEqual(c.direct(moved));
    expect(second.value).not.toEqual(first.value);
    expect(reads).toBe(1);
    expect(w.received.map((q) => `${q.pieces.kind} ${q.context ? 'context' : ''}`)).toEqual(['hold context', 'once ', 'held ']);
  });
});
