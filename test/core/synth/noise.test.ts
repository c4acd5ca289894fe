import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { sosfilt } from '../../../core/dsp/sosfilt';
import { channelNoise, whiteNoise, type NoiseSpec } from '../../../core/synth/noise';
import { broadbandSensor, polesZerosRatio, responseScale, sensitivity, shortPeriodSensor } from '../../../core/synth/response';
import { python } from './python';

const fs = 100;
function spec(over: Partial<NoiseSpec>): NoiseSpec {
  return {
    seed: 5, sampleRate: fs, siteMs: 1e-8, siteBandHz: [0.5, 15], microseismMs: 0, levelPerSecond: new Float64Array([1]),
    instrument: broadbandSensor(), selfNoiseCounts: 0, ...over,
  };
}
const rms = (x: ArrayLike<number>, from = 0, to = x.length) => {
  let s = 0;
  for (let i = from; i < to; i++) s += x[i] * x[i];
  return Math.sqrt(s / (to - from));
};

describe('noise', () => {
  it('whiteNoise has mean 0 and variance 1 and depends on its seed only', () => {
    const a = new Float64Array(100_000), b = new Float64Array(100_000);
    whiteNoise(a, 77);
    whiteNoise(b, 77);
    expect(a).toEqual(b);
    const mean = a.reduce((s, v) => s + v, 0) / a.length;
    expect(Math.abs(mean)).toBeLessThan(0.02);
    expect(rms(a)).toBeCloseTo(1, 2);
  });

  it('sets the site band to its stated RMS ground velocity on a broadband (counts / sensitivity), within 3 %', () => {
    const x = channelNoise(spec({}), 600 * fs);
    // Leave out the first minute (the 120 s seismometer's start-up).
    expect(rms(x, 60 * fs) / sensitivity(broadbandSensor()) / 1e-8).toBeGreaterThan(0.97);
    expect(rms(x, 60 * fs) / sensitivity(broadbandSensor()) / 1e-8).toBeLessThan(1.03);
  });

  it('follows the level per second: three times the level gives three times the RMS', () => {
    const levels = new Float64Array(600);
    levels.fill(1, 0, 300);
    levels.fill(3, 300);
    const x = channelNoise(spec({ levelPerSecond: levels }), 600 * fs);
    expect(rms(x, 310 * fs, 600 * fs) / rms(x, 60 * fs, 290 * fs)).toBeCloseTo(3, 1);
  });

  it('puts the microseism peak between 0.12 and 0.35 Hz (power spectral density by scipy.signal.welch)', () => {
    const x = channelNoise(spec({ siteMs: 1e-9, microseismMs: 5e-8 }), 1200 * fs);
    const peak = python<number>(`
x = np.array(inp['x'])
f, p = scipy.signal.welch(x, fs=inp['fs'], nperseg=8192)
sel = (f > 0.03) & (f < 5)
print(json.dumps(float(f[sel][np.argmax(p[sel])])))`, { x: x.subarray(120 * fs), fs });
    expect(peak).toBeGreaterThan(0.12);
    expect(peak).toBeLessThan(0.35);
  });

  it('passes the microseism through the instrument: a 1 Hz geophone records it |H(0.2 Hz)| / |H(5 Hz)| times weaker than its flat band', () => {
    const sp = shortPeriodSensor();
    const x = channelNoise(spec({ siteMs: 0, microseismMs: 5e-8, instrument: sp }), 1200 * fs);
    const band = sosfilt(butterworth(2, [0.12, 0.35], 'bandpass', fs), x);
    const h = polesZerosRatio(sp.poles, sp.zeros, 0.2);
    const expected = 5e-8 * Math.hypot(h.re, h.im) * responseScale(sp);
    const ratio = rms(band, 200 * fs) / expected;
    expect(ratio).toBeGreaterThan(0.7);
    expect(ratio).toBeLessThan(1.1);
  });

  it('rejects a fractional length', () => {
    expect(() => channelNoise(spec({}), 10.5)).toThrow(RangeError);
  });
});
