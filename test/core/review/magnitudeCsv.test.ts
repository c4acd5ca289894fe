import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { MAGNITUDE_CSV_COLUMNS, magnitudesToCsv } from '../../../core/review/magnitudeCsv';
import type { QmlEvent } from '../../../core/quakeml/types';
import { microsFromIso } from '../../../core/time';

function events(): QmlEvent[] {
  const hn = { network: 'XX', station: 'BRAE', location: '00', channel: 'HHN' };
  const he = { network: 'XX', station: 'CALD', location: '', channel: 'HHE' };
  const base = () => ({ type: null, typeCertainty: null, picks: [], origins: [], preferredOriginId: 'o1' });
  return [{
    ...base(), id: 'ev1',
    amplitudes: [
      { id: 'a1', value: 1.25e-6, type: 'IAML', unit: 'm', periodS: null, snr: 42.5, timeWindow: { reference: microsFromIso('2026-11-14T20:41:23.5Z'), beginS: 3.63, endS: 10 },
        time: microsFromIso('2026-11-14T20:41:24.125Z'), waveformId: hn, pickId: 'ev1.s1', magnitudeHint: 'ML', evaluationMode: 'automatic', evaluationStatus: 'preliminary' },
      { id: 'a2', value: 3e-7, type: 'IAML', unit: 'm', periodS: 0.2, snr: null, timeWindow: null, time: null, waveformId: he, pickId: null, magnitudeHint: 'ML', evaluationMode: 'manual', evaluationStatus: 'reviewed' },
    ],
    stationMagnitudes: [
      { id: 'sm1', originId: 'o1', mag: 1.71, type: 'ML', amplitudeId: 'a1', waveformId: hn },
      { id: 'sm2', originId: 'o1', mag: 1.65, type: 'ML', amplitudeId: 'a2', waveformId: he },
      { id: 'sm3', originId: 'o1', mag: 2.5, type: 'ML', amplitudeId: null, waveformId: null },
    ],
    magnitudes: [{
      id: 'm1', mag: 1.68, uncertainty: 0.04, type: 'ML', originId: 'o1', stationCount: 2, azimuthalGap: null,
      contributions: [{ stationMagnitudeId: 'sm1', residual: 0.03, weight: 1 }, { stationMagnitudeId: 'sm2', residual: -0.03, weight: 1 }],
      evaluationMode: 'automatic', evaluationStatus: 'preliminary',
    }],
    preferredMagnitudeId: 'm1',
  }, { ...base(), id: 'ev2, "quoted"' }];
}

describe('magnitudesToCsv', () => {
  it("writes one row per station magnitude that Python's csv module reads back with the same values, after the caution line", () => {
    // Reference reader: CPython 3 csv module (RFC 4180 quoting).
    const csv = magnitudesToCsv(events());
    expect(csv.split('\n')[0]).toMatch(/^# .*preliminary/);
    const out = execFileSync('python3', ['-c', `
import sys, csv, json
rows = list(csv.DictReader(l for l in sys.stdin if not l.startswith('#')))
print(json.dumps({'fields': list(rows[0].keys()), 'rows': [[r['event_id'], r['magnitude_id'], r['network_magnitude'], r['network_uncertainty'], r['station_count'], r['preferred'],
  r['station'], r['location'], r['channel'], r['station_magnitude'], r['residual'], r['amplitude_type'], r['amplitude_m'], r['period_s'], r['snr'],
  r['amplitude_time'], r['window_reference'], r['window_begin_s'], r['window_end_s'], r['pick_id'], r['evaluation_status']] for r in rows]}))`], { input: csv }).toString();
    const got = JSON.parse(out) as { fields: string[]; rows: string[][] };
    expect(got.fields).toEqual([...MAGNITUDE_CSV_COLUMNS]);
    expect(got.rows).toEqual([
      ['ev1', 'm1', '1.68', '0.04', '2', 'true', 'BRAE', '00', 'HHN', '1.71', '0.03', 'IAML', '0.00000125', '', '42.5',
        '2026-11-14T20:41:24.125000Z', '2026-11-14T20:41:23.500000Z', '3.63', '10', 'ev1.s1', 'preliminary'],
      ['ev1', 'm1', '1.68', '0.04', '2', 'true', 'CALD', '', 'HHE', '1.65', '-0.03', 'IAML', '3e-7', '0.2', '', '', '', '', '', '', 'reviewed'],
      // Counted by no magnitude and naming no amplitude: network and amplitude columns empty.
      ['ev1', '', '', '', '', '', '', '', '', '2.5', '', '', '', '', '', '', '', '', '', '', ''],
    ]);
    expect(Number(got.rows[1][12])).toBe(3e-7);
  });

  it('gives only the caution and the header for events without station magnitudes', () => {
    expect(magnitudesToCsv([events()[1]]).trim().split('\n')).toEqual([expect.stringMatching(/^# /), MAGNITUDE_CSV_COLUMNS.join(',')]);
  });
});
