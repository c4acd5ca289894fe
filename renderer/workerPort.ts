/**
 * What the desk's worker clients share: the worker they talk to (a Worker, or a stand-in that tests
 * give them) and the matching of each reply to its request by id.
 */
export interface WorkerPort {
  postMessage(message: unknown, transfer?: Transferable[]): void;
  onmessage: ((e: MessageEvent) => void) | null;
  onerror: ((e: ErrorEvent) => void) | null;
  terminate(): void;
}

/** A failed call: the worker failed or stopped, the message says which. */
export interface CallFailure { id: number; ok: false; message: string; stale: false }

/**
 * Requests with a numeric `id` and the replies carrying it back. When the worker fails (e.g. its
 * script could not load) every call waiting, and every later one, gets a failure at once.
 */
export class WorkerCalls<Req extends { id: number }, Reply extends { id: number }> {
  private readonly pending = new Map<number, (r: Reply | CallFailure) => void>();
  private nextId = 1;
  private failed: string | null = null;

  /** @param name says which worker in failure messages ("location", "magnitude") */
  constructor(private readonly worker: WorkerPort, private readonly name: string) {
    worker.onmessage = (e: MessageEvent<Reply>) => {
      const done = this.pending.get(e.data.id);
      this.pending.delete(e.data.id);
      done?.(e.data);
    };
    worker.onerror = (e) => this.fail(`${name} worker failed: ${e.message || 'its script could not be loaded'}`);
  }

  /** A fresh request id. */
  id(): number {
    return this.nextId++;
  }

  /** Posts `req` (moving the buffers in `transfer`) and resolves with the reply of the same id. */
  call(req: Req, transfer: Transferable[] = []): Promise<Reply | CallFailure> {
    if (this.failed) return Promise.resolve({ id: req.id, ok: false, message: this.failed, stale: false });
    return new Promise((resolve) => {
      this.pending.set(req.id, resolve);
      this.worker.postMessage(req, transfer);
    });
  }

  terminate(): void {
    this.worker.terminate();
    this.fail(`${this.name} worker stopped`);
  }

  private fail(message: string): void {
    this.failed = message;
    for (const [id, done] of this.pending) done({ id, ok: false, message, stale: false });
    this.pending.clear();
  }
}
