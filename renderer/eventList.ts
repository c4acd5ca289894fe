/** The list of events of the night: time, picks, review state and type; click to open. */
import { isoFromMicros } from '../core/time';
import type { ReviewEvent, ReviewState } from '../core/review';

const STATE_LABEL: Record<ReviewState, string> = { todo: 'to do', started: 'started', done: 'done', discarded: 'discarded' };

export class EventList {
  readonly root = document.createElement('aside');
  private readonly list = document.createElement('ol');
  private readonly filter = document.createElement('select');
  private events: readonly ReviewEvent[] = [];
  private current: string | null = null;

  constructor(private readonly onOpen: (id: string) => void) {
    this.root.className = 'event-list';
    const head = document.createElement('div');
    head.className = 'event-list-head';
    const title = document.createElement('span');
    title.textContent = 'Events';
    for (const [value, label] of [['all', 'all'], ['open', 'not done'], ['done', 'done'], ['discarded', 'discarded']]) {
      const o = document.createElement('option');
      o.value = value;
      o.textContent = label;
      this.filter.append(o);
    }
    this.filter.value = 'all';
    this.filter.addEventListener('change', () => this.render());
    head.append(title, this.filter);
    this.root.append(head, this.list);
    this.list.addEventListener('click', (e) => {
      const li = (e.target as HTMLElement).closest('li');
      if (li?.dataset.id) this.onOpen(li.dataset.id);
    });
  }

  set(events: readonly ReviewEvent[], current: string | null): void {
    this.events = events;
    this.current = current;
    this.render();
  }

  /** The event after (or before) `id` in list order, for next/previous keys. */
  neighbour(id: string | null, step: 1 | -1): string | null {
    const shown = this.shown();
    if (shown.length === 0) return null;
    const i = shown.findIndex((e) => e.id === id);
    if (i < 0) return shown[step > 0 ? 0 : shown.length - 1].id;
    return shown[Math.min(shown.length - 1, Math.max(0, i + step))].id;
  }

  private shown(): readonly ReviewEvent[] {
    const f = this.filter.value;
    return this.events.filter((e) => f === 'all' || (f === 'open' ? e.state === 'todo' || e.state === 'started' : e.state === f));
  }

  private render(): void {
    const shown = this.shown();
    this.list.replaceChildren(...shown.map((e) => {
      const li = document.createElement('li');
      li.dataset.id = e.id;
      li.className = `state-${e.state}${e.id === this.current ? ' current' : ''}`;
      const sites = new Set(e.picks.map((p) => p.channel.split('.').slice(0, 2).join('.'))).size;
      const time = document.createElement('span');
      time.className = 'ev-time';
      time.textContent = isoFromMicros(e.start).slice(11, 19);
      const info = document.createElement('span');
      info.className = 'ev-info';
      info.textContent = `${sites} site${sites === 1 ? '' : 's'} \u00b7 ${e.picks.length} picks${e.type ? ` \u00b7 ${e.type}` : ''}`;
      const state = document.createElement('span');
      state.className = 'ev-state';
      state.textContent = STATE_LABEL[e.state];
      li.append(time, state, info);
      return li;
    }));
    if (shown.length === 0) {
      const li = document.createElement('li');
      li.className = 'empty';
      li.textContent = 'No events yet. Open a moment on the overview and place picks (R for P, F for S), or make the window an event.';
      this.list.append(li);
    }
  }
}
