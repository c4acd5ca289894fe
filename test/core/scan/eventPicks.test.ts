import { describe, expect, it } from 'vitest';
import type { ChannelId, Segment } from '../../../core/model';
import { butterworth } from '../../../core/dsp';
import type { CandidateEvent, StationTrigger } from '../../../core/pick';
import { eventPicks, horizontalTraces, pickId, type PickSite } from '../../../core/scan/eventPicks';
import { LOCAL_SCAN_SETTINGS } from '../../../core/scan/settings';
import { Rng } from '../../../core/synth/random';

// The traces are built here so the onset samples are known by construction: noise, then at sample
// iP a wave packet whose first swing is up on the vertical (ground up), and at iS a stronger
// horizontal packet polarised along azimuth 30 degrees. The horizontals are recorded as channels
// 1/2 at azimuths 20 and 110 degrees (h = N cos(az) + E sin(az), SEED manual v2.4 / StationXML
// azimuth convention), so the scan must rotate them back.

const FS = 100;
const T0 = 1_772_409_600_000_000;
const SOS = butterworth(4, [2, 15], 'bandpass', FS);
const N = 60 * FS;
const iP = 30 * FS + 37;
const iS = iP + 250;

const cid = (channel: string, station = 'AB'): ChannelId => ({ network: 'XX', station, location: '00', channel });

function segment(id: ChannelId, samples: Float64Array, questionable = 0): Segment {
  return {
    id, sampleRate: FS, start: T0, end: T0 + ((samples.length - 1) * 1e6) / FS, samples,
    recordStarts: Float64Array.of(T0), recordFirstSample: Int32Array.of(0), encoding: 5, recordLength: 4096, quality: 'D',
    timing: { qualityMin: null, qualityMax: null, clockLockedRecords: 1, questionableTimeRecords: questionable, leapSecondRecords: 0, steimMismatchRecords: 0, records: 1 },
  };
}

function packet(x: Float64Array, i0: number, amp: number): void {
  for (let i = i0; i < Math.min(x.length, i0 + 3 * FS); i++) {
    const s = (i - i0) / FS;
    x[i] += amp * Math.exp(-s / 0.5) * Math.sin(2 * Math.PI * 8 * s);
  }
}

function site(polarityFactor: 1 | -1, withHorizontals: boolean, questionable = 0): PickSite {
  const rng = new Rng(42);
  const z = new Float64Array(N), nn = new Float64Array(N), ee = new Float64Array(N);
  for (let i = 0; i < N; i++) { z[i] = rng.normal(); nn[i] = rng.normal(); ee[i] = rng.normal(); }
  packet(z, iP, 60);
  const sNorth = new Float64Array(N), sEast = new Float64Array(N);
  packet(sNorth, iS, 200 * Math.cos(Math.PI / 6));
  packet(sEast, iS, 200 * Math.sin(Math.PI / 6));
  const rad = Math.PI / 180;
  const h1 = new Float64Array(N), h2 = new Float64Array(N);
  for (let i = 0; i < N; i++) {
    const n = nn[i] + sNorth[i], e = ee[i] + sEast[i];
    h1[i] = n * Math.cos(20 * rad) + e * Math.sin(20 * rad);
    h2[i] = n * Math.cos(110 * rad) + e * Math.sin(110 * rad);
  }
  // A down-positive vertical records -z.
  const zRec = polarityFactor === 1 ? z : z.map((v) => -v);
  return {
    vertical: { id: cid('HHZ'), segments: [segment(cid('HHZ'), zRec, questionable)], azimuth: 0 },
    polarity: polarityFactor,
    position: { x: 0, y: 0 },
    horizontals: withHorizontals ? [
      { id: cid('HH1'), segments: [segment(cid('HH1'), h1)], azimuth: 20 },
      { id: cid('HH2'), segments: [segment(cid('HH2'), h2)], azimuth: 110 },
    ] : null,
  };
}

function event(onSample: number): CandidateEvent {
  const on = T0 + (onSample * 1e6) / FS;
  const trig: StationTrigger = { id: cid('HHZ'), on, off: on + 2e6, peakRatio: 20, peakTime: on, start: on - 10e6, end: on + 22e6, endedBy: 'ratio' };
  return { id: 'XX.20260302T000030', time: on, start: trig.start, end: trig.end, sites: ['XX.AB'], triggers: [trig], secondary: [] };
}

describe('eventPicks', () => {
  const sosFor = () => SOS;

  it('picks P on the vertical within 2 samples of the onset with an upward first motion, and S on the horizontals within 5 samples', () => {
    const picks = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, true)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(picks.map((p) => p.phaseHint)).toEqual(['P', 'S']);
    const [p, s] = picks;
    expect(Math.abs((p.time - T0) / 1e4 - iP)).toBeLessThanOrEqual(2);
    expect(p.polarity).toBe('positive');
    expect(p.waveformId.channel).toBe('HHZ');
    expect(Math.abs((s.time - T0) / 1e4 - iS)).toBeLessThanOrEqual(5);
    expect(['HH1', 'HH2']).toContain(s.waveformId.channel);
    expect(s.polarity).toBeNull();
    expect(p.evaluationMode).toBe('automatic');
    expect(pickId('XX.20260302T000030', p)).toBe('XX.20260302T000030.XX.AB.00.HHZ.P');
  });

  it('corrects a down-positive vertical: the same ground motion recorded with reversed counts gives the same P and polarity', () => {
    const up = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, false)]]), sosFor, LOCAL_SCAN_SETTINGS);
    const down = eventPicks(event(iP + 8), new Map([['XX.AB', site(-1, false)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(down[0].time).toBe(up[0].time);
    expect(down[0].polarity).toBe('positive');
  });

  it('gives P only at a vertical-only site, and carries the questionable-timing flag of the records', () => {
    const picks = eventPicks(event(iP + 8), new Map([['XX.AB', site(1, false, 1)]]), sosFor, LOCAL_SCAN_SETTINGS);
    expect(picks.map((p) => p.phaseHint)).toEqual(['P']);
    expect(picks[0].questionableTiming).toBe(true);
  });

  it('rotates horizontals 1/2 at 20 and 110 degrees back to north and east (the S packet polarised at 30 degrees: east/north = tan 30)', () => {
    const h = horizontalTraces(site(1, true), new Float64Array([1, 0, 0, 1, 0, 0]), T0 + 40e6);
    expect(h).not.toBeNull();
    const [n, e] = h!;
    let ratio = 0;
    for (let i = iS + 5; i < iS + 20; i++) ratio = Math.max(ratio, Math.abs(e.samples[i] / n.samples[i]));
    // Noise of RMS 1 against a packet of 200: the ratio is tan 30 = 0.577 within a few per cent.
    expect(ratio).toBeGreaterThan(0.577 * 0.9);
    expect(ratio).toBeLessThan(0.577 * 1.15);
  });

  it('gives no pick for a site whose data does not cover the trigger', () => {
    const ev = event(N + 500);
    expect(eventPicks(ev, new Map([['XX.AB', site(1, true)]]), sosFor, LOCAL_SCAN_SETTINGS)).toEqual([]);
  });
});
