import { describe, expect, it } from 'vitest';
import { chooseSiteStreams } from '../../../core/pick/streams';
import type { ChannelId } from '../../../core/model';

function ids(station: string, spec: string): ChannelId[] {
  // spec: "LOC.CHA LOC.CHA ...", location "--" for empty
  return spec.split(' ').map((s) => {
    const [loc, cha] = s.split('.');
    return { network: 'XX', station, location: loc === '--' ? '' : loc, channel: cha };
  });
}

describe('one stream per site (SEED band/instrument/orientation codes, SEED manual v2.4 appendix A)', () => {
  it('prefers the high-gain seismometer (HH?) to the accelerometer (HN?) at the same site', () => {
    const [s] = chooseSiteStreams(ids('A', '00.HNZ 00.HNN 00.HNE 10.HHZ 10.HHN 10.HHE'));
    expect(s.site).toBe('XX.A');
    expect(s.vertical.channel).toBe('HHZ');
    expect(s.vertical.location).toBe('10');
    expect(s.horizontals!.map((h) => h.channel)).toEqual(['HHN', 'HHE']);
    expect(s.skipped).toEqual(['00.HN']);
  });

  it('prefers three components to a vertical alone, then the higher-rate band, then the lower location code', () => {
    expect(chooseSiteStreams(ids('B', '--.EHZ 00.HHZ'))[0].vertical).toMatchObject({ location: '00', channel: 'HHZ' });
    expect(chooseSiteStreams(ids('B', '--.EHZ --.EHN --.EHE 00.HHZ'))[0].vertical.channel).toBe('EHZ');
    expect(chooseSiteStreams(ids('B', '00.BHZ 00.BHN 00.BHE 00.HHZ 00.HH1 00.HH2'))[0].vertical.channel).toBe('HHZ');
    expect(chooseSiteStreams(ids('B', '10.HHZ 10.HHN 10.HHE 00.HHZ 00.HHN 00.HHE'))[0].vertical.location).toBe('00');
  });

  it('takes horizontals coded 1/2 when there are no N/E, gives a vertical-only site no horizontals, and leaves out sites without a vertical', () => {
    const out = chooseSiteStreams([...ids('C', '--.HHZ --.HH1 --.HH2'), ...ids('D', '--.HHZ'), ...ids('E', '--.HHN --.HHE')]);
    expect(out.map((s) => s.site)).toEqual(['XX.C', 'XX.D']);
    expect(out[0].horizontals!.map((h) => h.channel)).toEqual(['HH1', 'HH2']);
    expect(out[1].horizontals).toBeNull();
  });

  it('geophones (DP?) are a site\'s stream when they are all it has', () => {
    const [s] = chooseSiteStreams(ids('5', '1.DPZ 1.DPN 1.DPE'));
    expect(s.vertical.channel).toBe('DPZ');
    expect(s.horizontals!.map((h) => h.channel)).toEqual(['DPN', 'DPE']);
  });

  it('rejects a channel code that is not three characters', () => {
    expect(() => chooseSiteStreams(ids('F', '--.HZ'))).toThrow(/channel code must have 3 characters .*got "HZ"/);
  });
});
