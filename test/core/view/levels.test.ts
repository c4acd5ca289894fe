import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { levelBins } from '../../../core/view/levels';
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
});
