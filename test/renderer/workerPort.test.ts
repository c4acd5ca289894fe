import { describe, expect, it } from 'vitest';
import { WorkerCalls, type WorkerPort } from '../../renderer/workerPort';

/** A worker that answers nothing until told: replies and failures come from the test. */
class QuietWorker implements WorkerPort {
  onmessage: ((e: MessageEvent) => void) | null = null;
  onerror: ((e: ErrorEvent) => void) | null = null;
  readonly posted: unknown[] = [];
  stopped = false;
  postMessage(message: unknown): void { this.posted.push(message); }
  terminate(): void { this.stopped = true; }
  reply(data: unknown): void { this.onmessage?.({ data } as MessageEvent); }
}

describe('WorkerCalls: replies matched to requests by id', () => {
  it('resolves each call with the reply carrying its id, whatever the order the replies come in', async () => {
    const w = new QuietWorker();
    const calls = new WorkerCalls<{ id: number; x: number }, { id: number; ok: true; y: number }>(w, 'test');
    const a = calls.call({ id: calls.id(), x: 1 });
    const b = calls.call({ id: calls.id(), x: 2 });
    expect(w.posted).toEqual([{ id: 1, x: 1 }, { id: 2, x: 2 }]);
    w.reply({ id: 2, ok: true, y: 20 });
    w.reply({ id: 1, ok: true, y: 10 });
    await expect(a).resolves.toEqual({ id: 1, ok: true, y: 10 });
    await expect(b).resolves.toEqual({ id: 2, ok: true, y: 20 });
  });

  it('fails the calls waiting when the worker fails, and every later call at once, naming the worker', async () => {
    const w = new QuietWorker();
    const calls = new WorkerCalls<{ id: number }, { id: number; ok: true }>(w, 'location');
    const waiting = calls.call({ id: calls.id() });
    w.onerror?.({ message: '' } as ErrorEvent);
    await expect(waiting).resolves.toEqual({ id: 1, ok: false, message: 'location worker failed: its script could not be loaded', stale: false });
    await expect(calls.call({ id: calls.id() })).resolves.toEqual({ id: 2, ok: false, message: 'location worker failed: its script could not be loaded', stale: false });
    expect(w.posted).toHaveLength(1);
  });

  it('stops the worker on terminate and fails what waits with "stopped"', async () => {
    const w = new QuietWorker();
    const calls = new WorkerCalls<{ id: number }, { id: number; ok: true }>(w, 'magnitude');
    const waiting = calls.call({ id: calls.id() });
    calls.terminate();
    expect(w.stopped).toBe(true);
    await expect(waiting).resolves.toMatchObject({ ok: false, message: 'magnitude worker stopped' });
  });
});
