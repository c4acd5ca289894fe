import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseStationXml, writeStationXml, type ChannelMeta, type Inventory } from '../../../core/stationxml';
import { microsFromIso } from '../../../core/time';

// An invented station of the kind the demo scenario writes: a broadband with a full
// poles-and-zeros sensor stage, a digitiser gain stage and a decimating FIR stage.
function broadband(channel: string, azimuth: number, dip: number, start: string, end: string | null): ChannelMeta {
  return {
    id: { network: 'ZQ', station: 'KELD', location: '00', channel },
    start: microsFromIso(start),
    end: end === null ? null : microsFromIso(end),
    latitude: 61.234567, longitude: -12.5, elevation: 312.25, depth: 2,
    azimuth, dip, sampleRate: 100,
    sensor: 'Invented broadband 120 s & co <test>',
    sensitivity: { value: 7.5e8, frequency: 1, inputUnits: 'm/s', outputUnits: 'count', sign: 1 },
    stages: [
      {
        number: 1, inputUnits: 'm/s', outputUnits: 'V',
        filter: {
          kind: 'polesZeros', transferFunction: 'LAPLACE (RADIANS/SECOND)',
          normalizationFactor: 60077000, normalizationFrequency: 1,
          zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }],
          poles: [{ re: -0.037004, im: 0.037016 }, { re: -0.037004, im: -0.037016 }, { re: -251.33, im: 0 },
            { re: -131.04, im: -467.29 }, { re: -131.04, im: 467.29 }],
        },
        decimation: null,
        gain: { value: 1500, frequency: 1 },
      },
      {
        number: 2, inputUnits: 'V', outputUnits: 'count',
        filter: { kind: 'coefficients', transferFunction: 'DIGITAL', numerator: [1], denominator: [] },
        decimation: { inputSampleRate: 200, factor: 1, offset: 0, delay: 0, correction: 0 },
        gain: { value: 500000, frequency: 1 },
      },
      {
        number: 3, inputUnits: 'count', outputUnits: 'count',
        filter: { kind: 'fir', symmetry: 'NONE', coefficients: [0.1, 0.2, 0.4, 0.2, 0.1] },
        decimation: { inputSampleRate: 200, factor: 2, offset: 0, delay: 0.01, correction: 0.01 },
        gain: { value: 1, frequency: 0 },
      },
    ],
  };
}

const invented: Inventory = {
  schemaVersion: '1.2',
  source: 'Daybreak demo',
  sender: 'Daybreak',
  module: 'scenario generator',
  created: microsFromIso('2026-12-01T20:00:00Z'),
  networks: [{
    code: 'ZQ', description: 'Invented network', start: microsFromIso('2025-01-01T00:00:00Z'), end: null,
    stations: [{
      code: 'KELD', start: microsFromIso('2025-01-01T00:00:00Z'), end: null,
      latitude: 61.234567, longitude: -12.5, elevation: 312.25, site: 'Keld ridge',
      channels: [
        broadband('HHZ', 0, -90, '2025-01-01T00:00:00Z', null),
        broadband('HH1', 20, 0, '2025-01-01T00:00:00Z', '2026-06-01T00:00:00.250000Z'),
        broadband('HH2', 110, 0, '2025-01-01T00:00:00Z', null),
      ],
    }],
  }],
};

describe('writeStationXml', () => {
  const xml = writeStationXml(invented);

  it('round-trips: reading what it wrote gives back the inventory', () => {
    expect(parseStationXml(xml, 'written.xml')).toEqual(invented);
  });

  // Reference: Python's xml.etree.ElementTree (standard library) reads the written document; the
  // expected element order is that of the sequences in the FDSN StationXML 1.2 schema
  // (fdsn-station.xsd: RootType, StationType, ChannelType, ResponseType, ResponseStageType, PolesZerosType).
  it('writes well-formed XML in the StationXML namespace, schema 1.2, elements in schema order', () => {
    const out = JSON.parse(execFileSync('python3', ['-c', `
import sys, json, xml.etree.ElementTree as ET
root = ET.fromstring(sys.stdin.read())
ns = '{http://www.fdsn.org/xml/station/1}'
strip = lambda e: e.tag.replace(ns, '')
ch = root.find(ns + 'Network/' + ns + 'Station/' + ns + 'Channel')
stage = ch.find(ns + 'Response/' + ns + 'Stage')
pz = stage.find(ns + 'PolesZeros')
print(json.dumps({'root': root.tag, 'version': root.get('schemaVersion'),
  'rootChildren': [strip(e) for e in root],
  'station': [strip(e) for e in root.find(ns + 'Network/' + ns + 'Station') if strip(e) != 'Channel'],
  'channel': [strip(e) for e in ch], 'response': [strip(e) for e in ch.find(ns + 'Response')],
  'stage': [strip(e) for e in stage], 'pz': [strip(e) for e in pz],
  'a0': float(pz.findtext(ns + 'NormalizationFactor')),
  'pole3': [float(pz.findall(ns + 'Pole')[3].findtext(ns + x)) for x in ('Real', 'Imaginary')],
  'sensor': ch.findtext(ns + 'Sensor/' + ns + 'Description'),
  'end': root.find(ns + 'Network/' + ns + 'Station').findall(ns + 'Channel')[1].get('endDate')}))`], { input: xml }).toString());
    expect(out.root).toBe('{http://www.fdsn.org/xml/station/1}FDSNStationXML');
    expect(out.version).toBe('1.2');
    expect(out.rootChildren).toEqual(['Source', 'Sender', 'Module', 'Created', 'Network']);
    expect(out.station).toEqual(['Latitude', 'Longitude', 'Elevation', 'Site']);
    expect(out.channel).toEqual(['Latitude', 'Longitude', 'Elevation', 'Depth', 'Azimuth', 'Dip', 'SampleRate', 'Sensor', 'Response']);
    expect(out.response).toEqual(['InstrumentSensitivity', 'Stage', 'Stage', 'Stage']);
    expect(out.stage).toEqual(['PolesZeros', 'StageGain']);
    expect(out.pz).toEqual(['InputUnits', 'OutputUnits', 'PzTransferFunctionType', 'NormalizationFactor',
      'NormalizationFrequency', 'Zero', 'Zero', 'Pole', 'Pole', 'Pole', 'Pole', 'Pole']);
    expect(out.a0).toBe(60077000);
    expect(out.pole3).toEqual([-131.04, -467.29]);
    expect(out.sensor).toBe('Invented broadband 120 s & co <test>');
    expect(out.end).toBe('2026-06-01T00:00:00.250000Z');
  });

  it('round-trips the real microseismic inventory (StationXML 1.0 in, 1.2 out)', () => {
    const file = join(__dirname, '../../../../shared/data/real-microseismic/stations/inv.xml');
    if (!existsSync(file)) throw new Error(`the real test data is missing: ${file}`);
    const inv = parseStationXml(readFileSync(file, 'utf8'), 'inv.xml');
    const again = parseStationXml(writeStationXml(inv), 'rewritten.xml');
    expect(again.networks).toEqual(inv.networks);
    expect(again.created).toBe(inv.created);
    expect(again.schemaVersion).toBe('1.2');
  });

  it('refuses what the schema cannot hold: no Created, a stage without gain, a non-finite number', () => {
    expect(() => writeStationXml({ ...invented, created: null })).toThrow(/created is required/);
    const station = invented.networks[0].stations[0];
    const ch = station.channels[0];
    const withStages = (stages: ChannelMeta['stages']): Inventory => ({
      ...invented,
      networks: [{ ...invented.networks[0], stations: [{ ...station, channels: [{ ...ch, stages }] }] }],
    });
    expect(() => writeStationXml(withStages([{ ...ch.stages[0], gain: null }]))).toThrow(/stages\[0\]: StageGain is required/);
    expect(() => writeStationXml(withStages([{ ...ch.stages[1], gain: { value: NaN, frequency: 1 } }])))
      .toThrow(/stages\[0\]\.gain\.value must be a finite number, got NaN/);
  });
});
