/**
 * The event bar's depth control: a field where the analyst types a depth to hold the event's
 * location at (km below the model's datum; "350 m" works too), or "free" (or nothing) to solve for
 * it, and a button that holds the current solution's depth or frees a held one. Changes go through
 * `onSet`, which the desk turns into an undoable edit (core/location/reviewDepth.ts).
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
  /** Sets (km) or frees (null) the event's depth. */
  onSet(depthKm: number | null): void;
  /** A message for the status line (e.g. unreadable input). */
  onError(message: string): void;
}

/** The control for `ev`: a labelled field and a hold/free button. */
export function depthControl(ev: ReviewEvent, opts: DepthControlOptions): HTMLElement {
  const held = ev.fixedDepthKm;
  const input = document.createElement('input');
  input.type = 'text';
  input.className = 'depth-input';
  input.size = 6;
  input.placeholder = 'free';
  input.value = held === undefined ? '' : depthText(held);
  input.title = 'Hold the location at this depth, km below the model datum (e.g. 5, 5.5 km or 350 m); empty or "free" to solve for it (H)';
  input.addEventListener('change', () => {
    const r = parseDepthInput(input.value);
    if (!r.ok) {
      opts.onError(r.message);
      input.value = held === undefined ? '' : depthText(held);
      return;
    }
    if (r.depthKm !== (held ?? null)) opts.onSet(r.depthKm);
  });
  const button = document.createElement('button');
  button.className = 'depth-hold';
  if (held === undefined) {
    button.textContent = 'Hold';
    button.title = 'Hold the depth where the current solution has it (H)';
    button.addEventListener('click', () => {
      const z = opts.solvedDepthKm();
      if (z === null) opts.onError('no solution to take the depth from: type a depth instead');
      else opts.onSet(holdDepthKm(z));
    });
  } else {
    button.textContent = 'Free';
    button.title = 'Solve for the depth again (H)';
    button.addEventListener('click', () => opts.onSet(null));
  }
  const label = document.createElement('label');
  label.className = `depth-control${held === undefined ? '' : ' held'}`;
  label.append('Depth ', input, held === undefined ? '' : ' km fixed ', button);
  return label;
}
