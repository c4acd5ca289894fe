/**
 * The event list's measures: each event's location RMS (s) and local magnitude, worked out in the
 * background only when the list is sorted by one of them, one event at a time (the desk locates and
 * measures in workers, so the interface thread only sends and receives), and kept per event object:
 * an edited event is a new object and is measured again; an unchanged one never is.
 */
import type { ReviewEvent } from '../core/review';
import type { ReviewLocation } from '../core/location';
import type { EventMeasure, SortKey } from './eventList';

/** What is known of an event once it has been located (location null: no solution). */
interface Known { location: ReviewLocation | null; ml: number | null; mlDone: boolean }

export class EventMeasures {
  private readonly known = new WeakMap<ReviewEvent, Known>();
  private queue: { ev: ReviewEvent; ml: boolean }[] = [];
  private running = false;

  /**
   * `locate` returns the event's location or null (too few picks, no solution); `magnitude` its ML or
   * null; `changed` is called when values arrive (at most every `notifyMs`).
   */
  constructor(
    private readonly locate: (ev: ReviewEvent) => Promise<ReviewLocation | null>,
    private readonly magnitude: (ev: ReviewEvent, loc: ReviewLocation) => Promise<number | null>,
    private readonly changed: () => void,
    private readonly notifyMs = 250,
  ) {}

  /** What is known of `ev` so far. */
  get(ev: ReviewEvent): EventMeasure {
    const k = this.known.get(ev);
    return { rmsS: k?.location ? k.location.hypocentre.rmsS : null, ml: k?.ml ?? null };
  }

  /** `ev`'s location as already worked out (null: no solution), or undefined when not yet. */
  locationOf(ev: ReviewEvent): ReviewLocation | null | undefined {
    return this.known.get(ev)?.location;
  }

  /** Whether `ev` has been measured as far as the key needs. */
  measured(ev: ReviewEvent, key: SortKey): boolean {
    const k = this.known.get(ev);
    return key === 'magnitude' ? !!k && (k.mlDone || !k.location) : key === 'rms' ? !!k : true;
  }

  /** Starts measuring the events the list's sort key needs (nothing for keys without measures). */
  want(key: SortKey, events: readonly ReviewEvent[]): void {
    if (key !== 'rms' && key !== 'magnitude') return;
    const queued = new Set(this.queue.map((q) => q.ev));
    for (const ev of events) {
      if (queued.has(ev) || this.measured(ev, key)) continue;
      this.queue.push({ ev, ml: key === 'magnitude' });
    }
    if (!this.running && this.queue.length) void this.run();
  }

  /**
   * Takes what the desk worked out for the open event anyway (its location for the panels, its ML
   * for the event bar), so the list shows them without measuring the event again. `ml` undefined:
   * not known yet (the location alone is recorded).
   */
  record(ev: ReviewEvent, location: ReviewLocation | null, ml?: number | null): void {
    const had = this.known.get(ev);
    const k: Known = ml === undefined
      ? { location, ml: had?.location === location ? had.ml : null, mlDone: had?.location === location ? had.mlDone : false }
      : { location, ml: location ? ml : null, mlDone: true };
    if (had && had.location === k.location && had.ml === k.ml && had.mlDone === k.mlDone) return;
    this.known.set(ev, k);
    this.changed();
  }

  /** Number of events waiting to be measured. */
  get pending(): number {
    return this.queue.length;
  }

  private async run(): Promise<void> {
    this.running = true;
    let lastNote = performance.now();
    try {
      while (this.queue.length) {
        const { ev, ml } = this.queue.shift()!;
        let k = this.known.get(ev);
        if (!k) {
          let location: ReviewLocation | null = null;
          try {
            location = await this.locate(ev);
          } catch {
            location = null;
          }
          k = { location, ml: null, mlDone: false };
          this.known.set(ev, k);
        }
        if (ml && k.location && !k.mlDone) {
          try {
            k.ml = await this.magnitude(ev, k.location);
          } catch {
            k.ml = null;
          }
          k.mlDone = true;
        }
        if (performance.now() - lastNote >= this.notifyMs || this.queue.length === 0) {
          lastNote = performance.now();
          this.changed();
        }
      }
    } finally {
      this.running = false;
    }
  }
}
