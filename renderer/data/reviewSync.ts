/**
 * Keeps the review file in step with the analyst's edits: every change is saved at once, one save in
 * flight at a time; while one is in flight, only the newest document waits (older ones are
 * superseded), so a crash loses at most the edit being written.
 */
import type { HostApi } from '../../electron/contract';
import { EMPTY_REVIEW, parseReview, serializeReview, type ReviewDocument } from '../../core/review';

export interface ReviewOpenResult {
  doc: ReviewDocument;
  path: string;
  lockedBy: { pid: number; host: string; since: string } | null;
}

export async function openReview(host: HostApi, root: string, force = false): Promise<ReviewOpenResult> {
  const r = await host.call('review.open', { root, force });
  if (!r.ok) throw new Error(`could not open the review file: ${r.message}`);
  const doc = r.value.content === null ? EMPTY_REVIEW : parseReview(r.value.content, r.value.path);
  return { doc, path: r.value.path, lockedBy: r.value.lockedBy };
}

export type SaveState = { state: 'saved'; revision: number } | { state: 'saving' } | { state: 'failed'; message: string };

export class ReviewSaver {
  private inFlight: Promise<void> | null = null;
  private waiting: ReviewDocument | null = null;
  private lastSaved = -1;

  constructor(private readonly host: HostApi, private readonly root: string, private readonly onState: (s: SaveState) => void) {}

  save(doc: ReviewDocument): void {
    this.waiting = doc;
    if (!this.inFlight) this.inFlight = this.drain();
  }

  /** Resolves when everything asked for so far is on disk (or failed). */
  async flush(): Promise<void> {
    while (this.inFlight) await this.inFlight;
  }

  private async drain(): Promise<void> {
    while (this.waiting) {
      const doc = this.waiting;
      this.waiting = null;
      if (doc.revision === this.lastSaved) continue;
      this.onState({ state: 'saving' });
      const r = await this.host.call('review.save', { root: this.root, content: serializeReview(doc) });
      if (r.ok) {
        this.lastSaved = doc.revision;
        this.onState({ state: 'saved', revision: doc.revision });
      } else {
        this.onState({ state: 'failed', message: r.message });
      }
    }
    this.inFlight = null;
  }
}
