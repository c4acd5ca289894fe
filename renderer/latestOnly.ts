/**
 * Runs jobs one at a time and only the latest of those waiting: a job asked for while another runs
 * waits, and a newer one replaces it (the replaced job's promise rejects with SupersededError). For
 * work whose answer matters only for what is on screen now, e.g. the open event's magnitude while
 * the analyst steps through events: stale jobs would otherwise queue up in a worker and take the
 * cores from the traces being drawn.
 */
export class SupersededError extends Error {
  constructor() {
    super('superseded by a newer request');
    this.name = 'SupersededError';
  }
}

export class LatestOnly<J, R> {
  private running = false;
  private waiting: { job: J; resolve: (r: R) => void; reject: (e: unknown) => void } | null = null;

  /** @param run does one job */
  constructor(private readonly run: (job: J) => Promise<R>) {}

  /** The result of `job`, or a rejection with SupersededError when a newer job came before it started. */
  submit(job: J): Promise<R> {
    return new Promise<R>((resolve, reject) => {
      this.waiting?.reject(new SupersededError());
      this.waiting = { job, resolve, reject };
      void this.next();
    });
  }

  private async next(): Promise<void> {
    if (this.running || !this.waiting) return;
    const { job, resolve, reject } = this.waiting;
    this.waiting = null;
    this.running = true;
    try {
      resolve(await this.run(job));
    } catch (e) {
      reject(e);
    } finally {
      this.running = false;
      void this.next();
    }
  }
}
