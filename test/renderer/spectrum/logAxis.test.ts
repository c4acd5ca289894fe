import { describe, expect, it } from 'vitest';
import { logTicks, tickLabel } from '../../../renderer/spectrum/logAxis';

describe('logAxis', () => {
  it('logTicks lists 1-2-5 ticks of each decade inside the range, exact in decimal', () => {
    expect(logTicks(0.033, 50, [1, 2, 5])).toEqual([0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50]);
    expect(logTicks(1e-4, 1e4, [1])).toEqual([1e-4, 1e-3, 0.01, 0.1, 1, 10, 100, 1000, 1e4]);
  });

  it('logTicks keeps a tick on the range\u2019s ends and gives none for a range that is empty or not positive', () => {
    expect(logTicks(0.1, 100, [1])).toEqual([0.1, 1, 10, 100]);
    expect(logTicks(0, 10, [1])).toEqual([]);
    expect(logTicks(10, 1, [1])).toEqual([]);
  });

  it('tickLabel writes plain decimals from 0.001 below 1e5 and exponents outside, nothing for an unlabelled tick', () => {
    expect([0.001, 0.05, 1, 20, 50000].map(tickLabel)).toEqual(['0.001', '0.05', '1', '20', '50000']);
    expect([1e-4, 1e5, 2e6].map(tickLabel)).toEqual(['1e-4', '1e5', '2e6']);
    expect(tickLabel(null)).toBe('');
  });
});
