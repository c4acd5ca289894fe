/**
 * Daybreak's key map, designed for a left hand on the keyboard while the right hand holds the mouse.
 * Keys are grouped by finger column, top row to bottom row:
 *   index  R / F / V   place P at the pointer / place S at the pointer / delete the selected pick
 *                      (on a selected amplitude mark V takes it out of ML or puts it back;
 *                      Shift+V does so for all the station's horizontals)
 *   middle E / D / C   onset impulsive / emergent / questionable  (sharp at the top, vague at the bottom)
 *   ring   W / S / X   polarity positive (up) / undecidable / negative (down)
 *   pinky  Q / A / Z   widen the uncertainty / set it from the zoom / narrow it
 *   index stretch T / G / B   zoom to the selected pick / whole window / accept every automatic pick
 * Location: H holds the depth at the current solution's (or frees it), Y switches the horizontals
 * between radial / transverse and as recorded.
 * N, below H at the end of the same far index stretch (a look at the data, not an edit), opens the
 * amplitude spectrum of the site under the pointer; N again or Escape closes it (the panel takes
 * Escape itself, and only while it is open, so Escape still closes the dialogs).
 * Thumb and reach keys: Tab / Shift+Tab next / previous event, Enter marks the event done,
 * Backspace discards it, 1-7 filter presets, arrows pan, Ctrl+Z / Ctrl+Shift+Z undo / redo,
 * ? shows this map.
 * The event list, with the key above Tab (Tab walks the list in its order): ` sorts by the next key
 * (time, state, sites, RMS, magnitude), ~ (Shift+`) turns the order round; Shift+Enter (beside
 * Enter, which sets a state) shows the next review state only (all, not done, to do, ...).
 */
export type KeyAction =
  | 'placeP' | 'placeS' | 'deletePick' | 'leaveOut'
  | 'onsetImpulsive' | 'onsetEmergent' | 'onsetQuestionable'
  | 'polarityPositive' | 'polarityUndecidable' | 'polarityNegative'
  | 'widen' | 'uncertaintyFromZoom' | 'narrow'
  | 'zoomToPick' | 'wholeWindow' | 'acceptAutomatic'
  | 'nextEvent' | 'previousEvent' | 'markDone' | 'discardEvent' | 'sortNext' | 'sortReverse' | 'filterNext'
  | 'filter1' | 'filter2' | 'filter3' | 'filter4' | 'filter5' | 'filter6' | 'filter7'
  | 'panLeft' | 'panRight' | 'undo' | 'redo' | 'help'
  | 'holdDepth' | 'radialTransverse' | 'spectrum';

export interface KeyBinding { keys: string; action: KeyAction; what: string; group: string }

export const KEY_MAP: readonly KeyBinding[] = [
  { group: 'Picks (index finger)', keys: 'R', action: 'placeP', what: 'place a P pick at the pointer' },
  { group: 'Picks (index finger)', keys: 'F', action: 'placeS', what: 'place an S pick at the pointer' },
  { group: 'Picks (index finger)', keys: 'V', action: 'deletePick', what: 'delete the selected pick; on an amplitude mark: take it out of ML, or put it back' },
  { group: 'Picks (index finger)', keys: 'Shift+V', action: 'leaveOut', what: 'pick: leave it out of the location (kept), or use it again; amplitude mark: the whole station out of ML, or back' },
  { group: 'Picks (index finger)', keys: 'drag a green mark', action: 'deletePick', what: 'move an amplitude: its peak is measured again where it is dropped' },
  { group: 'Onset (middle finger)', keys: 'E', action: 'onsetImpulsive', what: 'onset impulsive' },
  { group: 'Onset (middle finger)', keys: 'D', action: 'onsetEmergent', what: 'onset emergent' },
  { group: 'Onset (middle finger)', keys: 'C', action: 'onsetQuestionable', what: 'onset questionable' },
  { group: 'Polarity (ring finger)', keys: 'W', action: 'polarityPositive', what: 'first motion positive (up)' },
  { group: 'Polarity (ring finger)', keys: 'S', action: 'polarityUndecidable', what: 'first motion undecidable' },
  { group: 'Polarity (ring finger)', keys: 'X', action: 'polarityNegative', what: 'first motion negative (down)' },
  { group: 'Uncertainty (little finger)', keys: 'Q', action: 'widen', what: 'widen the uncertainty by half' },
  { group: 'Uncertainty (little finger)', keys: 'A', action: 'uncertaintyFromZoom', what: 'uncertainty = 8 pixels at this zoom' },
  { group: 'Uncertainty (little finger)', keys: 'Z', action: 'narrow', what: 'narrow the uncertainty by a third' },
  { group: 'View and event (index stretch)', keys: 'T', action: 'zoomToPick', what: 'zoom to the selected pick' },
  { group: 'View and event (index stretch)', keys: 'G', action: 'wholeWindow', what: 'show the whole window' },
  { group: 'View and event (index stretch)', keys: 'B', action: 'acceptAutomatic', what: 'accept every automatic pick of the event' },
  { group: 'Location', keys: 'H', action: 'holdDepth', what: 'hold the depth where the solution has it, or free a held depth' },
  { group: 'Location', keys: 'Y', action: 'radialTransverse', what: 'horizontals as radial / transverse (from the location) or as recorded' },
  { group: 'Spectrum', keys: 'N', action: 'spectrum', what: 'amplitude spectrum of the site under the pointer over the span in view, beside the noise before the first pick; N again or Esc closes it' },
  { group: 'Events', keys: 'Tab', action: 'nextEvent', what: 'next event' },
  { group: 'Events', keys: 'Shift+Tab', action: 'previousEvent', what: 'previous event' },
  { group: 'Events', keys: 'Enter', action: 'markDone', what: 'mark the event done' },
  { group: 'Events', keys: 'Backspace', action: 'discardEvent', what: 'discard the event (not an event)' },
  { group: 'Events', keys: '`', action: 'sortNext', what: 'sort the list by the next key (time, state, sites, RMS, magnitude)' },
  { group: 'Events', keys: '~ (Shift+`)', action: 'sortReverse', what: 'turn the list\u2019s order round' },
  { group: 'Events', keys: 'Shift+Enter', action: 'filterNext', what: 'list only the next review state (all, not done, to do, \u2026)' },
  { group: 'View', keys: '1 \u2026 7', action: 'filter1', what: 'filter presets' },
  { group: 'View', keys: '\u2190 \u2192', action: 'panLeft', what: 'pan by a quarter window' },
  { group: 'View', keys: 'wheel / drag / right-drag', action: 'wholeWindow', what: 'zoom at the pointer / zoom to a box / pan' },
  { group: 'Edit', keys: 'Ctrl+Z', action: 'undo', what: 'undo' },
  { group: 'Edit', keys: 'Ctrl+Shift+Z, Ctrl+Y', action: 'redo', what: 'redo' },
  { group: 'Help', keys: '?', action: 'help', what: 'show or hide this list' },
];

const PLAIN: Record<string, KeyAction> = {
  r: 'placeP', f: 'placeS', v: 'deletePick',
  e: 'onsetImpulsive', d: 'onsetEmergent', c: 'onsetQuestionable',
  w: 'polarityPositive', s: 'polarityUndecidable', x: 'polarityNegative',
  q: 'widen', a: 'uncertaintyFromZoom', z: 'narrow',
  t: 'zoomToPick', g: 'wholeWindow', b: 'acceptAutomatic',
  h: 'holdDepth', y: 'radialTransverse', n: 'spectrum',
  Enter: 'markDone', Backspace: 'discardEvent', Delete: 'deletePick',
  '1': 'filter1', '2': 'filter2', '3': 'filter3', '4': 'filter4', '5': 'filter5', '6': 'filter6', '7': 'filter7',
  ArrowLeft: 'panLeft', ArrowRight: 'panRight', '?': 'help',
};

/** The action of a key press, or null when the key means nothing here. */
export function actionForKey(e: Pick<KeyboardEvent, 'key' | 'ctrlKey' | 'metaKey' | 'shiftKey' | 'altKey'>): KeyAction | null {
  const mod = e.ctrlKey || e.metaKey;
  if (mod) {
    const k = e.key.toLowerCase();
    if (k === 'z') return e.shiftKey ? 'redo' : 'undo';
    if (k === 'y') return 'redo';
    return null;
  }
  if (e.altKey) return null;
  if (e.key === 'Tab') return e.shiftKey ? 'previousEvent' : 'nextEvent';
  if (e.key === 'Enter' && e.shiftKey) return 'filterNext';
  if (e.key === '`') return 'sortNext';
  if (e.key === '~') return 'sortReverse';
  if (e.shiftKey && (e.key === 'V' || e.key === 'v')) return 'leaveOut';
  return PLAIN[e.key.length === 1 ? e.key.toLowerCase() : e.key] ?? (e.key === '?' ? 'help' : null);
}
