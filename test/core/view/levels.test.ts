import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { levelBins, looksClipped } from '../../../core/view/levels';
import type { Segment } from '../../../core/model';

function segment(start: number, rate: number, samples: Float64Array, recordLen = 400): Segment {
  const nRec = Math.ceil(samples.length / recordLen);
  const recordStarts = new Float64Array(nRec);
  const recordFirstSample = new Int32Array(nRec);
  for (let r = 0; r < nRec; r++) {
    recordFirstSample[r] = r * recordLen;
    recordStarts[r] = start + Math.round((r * recordLen * 1e6) / rate);
  }
  return {
    id: { network: 'XX', station: 'A', location: '', channel: 'HHZ' }, sampleRate: rate, start,
    end: start + Math.round(((samples.length - 1) * 1e6) / rate), samples, recordStarts, recordFirstSample,
    encoding: 11, recordLength: 512, quality: 'D',
    timing: { qualityMin: null, qualityMax: null, clockLockedRecords: 0, questionableTimeRecords: 0, leapSecondRecords: 0, steimMismatchRecords: 0, records: nRec },
  };
}

describe('levelBins', () => {
  it('gives per-bin RMS about the bin mean equal to numpy std (ddof=0)', () => {
    // Reference: numpy 2.x std over the same bins of the same samples.
    const rate = 100;
    const n = 100 * 95;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = 1000 + 50 * Math.sin(i * 0.37) + ((i * 7919) % 101) - 50;
    const start = 1_700_000_000_000_000;
    // Grid starts 2.5 s before the data; bins of 10 s.
    const res = levelBins([segment(start, rate, x)], start - 2_500_000, 10_000_000, 11);
    const ref = JSON.parse(execFileSync('python3', ['-c', `
import sys, json, numpy as np
x = np.array(json.loads(sys.stdin.read()))
# bin b covers samples with t in [b*10 - 2.5, (b+1)*10 - 2.5) s from the data start, 100 Hz
out = []
for b in range(11):
    i0 = max(0, int(np.ceil((b * 10 - 2.5) * 100))); i1 = min(len(x), int(np.ceil(((b + 1) * 10 - 2.5) * 100)))
    out.append(float(np.std(x[i0:i1])) if i1 > i0 else None)
print(json.dumps(out))`], { input: JSON.stringify(Array.from(x)) }).toString()) as (number | null)[];
    for (let b = 0; b < 11; b++) {
      if (ref[b] === null) expect(res.rms[b]).toBeNaN();
      else expect(res.rms[b]).toBeCloseTo(ref[b]!, 9);
    }
  });

  it('reports the share of each bin that holds data', () => {
    const start = 0;
    const res = levelBins([segment(start, 100, new Float64Array(1500))], -5_000_000, 10_000_000, 3);
    expect(Array.from(res.coverage)).toEqual([0.5, 1, 0]);
    expect(res.rms[2]).toBeNaN();
  });

  it('treats a constant offset as no signal', () => {
    const res = levelBins([segment(0, 100, new Float64Array(1000).fill(123456))], 0, 10_000_000, 1);
    expect(res.rms[0]).toBe(0);
    expect(res.peak[0]).toBe(0);
  });

  it('flags the bins where a signal sits flat at its extreme, as numpy finds them by the same rule', () => {
    // A 2 Hz wave whose amplitude grows through 60 s at 100 Hz, on an offset of 3,000 counts, with
    // some integer noise, cut at 3,000 ± 20,000 counts by numpy's clip (a digitiser at full scale).
    // Reference: numpy 2.4 computes the rule independently: in each 5 s bin, the longest run of samples
    // equal to the bin's highest or lowest value, at least 4, and a range over 2000 counts.
    const out = JSON.parse(execFileSync('python3', ['-c', `
import json, numpy as np
rng = np.random.default_rng(7)
t = np.arange(6000) / 100.0
x = np.clip(np.round(3000 + 40000 * (t / 60.0) ** 2 * np.sin(2 * np.pi * 2 * t)) + rng.integers(-3, 4, 6000), 3000 - 20000, 3000 + 20000)
flags = []
for b in range(12):
    y = x[b * 500:(b + 1) * 500]
    best = 0
    for ext in (y.max(), y.min()):
        run = 0
        for v in y:
            run = run + 1 if v == ext else 0
            best = max(best, run)
    flags.append(int(best >= 4 and y.max() - y.min() > 2000))
print(json.dumps({"x": x.tolist(), "flags": flags}))`]).toString()) as { x: number[]; flags: number[] };
    const res = levelBins([segment(0, 100, Float64Array.from(out.x))], 0, 5_000_000, 12);
    expect(Array.from(res.clipped)).toEqual(out.flags);
    // The wave reaches the rails (40,000·(t/60)² > 20,000) after 42.4 s: bins 9-11 clipped, 0-7 not.
    expect(Array.from(res.clipped.subarray(0, 8))).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
    expect(Array.from(res.clipped.subarray(9))).toEqual([1, 1, 1]);
    for (let b = 0; b < 12; b++) expect(looksClipped(out.x, b * 500, (b + 1) * 500)).toBe(res.clipped[b] === 1);
  });

  it('does not call a constant offset, a quiet trace or a run at a superseded extreme clipped', () => {
    expect(levelBins([segment(0, 100, new Float64Array(1000).fill(123456))], 0, 10_000_000, 1).clipped[0]).toBe(0);
    // Noise of ±2 counts on a 50,000-count offset sits at its extremes for runs of 4 and more, but spans 4 counts.
    const quiet = Float64Array.from({ length: 1000 }, (_, i) => 50_000 + [2, 2, 2, 2, 2, -2, -2, -2, -2, 0][i % 10]);
    expect(levelBins([segment(0, 100, quiet)], 0, 10_000_000, 1).clipped[0]).toBe(0);
    expect(looksClipped(quiet, 0, quiet.length)).toBe(false);
    // Flat for 6 samples at 500, then a single swing to ±3000: the flat run is no longer at an extreme.
    const swing = [500, 500, 500, 500, 500, 500, 0, 3000, 0, -3000, 0];
    expect(looksClipped(swing, 0, swing.length)).toBe(false);
    expect(looksClipped([...swing, 3000, 3000, 3000, 3000], 0, swing.length + 4)).toBe(true);
  });

  it('continues a flat run across a record boundary inside a segment, but not across a gap between segments', () => {
    // 100 Hz, one 10 s bin. A swing of ±3000 counts, then 4 samples at +3000 split 2 + 2 by a record
    // boundary (records of 102 samples: the run is samples 100-103).
    const x = new Float64Array(200);
    x[10] = -3000;
    x.fill(3000, 100, 104);
    expect(levelBins([segment(0, 100, x, 102)], 0, 10_000_000, 1).clipped[0]).toBe(1);
    expect(looksClipped(x, 0, 200)).toBe(true);
    // The same samples as two segments with a 1 s gap after sample 101: runs of 2 and 2.
    const a = segment(0, 100, x.slice(0, 102), 102);
    const b = segment(2_020_000, 100, x.slice(102), 102);
    expect(levelBins([a, b], 0, 10_000_000, 1).clipped[0]).toBe(0);
  });

  it('looksClipped refuses a sample range outside the samples, naming it', () => {
    const x = [0, 3000, 3000, 3000, 3000];
    expect(looksClipped(x, 0, 0)).toBe(false);
    expect(() => looksClipped(x, 0, 6)).toThrow(/0 <= i0 <= i1 <= 5 .*got i0 = 0, i1 = 6/);
    expect(() => looksClipped(x, 3, 2)).toThrow(RangeError);
    expect(() => looksClipped(x, -1, 2)).toThrow(RangeError);
    expect(() => looksClipped(x, 0.5, 2)).toThrow(RangeError);
  });
});
