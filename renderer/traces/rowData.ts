/**
 * Turns a site's component traces into the columnar data one uPlot row draws: a shared x array
 * (seconds from the view's reference time) and one y array per component, each placed in its own
 * band of the row. Components that share no x values are joined as uPlot expects: `undefined` where
 * a component has no point (lines pass over it), `null` where its data has a gap (lines break).
 */
import { buildEnvelope, plotColumns, RAW_SAMPLES_PER_COLUMN, type Envelope, type PlotColumns } from '../../core/view/envelope';
import type { SampleArray } from '../../core/model';

/** A continuous piece of one component: sample i is at t0 + i * dt seconds from the reference time. */
export interface TracePiece {
  t0: number;
  dt: number;
  samples: SampleArray;
  envelope: Envelope;
}

export interface ComponentTrace {
  /** "NET.STA.LOC.CHA". */
  key: string;
  /** Short label, e.g. the channel code. */
  label: string;
  pieces: TracePiece[];
}

/** A piece starting `t0` s from the reference; its pyramid is built here unless given (e.g. built in a data worker). */
export function makePiece(t0: number, sampleRate: number, samples: SampleArray, envelope?: Envelope): TracePiece {
  return { t0, dt: 1 / sampleRate, samples, envelope: envelope ?? buildEnvelope(samples) };
}

/** One column of y values: a plain array when it has gaps or missing points, else a typed array. */
export type YColumn = (number | null | undefined)[] | Float64Array;

export interface RowColumns {
  data: [number[] | Float64Array, ...YColumn[]];
  /** Per component: [min, max] of the values in the window (NaN when it has none). */
  ranges: [number, number][];
}

/** Window [x0, x1] in seconds, drawn `width` pixels wide. */
export function rowColumns(components: ComponentTrace[], x0: number, x1: number, width: number): RowColumns {
  return alignedColumns(components, x0, x1, width) ?? joinedColumns(components, x0, x1, width);
}

/** The visible piece of a component when it has exactly one in [x0, x1], else null. */
function onlyVisiblePiece(comp: ComponentTrace, x0: number, x1: number): TracePiece | null {
  let found: TracePiece | null = null;
  for (const p of comp.pieces) {
    const pEnd = p.t0 + (p.samples.length - 1) * p.dt;
    if (pEnd < x0 || p.t0 > x1) continue;
    if (found) return null;
    found = p;
  }
  return found;
}

/**
 * The common case, without joining: every component has one visible piece and all pieces share start,
 * sample interval and length (a three-component sensor on one digitiser). The points of every
 * component then fall on the same x values, so one x column serves all and the y columns are typed
 * arrays. Returns the same points as the general join (`joinedColumns`), or null when it does not apply.
 */
function alignedColumns(components: ComponentTrace[], x0: number, x1: number, width: number): RowColumns | null {
  if (components.length === 0) return null;
  const pieces: TracePiece[] = [];
  for (const c of components) {
    const p = onlyVisiblePiece(c, x0, x1);
    if (!p) return null;
    if (pieces.length && (p.t0 !== pieces[0].t0 || p.dt !== pieces[0].dt || p.samples.length !== pieces[0].samples.length)) return null;
    pieces.push(p);
  }
  const p = pieces[0];
  const n = p.samples.length;
  const pEnd = p.t0 + (n - 1) * p.dt;
  const i0 = Math.max(0, Math.floor((x0 - p.t0) / p.dt));
  const i1 = Math.min(n, Math.ceil((x1 - p.t0) / p.dt) + 1);
  const visibleSpan = Math.min(x1, pEnd) - Math.max(x0, p.t0);
  const columns = Math.max(1, Math.round((width * Math.max(visibleSpan, p.dt)) / (x1 - x0)));
  const ys: Float64Array[] = [];
  const ranges: [number, number][] = [];
  let xs: Float64Array | null = null;
  for (const piece of pieces) {
    const cols = drawColumns(piece.samples, piece.envelope, i0, i1, columns);
    if (!xs) {
      xs = new Float64Array(cols.count);
      for (let k = 0; k < cols.count; k++) xs[k] = p.t0 + cols.index[k] * p.dt;
    }
    const y = cols.value.length === cols.count ? cols.value : cols.value.slice(0, cols.count);
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < y.length; k++) {
      const v = y[k];
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    ys.push(y);
    ranges.push(lo <= hi ? [lo, hi] : [NaN, NaN]);
  }
  return { data: [xs!, ...ys], ranges };
}

/** The general case: per component (x, y) lists with gap markers between pieces, joined on x. */
export function joinedColumns(components: ComponentTrace[], x0: number, x1: number, width: number): RowColumns {
  const perComp: { xs: number[]; ys: (number | null)[] }[] = [];
  const ranges: [number, number][] = [];
  const span = x1 - x0;
  for (const comp of components) {
    const xs: number[] = [];
    const ys: (number | null)[] = [];
    let lo = Infinity;
    let hi = -Infinity;
    for (const p of comp.pieces) {
      const n = p.samples.length;
      const pEnd = p.t0 + (n - 1) * p.dt;
      if (pEnd < x0 || p.t0 > x1) continue;
      const i0 = Math.max(0, Math.floor((x0 - p.t0) / p.dt));
      const i1 = Math.min(n, Math.ceil((x1 - p.t0) / p.dt) + 1);
      const visibleSpan = Math.min(x1, pEnd) - Math.max(x0, p.t0);
      const columns = Math.max(1, Math.round((width * Math.max(visibleSpan, p.dt)) / span));
      const cols = drawColumns(p.samples, p.envelope, i0, i1, columns);
      if (xs.length > 0 && cols.count > 0) {
        // Gap marker between pieces: a null just after the previous piece's last point.
        xs.push(xs[xs.length - 1] + p.dt * 1e-3);
        ys.push(null);
      }
      for (let k = 0; k < cols.count; k++) {
        const v = cols.value[k];
        xs.push(p.t0 + cols.index[k] * p.dt);
        ys.push(v);
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
    perComp.push({ xs, ys });
    ranges.push(lo <= hi ? [lo, hi] : [NaN, NaN]);
  }
  return { data: joinColumns(perComp), ranges };
}

/** Merges per-component (xs, ys) into uPlot's aligned form. Exact x ties share one column. */
export function joinColumns(parts: { xs: number[]; ys: (number | null)[] }[]): RowColumns['data'] {
  if (parts.length === 1) return [parts[0].xs, parts[0].ys];
  const pos = new Array<number>(parts.length).fill(0);
  const xs: number[] = [];
  const ys: (number | null | undefined)[][] = parts.map(() => []);
  for (;;) {
    let next = Infinity;
    for (let c = 0; c < parts.length; c++) if (pos[c] < parts[c].xs.length && parts[c].xs[pos[c]] < next) next = parts[c].xs[pos[c]];
    if (next === Infinity) break;
    xs.push(next);
    for (let c = 0; c < parts.length; c++) {
      if (pos[c] < parts[c].xs.length && parts[c].xs[pos[c]] === next) ys[c].push(parts[c].ys[pos[c]++]);
      else ys[c].push(undefined);
    }
  }
  return [xs, ...ys];
}

/**
 * Places a component's values in its band: `centre + (v - mid) * scale` (band units), leaving gaps
 * (null) and missing points (undefined) as they are. Typed columns are rewritten in place.
 */
export function placeColumn(col: YColumn, centre: number, mid: number, scale: number): YColumn {
  if (col instanceof Float64Array) {
    for (let k = 0; k < col.length; k++) col[k] = centre + (col[k] - mid) * scale;
    return col;
  }
  return col.map((v) => (v === null || v === undefined ? v : centre + (v - mid) * scale));
}

/**
 * Points for drawing samples [i0, i1) into `columns` pixel columns, as `plotColumns` gives them
 * (core/view/envelope.ts: raw samples at up to RAW_SAMPLES_PER_COLUMN per column, else each column's
 * minimum then maximum), except between that and the pyramid's first level (which needs two of its
 * buckets per column): there `plotColumns` hands over the raw samples, and this gives it the samples
 * themselves as a level of one-sample buckets instead, so each column's minimum and maximum come from
 * the raw samples. Every sample still counts in exactly one column, so no spike is lost, and the plot
 * is given two points per column instead of up to 32.
 */
export function drawColumns(samples: SampleArray, env: Envelope, i0: number, i1: number, columns: number): PlotColumns {
  const a = Math.max(0, Math.floor(i0));
  const b = Math.min(samples.length, Math.ceil(i1));
  const perColumn = (b - a) / columns;
  const between = b > a && perColumn > RAW_SAMPLES_PER_COLUMN && env.levels.length > 0 && env.levels[0].bucket * 2 > perColumn;
  if (!between || !(samples instanceof Float32Array)) return plotColumns(samples, env, i0, i1, columns);
  return plotColumns(samples, { length: samples.length, levels: [{ bucket: 1, min: samples, max: samples }] }, i0, i1, columns);
}
