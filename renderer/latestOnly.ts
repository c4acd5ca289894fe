/**
 * Runs jobs one at a time and only the latest of those waiting: a job asked for while another runs
 * waits, and a newer one replaces it (the replaced job's promise rejects with SupersededError). For
 * work whose answer matters only for what is on screen now, e.g. the open event's magnitude while
 * the analyst steps through events: stale jobs would otherwise queue up in a worker and take the
 * cores from the traces being drawn.
 *
 * Background jobs (`queue`) share the same runner: they run in the order given, each only when no
 * latest-only job waits, so work for the list or an export never holds up what is on screen by more
 * than the one background job already running.
 */
export class SupersededError extends Error {
  constructor() {
    super('superseded by a newer request');
    this.name = 'SupersededError';
  }
}

interface Waiting<J, R> { job: J; resolve: (r: R) => void; reject: (e: unknown) => void }

export class LatestOnly<J, R> {
  private running = false;
  private waiting: Waiting<J, R> | null = null;
  private readonly background: Waiting<J, R>[] = [];

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

  /** The result of `job`, run after the jobs queued before it and after any latest-only job waiting; never dropped. */
  queue(job: J): Promise<R> {
    return new Promise<R>((resolve, reject) => {
      this.background.push({ job, resolve, reject });
      void this.next();
    });
  }

  /** Background jobs not started yet. */
  get queued(): number {
    return this.background.length;
  }

  private async next(): Promise<void> {
    if (this.running) return;
    const w = this.waiting ?? this.background.shift();
    if (!w) return;
    if (w === this.waiting) this.waiting = null;
    this.running = true;
    try {
      w.resolve(await this.run(w.job));
    } catch (e) {
      w.reject(e);
    } finally {
      this.running = false;
      void this.next();
    }
  }
}
