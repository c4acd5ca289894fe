import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { despike } from '../../../core/dsp/despike';
import { readMiniSeedBuffer } from '../../../core/mseed';
import { microsFromIso } from '../../../core/time';

// Reference: real records — five microseismic events (500 Hz geophones, FLOAT32 miniSEED) with an
// analyst's P and S picks, in ../shared/data/real-microseismic (see its README). Real onsets, coda
// and noise must come through untouched; spikes put into those records must all be found.

const here = dirname(fileURLToPath(import.meta.url));
const DATA = resolve(here, '..', '..', '..', '..', 'shared', 'data', 'real-microseismic');

interface Trace { key: string; start: number; rate: number; samples: Float64Array }

function loadTraces(): Trace[] {
  if (!existsSync(join(DATA, 'picks.csv'))) {
    throw new Error(`real test records not found at ${DATA} (expected ../shared/data/real-microseismic beside the repository)`);
  }
  const files = ['2018-05-22T17-02-16.mseed', '2018-05-22T20-57-15.mseed', '2018-05-24T18-50-32.mseed', '2018-05-27T08-58-00.mseed', '2018-06-01T03-54-47.mseed'];
  const traces: Trace[] = [];
  for (const f of files) {
    const res = readMiniSeedBuffer(new Uint8Array(readFileSync(join(DATA, 'waveforms', f))), f);
    for (const ch of res.channels) {
      for (const seg of ch.segments) {
        traces.push({ key: `${f} ${ch.id.station}.${ch.id.channel}`, start: seg.start, rate: seg.sampleRate, samples: Float64Array.from(seg.samples) });
      }
    }
  }
  return traces;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[s.length >> 1];
}

describe('despike', () => {
  const traces = loadTraces();

  it('reads the 180 real traces (5 events x 12 stations x 3 components)', () => {
    expect(traces.length).toBe(180);
  });

  it('changes nothing in the real records: onsets, coda and noise are not single-sample spikes', () => {
    for (const t of traces) expect(despike(t.samples).spikes, t.key).toEqual([]);
  });

  it('leaves every manual P onset window (0.1 s either side of the analyst\'s pick) exactly as it was', () => {
    const rows = readFileSync(join(DATA, 'picks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
    const manualP = rows.filter((r) => r[7] === 'P' && r[10] === 'manual');
    expect(manualP.length).toBe(43);
    for (const r of manualP) {
      const t = traces.find((x) => x.key === `${r[2]} ${r[4]}.${r[6]}`);
      expect(t, `${r[2]} ${r[4]}.${r[6]}`).toBeDefined();
      const i = Math.round(((microsFromIso(r[8]) - t!.start) / 1e6) * t!.rate);
      const cleaned = despike(t!.samples).samples;
      for (let j = i - 50; j <= i + 50; j++) expect(cleaned[j]).toBe(t!.samples[j]);
    }
  });

  it('finds isolated spikes put into real records (quiet noise and strong coda alike) and restores the neighbours\' mean there', () => {
    for (const t of traces.filter((_, k) => k % 9 === 0)) {
      const x = Float64Array.from(t.samples);
      const steps: number[] = [];
      let maxStep = 0;
      for (let j = 0; j + 1 < x.length; j++) {
        const d = Math.abs(x[j + 1] - x[j]);
        steps.push(d);
        maxStep = Math.max(maxStep, d);
      }
      // Big glitches anywhere (20 times the trace's largest step), and smaller ones in the pre-event
      // noise: 8 times the largest step within 6 samples, and at least 30 times the median step.
      const big = [1500, 2333, 3001, 4200, 5555, 6700, 7400];
      const small = [100, 401, 777];
      const med = median(steps.slice(0, 1000));
      big.forEach((p, k) => { x[p] += (k % 2 ? -1 : 1) * 20 * maxStep; });
      small.forEach((p, k) => { x[p] += (k % 2 ? -1 : 1) * Math.max(30 * med, 8 * Math.max(...steps.slice(p - 6, p + 6))); });
      const { samples, spikes } = despike(x);
      expect(spikes, t.key).toEqual([...small, ...big]);
      for (let j = 0; j < x.length; j++) {
        if (spikes.includes(j)) expect(samples[j]).toBe((x[j - 1] + x[j + 1]) / 2);
        else expect(samples[j]).toBe(x[j]);
      }
    }
  });

  it('leaves clipped plateaus alone: real records clipped at 20 % of their peak come through unchanged', () => {
    for (const t of traces.filter((_, k) => k % 6 === 0)) {
      let peak = 0;
      for (const v of t.samples) peak = Math.max(peak, Math.abs(v));
      const c = 0.2 * peak;
      const clipped = t.samples.map((v) => Math.max(-c, Math.min(c, v)));
      expect(despike(clipped).spikes, t.key).toEqual([]);
    }
  });

  it('does not touch a spike two samples wide, nor an oscillation at a third of the sample rate', () => {
    const x = new Float64Array(400);
    x[200] = 1000;
    x[201] = 1000;
    for (let i = 0; i < 150; i++) x[i] = Math.cos((2 * Math.PI * i) / 3);
    expect(despike(x).spikes).toEqual([]);
  });

  it('refuses a ratio below 1 and blocks under 8 samples', () => {
    expect(() => despike(new Float64Array(50), { ratio: 0.5 })).toThrow(/at least 1, got 0.5/);
    expect(() => despike(new Float64Array(50), { block: 4 })).toThrow(/at least 8 samples, got 4/);
  });
});
