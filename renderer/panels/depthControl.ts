/**
 * The event bar's depth control: a field where the analyst types a depth to hold the event's
 * location at (km below the model's datum; "350 m" works too), or "free" (or nothing) to solve for
 * it, and a button that holds the current solution's depth or frees a held one. Changes go through
 * `onSet`, which the desk turns into an undoable edit (core/location/reviewDepth.ts).
 *
 * One element for the life of the desk: `show(ev)` refreshes it for the open event, and leaves the
 * field alone while the analyst is typing in it (the event bar is redrawn after every edit and when
 * a magnitude arrives, which would otherwise throw the typed text away).
 */
import { parseDepthInput } from '../../core/location/reviewDepth';
import type { ReviewEvent } from '../../core/review/types';

/** A depth for the field: km with up to three decimals (metre steps), no trailing zeros. */
export function depthText(km: number): string {
  return `${Number(km.toFixed(3))}`;
}

/** What "hold" holds: the solution's depth rounded to 10 m, km. */
export function holdDepthKm(solvedKm: number): number {
  return Math.round(solvedKm * 100) / 100;
}

export interface DepthControlOptions {
  /** The open event's current solution depth, km (null when not located). */
  solvedDepthKm(): number | null;
  /** Sets (km) or frees (null) the open event's depth. */
  onSet(depthKm: number | null): void;
  /** A message for the status line (e.g. unreadable input). */
  onError(message: string): void;
}

export class DepthControl {
  readonly root = document.createElement('label');
  private readonly input = document.createElement('input');
  private readonly unit = document.createElement('span');
  private readonly button = document.createElement('button');
  private held: number | undefined = undefined;
  private eventId: string | null = null;

  constructor(private readonly opts: DepthControlOptions) {
    this.input.type = 'text';
    this.input.className = 'depth-input';
    this.input.size = 6;
    this.input.placeholder = 'free';
    this.input.title = 'Hold the location at this depth, km below the model datum (e.g. 5, 5.5 km or 350 m); empty or "free" to solve for it (H)';
    this.input.addEventListener('change', () => this.typed());
    this.button.className = 'depth-hold';
    this.button.addEventListener('click', () => this.toggle());
    this.root.className = 'depth-control';
    this.root.append('Depth ', this.input, this.unit, this.button);
  }

  /** Shows the depth of `ev` (the field keeps what is being typed in it for the same event). */
  show(ev: ReviewEvent): HTMLElement {
    const sameEvent = ev.id === this.eventId;
    this.eventId = ev.id;
    this.held = ev.fixedDepthKm;
    const typing = sameEvent && document.activeElement === this.input;
    if (!typing) this.input.value = this.held === undefined ? '' : depthText(this.held);
    this.unit.textContent = this.held === undefined ? ' ' : ' km fixed ';
    this.button.textContent = this.held === undefined ? 'Hold' : 'Free';
    this.button.title = this.held === undefined ? 'Hold the depth where the current solution has it (H)' : 'Solve for the depth again (H)';
    this.root.classList.toggle('held', this.held !== undefined);
    return this.root;
  }

  private typed(): void {
    const r = parseDepthInput(this.input.value);
    if (!r.ok) {
      this.opts.onError(r.message);
      this.input.value = this.held === undefined ? '' : depthText(this.held);
      return;
    }
    if (r.depthKm !== (this.held ?? null)) this.opts.onSet(r.depthKm);
  }

  private toggle(): void {
    if (this.held !== undefined) {
      this.opts.onSet(null);
      return;
    }
    const z = this.opts.solvedDepthKm();
    if (z === null) this.opts.onError('no solution to take the depth from: type a depth instead');
    else this.opts.onSet(holdDepthKm(z));
  }
}
