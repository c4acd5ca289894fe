import { describe, expect, it } from 'vitest';
import { MagnitudeWorker } from '../../../renderer/picks/magnitudeClient';
import { MagnitudeJobs } from '../../../renderer/picks/magnitudeJobs';
import type { MagnitudeRequest } from '../../../renderer/picks/magnitudeProtocol';
import type { WorkerPort } from '../../../renderer/workerPort';
import { magnitudeRead, reviewMagnitude, type RawPiece } from '../../../core/review/reviewMagnitude';
import { moveAmplitude } from '../../../core/review/edits';
import { channelKey } from '../../../core/model';
import { magnitudeCase, piecesOf } from '../../support/magnitudeCase';

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

// A generated event (test/support/magnitudeCase.ts: ML 2.3 at 7 sites) with picks at the true
// arrivals, located; the reference is core/review/reviewMagnitude called directly on the same pieces.
function workerCase() {
  const { d, ev, loc, metas, byKey, sites, rendered } = magnitudeCase();
  const rd = magnitudeRead(ev, loc, metas, sites)!;
  const pieces = (): RawPiece[] => piecesOf(rendered, rd.channels, rd.from, rd.to);
  const direct = (e = ev) => reviewMagnitude(e, loc, pieces(), (k) => byKey.get(k), sites, undefined, { evaluationStatus: 'preliminary' });
  return { d, ev, loc, metas, sites, pieces, direct, readKey: `${rd.channels.join(',')}|${rd.from}|${rd.to}` };
}

describe('MagnitudeWorker: magnitudes through the worker\'s messages', () => {
  const c = workerCase();
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
