import { describe, expect, it } from 'vitest';
import {
  channelsOf, findChannel, isStateOfHealthChannel, missingMetadata, parseStationXml, type Inventory,
} from '../../../core/stationxml';
import { microsFromIso } from '../../../core/time';

// A StationXML 1.2 document (FDSN schema element names) with two epochs of one channel, the
// second changing the sample rate at a known time, an open-ended channel and one closed channel.
const doc = `<?xml version="1.0" encoding="UTF-8"?>
<FDSNStationXML xmlns="http://www.fdsn.org/xml/station/1" schemaVersion="1.2">
  <Source>test</Source>
  <Created>2024-01-01T00:00:00Z</Created>
  <Network code="XT">
    <Station code="ALPHA">
      <Latitude>46.5</Latitude><Longitude>7.25</Longitude><Elevation>1520</Elevation><Site><Name>A</Name></Site>
      <Channel code="HHZ" locationCode="00" startDate="2020-01-01T00:00:00Z" endDate="2023-06-30T10:00:00Z">
        <Latitude>46.5</Latitude><Longitude>7.25</Longitude><Elevation>1520</Elevation><Depth>0</Depth><SampleRate>100</SampleRate>
      </Channel>
      <Channel code="HHZ" locationCode="00" startDate="2023-06-30T10:00:00Z">
        <Latitude>46.5</Latitude><Longitude>7.25</Longitude><Elevation>1520</Elevation><Depth>0</Depth><SampleRate>200</SampleRate>
      </Channel>
      <Channel code="HHN" locationCode="00" startDate="2020-01-01T00:00:00Z" endDate="2021-01-01T00:00:00Z">
        <Latitude>46.5</Latitude><Longitude>7.25</Longitude><Elevation>1520</Elevation><Depth>0</Depth><SampleRate>100</SampleRate>
      </Channel>
      <Channel code="LHZ" locationCode="">
        <Latitude>46.5</Latitude><Longitude>7.25</Longitude><Elevation>1520</Elevation><Depth>0</Depth><SampleRate>1</SampleRate>
      </Channel>
    </Station>
  </Network>
</FDSNStationXML>`;

const inv: Inventory = parseStationXml(doc, 'epochs.xml');
const id = (station: string, location: string, channel: string) => ({ network: 'XT', station, location, channel });
const t = microsFromIso;

describe('channelsOf', () => {
  it('lists every channel epoch in document order', () => {
    expect(channelsOf(inv).map((c) => `${c.id.channel}@${c.sampleRate}`)).toEqual(['HHZ@100', 'HHZ@200', 'HHN@100', 'LHZ@1']);
  });
});

describe('findChannel', () => {
  it('returns the epoch in force: start inclusive, end exclusive', () => {
    expect(findChannel(inv, id('ALPHA', '00', 'HHZ'), t('2022-05-01T00:00:00Z'))?.sampleRate).toBe(100);
    expect(findChannel(inv, id('ALPHA', '00', 'HHZ'), t('2023-06-30T09:59:59.999999Z'))?.sampleRate).toBe(100);
    expect(findChannel(inv, id('ALPHA', '00', 'HHZ'), t('2023-06-30T10:00:00Z'))?.sampleRate).toBe(200);
    expect(findChannel(inv, id('ALPHA', '00', 'HHZ'), t('2030-01-01T00:00:00Z'))?.sampleRate).toBe(200);
  });

  it('returns undefined before the first epoch, after a closed epoch and for unknown codes', () => {
    expect(findChannel(inv, id('ALPHA', '00', 'HHZ'), t('2019-12-31T23:59:59Z'))).toBeUndefined();
    expect(findChannel(inv, id('ALPHA', '00', 'HHN'), t('2021-01-01T00:00:00Z'))).toBeUndefined();
    expect(findChannel(inv, id('ALPHA', '', 'HHZ'), t('2022-01-01T00:00:00Z'))).toBeUndefined();
    expect(findChannel(inv, id('BETA', '00', 'HHZ'), t('2022-01-01T00:00:00Z'))).toBeUndefined();
  });

  it('treats a channel without dates as in force at any time', () => {
    expect(findChannel(inv, id('ALPHA', '', 'LHZ'), t('1990-01-01T00:00:00Z'))?.sampleRate).toBe(1);
  });

  it('refuses a time that is not a finite number', () => {
    expect(() => findChannel(inv, id('ALPHA', '', 'LHZ'), NaN)).toThrow(RangeError);
  });
});

describe('isStateOfHealthChannel (SEED Reference Manual v2.4 appendix A channel codes)', () => {
  it('marks log, administrative, opaque, test-point, temperature, humidity, mass-position and clock channels', () => {
    for (const c of ['LOG', 'SOH', 'ACE', 'OCF', 'VEP', 'VEA', 'LKI', 'LIO', 'VMU', 'VM1', 'LCQ', 'LCE']) {
      expect([c, isStateOfHealthChannel(c)]).toEqual([c, true]);
    }
  });

  it('keeps ground-motion and pressure channels as waveforms', () => {
    for (const c of ['HHZ', 'HH1', 'EHZ', 'HNZ', 'BHN', 'LHZ', 'DPZ', 'SHZ', 'BDF', 'HDH']) {
      expect([c, isStateOfHealthChannel(c)]).toEqual([c, false]);
    }
  });
});

describe('missingMetadata', () => {
  it('reports each data channel without metadata once, log and state-of-health channels apart', () => {
    const day = { start: t('2024-01-01T00:00:00Z'), end: t('2024-01-01T23:59:59.99Z') };
    const report = missingMetadata(inv, [
      { id: id('ALPHA', '00', 'HHZ'), ...day },
      { id: id('BETA', '00', 'HHZ'), ...day },
      { id: id('BETA', '00', 'HHZ'), start: t('2024-01-02T00:00:00Z'), end: t('2024-01-02T01:00:00Z') },
      { id: id('ALPHA', '', 'LOG'), ...day },
      { id: id('ALPHA', '00', 'HHN'), ...day },
      { id: id('ALPHA', '', 'VM1') },
      { id: id('ALPHA', '', 'LHZ') },
    ]);
    expect(report.waveforms).toEqual([
      { id: id('BETA', '00', 'HHZ'), key: 'XT.BETA.00.HHZ', reason: 'no-channel' },
      { id: id('ALPHA', '00', 'HHN'), key: 'XT.ALPHA.00.HHN', reason: 'no-epoch' },
    ]);
    expect(report.stateOfHealth.map((m) => m.key)).toEqual(['XT.ALPHA..LOG', 'XT.ALPHA..VM1']);
  });

  it('counts a channel as covered when any of its spans overlaps an epoch', () => {
    const report = missingMetadata(inv, [
      { id: id('ALPHA', '00', 'HHN'), start: t('2022-01-01T00:00:00Z'), end: t('2022-01-02T00:00:00Z') },
      { id: id('ALPHA', '00', 'HHN'), start: t('2020-12-31T23:00:00Z'), end: t('2021-01-01T01:00:00Z') },
    ]);
    expect(report.waveforms).toEqual([]);
  });

  it('refuses data that is not an array', () => {
    expect(() => missingMetadata(inv, 'XT.ALPHA.00.HHZ' as never)).toThrow(TypeError);
  });
});
