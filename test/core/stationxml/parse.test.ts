import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseStationXml, parseXsDateTime, StationXmlError, type ChannelMeta, type Inventory } from '../../../core/stationxml';
import { microsFromIso } from '../../../core/time';

// The reference for the hand-written documents is the FDSN StationXML schema itself
// (fdsn-station.xsd, version 1.2, namespace http://www.fdsn.org/xml/station/1; the 1.0 and 1.1
// schemas for the version variants): each value below is checked against what the element that
// holds it means in that schema (RootType, NetworkType, StationType, ChannelType, ResponseType,
// SensitivityType, ResponseStageType, PolesZerosType, CoefficientsType, FIRType, DecimationType,
// GainType). The instrument values are invented for the test.

function handDoc(version: string, extraChannelElements = '', numeratorAttr = ''): string {
  return `<?xml version="1.0" encoding="UTF-8"?>
<FDSNStationXML xmlns="http://www.fdsn.org/xml/station/1" schemaVersion="${version}">
  <Source>Test operator</Source>
  <Sender>Test sender</Sender>
  <Module>hand-written test document</Module>
  <Created>2024-03-01T12:00:00.5Z</Created>
  <Network code="XT" startDate="2020-01-01T00:00:00Z">
    <Description>Test network</Description>
    <Station code="ALPHA" startDate="2020-01-01T00:00:00Z">
      <Latitude unit="DEGREES">46.5</Latitude>
      <Longitude unit="DEGREES">7.25</Longitude>
      <Elevation unit="m">1520.0</Elevation>
      <Site>
        <Name>Alpha hut</Name>
      </Site>
      <CreationDate>2020-01-01T00:00:00Z</CreationDate>
      <Channel code="HHZ" locationCode="00" startDate="2020-01-01T00:00:00Z" endDate="2023-06-30T10:00:00Z">
        <Comment><Value>first epoch</Value></Comment>
        <Latitude unit="DEGREES">46.50012</Latitude>
        <Longitude unit="DEGREES">7.25034</Longitude>
        <Elevation unit="m">1518.5</Elevation>
        <Depth unit="m">1.5</Depth>
        <Azimuth unit="DEGREES">0</Azimuth>
        <Dip unit="DEGREES">-90</Dip>
        <Type>CONTINUOUS</Type>
        <Type>GEOPHYSICAL</Type>
        <SampleRate unit="SAMPLES/S">100</SampleRate>
        <SampleRateRatio><NumberSamples>100</NumberSamples><NumberSeconds>1</NumberSeconds></SampleRateRatio>
        ${extraChannelElements}
        <ClockDrift unit="SECONDS/SAMPLE">0.0001</ClockDrift>
        <Sensor><Type>Broadband seismometer</Type><Description>Test broadband 120 s</Description></Sensor>
        <DataLogger><Description>Test digitiser</Description></DataLogger>
        <Response>
          <InstrumentSensitivity>
            <Value>-6.0E8</Value>
            <Frequency>1.0</Frequency>
            <InputUnits><Name>m/s</Name><Description>Velocity in meters per second</Description></InputUnits>
            <OutputUnits><Name>count</Name></OutputUnits>
          </InstrumentSensitivity>
          <Stage number="1">
            <PolesZeros name="sensor">
              <InputUnits><Name>m/s</Name></InputUnits>
              <OutputUnits><Name>V</Name></OutputUnits>
              <PzTransferFunctionType>LAPLACE (RADIANS/SECOND)</PzTransferFunctionType>
              <NormalizationFactor>60077000.0</NormalizationFactor>
              <NormalizationFrequency unit="HERTZ">1.0</NormalizationFrequency>
              <Zero number="0"><Real>0</Real><Imaginary>0</Imaginary></Zero>
              <Zero number="1"><Real>0</Real><Imaginary>0</Imaginary></Zero>
              <Pole number="0"><Real>-0.037004</Real><Imaginary>0.037016</Imaginary></Pole>
              <Pole number="1"><Real>-0.037004</Real><Imaginary>-0.037016</Imaginary></Pole>
              <Pole number="2"><Real>-251.33</Real><Imaginary>0</Imaginary></Pole>
            </PolesZeros>
            <StageGain><Value>-1500</Value><Frequency>1</Frequency></StageGain>
          </Stage>
          <Stage number="2">
            <Coefficients>
              <InputUnits><Name>V</Name></InputUnits>
              <OutputUnits><Name>count</Name></OutputUnits>
              <CfTransferFunctionType>DIGITAL</CfTransferFunctionType>
              <Numerator${numeratorAttr}>1</Numerator>
            </Coefficients>
            <Decimation>
              <InputSampleRate unit="HERTZ">200</InputSampleRate>
              <Factor>1</Factor>
              <Offset>0</Offset>
              <Delay unit="SECONDS">0</Delay>
              <Correction unit="SECONDS">0</Correction>
            </Decimation>
            <StageGain><Value>400000</Value><Frequency>1</Frequency></StageGain>
          </Stage>
          <Stage number="3">
            <FIR>
              <InputUnits><Name>count</Name></InputUnits>
              <OutputUnits><Name>count</Name></OutputUnits>
              <Symmetry>EVEN</Symmetry>
              <NumeratorCoefficient i="0">0.125</NumeratorCoefficient>
              <NumeratorCoefficient i="1">0.375</NumeratorCoefficient>
            </FIR>
            <Decimation>
              <InputSampleRate>200</InputSampleRate>
              <Factor>2</Factor>
              <Offset>1</Offset>
              <Delay>0.0075</Delay>
              <Correction>0.0075</Correction>
            </Decimation>
            <StageGain><Value>1</Value><Frequency>0</Frequency></StageGain>
          </Stage>
        </Response>
      </Channel>
      <Channel code="HHZ" locationCode="00" startDate="2023-06-30T10:00:00Z" endDate="2599-12-31T23:59:59Z">
        <Latitude>46.50012</Latitude>
        <Longitude>7.25034</Longitude>
        <Elevation>1518.5</Elevation>
        <Depth>1.5</Depth>
        <Azimuth>0</Azimuth>
        <Dip>-90</Dip>
        <SampleRate>200</SampleRate>
        <Response>
          <InstrumentSensitivity>
            <Value>1.2E9</Value>
            <Frequency>2.0</Frequency>
            <InputUnits><Name>M/S</Name></InputUnits>
            <OutputUnits><Name>COUNTS</Name></OutputUnits>
          </InstrumentSensitivity>
        </Response>
      </Channel>
      <Channel code="HH1" locationCode="" startDate="2020-01-01T00:00:00+02:00">
        <Latitude>46.5</Latitude>
        <Longitude>7.25</Longitude>
        <Elevation unit="km">1.52</Elevation>
        <Depth>0</Depth>
        <Azimuth>20.5</Azimuth>
        <Dip>0</Dip>
        <SampleRate>100</SampleRate>
        <Response/>
      </Channel>
    </Station>
  </Network>
</FDSNStationXML>
`;
}

function firstEpoch(inv: Inventory): ChannelMeta {
  return inv.networks[0].stations[0].channels[0];
}

describe('parseStationXml on a hand-written StationXML 1.2 document', () => {
  const inv = parseStationXml(handDoc('1.2'), 'hand.xml');

  it('reads the root: schemaVersion, Source, Sender, Module and Created', () => {
    expect(inv.schemaVersion).toBe('1.2');
    expect(inv.source).toBe('Test operator');
    expect(inv.sender).toBe('Test sender');
    expect(inv.module).toBe('hand-written test document');
    expect(inv.created).toBe(microsFromIso('2024-03-01T12:00:00.500000Z'));
  });

  it('reads the network and station codes, dates, coordinates and site name', () => {
    const n = inv.networks[0];
    expect(n.code).toBe('XT');
    expect(n.description).toBe('Test network');
    expect(n.start).toBe(microsFromIso('2020-01-01T00:00:00Z'));
    expect(n.end).toBeNull();
    const s = n.stations[0];
    expect(s.code).toBe('ALPHA');
    expect([s.latitude, s.longitude, s.elevation]).toEqual([46.5, 7.25, 1520]);
    expect(s.site).toBe('Alpha hut');
    expect(s.channels).toHaveLength(3);
  });

  it('reads a channel epoch field by field: codes, epoch, position, orientation, rate, sensor', () => {
    const c = firstEpoch(inv);
    expect(c.id).toEqual({ network: 'XT', station: 'ALPHA', location: '00', channel: 'HHZ' });
    expect(c.start).toBe(microsFromIso('2020-01-01T00:00:00Z'));
    expect(c.end).toBe(microsFromIso('2023-06-30T10:00:00Z'));
    expect(c.latitude).toBe(46.50012);
    expect(c.longitude).toBe(7.25034);
    expect(c.elevation).toBe(1518.5);
    expect(c.depth).toBe(1.5);
    expect(c.azimuth).toBe(0);
    expect(c.dip).toBe(-90);
    expect(c.sampleRate).toBe(100);
    expect(c.sensor).toBe('Test broadband 120 s');
  });

  it('reads InstrumentSensitivity with its sign, frequency and units', () => {
    expect(firstEpoch(inv).sensitivity).toEqual({ value: -6e8, frequency: 1, inputUnits: 'm/s', outputUnits: 'count', sign: -1 });
    expect(inv.networks[0].stations[0].channels[1].sensitivity).toEqual(
      { value: 1.2e9, frequency: 2, inputUnits: 'M/S', outputUnits: 'COUNTS', sign: 1 });
  });

  it('reads a PolesZeros stage: transfer function type, A0, normalization frequency, zeros and poles as complex numbers, gain', () => {
    const st = firstEpoch(inv).stages[0];
    expect(st.number).toBe(1);
    expect([st.inputUnits, st.outputUnits]).toEqual(['m/s', 'V']);
    expect(st.filter).toEqual({
      kind: 'polesZeros',
      transferFunction: 'LAPLACE (RADIANS/SECOND)',
      normalizationFactor: 60077000,
      normalizationFrequency: 1,
      zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }],
      poles: [{ re: -0.037004, im: 0.037016 }, { re: -0.037004, im: -0.037016 }, { re: -251.33, im: 0 }],
    });
    expect(st.decimation).toBeNull();
    expect(st.gain).toEqual({ value: -1500, frequency: 1 });
  });

  it('reads a Coefficients stage with its Decimation and StageGain', () => {
    const st = firstEpoch(inv).stages[1];
    expect(st.number).toBe(2);
    expect([st.inputUnits, st.outputUnits]).toEqual(['V', 'count']);
    expect(st.filter).toEqual({ kind: 'coefficients', transferFunction: 'DIGITAL', numerator: [1], denominator: [] });
    expect(st.decimation).toEqual({ inputSampleRate: 200, factor: 1, offset: 0, delay: 0, correction: 0 });
    expect(st.gain).toEqual({ value: 400000, frequency: 1 });
  });

  it('reads a FIR stage: symmetry and coefficients as stored, decimation factor, offset, delay and correction', () => {
    const st = firstEpoch(inv).stages[2];
    expect(st.filter).toEqual({ kind: 'fir', symmetry: 'EVEN', coefficients: [0.125, 0.375] });
    expect(st.decimation).toEqual({ inputSampleRate: 200, factor: 2, offset: 1, delay: 0.0075, correction: 0.0075 });
    expect(st.gain).toEqual({ value: 1, frequency: 0 });
  });

  it('reads an end date far in the future (2599) as an open epoch', () => {
    const c = inv.networks[0].stations[0].channels[1];
    expect(c.start).toBe(microsFromIso('2023-06-30T10:00:00Z'));
    expect(c.end).toBeNull();
    expect(c.sampleRate).toBe(200);
    expect(c.stages).toEqual([]);
  });

  it('applies a time-zone offset, converts kilometres to metres, keeps an empty location code and an empty Response', () => {
    const c = inv.networks[0].stations[0].channels[2];
    expect(c.id.location).toBe('');
    expect(c.start).toBe(microsFromIso('2019-12-31T22:00:00Z'));
    expect(c.elevation).toBe(1520);
    expect(c.azimuth).toBe(20.5);
    expect(c.dip).toBe(0);
    expect(c.sensitivity).toBeUndefined();
    expect(c.stages).toEqual([]);
  });
});

describe('parseStationXml across schema versions', () => {
  it('reads the same values from 1.0 (with StorageFormat and a unit attribute on Numerator), 1.1 and 1.2', () => {
    const v12 = parseStationXml(handDoc('1.2'), 'a.xml');
    // StationXML 1.0 ChannelType allows StorageFormat (before ClockDrift); 1.1 removed it (FDSN StationXML changelog, 1.0 to 1.1).
    const v10 = parseStationXml(handDoc('1.0', '<StorageFormat>Steim2</StorageFormat>', ' unit="V"'), 'b.xml');
    const v11 = parseStationXml(handDoc('1.1'), 'c.xml');
    expect(v10.schemaVersion).toBe('1.0');
    expect(v11.schemaVersion).toBe('1.1');
    expect(v10.networks).toEqual(v12.networks);
    expect(v11.networks).toEqual(v12.networks);
  });

  it('refuses a StationXML 2.x document, naming the version', () => {
    expect(() => parseStationXml(handDoc('2.0'), 'v2.xml')).toThrow(/v2\.xml.*schemaVersion: schema version 2\.0 is not read/);
  });
});

describe('parseStationXml errors name the file and where', () => {
  function errorOf(text: string, file = 'bad.xml'): StationXmlError {
    try {
      parseStationXml(text, file);
    } catch (e) {
      if (e instanceof StationXmlError) return e;
      throw e;
    }
    throw new Error('no error thrown');
  }

  it('gives the line of malformed XML', () => {
    const e = errorOf('<FDSNStationXML schemaVersion="1.2">\n<Source>x</Source>\n<Network code="X">\n</FDSNStationXML>');
    expect(e.file).toBe('bad.xml');
    expect(e.line).toBe(4);
    expect(e.message).toMatch(/^bad\.xml line 4: \/: malformed XML/);
  });

  it('gives the line and XML path of a missing required channel element', () => {
    const text = handDoc('1.2').replace('<Depth>0</Depth>', '');
    const e = errorOf(text);
    expect(e.path).toBe('/FDSNStationXML/Network[XT]/Station[ALPHA]/Channel[.HH1]/Depth');
    const expectedLine = text.split('\n').findIndex((l) => l.includes('<Channel code="HH1"')) + 1;
    expect(e.line).toBe(expectedLine);
    expect(e.message).toContain('required element is missing');
  });

  it('names a value that is not a number, and a value outside the schema range', () => {
    expect(errorOf(handDoc('1.2').replace('<Azimuth>20.5</Azimuth>', '<Azimuth>north</Azimuth>')).message)
      .toMatch(/Channel\[\.HH1\]\/Azimuth: not a number: "north"/);
    expect(errorOf(handDoc('1.2').replace('<Dip>0</Dip>', '<Dip>95</Dip>')).message)
      .toMatch(/Channel\[\.HH1\]\/Dip: 95 is outside \[-90, 90\]/);
  });

  it('names a pole without its imaginary part by stage and pole number', () => {
    const text = handDoc('1.2').replace('<Imaginary>0</Imaginary></Pole>', '</Pole>');
    expect(errorOf(text).path).toBe('/FDSNStationXML/Network[XT]/Station[ALPHA]/Channel[00.HHZ]/Response/Stage[1]/PolesZeros/Pole[2]/Imaginary');
  });

  it('names a transfer function type outside the schema enumeration', () => {
    const text = handDoc('1.2').replace('LAPLACE (RADIANS/SECOND)', 'LAPLACE');
    expect(errorOf(text).message).toMatch(/PzTransferFunctionType: "LAPLACE" is not one of/);
  });

  it('names a malformed date attribute', () => {
    const text = handDoc('1.2').replace('startDate="2023-06-30T10:00:00Z"', 'startDate="June 2023"');
    expect(errorOf(text).message).toMatch(/Channel\[00\.HHZ\]\/@startDate: not an xs:dateTime: "June 2023"/);
  });

  it('refuses a document whose root is not FDSNStationXML', () => {
    expect(errorOf('<?xml version="1.0"?>\n<q:quakeml xmlns:q="x"></q:quakeml>', 'ev.xml').message)
      .toMatch(/^ev\.xml: : root element must be FDSNStationXML, found quakeml/);
  });
});

describe('parseXsDateTime', () => {
  // Reference: Python's datetime.fromisoformat (CPython 3.11+ standard library), run in the test.
  const cases = [
    '2020-01-01T00:00:00Z', '2020-01-01T00:00:00', '2019-06-30T23:59:59.9999995Z',
    '2008-08-06T12:30:00.1234+05:30', '2001-02-28T10:00:00-08:00', '2016-02-29T00:00:00.000001Z',
  ];

  it('agrees with Python datetime to the microsecond, with zones, without a zone (UTC) and rounding beyond 6 digits', () => {
    const script = `
import sys, json, datetime, re
out = []
for s in json.loads(sys.stdin.read()):
    frac = ''
    if '.' in s:
        head, rest = s.split('.', 1)
        digits = re.match(r'\\d+', rest).group(0)
        zone = rest[len(digits):]
        us = round(int(digits.ljust(7, '0')[:7]) / 10)
        s = head + zone
    else:
        us = 0
    s = s.replace('Z', '+00:00')
    d = datetime.datetime.fromisoformat(s)
    if d.tzinfo is None:
        d = d.replace(tzinfo=datetime.timezone.utc)
    delta = d - datetime.datetime(1970, 1, 1, tzinfo=datetime.timezone.utc)
    out.append((delta.days * 86400 + delta.seconds) * 1000000 + us)
print(json.dumps(out))`;
    const expected = JSON.parse(execFileSync('python3', ['-c', script], { input: JSON.stringify(cases) }).toString());
    expect(cases.map((c) => parseXsDateTime(c))).toEqual(expected);
  });

  it('returns undefined for text that is not a date and null for a placeholder end after 2200', () => {
    expect(parseXsDateTime('None')).toBeUndefined();
    expect(parseXsDateTime('2020-02-30T00:00:00Z')).toBeUndefined();
    expect(parseXsDateTime('9999-12-31T23:59:59Z', true)).toBeNull();
  });
});

describe('parseStationXml on the real microseismic inventory', () => {
  const file = join(__dirname, '../../../../shared/data/real-microseismic/stations/inv.xml');
  if (!existsSync(file)) {
    throw new Error(`the real test data is missing: ${file} (expected ../shared/data/real-microseismic beside the repository)`);
  }
  const text = readFileSync(file, 'utf8');
  const inv = parseStationXml(text, 'inv.xml');

  // Reference: Python's xml.etree.ElementTree (standard library) reading the same file in the test.
  const reference = JSON.parse(execFileSync('python3', ['-c', `
import sys, json, xml.etree.ElementTree as ET
ns = {'s': 'http://www.fdsn.org/xml/station/1'}
root = ET.parse(sys.argv[1]).getroot()
out = {'schemaVersion': root.get('schemaVersion'), 'source': root.findtext('s:Source', namespaces=ns),
       'module': root.findtext('s:Module', namespaces=ns), 'created': root.findtext('s:Created', namespaces=ns), 'channels': []}
for net in root.findall('s:Network', ns):
    for sta in net.findall('s:Station', ns):
        for ch in sta.findall('s:Channel', ns):
            f = lambda tag: ch.findtext('s:' + tag, namespaces=ns)
            out['channels'].append({'key': '.'.join([net.get('code'), sta.get('code'), ch.get('locationCode'), ch.get('code')]),
              'lat': float(f('Latitude')), 'lon': float(f('Longitude')), 'elev': float(f('Elevation')),
              'depth': float(f('Depth')), 'rate': float(f('SampleRate')), 'azimuth': f('Azimuth'), 'dip': f('Dip'),
              'start': ch.get('startDate'), 'response': ch.find('s:Response', ns) is not None})
print(json.dumps(out))`, file]).toString());

  it('reads the root as the file states it (schema 1.0, Source, Module, Created)', () => {
    expect(inv.schemaVersion).toBe(reference.schemaVersion);
    expect(inv.schemaVersion).toBe('1.0');
    expect(inv.source).toBe(reference.source);
    expect(inv.module).toBe(reference.module);
    expect(inv.created).toBe(microsFromIso(reference.created));
  });

  it('reads all 36 channels with the coordinates, depth and sample rate that xml.etree reads', () => {
    const channels = inv.networks.flatMap((n) => n.stations.flatMap((s) => s.channels));
    expect(channels).toHaveLength(36);
    expect(reference.channels).toHaveLength(36);
    channels.forEach((c, i) => {
      const r = reference.channels[i];
      expect(`${c.id.network}.${c.id.station}.${c.id.location}.${c.id.channel}`).toBe(r.key);
      expect([c.latitude, c.longitude, c.elevation, c.depth, c.sampleRate]).toEqual([r.lat, r.lon, r.elev, r.depth, r.rate]);
    });
  });

  it('spot-checks station 10 channel DPE against the values written in the file', () => {
    const c = inv.networks[0].stations[0].channels[0];
    expect(c.id).toEqual({ network: '1', station: '10', location: '1', channel: 'DPE' });
    expect(c.latitude).toBe(47.68296693415016);
    expect(c.longitude).toBe(-117.40686942299459);
    expect(c.elevation).toBe(543.5833333333335);
    expect(c.sampleRate).toBe(250);
  });

  it('leaves what the file does not give empty: no azimuth, dip, epoch dates or response', () => {
    expect(reference.channels.every((r: { azimuth: null; dip: null; start: null; response: boolean }) =>
      r.azimuth === null && r.dip === null && r.start === null && !r.response)).toBe(true);
    for (const c of inv.networks.flatMap((n) => n.stations.flatMap((s) => s.channels))) {
      expect([c.azimuth, c.dip, c.start, c.end, c.sensitivity, c.stages.length]).toEqual([null, null, null, null, undefined, 0]);
    }
  });
});
