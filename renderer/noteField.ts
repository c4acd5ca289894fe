/**
 * The event bar's note field. One element for the life of the desk: the event bar is redrawn after
 * every edit and whenever a magnitude or location arrives, and a field made anew each time would
 * throw away what the analyst is typing. The text is saved when the field is left, when typing
 * pauses for `pauseMs`, and before the field is shown for another event, so a note is never lost
 * by switching events or by a redraw.
 */
import type { ReviewEvent } from '../core/review/types';

export class NoteField {
  readonly input = document.createElement('input');
  private eventId: string | null = null;
  /** The note as last saved or shown for `eventId`. */
  private saved = '';
  private timer: ReturnType<typeof setTimeout> | undefined;

  /**
   * @param onSave saves `text` as the note of event `eventId` (an undoable edit in the desk)
   * @param pauseMs typing pause after which the text is saved, ms
   */
  constructor(private readonly onSave: (eventId: string, text: string) => void, private readonly pauseMs = 1500) {
    this.input.type = 'text';
    this.input.className = 'note';
    this.input.placeholder = 'note';
    this.input.title = 'A note on this event (saved as you type)';
    this.input.addEventListener('input', () => {
      clearTimeout(this.timer);
      this.timer = setTimeout(() => this.flush(), this.pauseMs);
    });
    this.input.addEventListener('change', () => this.flush());
  }

  /** Shows the note of `ev`; text being typed for the same event is kept, for another event it is saved first. */
  show(ev: ReviewEvent): HTMLInputElement {
    if (ev.id !== this.eventId) {
      this.flush();
      this.eventId = ev.id;
      this.saved = ev.note;
      this.input.value = ev.note;
    } else if (ev.note !== this.saved) {
      // Changed from outside the field (undo, redo, a reload): show it unless the analyst has typed
      // something not yet saved.
      const untouched = this.timer === undefined && (document.activeElement !== this.input || this.input.value === this.saved);
      this.saved = ev.note;
      if (untouched) this.input.value = ev.note;
    }
    return this.input;
  }

  /** Saves the typed text now if it differs from the saved note. */
  flush(): void {
    clearTimeout(this.timer);
    this.timer = undefined;
    if (this.eventId !== null && this.input.value !== this.saved) {
      this.saved = this.input.value;
      this.onSave(this.eventId, this.input.value);
    }
  }
}
