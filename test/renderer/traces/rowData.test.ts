import { describe, expect, it } from 'vitest';
import { drawColumns, joinedColumns, makePiece, placeColumn, rowColumns, type ComponentTrace } from '../../../renderer/traces/rowData';
import { buildEnvelope, plotColumns } from '../../../core/view/envelope';
import { Rng } from '../../../core/synth/random';

/** A component of `n` samples at `rate` Hz starting `t0` s from the reference, noise with a spike at `spikeAt`. */
function comp(key: string, n: number, seed: number, t0 = 0, rate = 100, spikeAt = -1): ComponentTrace {
  const rng = new Rng(seed);
  const x = new Float32Array(n);
  for (let i = 0; i < n; i++) x[i] = rng.uniform(-100, 100);
  if (spikeAt >= 0) x[spikeAt] = 5000;
  return { key, label: key.slice(-3), pieces: [makePiece(t0, rate, x)] };
}

describe('rowColumns', () => {
  it('gives aligned components (same start, rate and length) the same points as the general join, as typed arrays', () => {
    const comps = [comp('Z', 9000, 1), comp('N', 9000, 2), comp('E', 9000, 3)];
    for (const [x0, x1, width] of [[0, 90, 1480], [10, 12, 1480], [-5, 95, 300], [0, 90, 40]]) {
      const fast = rowColumns(comps, x0, x1, width);
      const slow = joinedColumns(comps, x0, x1, width);
      expect(fast.data[0]).toBeInstanceOf(Float64Array);
      expect(Array.from(fast.data[0])).toEqual(slow.data[0]);
      for (let c = 1; c <= 3; c++) expect(Array.from(fast.data[c] as Float64Array)).toEqual(slow.data[c]);
      expect(fast.ranges).toEqual(slow.ranges);
    }
  });

  it('falls back to the join (with a gap marker) when a component has two pieces, and when starts differ', () => {
    const a = comp('Z', 3000, 4);
    const b: ComponentTrace = { key: 'N', label: 'N', pieces: [comp('N', 1000, 5).pieces[0], comp('N', 1000, 6, 20).pieces[0]] };
    const r = rowColumns([a, b], 0, 30, 600);
    expect(Array.isArray(r.data[0])).toBe(true);
    expect((r.data[2] as (number | null | undefined)[]).filter((v) => v === null)).toHaveLength(1);
    const shifted = rowColumns([comp('Z', 3000, 4), comp('N', 3000, 5, 0.005)], 0, 30, 600);
    expect(Array.isArray(shifted.data[0])).toBe(true);
    expect((shifted.data[1] as unknown[]).includes(undefined)).toBe(true);
  });
});

describe('drawColumns', () => {
  it('between 4 and 32 samples per column gives each column its min and max, every sample in exactly one column', () => {
    const c = comp('Z', 9000, 7, 0, 100, 4321);
    const p = c.pieces[0];
    const cols = drawColumns(p.samples, p.envelope, 0, 9000, 1480);
    expect(cols.raw).toBe(false);
    expect(cols.count).toBe(2 * 1480);
    // Independently: split [0, 9000) into 1480 runs by rounding (k + 1) * 9000 / 1480.
    let start = 0;
    for (let k = 0; k < 1480; k++) {
      const end = k === 1479 ? 9000 : Math.round(((k + 1) * 9000) / 1480);
      const slice = Array.from(p.samples.subarray(start, end));
      expect(cols.value[2 * k]).toBe(Math.min(...slice));
      expect(cols.value[2 * k + 1]).toBe(Math.max(...slice));
      expect(cols.index[2 * k]).toBe((start + end) / 2); // the pyramid's convention (core/view/envelope.ts)
      start = end;
    }
    expect(Math.max(...Array.from(cols.value.subarray(0, cols.count)))).toBe(5000);
  });

  it('is plotColumns itself at up to 4 samples per column and from the pyramid on', () => {
    const p = comp('Z', 9000, 8).pieces[0];
    expect(drawColumns(p.samples, p.envelope, 100, 500, 200)).toEqual(plotColumns(p.samples, p.envelope, 100, 500, 200));
    expect(drawColumns(p.samples, p.envelope, 0, 9000, 100)).toEqual(plotColumns(p.samples, p.envelope, 0, 9000, 100));
    expect(drawColumns(p.samples, buildEnvelope(p.samples), 0, 9000, 100).raw).toBe(false);
  });
});

describe('placeColumn', () => {
  it('moves values into the band (centre + (v - mid) * scale), in place for typed columns, keeping gaps and missing points', () => {
    const typed = new Float64Array([1, 3, 5]);
    expect(placeColumn(typed, 2.5, 3, 0.5)).toBe(typed);
    expect(Array.from(typed)).toEqual([1.5, 2.5, 3.5]);
    expect(placeColumn([1, null, undefined, 5], 0.5, 3, 0.25)).toEqual([0, null, undefined, 1]);
  });
});
