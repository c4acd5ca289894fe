/** A small pool of data workers with promise-based requests. */
import type { WorkerReply, WorkerRequest } from './protocol';

/** A request before the pool numbers it. */
export type Unnumbered<T> = T extends unknown ? Omit<T, 'id'> : never;

type Pending = { resolve: (r: WorkerReply) => void; reject: (e: Error) => void };

export class WorkerPool {
  private readonly workers: Worker[] = [];
  private readonly load: number[] = [];
  private readonly pending = new Map<number, Pending & { worker: number }>();
  private nextId = 1;

  constructor(size = Math.max(1, Math.min(4, (navigator.hardwareConcurrency || 2)))) {
    for (let i = 0; i < size; i++) {
      const w = new Worker(new URL('./worker.ts', import.meta.url), { type: 'module' });
      w.onmessage = (e: MessageEvent<WorkerReply>) => this.settle(e.data);
      w.onerror = (e) => this.failAll(i, new Error(`data worker failed: ${e.message}`));
      this.workers.push(w);
      this.load.push(0);
    }
  }

  /** Number of workers. */
  get size(): number {
    return this.workers.length;
  }

  /** Sends a request to the least busy worker; `transfer` hands buffers over without copying. */
  request<R extends WorkerReply>(req: Unnumbered<WorkerRequest>, transfer: Transferable[] = [], worker?: number): Promise<R> {
    const id = this.nextId++;
    let w = worker ?? 0;
    if (worker === undefined) for (let i = 1; i < this.workers.length; i++) if (this.load[i] < this.load[w]) w = i;
    this.load[w]++;
    return new Promise<R>((resolve, reject) => {
      this.pending.set(id, { resolve: resolve as (r: WorkerReply) => void, reject, worker: w });
      this.workers[w].postMessage({ ...req, id }, transfer);
    });
  }

  terminate(): void {
    for (const w of this.workers) w.terminate();
    for (const [, p] of this.pending) p.reject(new Error('cancelled'));
    this.pending.clear();
  }

  private settle(reply: WorkerReply): void {
    const p = this.pending.get(reply.id);
    if (!p) return;
    this.pending.delete(reply.id);
    this.load[p.worker]--;
    if (reply.type === 'fail') p.reject(new Error(reply.message));
    else p.resolve(reply);
  }

  private failAll(worker: number, err: Error): void {
    for (const [id, p] of this.pending) {
      if (p.worker === worker) { this.pending.delete(id); this.load[worker]--; p.reject(err); }
    }
  }
}
