import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { buildEnvelope, plotColumns } from '../../../core/view/envelope';

function noise(n: number, seed: number): Float32Array {
  const out = new Float32Array(n);
  let s = seed >>> 0;
  for (let i = 0; i < n; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    out[i] = (s / 2 ** 32 - 0.5) * 1000;
  }
  return out;
}

describe('buildEnvelope / plotColumns', () => {
  it('column minima and maxima equal numpy.minimum/maximum.reduceat over the same sample partition', () => {
    // Reference: numpy 2.x ufunc.reduceat over the column boundaries the function reports.
    const x = noise(100_003, 7);
    const env = buildEnvelope(x);
    const cols = plotColumns(x, env, 1234, 98_765, 300);
    expect(cols.raw).toBe(false);
    const bucket = env.levels.find((l) => (98_765 - 1234) / 300 >= l.bucket * 2 && l.bucket * 4 * 2 > (98_765 - 1234) / 300)!.bucket;
    const script = `
import sys, json, numpy as np
d = json.loads(sys.stdin.read())
x = np.array(d['x'], dtype=np.float32)
first = d['a'] // d['bucket']; last = -(-d['b'] // d['bucket'])
per = (last - first) / d['columns']
edges = [first] + [first + int(np.floor((c + 1) * per + 0.5)) for c in range(d['columns'] - 1)] + [last]
edges = [min(e * d['bucket'], len(x)) for e in edges]
x = x[:edges[-1]]
starts = [e for i, e in enumerate(edges[:-1]) if edges[i + 1] > e]
print(json.dumps({'min': np.minimum.reduceat(x, starts).tolist(), 'max': np.maximum.reduceat(x, starts).tolist()}))`;
    const ref = JSON.parse(execFileSync('python3', ['-c', script], {
      input: JSON.stringify({ x: Array.from(x), a: 1234, b: 98_765, bucket, columns: 300 }),
    }).toString()) as { min: number[]; max: number[] };
    const mins: number[] = [];
    const maxs: number[] = [];
    for (let k = 0; k < cols.count; k += 2) {
      mins.push(cols.value[k]);
      maxs.push(cols.value[k + 1]);
    }
    expect(mins.length).toBe(ref.min.length);
    expect(mins).toEqual(ref.min);
    expect(maxs).toEqual(ref.max);
  });

  it('keeps a single-sample spike wherever it falls and however far out the view is', () => {
    const n = 360_000;
    for (const at of [0, 17, 123_457, n - 1]) {
      const x = new Float32Array(n);
      x[at] = 5000;
      const env = buildEnvelope(x);
      for (const columns of [50, 333, 1920]) {
        const cols = plotColumns(x, env, 0, n, columns);
        expect(Math.max(...cols.value.subarray(0, cols.count))).toBe(5000);
      }
    }
  });

  it('returns the raw samples when there are at most 4 samples per column', () => {
    const x = new Int32Array([5, -3, 9, 2, 7, 1, 0, 4]);
    const cols = plotColumns(x, buildEnvelope(x), 2, 6, 2);
    expect(cols.raw).toBe(true);
    expect(Array.from(cols.index)).toEqual([2, 3, 4, 5]);
    expect(Array.from(cols.value)).toEqual([9, 2, 7, 1]);
  });

  it('draws at most two points per column', () => {
    const x = noise(1_000_000, 3);
    const cols = plotColumns(x, buildEnvelope(x), 0, x.length, 800);
    expect(cols.count).toBeLessThanOrEqual(1600);
    expect(cols.count).toBeGreaterThan(1500);
  });

  it('rejects a non-positive column count', () => {
    const x = noise(10, 1);
    expect(() => plotColumns(x, buildEnvelope(x), 0, 10, 0)).toThrow(RangeError);
  });
});
