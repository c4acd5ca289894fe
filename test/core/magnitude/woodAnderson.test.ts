import { describe, expect, it } from 'vitest';
import { channelResponse, normalizationFactorOf, oscillatorPoles } from '../../../core/magnitude/response';
import {
  defaultWoodAndersonPreFilter, simulateWoodAnderson, WOOD_ANDERSON_2080, WOOD_ANDERSON_2800, woodAndersonPolesZeros, woodAndersonResponse,
} from '../../../core/magnitude/woodAnderson';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { magnitudeReference, pairsOf } from '../../ref/magnitude/reference';

/** Analytic Wood-Anderson response V·s²/(s² + 2hω0 s + ω0²) at s = i2πf, written out as -Vr²/((1 - r²) + 2hr·i). */
function analytic(f: number, t0: number, h: number, v: number): { amp: number; phase: number } {
  const r = f * t0;
  const re = 1 - r * r, im = 2 * h * r;
  return { amp: (v * r * r) / Math.hypot(re, im), phase: Math.atan2(-(-im), -re) };
}

/** A channel that records ground displacement flat (input m, gain only). */
function displacementChannel(gain: number): ChannelMeta {
  return {
    id: { network: 'XX', station: 'TEST', location: '', channel: 'HHN' }, start: null, end: null, latitude: 0, longitude: 0,
    elevation: 0, depth: 0, azimuth: 0, dip: 0, sampleRate: 100,
    stages: [{ number: 1, inputUnits: 'm', outputUnits: 'count', decimation: null, gain: { value: gain, frequency: 1 }, filter: null }],
  };
}


const FREQS = [0.1, 0.5, 1, 1.25, 2, 5, 10, 30];
const BB_CASE = (() => {
  const fs = 100, n = 2500;
  const poles = [...oscillatorPoles(120, 0.707), ...oscillatorPoles(1 / 80, 0.707)];
  const zeros = [{ re: 0, im: 0 }, { re: 0, im: 0 }];
  const a0 = normalizationFactorOf(poles, zeros, 1);
  const m: ChannelMeta = {
    ...displacementChannel(1),
    stages: [
      { number: 1, inputUnits: 'm/s', outputUnits: 'V', decimation: null, gain: { value: 1500, frequency: 1 }, filter: { kind: 'polesZeros', transferFunction: 'LAPLACE (RADIANS/SECOND)', normalizationFactor: a0, normalizationFrequency: 1, zeros, poles } },
      { number: 2, inputUnits: 'V', outputUnits: 'count', decimation: null, gain: { value: 419430.4, frequency: 1 }, filter: null },
    ],
  };
  const x = new Int32Array(n);
  for (let i = 0; i < n; i++) x[i] = Math.round(3e4 * Math.exp(-(((i - 1200) / 80) ** 2)) * Math.sin(i / 3) + ((i * 7919) % 200) - 100);
  const pz = woodAndersonPolesZeros(WOOD_ANDERSON_2080);
  const pre = defaultWoodAndersonPreFilter(fs);
  const removeCase = {
    op: 'remove', x: Array.from(x), fs, zeros: pairsOf(zeros), poles: pairsOf(poles), k: a0 * 1500 * 419430.4, inpower: 1, outpower: 0,
    prefilt: pre, wl_db: 60, taper: 0.05, wa: { zeros: pairsOf(pz.zeros), poles: pairsOf(pz.poles), k: 1 },
  };
  return { fs, n, x, m, removeCase };
})();
/** One python process for the file: freqs_zpk of both standards, then the numpy removal case. */
const REFS = magnitudeReference([
  ...[WOOD_ANDERSON_2080, WOOD_ANDERSON_2800].map((s) => {
    const pz = woodAndersonPolesZeros(s);
    return { op: 'freqs_zpk', zeros: pairsOf(pz.zeros), poles: pairsOf(pz.poles), k: s.magnification, freqs: FREQS };
  }),
  BB_CASE.removeCase,
]);

describe('Wood-Anderson standards', () => {
  it('carry the published pairs: T0 0.8 s, h 0.7, V 2080 (Uhrhammer & Collins 1990) and T0 0.8 s, h 0.8, V 2800 (Anderson & Wood 1925; values from memory)', () => {
    expect([WOOD_ANDERSON_2080.periodS, WOOD_ANDERSON_2080.damping, WOOD_ANDERSON_2080.magnification]).toEqual([0.8, 0.7, 2080]);
    expect([WOOD_ANDERSON_2800.periodS, WOOD_ANDERSON_2800.damping, WOOD_ANDERSON_2800.magnification]).toEqual([0.8, 0.8, 2800]);
  });
  it('have poles -5.497787 ± 5.608865i (h 0.7) and -6.283185 ± 4.712389i (h 0.8) rad/s, zeros 0, 0 (hand-computed from ω0 = 2π/0.8)', () => {
    const a = woodAndersonPolesZeros(WOOD_ANDERSON_2080), b = woodAndersonPolesZeros(WOOD_ANDERSON_2800);
    expect(a.poles[0].re).toBeCloseTo(-5.497787, 6);
    expect(a.poles[0].im).toBeCloseTo(5.608865, 6);
    expect(b.poles[0].re).toBeCloseTo(-6.283185, 6);
    expect(b.poles[0].im).toBeCloseTo(4.712389, 6);
    expect(a.zeros).toEqual([{ re: 0, im: 0 }, { re: 0, im: 0 }]);
  });
  it('response is V/(2h) with phase +90° at the natural frequency 1.25 Hz and tends to V at high frequency', () => {
    const out = new Float64Array(2);
    woodAndersonResponse(WOOD_ANDERSON_2080).evaluate(1.25, out);
    expect(out[0]).toBeCloseTo(0, 9);
    expect(out[1]).toBeCloseTo(2080 / 1.4, 9);
    woodAndersonResponse(WOOD_ANDERSON_2800).evaluate(1000, out);
    expect(Math.hypot(out[0], out[1]) / 2800).toBeCloseTo(1, 5);
  });
  it('response equals scipy.signal.freqs_zpk of its poles and zeros with gain V to 1e-12 (scipy 1.17.1)', () => {
    const freqs = FREQS;
    const refs = REFS as [number, number][][];
    [WOOD_ANDERSON_2080, WOOD_ANDERSON_2800].forEach((s, i) => {
      const out = new Float64Array(2);
      freqs.forEach((f, j) => {
        woodAndersonResponse(s).evaluate(f, out);
        const [re, im] = refs[i][j];
        expect(Math.hypot(out[0] - re, out[1] - im) / Math.hypot(re, im)).toBeLessThan(1e-12);
      });
    });
  });
});

describe('simulateWoodAnderson', () => {
  it('turns sinusoidal ground displacement into the analytic Wood-Anderson amplitude (0.5 %) and phase (0.01 rad) at 0.5-10 Hz', () => {
    const fs = 100, n = 6000, d0 = 1e-6, gain = 1e9;
    const r = channelResponse(displacementChannel(gain));
    for (const std of [WOOD_ANDERSON_2080, WOOD_ANDERSON_2800]) {
      for (const f of [0.5, 1, 1.25, 2, 5, 10]) {
        const x = new Float64Array(n);
        for (let i = 0; i < n; i++) x[i] = gain * d0 * Math.sin(2 * Math.PI * f * (i / fs));
        const y = simulateWoodAnderson(x, fs, r, { standard: std, magnification: std.magnification });
        // Least-squares fit of a·sin + b·cos over the middle third.
        let ss = 0, sc = 0, cc = 0, ys = 0, yc = 0;
        for (let i = 2000; i < 4000; i++) {
          const s = Math.sin(2 * Math.PI * f * (i / fs)), c = Math.cos(2 * Math.PI * f * (i / fs));
          ss += s * s; sc += s * c; cc += c * c; ys += y[i] * s; yc += y[i] * c;
        }
        const det = ss * cc - sc * sc;
        const a = (ys * cc - yc * sc) / det, b = (yc * ss - ys * sc) / det;
        const want = analytic(f, std.periodS, std.damping, std.magnification);
        expect(Math.abs(Math.hypot(a, b) / (d0 * want.amp) - 1)).toBeLessThan(0.005);
        const dphi = Math.atan2(b, a) - want.phase;
        expect(Math.abs(Math.atan2(Math.sin(dphi), Math.cos(dphi)))).toBeLessThan(0.01);
      }
    }
  });
  it('agrees with the numpy implementation of the same steps through the Wood-Anderson poles and zeros (1e-9 of the peak, numpy 2.4.6)', () => {
    const { fs, n, x, m } = BB_CASE;
    const ref = REFS[2] as number[];
    const y = simulateWoodAnderson(x, fs, channelResponse(m));
    let peak = 0, err = 0;
    for (let i = 0; i < n; i++) {
      peak = Math.max(peak, Math.abs(ref[i]));
      err = Math.max(err, Math.abs(y[i] - ref[i]));
    }
    expect(peak).toBeGreaterThan(0);
    expect(err / peak).toBeLessThan(1e-9);
  });
  it('rejects a standard with damping outside (0, 1)', () => {
    expect(() => woodAndersonResponse({ ...WOOD_ANDERSON_2080, damping: 1.2 })).toThrow(/damping in \(0, 1\).*h 1.2/);
  });
});
