/**
 * The trace panel of the event sheet: one row per site (its components stacked in bands), on a
 * common time axis in seconds from a reference time. Rows are drawn by uPlot; only the rows in view
 * hold a plot (plots are pooled and reused while scrolling), so 60 sites stay fluid. The view owns
 * the time window: wheel zooms around the pointer, dragging a box zooms to it, dragging with the
 * right button (or Shift) pans, and `resetWindow()` returns to the full span. Marks (picks,
 * uncertainty bars, predicted arrivals) are drawn by plugins on each row's canvas.
 */
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { placeColumn, rowColumns, type ComponentTrace } from './rowData';
import { watchTheme } from '../dom';

export interface SiteRow {
  /** "NET.STA". */
  key: string;
  label: string;
  /** Second line of the label, e.g. distance or first-arrival time. */
  detail?: string;
  components: ComponentTrace[];
  /** Row warnings shown beside the label: clipping, questionable timing, gaps. */
  flags?: string[];
}

export interface RowMarksContext {
  row: SiteRow;
  ctx: CanvasRenderingContext2D;
  /** Plot area in canvas pixels. */
  left: number; top: number; width: number; height: number;
  /** Canvas x of a time (seconds from the reference). */
  xOf(t: number): number;
  /** Vertical extent of component `c`'s band in canvas pixels. */
  band(c: number): [top: number, bottom: number];
  pxRatio: number;
}

export interface TraceViewOptions {
  /** Height of one component band in CSS pixels. */
  bandHeight?: number;
  labelWidth?: number;
  /** Draws marks on a row after its traces. */
  drawMarks?: (m: RowMarksContext) => void;
  /** Formats a time axis label (seconds from the reference; `step` is the tick spacing in seconds). */
  formatTime?: (t: number, step: number) => string;
  /** Told whenever the window changes. */
  onWindow?: (x0: number, x1: number) => void;
  /** Pointer down on a row's plot area: return true to take over the drag (e.g. moving a pick). */
  onPointerDown?: (row: SiteRow, t: number, band: number, ev: PointerEvent) => boolean;
  /** While a drag taken over by onPointerDown goes on: the time under the pointer. */
  onPointerDrag?: (t: number, ev: PointerEvent) => void;
  /** End of a drag taken over by onPointerDown. */
  onPointerUp?: (t: number, ev: PointerEvent) => void;
}

/** Where the pointer is over the traces. */
export interface PointerSpot { row: SiteRow; rowIndex: number; band: number; t: number }

interface PlotSlot {
  el: HTMLDivElement;
  label: HTMLDivElement;
  plotHost: HTMLDivElement;
  plot: uPlot | null;
  series: number;
  rowIndex: number;
  row: SiteRow | null;
  /** What the label says (see labelText). */
  says: string;
  /** What the plot last drew, so an unchanged row is not drawn again. */
  drawn: { row: SiteRow; x0: number; x1: number; width: number; amplitude: 'trace' | 'common'; common: number; ranges: [number, number][] } | null;
}

const TRACE_COLOURS = ['var(--trace)', 'var(--trace)', 'var(--trace)'];

export class TraceView {
  readonly root: HTMLDivElement;
  private readonly scroller: HTMLDivElement;
  private readonly spacer: HTMLDivElement;
  private readonly axisHost: HTMLDivElement;
  private axis: uPlot | null = null;
  private rows: SiteRow[] = [];
  private slots: PlotSlot[] = [];
  private full: [number, number] = [0, 1];
  private win: [number, number] = [0, 1];
  private amplitude: 'trace' | 'common' = 'trace';
  private rafPending = false;
  private readonly opts: Required<Pick<TraceViewOptions, 'bandHeight' | 'labelWidth' | 'formatTime'>> & TraceViewOptions;
  private readonly selectBox: HTMLDivElement;
  private traceColour = '#ccc';
  private resizeObserver: ResizeObserver;
  /** Redraws in the new colours when the theme (the root element's data-theme) changes. */
  private readonly themeObserver: MutationObserver;
  private lastPointer: { x: number; y: number } | null = null;

  constructor(container: HTMLElement, opts: TraceViewOptions = {}) {
    this.opts = { bandHeight: 34, labelWidth: 116, formatTime: (t) => t.toFixed(2), ...opts };
    this.root = document.createElement('div');
    this.root.className = 'trace-view';
    this.axisHost = document.createElement('div');
    this.axisHost.className = 'trace-axis';
    this.scroller = document.createElement('div');
    this.scroller.className = 'trace-scroller';
    this.spacer = document.createElement('div');
    this.spacer.className = 'trace-spacer';
    this.selectBox = document.createElement('div');
    this.selectBox.className = 'trace-select';
    this.scroller.append(this.spacer);
    this.root.append(this.axisHost, this.scroller, this.selectBox);
    container.append(this.root);
    this.scroller.addEventListener('scroll', () => { this.box = null; this.schedule(); });
    this.bindPointer();
    this.resizeObserver = new ResizeObserver(() => { this.box = null; this.rebuildAxis(); this.schedule(true); });
    this.resizeObserver.observe(this.root);
    this.resizeObserver.observe(this.scroller);
    this.themeObserver = watchTheme(() => this.themeChanged());
  }

  /**
   * The theme changed: the plots took their colours when they were made, so they are made again
   * (with the axis) from the new theme's values and every row in view is drawn again.
   */
  private themeChanged(): void {
    this.traceColour = getComputedStyle(this.root).getPropertyValue('--trace').trim() || '#ccc';
    for (const s of this.slots) {
      s.plot?.destroy();
      s.plot = null;
      s.drawn = null;
    }
    this.rebuildAxis();
    this.drawNow(true);
  }

  destroy(): void {
    this.resizeObserver.disconnect();
    this.themeObserver.disconnect();
    for (const s of this.slots) s.plot?.destroy();
    this.axis?.destroy();
    this.root.remove();
  }

  /** Replaces the rows; `span` is the full time span [x0, x1] in seconds. */
  setRows(rows: SiteRow[], span: [number, number]): void {
    this.rows = rows;
    // Same span as before (e.g. a new filter on the same window): keep the zoom.
    if (span[0] !== this.full[0] || span[1] !== this.full[1]) this.win = [span[0], span[1]];
    this.full = span;
    this.traceColour = getComputedStyle(this.root).getPropertyValue('--trace').trim() || '#ccc';
    this.layout();
    // The axis is rebuilt on resize (see the ResizeObserver); new rows only need its scale, set in drawNow.
    if (!this.axis) this.rebuildAxis();
    this.drawNow(true);
    // Same span, new reference time: the labels must be formatted again.
    this.axis?.redraw(false, true);
  }

  /**
   * Replaces the rows on the same span and keeps the zoom; only rows whose objects changed are drawn
   * again (e.g. rows whose samples arrived after the rows in view were drawn).
   */
  updateRows(rows: SiteRow[]): void {
    this.rows = rows;
    this.layout();
    this.schedule();
  }

  /** Indices [first, last] of the rows of `rows` that the view would show at its scroll position. */
  rowsInView(rows: readonly SiteRow[]): [number, number] {
    const { top, height } = this.viewBox();
    const bottom = top + Math.max(height, 1);
    let first = -1;
    let last = -1;
    let y = 0;
    for (let i = 0; i < rows.length && y <= bottom; i++) {
      const h = this.rowHeight(rows[i]);
      if (y + h >= top) {
        if (first < 0) first = i;
        last = i;
      }
      y += h;
    }
    return [first, last];
  }

  /** Re-draws after the samples of some rows changed (e.g. a new filter). */
  refresh(): void {
    this.drawNow(true);
  }

  get window(): [number, number] {
    return [this.win[0], this.win[1]];
  }

  setWindow(x0: number, x1: number): void {
    const minSpan = 0.02;
    if (x1 - x0 < minSpan) {
      const c = (x0 + x1) / 2;
      x0 = c - minSpan / 2;
      x1 = c + minSpan / 2;
    }
    this.win = [x0, x1];
    this.opts.onWindow?.(x0, x1);
    this.schedule();
  }

  resetWindow(): void {
    this.setWindow(this.full[0], this.full[1]);
  }

  setAmplitudeMode(mode: 'trace' | 'common'): void {
    this.amplitude = mode;
    this.schedule(true);
  }

  /** Canvas-independent mapping: time at a client x coordinate over the plot area. */
  timeAtClientX(clientX: number): number {
    const r = this.plotRect();
    return this.win[0] + ((clientX - r.left) / r.width) * (this.win[1] - this.win[0]);
  }

  clientXOfTime(t: number): number {
    const r = this.plotRect();
    return r.left + ((t - this.win[0]) / (this.win[1] - this.win[0])) * r.width;
  }

  private highlighted: string | null = null;

  /** Marks the row of site `key` (e.g. hovered in a linked panel); null clears it. */
  highlightRow(key: string | null): void {
    this.highlighted = key;
    for (const s of this.slots) s.el.classList.toggle('hovered', s.row !== null && s.rowIndex >= 0 && s.row.key === key);
  }

  /** The row, band and time under the pointer, or null when it is not over the traces. */
  pointer(): PointerSpot | null {
    if (!this.lastPointer) return null;
    const rect = this.plotRect();
    if (this.lastPointer.x < rect.left) return null;
    const rowIndex = this.rowIndexAtClientY(this.lastPointer.y);
    if (rowIndex < 0) return null;
    return { row: this.rows[rowIndex], rowIndex, band: this.bandAtClientY(rowIndex, this.lastPointer.y), t: this.timeAtClientX(this.lastPointer.x) };
  }

  /** Seconds per CSS pixel at the current zoom. */
  secondsPerPixel(): number {
    // The width kept since the last scroll or resize: no layout is forced (this is asked while drawing).
    return (this.win[1] - this.win[0]) / Math.max(1, this.viewBox().width - this.opts.labelWidth);
  }

  /** Asks for a redraw of marks only (picks changed). */
  redrawMarks(): void {
    for (const s of this.slots) s.plot?.redraw(false, false);
  }

  /** Scrolls so that row `index` is visible. */
  revealRow(index: number): void {
    const top = this.rowTop(index);
    const h = this.rowHeight(this.rows[index]);
    this.box = null;
    if (top < this.scroller.scrollTop) this.scroller.scrollTop = top;
    else if (top + h > this.scroller.scrollTop + this.scroller.clientHeight) this.scroller.scrollTop = top + h - this.scroller.clientHeight;
  }

  /**
   * The scroller's scroll position and size, read once and kept until it scrolls or resizes: reading
   * them while the page has pending changes would force a layout in the middle of drawing.
   */
  private viewBox(): { top: number; height: number; width: number } {
    this.box ??= { top: this.scroller.scrollTop, height: this.scroller.clientHeight, width: this.scroller.clientWidth };
    return this.box;
  }
  private box: { top: number; height: number; width: number } | null = null;

  private plotRect(): { left: number; width: number } {
    const r = this.scroller.getBoundingClientRect();
    const left = r.left + this.opts.labelWidth;
    return { left, width: Math.max(1, this.scroller.clientWidth - this.opts.labelWidth) };
  }

  private rowHeight(row: SiteRow): number {
    // At least tall enough for the three label lines of a vertical-only site.
    return Math.max(Math.max(1, row.components.length) * this.opts.bandHeight, 46) + 4;
  }

  private rowTop(index: number): number {
    let y = 0;
    for (let i = 0; i < index; i++) y += this.rowHeight(this.rows[i]);
    return y;
  }

  private layout(): void {
    let total = 0;
    for (const r of this.rows) total += this.rowHeight(r);
    this.spacer.style.height = `${total}px`;
  }

  private schedule(rebuild = false): void {
    if (rebuild) this.forceRebuild = true;
    if (this.rafPending) return;
    this.rafPending = true;
    requestAnimationFrame(() => {
      this.rafPending = false;
      this.drawNow(this.forceRebuild);
      this.forceRebuild = false;
    });
  }
  private forceRebuild = false;

  private rebuildAxis(): void {
    this.axis?.destroy();
    const width = Math.max(50, this.scroller.clientWidth - this.opts.labelWidth);
    const fmt = this.opts.formatTime;
    this.axisHost.style.paddingLeft = `${this.opts.labelWidth}px`;
    this.axis = new uPlot({
      width, height: 30,
      legend: { show: false }, cursor: { show: false },
      scales: { x: { time: false, auto: false }, y: { auto: false, range: [0, 1] } },
      series: [{}, { show: false }],
      axes: [
        {
          side: 0, size: 28, space: 110, stroke: getComputedStyle(this.root).getPropertyValue('--muted').trim() || '#888',
          grid: { show: false }, ticks: { stroke: getComputedStyle(this.root).getPropertyValue('--line').trim() || '#444' },
          values: (_u, vals, _axis, _space, incr) => vals.map((v) => fmt(v, incr)),
        },
        { show: false },
      ],
    }, [[this.win[0], this.win[1]], [null, null]], this.axisHost);
  }

  /** Draws the rows in view: pooled plots get their row's data for the current window. */
  /** Time the last draw of the rows took (the work of one frame), ms. */
  lastDrawMs = 0;

  private drawNow(rebuild: boolean): void {
    const t0 = performance.now();
    const margin = this.drawRows(rebuild, false);
    this.lastDrawMs = performance.now() - t0;
    // Rows just below the view (ready for scrolling) are drawn once the main thread is idle, after the
    // visible rows have been painted (a frame callback would run before that paint); anything drawn
    // since supersedes this.
    if (margin && !this.rafPending) {
      const seq = ++this.marginSeq;
      requestIdleCallback(() => { if (seq === this.marginSeq && !this.rafPending) this.drawRows(false, true); }, { timeout: 200 });
    }
  }
  private marginSeq = 0;

  /**
   * Draws the rows in view (with `withMargin`, also the rows of half a screen below them); returns
   * whether rows of that margin were left out.
   */
  private drawRows(rebuild: boolean, withMargin: boolean): boolean {
    this.marginSeq++;
    const [x0, x1] = this.win;
    this.axis?.setScale('x', { min: x0, max: x1 });
    const box = this.viewBox();
    const viewTop = box.top;
    const viewBottom = viewTop + box.height;
    const width = Math.max(50, box.width - this.opts.labelWidth);
    // Rows in view (plus half a screen of margin below for smooth scrolling).
    const wanted: number[] = [];
    const keep = new Set<number>();
    let marginLeft = false;
    let y = 0;
    for (let i = 0; i < this.rows.length; i++) {
      const h = this.rowHeight(this.rows[i]);
      if (y + h >= viewTop && y <= viewBottom) wanted.push(i);
      else if (y + h >= viewTop && y <= viewBottom + box.height * 0.5) {
        // A margin row keeps its slot (and what it shows) until it is drawn again.
        if (withMargin) wanted.push(i);
        else marginLeft = true;
        keep.add(i);
      }
      y += h;
    }
    for (const i of wanted) keep.add(i);
    // Free slots whose rows left the view.
    const free: PlotSlot[] = [];
    for (const s of this.slots) if (!keep.has(s.rowIndex)) { s.rowIndex = -1; s.el.style.display = 'none'; free.push(s); }
    const byRow = new Map(this.slots.filter((s) => s.rowIndex >= 0).map((s) => [s.rowIndex, s]));
    if (rebuild) for (const s of this.slots) s.drawn = null;
    let common = 0;
    const rowsData = new Map<number, ReturnType<typeof rowColumns>>();
    const unchanged = new Set<number>();
    for (const i of wanted) {
      const had = byRow.get(i)?.drawn;
      let ranges: [number, number][];
      if (had && had.row === this.rows[i] && had.x0 === x0 && had.x1 === x1 && had.width === width) {
        unchanged.add(i);
        ranges = had.ranges;
      } else {
        const d = rowColumns(this.rows[i].components, x0, x1, width);
        rowsData.set(i, d);
        ranges = d.ranges;
      }
      for (const [lo, hi] of ranges) if (Number.isFinite(lo)) common = Math.max(common, (hi - lo) / 2);
    }
    for (const i of wanted) {
      const row = this.rows[i];
      let slot = byRow.get(i);
      if (!slot) {
        slot = free.pop() ?? this.newSlot();
        slot.rowIndex = i;
        rebuild = true;
      }
      // A slot shows whatever row now sits at its index: relabel when what the label says changed
      // (a new filter makes new row objects with the same labels).
      if (slot.row !== row) {
        slot.row = row;
        const says = labelText(row);
        if (says !== slot.says) {
          slot.says = says;
          slot.label.replaceChildren(labelContent(row));
          slot.el.title = row.flags?.join('\n') ?? '';
        }
      }
      slot.el.style.display = '';
      slot.el.classList.toggle('hovered', row.key === this.highlighted);
      slot.el.style.top = `${this.rowTop(i)}px`;
      const h = this.rowHeight(row);
      slot.el.style.height = `${h}px`;
      const drawn = slot.drawn;
      if (unchanged.has(i) && drawn && drawn.amplitude === this.amplitude && (this.amplitude === 'trace' || drawn.common === common)) continue;
      const d = rowsData.get(i) ?? rowColumns(row.components, x0, x1, width);
      slot.drawn = { row, x0, x1, width, amplitude: this.amplitude, common, ranges: d.ranges };
      const nComp = row.components.length;
      const placed = d.data.slice(1).map((col, c) => {
        const [lo, hi] = d.ranges[c];
        const mid = (lo + hi) / 2;
        const half = this.amplitude === 'common' ? common : (hi - lo) / 2;
        const scale = half > 0 ? 0.46 / half : 0;
        return placeColumn(col, nComp - c - 0.5, mid, scale);
      });
      const data = [d.data[0], ...placed] as uPlot.AlignedData;
      if (!slot.plot || slot.series !== nComp || slot.plot.width !== width || slot.plot.height !== h - 4) {
        slot.plot?.destroy();
        slot.plot = this.newPlot(slot, nComp, width, h - 4, data);
        slot.series = nComp;
      } else {
        slot.plot.batch(() => {
          slot!.plot!.setData(data, false);
          slot!.plot!.setScale('x', { min: x0, max: x1 });
        });
      }
    }
    void rebuild;
    return marginLeft;
  }

  private newSlot(): PlotSlot {
    const el = document.createElement('div');
    el.className = 'trace-row';
    const label = document.createElement('div');
    label.className = 'trace-label';
    label.style.width = `${this.opts.labelWidth}px`;
    const plotHost = document.createElement('div');
    plotHost.className = 'trace-plot';
    el.append(label, plotHost);
    this.spacer.append(el);
    const slot: PlotSlot = { el, label, plotHost, plot: null, series: 0, rowIndex: -1, row: null, drawn: null, says: '' };
    this.slots.push(slot);
    return slot;
  }

  private newPlot(slot: PlotSlot, nComp: number, width: number, height: number, data: uPlot.AlignedData): uPlot {
    const series: uPlot.Series[] = [{}];
    for (let c = 0; c < nComp; c++) {
      // Points appear once zoomed in far enough that samples are spread apart (uPlot's default rule,
      // which shows them when they are more than `space` pixels apart), for exact placement.
      series.push({ stroke: this.traceColour || TRACE_COLOURS[c], width: 1, points: { size: 4, space: 6, fill: this.traceColour }, spanGaps: false });
    }
    return new uPlot({
      width, height,
      legend: { show: false },
      cursor: { x: true, y: false, points: { show: false }, drag: { x: false, y: false, setScale: false }, sync: { key: 'daybreak-traces' } },
      select: { show: false, left: 0, top: 0, width: 0, height: 0 },
      scales: { x: { time: false, auto: false, min: this.win[0], max: this.win[1] }, y: { auto: false, range: [0, nComp] } },
      axes: [{ show: false }, { show: false }],
      series,
      hooks: {
        draw: [(u: uPlot) => {
          const drawMarks = this.opts.drawMarks;
          if (!drawMarks || slot.rowIndex < 0) return;
          const row = this.rows[slot.rowIndex];
          const { left, top, width: w, height: hh } = u.bbox;
          u.ctx.save();
          u.ctx.beginPath();
          u.ctx.rect(left, top, w, hh);
          u.ctx.clip();
          drawMarks({
            row, ctx: u.ctx, left, top, width: w, height: hh, pxRatio: uPlot.pxRatio,
            xOf: (t) => u.valToPos(t, 'x', true),
            band: (c) => [u.valToPos(nComp - c, 'y', true), u.valToPos(nComp - c - 1, 'y', true)],
          });
          u.ctx.restore();
        }],
      },
    }, data, slot.plotHost);
  }

  private bindPointer(): void {
    let mode: 'none' | 'box' | 'pan' | 'external' = 'none';
    let startX = 0;
    let startWin: [number, number] = [0, 1];
    this.scroller.addEventListener('wheel', (e) => {
      if (e.shiftKey) return; // Shift+wheel scrolls the rows
      e.preventDefault();
      const t = this.timeAtClientX(e.clientX);
      const factor = Math.exp(Math.sign(e.deltaY) * Math.min(Math.abs(e.deltaY), 200) * 0.002);
      const [x0, x1] = this.win;
      this.setWindow(t - (t - x0) * factor, t + (x1 - t) * factor);
    }, { passive: false });
    this.scroller.addEventListener('contextmenu', (e) => e.preventDefault());
    this.scroller.addEventListener('pointerdown', (e) => {
      const rect = this.plotRect();
      if (e.clientX < rect.left) return;
      const rowIndex = this.rowIndexAtClientY(e.clientY);
      if (e.button === 0 && !e.shiftKey && rowIndex >= 0 && this.opts.onPointerDown) {
        const row = this.rows[rowIndex];
        const band = this.bandAtClientY(rowIndex, e.clientY);
        if (this.opts.onPointerDown(row, this.timeAtClientX(e.clientX), band, e)) {
          mode = 'external';
          this.scroller.setPointerCapture(e.pointerId);
          e.preventDefault();
          return;
        }
      }
      startX = e.clientX;
      startWin = [this.win[0], this.win[1]];
      mode = e.button === 2 || (e.button === 0 && e.shiftKey) || e.button === 1 ? 'pan' : 'box';
      this.scroller.setPointerCapture(e.pointerId);
      e.preventDefault();
    });
    this.scroller.addEventListener('pointerleave', () => { this.lastPointer = null; });
    this.scroller.addEventListener('pointermove', (e) => {
      this.lastPointer = { x: e.clientX, y: e.clientY };
      if (mode === 'external') {
        this.opts.onPointerDrag?.(this.timeAtClientX(e.clientX), e);
      } else if (mode === 'pan') {
        const r = this.plotRect();
        const dt = ((e.clientX - startX) / r.width) * (startWin[1] - startWin[0]);
        this.setWindow(startWin[0] - dt, startWin[1] - dt);
      } else if (mode === 'box') {
        const a = Math.min(startX, e.clientX);
        const b = Math.max(startX, e.clientX);
        const root = this.root.getBoundingClientRect();
        const sc = this.scroller.getBoundingClientRect();
        Object.assign(this.selectBox.style, {
          display: 'block', left: `${a - root.left}px`, width: `${b - a}px`, top: `${sc.top - root.top}px`, height: `${sc.height}px`,
        });
      }
    });
    const finish = (e: PointerEvent) => {
      if (mode === 'external') this.opts.onPointerUp?.(this.timeAtClientX(e.clientX), e);
      if (mode === 'box') {
        this.selectBox.style.display = 'none';
        if (Math.abs(e.clientX - startX) > 4) {
          const t0 = this.timeAtClientX(Math.min(startX, e.clientX));
          const t1 = this.timeAtClientX(Math.max(startX, e.clientX));
          this.setWindow(t0, t1);
        }
      }
      mode = 'none';
    };
    this.scroller.addEventListener('pointerup', finish);
    this.scroller.addEventListener('pointercancel', finish);
  }

  private rowIndexAtClientY(clientY: number): number {
    const r = this.scroller.getBoundingClientRect();
    let y = clientY - r.top + this.scroller.scrollTop;
    for (let i = 0; i < this.rows.length; i++) {
      const h = this.rowHeight(this.rows[i]);
      if (y < h) return i;
      y -= h;
    }
    return -1;
  }

  private bandAtClientY(rowIndex: number, clientY: number): number {
    const r = this.scroller.getBoundingClientRect();
    const y = clientY - r.top + this.scroller.scrollTop - this.rowTop(rowIndex);
    return Math.min(this.rows[rowIndex].components.length - 1, Math.max(0, Math.floor(y / this.opts.bandHeight)));
  }
}

/** Everything a row's label shows, as one string (to tell whether it changed). */
function labelText(row: SiteRow): string {
  return [row.label, row.detail ?? '', row.components.map((c) => c.label).join(' '), ...(row.flags ?? [])].join('\u0001');
}

function labelContent(row: SiteRow): DocumentFragment {
  const f = document.createDocumentFragment();
  const name = document.createElement('div');
  name.className = 'site';
  name.textContent = row.label;
  f.append(name);
  if (row.detail) {
    const d = document.createElement('div');
    d.className = 'detail';
    d.textContent = row.detail;
    f.append(d);
  }
  const comps = document.createElement('div');
  comps.className = 'comps';
  comps.textContent = row.components.map((c) => c.label).join(' ');
  f.append(comps);
  if (row.flags?.length) {
    const w = document.createElement('div');
    w.className = 'flags';
    // One warning per line, wrapped to the label's width (the row's tooltip lists them all too).
    for (const x of row.flags) {
      const line = document.createElement('div');
      line.textContent = `\u25b2 ${x}`;
      w.append(line);
    }
    f.append(w);
  }
  return f;
}
