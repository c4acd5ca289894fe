/**
 * Turns a site's component traces into the columnar data one uPlot row draws: a shared x array
 * (seconds from the view's reference time) and one y array per component, each placed in its own
 * band of the row. Components that share no x values are joined as uPlot expects: `undefined` where
 * a component has no point (lines pass over it), `null` where its data has a gap (lines break).
 */
import { buildEnvelope, plotColumns, type Envelope } from '../../core/view/envelope';
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

export function makePiece(t0: number, sampleRate: number, samples: SampleArray): TracePiece {
  return { t0, dt: 1 / sampleRate, samples, envelope: buildEnvelope(samples) };
}

export interface RowColumns {
  data: [number[], ...(number | null | undefined)[][]];
  /** Per component: [min, max] of the values in the window (NaN when it has none). */
  ranges: [number, number][];
}

/** Window [x0, x1] in seconds, drawn `width` pixels wide. */
export function rowColumns(components: ComponentTrace[], x0: number, x1: number, width: number): RowColumns {
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
      const cols = plotColumns(p.samples, p.envelope, i0, i1, columns);
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
