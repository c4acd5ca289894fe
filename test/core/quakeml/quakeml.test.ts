import { describe, expect, it } from 'vitest';
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { readQuakeMl, writeQuakeMl, QuakeMlError, type QmlDocument } from '../../../core/quakeml';
import { isoFromMicros, microsFromIso } from '../../../core/time';

// Real QuakeML 1.2 written by another program, with its picks also given as a table (picks.csv):
// ../shared/data/real-microseismic (see its README).
const REAL = resolve(__dirname, '..', '..', '..', '..', 'shared', 'data', 'real-microseismic');

function sampleDoc(): QmlDocument {
  return {
    events: [{
      id: 'ev-20261114T204112-XX', type: 'earthquake', typeCertainty: 'suspected', description: 'a & b <test>',
      picks: [{
        id: 'p1', waveformId: { network: 'XX', station: 'BRAE', location: '00', channel: 'HHZ' },
        time: microsFromIso('2026-11-14T20:41:12.345678Z'), lowerUncertainty: 0.02, upperUncertainty: 0.05,
        phaseHint: 'P', onset: 'impulsive', polarity: 'negative', evaluationMode: 'automatic', evaluationStatus: 'preliminary', comment: 'snr 12.3',
      }, {
        id: 'p2', waveformId: { network: 'XX', station: 'BRAE', location: '', channel: 'HH1' },
        time: microsFromIso('2026-11-14T20:41:15.000001Z'), lowerUncertainty: 0.1, upperUncertainty: 0.1,
        phaseHint: 'S', onset: 'emergent', polarity: null, evaluationMode: 'manual', evaluationStatus: 'reviewed',
      }],
      origins: [{
        id: 'o1', time: microsFromIso('2026-11-14T20:41:10.5Z'), timeUncertainty: 0.08, latitude: 46.51, longitude: 7.25,
        depthM: 8200, depthUncertaintyM: 1500, depthType: 'from location',
        ellipse: { semiMajorM: 1200, semiMinorM: 700, azimuthMajor: 35 }, horizontalUncertaintyM: 1200,
        quality: { usedPhaseCount: 2, usedStationCount: 1, standardError: 0.05, azimuthalGap: 300 },
        arrivals: [{ pickId: 'p1', phase: 'P', distanceDeg: 0.1, azimuth: 45, timeResidual: -0.02, timeWeight: 1 }],
        evaluationMode: 'manual', evaluationStatus: 'reviewed',
      }],
      preferredOriginId: 'o1',
    }],
  };
}
const opts = { authority: 'daybreak.test', agencyId: 'XX', author: 'analyst', creationTime: microsFromIso('2026-11-15T07:00:00Z') };

describe('QuakeML', () => {
  it('reads the real event files with the same picks as their table (picks.csv), times to the microsecond', () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    const rows = readFileSync(join(REAL, 'picks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    let total = 0;
    for (const f of readdirSync(join(REAL, 'events'))) {
      const doc = readQuakeMl(readFileSync(join(REAL, 'events', f), 'utf8'), f);
      expect(doc.events).toHaveLength(1);
      const mine = rows.filter((r) => r[0] === f);
      const picks = doc.events[0].picks;
      expect(picks.length).toBe(mine.length);
      const key = (net: string, sta: string, phase: string, time: string) => `${net}.${sta}.${phase}.${time}`;
      const fromCsv = mine.map((r) => key(r[3], r[4], r[7], isoFromMicros(microsFromIso(r[8])))).sort();
      const fromXml = picks.map((p) => key(p.waveformId.network, p.waveformId.station, p.phaseHint, isoFromMicros(p.time))).sort();
      expect(fromXml).toEqual(fromCsv);
      expect(doc.events[0].origins.length).toBeGreaterThan(0);
      total += picks.length;
    }
    // README: 103 picks in all.
    expect(total).toBe(103);
  });

  it('reads back what it writes', () => {
    const doc = sampleDoc();
    const back = readQuakeMl(writeQuakeMl(doc, opts), 'x.xml');
    expect(back.events[0]).toEqual({ ...doc.events[0], comment: undefined });
  });

  it('writes the QuakeML 1.2 namespaces and the element paths real files use, as Python xml.etree reads them', () => {
    // Reference parser: CPython's xml.etree.ElementTree; reference paths: the real event files above.
    const xml = writeQuakeMl(sampleDoc(), opts);
    const script = `
import sys, xml.etree.ElementTree as ET
q = '{http://quakeml.org/xmlns/quakeml/1.2}'; b = '{http://quakeml.org/xmlns/bed/1.2}'
root = ET.fromstring(sys.stdin.read())
assert root.tag == q + 'quakeml', root.tag
ev = root.find(b + 'eventParameters/' + b + 'event')
pk = ev.find(b + 'pick')
wf = pk.find(b + 'waveformID')
print(ev.get('publicID'))
print(pk.find(b + 'time/' + b + 'value').text, pk.find(b + 'time/' + b + 'lowerUncertainty').text, pk.find(b + 'time/' + b + 'upperUncertainty').text)
print(wf.get('networkCode'), wf.get('stationCode'), wf.get('locationCode'), wf.get('channelCode'))
print(pk.find(b + 'phaseHint').text, pk.find(b + 'onset').text, pk.find(b + 'polarity').text, pk.find(b + 'evaluationMode').text, pk.find(b + 'evaluationStatus').text)
print(ev.find(b + 'description/' + b + 'text').text)
print(ev.find(b + 'preferredOriginID').text, ev.find(b + 'origin/' + b + 'arrival/' + b + 'pickID').text)
print(root.find(b + 'eventParameters/' + b + 'comment/' + b + 'text').text)
`;
    const lines = execFileSync('python3', ['-c', script], { input: xml }).toString().trim().split('\n');
    expect(lines[0]).toBe('smi:daybreak.test/event/ev-20261114T204112-XX');
    expect(lines[1]).toBe('2026-11-14T20:41:12.345678Z 0.02 0.05');
    expect(lines[2]).toBe('XX BRAE 00 HHZ');
    expect(lines[3]).toBe('P impulsive negative automatic preliminary');
    expect(lines[4]).toBe('a & b <test>');
    expect(lines[5]).toBe('smi:daybreak.test/origin/o1 smi:daybreak.test/pick/p1');
    expect(lines[6]).toMatch(/preliminary/);
  });

  it('refuses an identifier a resource identifier cannot hold, and names the element of a bad value', () => {
    const doc = sampleDoc();
    doc.events[0].id = 'has space';
    expect(() => writeQuakeMl(doc, opts)).toThrow(RangeError);
    const bad = writeQuakeMl(sampleDoc(), opts).replace('<onset>impulsive</onset>', '<onset>sudden</onset>');
    expect(() => readQuakeMl(bad, 'bad.xml')).toThrow(QuakeMlError);
    expect(() => readQuakeMl(bad, 'bad.xml')).toThrow('bad.xml: event[1]/pick[1]/onset: "sudden" is not one of impulsive, emergent, questionable');
    expect(() => readQuakeMl('<q:quakeml><eventParameters>', 'cut.xml')).toThrow(/cut.xml: line/);
  });
});

function magnitudeDoc(): QmlDocument {
  const doc = sampleDoc();
  const ev = doc.events[0];
  const hn = { network: 'XX', station: 'BRAE', location: '00', channel: 'HHN' };
  ev.amplitudes = [{
    id: 'a1', value: 1.25e-6, type: 'IAML', unit: 'm', periodS: 0.21, snr: 35.5,
    timeWindow: { reference: microsFromIso('2026-11-14T20:41:14Z'), beginS: 1, endS: 10 }, time: microsFromIso('2026-11-14T20:41:15.25Z'),
    waveformId: hn, pickId: 'p2', magnitudeHint: 'ML', methodId: 'wa-uc1990', evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  }];
  ev.stationMagnitudes = [{ id: 'sm1', originId: 'o1', mag: 1.73, type: 'ML', amplitudeId: 'a1', methodId: 'ml-iaspei2013', waveformId: hn }];
  ev.magnitudes = [{
    id: 'm1', mag: 1.7, uncertainty: 0.12, type: 'ML', originId: 'o1', methodId: 'ml-iaspei2013', stationCount: 1, azimuthalGap: null,
    contributions: [{ stationMagnitudeId: 'sm1', residual: 0.03, weight: 1 }], evaluationMode: 'automatic', evaluationStatus: 'preliminary',
    comment: 'median of 1',
  }];
  ev.preferredMagnitudeId = 'm1';
  return doc;
}

describe('QuakeML amplitudes, station magnitudes and magnitudes', () => {
  it('reads back the amplitudes, station magnitudes, magnitudes and preferred magnitude it writes', () => {
    const doc = magnitudeDoc();
    const back = readQuakeMl(writeQuakeMl(doc, opts), 'x.xml');
    expect(back.events[0]).toEqual({ ...doc.events[0], comment: undefined });
  });

  it('writes the BED elements in the real files\' order, as Python xml.etree reads them', () => {
    // Reference parser: CPython's xml.etree.ElementTree; element order: the real event files (their
    // event holds origin, magnitude, pick, amplitude; amplitude holds genericAmplitude, type, unit,
    // methodID, timeWindow (reference, begin, end), pickID, evaluationMode, evaluationStatus).
    const xml = writeQuakeMl(magnitudeDoc(), opts);
    const script = `
import sys, xml.etree.ElementTree as ET
b = '{http://quakeml.org/xmlns/bed/1.2}'
ev = ET.fromstring(sys.stdin.read()).find(b + 'eventParameters/' + b + 'event')
print(' '.join(c.tag.replace(b, '') for c in ev))
a = ev.find(b + 'amplitude')
print(' '.join(c.tag.replace(b, '') for c in a))
print(a.find(b + 'genericAmplitude/' + b + 'value').text, a.find(b + 'type').text, a.find(b + 'unit').text, a.find(b + 'period/' + b + 'value').text, a.find(b + 'magnitudeHint').text)
print(' '.join(c.tag.replace(b, '') for c in a.find(b + 'timeWindow')), a.find(b + 'timeWindow/' + b + 'reference').text, a.find(b + 'pickID').text, a.find(b + 'waveformID').get('channelCode'))
sm = ev.find(b + 'stationMagnitude')
print(' '.join(c.tag.replace(b, '') for c in sm))
print(sm.find(b + 'mag/' + b + 'value').text, sm.find(b + 'amplitudeID').text, sm.find(b + 'originID').text)
m = ev.find(b + 'magnitude')
print(' '.join(c.tag.replace(b, '') for c in m))
print(m.find(b + 'mag/' + b + 'value').text, m.find(b + 'mag/' + b + 'uncertainty').text, m.find(b + 'type').text, m.find(b + 'stationCount').text, m.find(b + 'stationMagnitudeContribution/' + b + 'stationMagnitudeID').text)
print(ev.find(b + 'preferredMagnitudeID').text)
`;
    const lines = execFileSync('python3', ['-c', script], { input: xml }).toString().trim().split('\n');
    expect(lines[0]).toBe('preferredOriginID preferredMagnitudeID type typeCertainty description creationInfo origin magnitude stationMagnitude pick pick amplitude');
    expect(lines[1]).toBe('genericAmplitude type unit methodID period snr timeWindow pickID waveformID scalingTime magnitudeHint evaluationMode evaluationStatus creationInfo');
    expect(lines[2]).toBe('0.00000125 IAML m 0.21 ML');
    expect(lines[3]).toBe('reference begin end 2026-11-14T20:41:14.000000Z smi:daybreak.test/pick/p2 HHN');
    expect(lines[4]).toBe('originID mag type amplitudeID methodID waveformID creationInfo');
    expect(lines[5]).toBe('1.73 smi:daybreak.test/amplitude/a1 smi:daybreak.test/origin/o1');
    expect(lines[6]).toBe('mag type originID methodID stationCount evaluationMode evaluationStatus stationMagnitudeContribution comment creationInfo');
    expect(lines[7]).toBe('1.7 0.12 ML 1 smi:daybreak.test/stationMagnitude/sm1');
    expect(lines[8]).toBe('smi:daybreak.test/magnitude/m1');
  });

  it('reads the real event files\' magnitudes and amplitudes as Python xml.etree does', () => {
    if (!existsSync(REAL)) throw new Error(`real test data missing: ${REAL}`);
    const files = readdirSync(join(REAL, 'events')).sort();
    const script = `
import sys, os, xml.etree.ElementTree as ET
b = '{http://quakeml.org/xmlns/bed/1.2}'
d = sys.argv[1]
for f in sorted(os.listdir(d)):
    ev = ET.parse(os.path.join(d, f)).getroot().find(b + 'eventParameters/' + b + 'event')
    pm = ev.find(b + 'preferredMagnitudeID')
    for m in ev.findall(b + 'magnitude'):
        u = m.find(b + 'mag/' + b + 'uncertainty')
        sc = m.find(b + 'stationCount')
        print(f, m.find(b + 'mag/' + b + 'value').text, u.text if u is not None else '-', m.find(b + 'type').text, sc.text if sc is not None else '-', len(m.findall(b + 'stationMagnitudeContribution')), pm.text.split('/')[-1] if pm is not None else '-')
    amps = ev.findall(b + 'amplitude')
    print(f, 'amplitudes', len(amps), ' '.join(a.find(b + 'genericAmplitude/' + b + 'value').text for a in amps))
`;
    const expected = execFileSync('python3', ['-c', script, join(REAL, 'events')]).toString().trim().split('\n');
    const got: string[] = [];
    let magnitudes = 0;
    for (const f of files) {
      const ev = readQuakeMl(readFileSync(join(REAL, 'events', f), 'utf8'), f).events[0];
      for (const m of ev.magnitudes ?? []) {
        got.push(`${f} ${m.mag} ${m.uncertainty ?? '-'} ${m.type} ${m.stationCount ?? '-'} ${m.contributions.length} ${ev.preferredMagnitudeId ?? '-'}`);
        magnitudes++;
      }
      got.push(`${f} amplitudes ${(ev.amplitudes ?? []).length} ${(ev.amplitudes ?? []).map((a) => a.value).join(' ')}`.trimEnd());
    }
    // Numbers compared as written by Python's float repr and JavaScript's Number toString (both shortest round trip).
    expect(got).toEqual(expected.map((l) => l.trimEnd().replace(/(\d\.\d+)(?=\s|$)/g, (x) => String(Number(x)))));
    expect(magnitudes).toBeGreaterThan(0);
    // The first file: ML -0.79 with 22 stations (read from the file by eye and by xml.etree above).
    const first = readQuakeMl(readFileSync(join(REAL, 'events', '2019-01-19T10-02-16-1584c.xml'), 'utf8'), 'f').events[0];
    expect(first.magnitudes?.[0]).toMatchObject({ type: 'ML', stationCount: 22, evaluationMode: 'automatic' });
    expect(first.magnitudes?.[0].mag).toBeCloseTo(-0.7908804499049045, 15);
    expect(first.preferredMagnitudeId).toBe(first.magnitudes?.[0].id);
    expect(first.amplitudes?.[0]).toMatchObject({ type: 'P', unit: 'm', evaluationStatus: 'reviewed' });
  });
});
