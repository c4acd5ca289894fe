/**
 * The list of events of the night: time, review state, sites with picks, type, and, as they become
 * known, the location's residual RMS and the local magnitude. The list is sorted by one key (time,
 * state, sites with picks, RMS or magnitude; the key's values are shown in bold and the header says
 * which key and which way) and filtered by review state. Events without a value for the key (not
 * located, no magnitude) come last whichever way the list is sorted. Next/previous follow the list
 * as shown. Click, or the keys of the key map, to open and to change the order.
 */
import { isoFromMicros, type Micros } from '../core/time';
import { REVIEW_STATES, type ReviewEvent, type ReviewState } from '../core/review';
import { el } from './dom';

const STATE_LABEL: Record<ReviewState, string> = { todo: 'to do', started: 'started', done: 'done', discarded: 'discarded' };

/** Values the desk measures per event (null: not known, or cannot be had). */
export interface EventMeasure {
  /** RMS of the location's residuals, s. */
  rmsS: number | null;
  /** Local magnitude. */
  ml: number | null;
}

export type SortKey = 'time' | 'state' | 'sites' | 'rms' | 'magnitude';
export type StateFilter = 'all' | 'open' | ReviewState;

export const SORT_KEYS: readonly { key: SortKey; label: string; descending: boolean }[] = [
  { key: 'time', label: 'time', descending: false },
  { key: 'state', label: 'review state', descending: false },
  { key: 'sites', label: 'sites with picks', descending: true },
  { key: 'rms', label: 'location RMS', descending: true },
  { key: 'magnitude', label: 'magnitude', descending: true },
];

const FILTERS: readonly [StateFilter, string][] = [
  ['all', 'all'], ['open', 'not done'], ['todo', 'to do'], ['started', 'started'], ['done', 'done'], ['discarded', 'discarded'],
];

/** Sites ("NET.STA") with at least one pick in the event. */
export function sitesWithPicks(e: ReviewEvent): number {
  return new Set(e.picks.map((p) => p.channel.split('.').slice(0, 2).join('.'))).size;
}

/** How many of the event's picks are kept but left out of its location. */
function leftOut(e: ReviewEvent): number {
  return e.picks.reduce((n, p) => n + (p.excluded && p.status !== 'rejected' ? 1 : 0), 0);
}

/**
 * The time the list shows and sorts an event by: its earliest P pick that is used in the location
 * (neither rejected nor left out), else its earliest pick that is not rejected, else the start of its
 * window (a detector's candidate window opens 20 s before its first pick, which would put the event
 * 20 s early in the list).
 */
export function eventTime(e: ReviewEvent): Micros {
  let p = Infinity;
  let any = Infinity;
  for (const k of e.picks) {
    if (k.status === 'rejected') continue;
    if (k.time < any) any = k.time;
    if (k.phase === 'P' && !k.excluded && k.time < p) p = k.time;
  }
  return Number.isFinite(p) ? p : Number.isFinite(any) ? any : e.start;
}

/**
 * `events` in list order for `key` (`descending` flips it); events lacking the key's value go last, in
 * time order. Ties are broken by time. `measure` gives RMS and magnitude.
 */
export function sortEvents(events: readonly ReviewEvent[], key: SortKey, descending: boolean, measure: (e: ReviewEvent) => EventMeasure): ReviewEvent[] {
  const value = (e: ReviewEvent, t: Micros): number | null => {
    switch (key) {
      case 'time': return t;
      case 'state': return REVIEW_STATES.indexOf(e.state);
      case 'sites': return sitesWithPicks(e);
      case 'rms': return measure(e).rmsS;
      case 'magnitude': return measure(e).ml;
    }
  };
  const keyed = events.map((e) => {
    const t = eventTime(e);
    return { e, v: value(e, t), t };
  });
  const sign = descending ? -1 : 1;
  keyed.sort((a, b) => {
    if (a.v === null || b.v === null) return a.v === b.v ? a.t - b.t : a.v === null ? 1 : -1;
    return sign * (a.v - b.v) || a.t - b.t;
  });
  return keyed.map((k) => k.e);
}

export class EventList {
  readonly root = el('aside', { className: 'event-list' });
  private readonly list = el('ol', { className: 'events', tabIndex: -1 });
  private readonly filter = el('select', { className: 'state-filter', title: 'Show the events in this review state', ariaLabel: 'filter by review state' },
    ...FILTERS.map(([v, label]) => el('option', { value: v }, label)));
  private readonly sortSelect = el('select', { className: 'sort-key', title: 'Order of the list (O: next key, Shift+O: the other way)', ariaLabel: 'sort by' },
    ...SORT_KEYS.map((k) => el('option', { value: k.key }, k.label)));
  private readonly direction = el('button', { className: 'sort-direction', type: 'button' });
  private readonly indicator = el('div', { className: 'sort-indicator', ariaLive: 'polite' });
  private events: readonly ReviewEvent[] = [];
  private current: string | null = null;
  private key: SortKey = 'time';
  private descending = false;

  /**
   * `measure` gives an event's RMS and magnitude when known (it may start working them out and call
   * `refresh` when they arrive); `wants` is told which key the list is sorted by, so the desk can
   * work out what that key needs.
   */
  constructor(
    private readonly onOpen: (id: string) => void,
    private readonly measure: (e: ReviewEvent) => EventMeasure = () => ({ rmsS: null, ml: null }),
    private readonly wants: (key: SortKey, events: readonly ReviewEvent[]) => void = () => {},
  ) {
    this.filter.value = 'all';
    this.filter.addEventListener('change', () => this.render());
    this.sortSelect.value = this.key;
    this.sortSelect.addEventListener('change', () => this.sortBy(this.sortSelect.value as SortKey));
    this.direction.addEventListener('click', () => this.reverse());
    const head = el('div', { className: 'event-list-head' },
      el('span', {}, 'Events'), this.filter,
      el('div', { className: 'sort-row' }, el('span', { className: 'muted' }, 'by'), this.sortSelect, this.direction));
    this.root.append(head, this.indicator, this.list);
    this.list.addEventListener('click', (e) => {
      const li = (e.target as HTMLElement).closest('li');
      if (li?.dataset.id) this.onOpen(li.dataset.id);
    });
    this.list.addEventListener('keydown', (e) => {
      const li = (e.target as HTMLElement).closest('li');
      if ((e.key === 'Enter' || e.key === ' ') && li?.dataset.id) {
        e.preventDefault();
        e.stopPropagation();
        this.onOpen(li.dataset.id);
      }
    });
  }

  set(events: readonly ReviewEvent[], current: string | null): void {
    this.events = events;
    this.current = current;
    this.render();
  }

  /** Draws the list again (e.g. measures arrived). */
  refresh(): void {
    this.render();
  }

  /** Sorts by `key`, in that key's usual direction (most sites, largest RMS and magnitude first). */
  sortBy(key: SortKey): void {
    const k = SORT_KEYS.find((x) => x.key === key);
    if (!k) throw new RangeError(`sort key must be one of ${SORT_KEYS.map((x) => x.key).join(', ')}, got ${String(key)}`);
    this.key = key;
    this.descending = k.descending;
    this.sortSelect.value = key;
    this.render();
  }

  /** The next sort key (after the last, the first again). */
  nextSortKey(): void {
    const i = SORT_KEYS.findIndex((x) => x.key === this.key);
    this.sortBy(SORT_KEYS[(i + 1) % SORT_KEYS.length].key);
  }

  reverse(): void {
    this.descending = !this.descending;
    this.render();
  }

  /** The next state filter (after the last, all again). */
  nextFilter(): void {
    const i = FILTERS.findIndex(([v]) => v === this.filter.value);
    this.filter.value = FILTERS[(i + 1) % FILTERS.length][0];
    this.render();
  }

  get sort(): { key: SortKey; descending: boolean; filter: StateFilter } {
    return { key: this.key, descending: this.descending, filter: this.filter.value as StateFilter };
  }

  /** The event after (or before) `id` in list order, for next/previous keys. */
  neighbour(id: string | null, step: 1 | -1): string | null {
    const shown = this.shown();
    if (shown.length === 0) return null;
    const i = shown.findIndex((e) => e.id === id);
    if (i < 0) return shown[step > 0 ? 0 : shown.length - 1].id;
    return shown[Math.min(shown.length - 1, Math.max(0, i + step))].id;
  }

  /** The events just after and before `id` in list order (those there are), e.g. to locate them ahead. */
  neighbours(id: string | null): ReviewEvent[] {
    const shown = this.shown();
    const i = shown.findIndex((e) => e.id === id);
    return i < 0 ? [] : [shown[i + 1], shown[i - 1]].filter((e): e is ReviewEvent => e !== undefined);
  }

  private shown(): ReviewEvent[] {
    const f = this.filter.value as StateFilter;
    const kept = this.events.filter((e) => f === 'all' || (f === 'open' ? e.state === 'todo' || e.state === 'started' : e.state === f));
    return sortEvents(kept, this.key, this.descending, this.measure);
  }

  private render(): void {
    this.wants(this.key, this.events);
    const shown = this.shown();
    const label = SORT_KEYS.find((k) => k.key === this.key)!.label;
    this.direction.textContent = this.descending ? '\u2193' : '\u2191';
    this.direction.title = this.descending ? 'largest first (click or Shift+O for the other way)' : 'smallest first (click or Shift+O for the other way)';
    this.direction.setAttribute('aria-label', this.descending ? 'descending' : 'ascending');
    const missing = this.key === 'rms' || this.key === 'magnitude' ? shown.filter((e) => (this.key === 'rms' ? this.measure(e).rmsS : this.measure(e).ml) === null).length : 0;
    this.indicator.textContent = `sorted by ${label} ${this.descending ? '\u2193 largest first' : '\u2191 smallest first'}${missing ? ` \u00b7 ${missing} without a value, at the end` : ''} \u00b7 ${shown.length} of ${this.events.length}`;
    this.root.dataset.sort = this.key;
    this.root.dataset.descending = String(this.descending);
    this.list.replaceChildren(...shown.map((e) => {
      const sites = sitesWithPicks(e);
      const out = leftOut(e);
      const m = this.measure(e);
      const mark = (k: SortKey, text: string) => withData(el('span', { className: k === this.key ? 'sort-value' : '' }, text), { key: k });
      const li = withData(el('li', { tabIndex: 0, className: `state-${e.state}${e.id === this.current ? ' current' : ''}` },
        el('span', { className: 'ev-time' }, mark('time', isoFromMicros(eventTime(e)).slice(11, 19))),
        el('span', { className: 'ev-state' }, mark('state', STATE_LABEL[e.state])),
        el('span', { className: 'ev-info' },
          mark('sites', `${sites} site${sites === 1 ? '' : 's'}`), ` \u00b7 ${e.picks.length} picks${out ? ` (${out} left out)` : ''}${e.type ? ` \u00b7 ${e.type}` : ''}`),
        el('span', { className: 'ev-measure' },
          mark('rms', m.rmsS === null ? 'RMS \u2013' : `RMS ${m.rmsS.toFixed(3)} s`), ' \u00b7 ', mark('magnitude', m.ml === null ? 'ML \u2013' : `ML ${m.ml.toFixed(1)}`))),
      { id: e.id, sites: String(sites), state: e.state, rms: m.rmsS === null ? '' : String(m.rmsS), ml: m.ml === null ? '' : String(m.ml) });
      return li;
    }));
    if (shown.length === 0) {
      this.list.append(el('li', { className: 'empty' }, this.events.length
        ? 'No events in this review state.'
        : 'No events yet. Open a moment on the overview and place picks (R for P, F for S), or make the window an event.'));
    }
  }
}

/** `e` with its data-* attributes set (the element builder cannot set `dataset`). */
function withData<E extends HTMLElement>(e: E, data: Record<string, string>): E {
  Object.assign(e.dataset, data);
  return e;
}
