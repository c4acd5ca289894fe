import { describe, expect, it } from 'vitest';
import { cosinePreFilter, removeResponse } from '../../../core/magnitude/removeResponse';
import { channelResponse, normalizationFactorOf, oscillatorPoles, type GroundMotion } from '../../../core/magnitude/response';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { magnitudeReference, pairsOf } from '../../ref/magnitude/reference';

type C = { re: number; im: number };
const ZZ: C[] = [{ re: 0, im: 0 }, { re: 0, im: 0 }];

function meta(poles: C[], zeros: C[], fn: number, gain: number, units: string): ChannelMeta {
  const a0 = normalizationFactorOf(poles, zeros, fn);
  return {
    id: { network: 'XX', station: 'TEST', location: '00', channel: units === 'm/s**2' ? 'HNE' : 'HHE' }, start: null, end: null,
    latitude: 0, longitude: 0, elevation: 0, depth: 0, azimuth: 90, dip: 0, sampleRate: 100,
    stages: [
      { number: 1, inputUnits: units, outputUnits: 'V', decimation: null, gain: { value: gain, frequency: fn }, filter: { kind: 'polesZeros', transferFunction: 'LAPLACE (RADIANS/SECOND)', normalizationFactor: a0, normalizationFrequency: fn, zeros, poles } },
      { number: 2, inputUnits: 'V', outputUnits: 'count', decimation: null, gain: { value: 419430.4, frequency: fn }, filter: null },
    ],
  };
}

/** Seeded noise plus a decaying 4 Hz burst, as Int32 counts (a deterministic test signal, not a reference). */
function testCounts(n: number, seed: number): Int32Array {
  let s = seed >>> 0;
  const x = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    const t = (i - n / 3) / 100;
    const burst = t > 0 ? 2e5 * Math.exp(-t) * Math.sin(2 * Math.PI * 4 * t) : 0;
    x[i] = Math.round((s / 2 ** 32 - 0.5) * 4000 + burst + 1500);
  }
  return x;
}

const BB = { poles: [...oscillatorPoles(120, 0.707), ...oscillatorPoles(1 / 80, 0.707)], zeros: ZZ, fn: 1, gain: 1500, units: 'm/s' };
const GEO = { poles: oscillatorPoles(1, 0.7), zeros: ZZ, fn: 5, gain: 170, units: 'm/s' };
const ACC = { poles: oscillatorPoles(1 / 150, 0.707), zeros: [] as C[], fn: 1, gain: 0.51, units: 'm/s**2' };
const ORDER: Record<GroundMotion, number> = { displacement: 0, velocity: 1, acceleration: 2 };

describe('cosinePreFilter', () => {
  it('is 0 outside [f1, f4], 1 on [f2, f3] and ½ at the middle of each flank (common practice cosine band)', () => {
    const c = [0.5, 1, 10, 20] as const;
    expect(cosinePreFilter(0.5, c)).toBe(0);
    expect(cosinePreFilter(0.75, c)).toBeCloseTo(0.5, 15);
    expect(cosinePreFilter(5, c)).toBe(1);
    expect(cosinePreFilter(15, c)).toBeCloseTo(0.5, 15);
    expect(cosinePreFilter(20, c)).toBe(0);
  });
});

describe('removeResponse against an independent numpy implementation of the same steps', () => {
  const n = 3000, fs = 100;
  const cases = [
    { name: 'broadband velocity to displacement', inst: BB, output: 'displacement' as GroundMotion, pre: [0.05, 0.1, 35, 45] as const, wl: 60 },
    { name: 'broadband velocity to velocity', inst: BB, output: 'velocity' as GroundMotion, pre: [0.05, 0.1, 35, 45] as const, wl: 60 },
    { name: 'broadband velocity to acceleration', inst: BB, output: 'acceleration' as GroundMotion, pre: [0.05, 0.1, 35, 45] as const, wl: 60 },
    { name: 'geophone to displacement, water level 20 dB (active below 1 Hz)', inst: GEO, output: 'displacement' as GroundMotion, pre: [0.2, 0.5, 30, 40] as const, wl: 20 },
    { name: 'geophone to velocity, no prefilter and no water level', inst: GEO, output: 'velocity' as GroundMotion, pre: null, wl: null },
    { name: 'accelerometer (m/s**2) to acceleration', inst: ACC, output: 'acceleration' as GroundMotion, pre: [0.1, 0.2, 35, 45] as const, wl: 60 },
    { name: 'accelerometer (m/s**2) to velocity', inst: ACC, output: 'velocity' as GroundMotion, pre: [0.1, 0.2, 35, 45] as const, wl: 60 },
    { name: 'accelerometer (m/s**2) to displacement', inst: ACC, output: 'displacement' as GroundMotion, pre: [0.2, 0.4, 35, 45] as const, wl: 60 },
    { name: 'broadband velocity to displacement with a linear detrend (scipy.signal.detrend)', inst: BB, output: 'displacement' as GroundMotion, pre: [0.05, 0.1, 35, 45] as const, wl: 60, detrend: 'linear' as const },
  ];
  const built = cases.map((c, i) => {
    const m = meta(c.inst.poles, c.inst.zeros, c.inst.fn, c.inst.gain, c.inst.units);
    const st = m.stages[0].filter;
    const k = (st?.kind === 'polesZeros' ? st.normalizationFactor : NaN) * c.inst.gain * 419430.4;
    const x = testCounts(n, 7 + i);
    if (c.detrend) for (let j = 0; j < n; j++) x[j] += Math.round(j * 3.7);
    return { ...c, meta: m, k, x };
  });
  const ref = magnitudeReference(built.map((c) => ({
    op: 'remove', x: Array.from(c.x), fs, zeros: pairsOf(c.inst.zeros), poles: pairsOf(c.inst.poles), k: c.k,
    inpower: ORDER[c.inst.units === 'm/s' ? 'velocity' : 'acceleration'], outpower: ORDER[c.output],
    prefilt: c.pre, wl_db: c.wl, taper: 0.05, wa: null, detrend: c.detrend ?? 'mean',
  }))) as number[][];
  built.forEach((c, i) => {
    it(`${c.name}: agrees to 1e-9 of the peak (numpy.fft rfft/irfft, scipy.signal.windows.tukey; numpy 2.4.6, scipy 1.17.1)`, () => {
      const y = removeResponse(c.x, fs, channelResponse(c.meta), { output: c.output, preFilter: c.pre, waterLevelDb: c.wl, taperFraction: 0.05, detrend: c.detrend });
      const r = ref[i];
      let peak = 0, err = 0;
      for (let j = 0; j < n; j++) {
        peak = Math.max(peak, Math.abs(r[j]));
        err = Math.max(err, Math.abs(y[j] - r[j]));
      }
      expect(peak).toBeGreaterThan(0);
      expect(err / peak).toBeLessThan(1e-9);
    });
  });
});

describe('removeResponse on a sinusoid recorded through a known response', () => {
  it('recovers the amplitude of a 2 Hz ground velocity within 0.5 % mid-trace (the response evaluated analytically, H = counts per m/s)', () => {
    const fs = 100, n = 4000, f = 2, v0 = 1e-6;
    const m = meta(GEO.poles, GEO.zeros, GEO.fn, GEO.gain, GEO.units);
    const h = new Float64Array(2);
    channelResponse(m).evaluate(f, h);
    const amp = Math.hypot(h[0], h[1]), ph = Math.atan2(h[1], h[0]);
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = v0 * amp * Math.sin(2 * Math.PI * f * (i / fs) + ph);
    const v = removeResponse(x, fs, channelResponse(m), { output: 'velocity', preFilter: [0.2, 0.5, 30, 40] });
    const d = removeResponse(x, fs, channelResponse(m), { output: 'displacement', preFilter: [0.2, 0.5, 30, 40] });
    let maxV = 0, maxD = 0, err = 0;
    for (let i = 1000; i < 3000; i++) {
      maxV = Math.max(maxV, Math.abs(v[i]));
      maxD = Math.max(maxD, Math.abs(d[i]));
      err = Math.max(err, Math.abs(v[i] - v0 * Math.sin(2 * Math.PI * f * (i / fs))));
    }
    expect(Math.abs(maxV / v0 - 1)).toBeLessThan(0.005);
    expect(err / v0).toBeLessThan(0.01);
    // Displacement of v0·sin(ωt) has amplitude v0/ω.
    expect(Math.abs(maxD / (v0 / (2 * Math.PI * f)) - 1)).toBeLessThan(0.005);
  });
});

describe('removeResponse argument checks', () => {
  const r = channelResponse(meta(GEO.poles, GEO.zeros, GEO.fn, GEO.gain, GEO.units));
  it('rejects prefilter corners out of order or above Nyquist, naming them', () => {
    expect(() => removeResponse(new Float64Array(100), 100, r, { output: 'velocity', preFilter: [1, 0.5, 10, 20] })).toThrow(/0 <= f1 < f2 < f3 < f4 <= 50 Hz .* got \[1, 0.5, 10, 20\]/);
    expect(() => removeResponse(new Float64Array(100), 100, r, { output: 'velocity', preFilter: [0.1, 0.5, 10, 60] })).toThrow(RangeError);
  });
  it('rejects a non-positive water level and too short traces', () => {
    expect(() => removeResponse(new Float64Array(100), 100, r, { output: 'velocity', preFilter: null, waterLevelDb: 0 })).toThrow(/water level must be > 0 dB or null, got 0/);
    expect(() => removeResponse(new Float64Array(1), 100, r, { output: 'velocity', preFilter: null })).toThrow(/at least 2 samples, got 1/);
  });
});
