import { describe, expect, it } from 'vitest';
import { siteStreams } from '../../renderer/data/sites';

describe('siteStreams', () => {
  it('prefers the broadband at a site that also has an accelerometer, and orders Z, N, E', () => {
    const s = siteStreams(['XX.A.10.HNZ', 'XX.A.00.HHE', 'XX.A.00.HHN', 'XX.A.00.HHZ', 'XX.A.10.HNN']);
    expect(s).toEqual([{ site: 'XX.A', stream: 'XX.A.00.HH', channels: ['XX.A.00.HHZ', 'XX.A.00.HHN', 'XX.A.00.HHE'], others: ['XX.A.10.HN'] }]);
  });

  it('orders 1/2 horizontals after the vertical and keeps a vertical-only site', () => {
    const s = siteStreams(['XX.B..HH2', 'XX.B..HH1', 'XX.B..HHZ', 'XX.C..EHZ']);
    expect(s.map((x) => x.channels)).toEqual([['XX.B..HHZ', 'XX.B..HH1', 'XX.B..HH2'], ['XX.C..EHZ']]);
  });

  it('orders numbered stations as numbers: 2 before 10', () => {
    expect(siteStreams(['1.10.1.DPZ', '1.2.1.DPZ', '1.1.1.DPZ']).map((s) => s.site)).toEqual(['1.1', '1.2', '1.10']);
  });

  it('ignores keys that are not NET.STA.LOC.CHA with a three-letter channel', () => {
    expect(siteStreams(['bad', 'XX.D..LOG'])).toEqual([{ site: 'XX.D', stream: 'XX.D..LO', channels: ['XX.D..LOG'], others: [] }]);
  });
});
