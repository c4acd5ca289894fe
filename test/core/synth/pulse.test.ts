import { describe, expect, it } from 'vitest';
import { filteredNoise, minimumPhaseAttenuation, pulseSpectrum, synthesizePulse, timeSeries } from '../../../core/synth/pulse';
import { broadbandSensor, responseScale, shortPeriodSensor } from '../../../core/synth/response';
import { whiteNoise } from '../../../core/synth/noise';
import { python } from './python';

describe('pulse', () => {
  it('minimumPhaseAttenuation has amplitude exp(-π f t*) at every frequency (to 1e-9)', () => {
    const n = 4096, fs = 100, ts = 0.04;
    const h = minimumPhaseAttenuation(n, fs, ts);
    for (let k = 0; k <= n / 2; k += 17) {
      expect(Math.abs(Math.hypot(h[2 * k], h[2 * k + 1]) - Math.exp(-Math.PI * (k * fs / n) * ts))).toBeLessThan(1e-9);
    }
  });

  it('minimumPhaseAttenuation is causal: its impulse response holds less than 1e-7 of its energy at negative times', () => {
    const n = 8192, fs = 100;
    for (const ts of [0.01, 0.05, 0.2]) {
      const x = timeSeries(minimumPhaseAttenuation(n, fs, ts), fs);
      let neg = 0, all = 0;
      for (let i = 0; i < n; i++) {
        all += x[i] * x[i];
        if (i >= n / 2) neg += x[i] * x[i];
      }
      expect(neg / all).toBeLessThan(1e-7);
    }
  });

  it("minimumPhaseAttenuation disperses like a constant-Q medium: the delay between 8 Hz and 2 Hz is (t*/π) ln 4 (Futterman 1962; Aki & Richards 2002 eq. 5.81), within 5 %", () => {
    const n = 16384, fs = 200, ts = 0.1;
    const h = minimumPhaseAttenuation(n, fs, ts);
    // Unwrapped phase, bin by bin from 0 Hz.
    const phase = new Float64Array(n / 2 + 1);
    for (let k = 1; k <= n / 2; k++) {
      let d = Math.atan2(h[2 * k + 1], h[2 * k]) - Math.atan2(h[2 * k - 1], h[2 * k - 2]);
      while (d > Math.PI) d -= 2 * Math.PI;
      while (d < -Math.PI) d += 2 * Math.PI;
      phase[k] = phase[k - 1] + d;
    }
    const phaseDelay = (f: number) => -phase[Math.round(f * n / fs)] / (2 * Math.PI * f);
    const expected = (ts / Math.PI) * Math.log(4);
    expect(Math.abs((phaseDelay(2) - phaseDelay(8)) / expected - 1)).toBeLessThan(0.05);
  });

  it('a pulse through an instrument equals, by numpy and scipy.signal.freqs_zpk, the displacement pulse times i·ω·A0·sensitivity·H(f) (to 1e-5 of its peak; the Nyquist bin is kept real here)', () => {
    const fs = 100, n = 4096;
    const spec = { sampleRate: fs, n, cornerHz: 4, tStar: 0.03, delaySamples: 0.25 };
    const disp = timeSeries(pulseSpectrum({ ...spec, output: { kind: 'displacement' } }), fs);
    const insts = [broadbandSensor(), shortPeriodSensor()];
    const refs = python<number[][]>(`
x = np.array(inp['x']); fs = inp['fs']
f = np.fft.fftfreq(len(x), 1/fs)
out = []
for inst in inp['insts']:
    z = [complex(a['re'], a['im']) for a in inst['zeros']]
    p = [complex(a['re'], a['im']) for a in inst['poles']]
    w, h = scipy.signal.freqs_zpk(z, p, inst['scale'], worN=2*np.pi*f)
    out.append(np.fft.ifft(np.fft.fft(x) * h * 2j*np.pi*f).real.tolist())
print(json.dumps(out))`, { x: disp, fs, insts: insts.map((i) => ({ zeros: i.zeros, poles: i.poles, scale: responseScale(i) })) });
    insts.forEach((inst, k) => {
      const counts = timeSeries(pulseSpectrum({ ...spec, output: { kind: 'instrument', instrument: inst } }), fs);
      const ref = refs[k];
      let peak = 0, err = 0;
      for (let i = 0; i < n; i++) {
        peak = Math.max(peak, Math.abs(ref[i]));
        err = Math.max(err, Math.abs(ref[i] - counts[i]));
      }
      expect(err / peak).toBeLessThan(1e-5);
    });
  });

  it('synthesizePulse puts exactly zero at the sample before a fractional onset', () => {
    const x = synthesizePulse({ sampleRate: 100, n: 1024, cornerHz: 8, tStar: 0.02, delaySamples: 0.6, output: { kind: 'instrument', instrument: broadbandSensor() } });
    expect(x[0]).toBe(0);
    expect(Math.abs(x[3])).toBeGreaterThan(0);
  });

  it('filteredNoise returns unit-RMS series that carry the kernel\'s spectrum (two series per complex transform kept apart)', () => {
    const n = 4096;
    const k = new Float64Array(n);
    k[0] = 1; // identity kernel: the noise comes back unchanged (up to RMS scaling)
    const a = new Float64Array(n), b = new Float64Array(n), c = new Float64Array(n);
    whiteNoise(a, 1); whiteNoise(b, 2); whiteNoise(c, 3);
    const [fa, fb, fc] = filteredNoise(k, 1, [a, b, c]);
    const rms = (x: Float64Array) => Math.sqrt(x.reduce((s, v) => s + v * v, 0) / x.length);
    for (const [f, src] of [[fa, a], [fb, b], [fc, c]] as const) {
      expect(rms(f)).toBeCloseTo(1, 9);
      const s = rms(src);
      for (let i = 0; i < n; i += 97) expect(f[i]).toBeCloseTo(src[i] / s, 9);
    }
  });

  it('rejects an FFT length that is not a power of two and a delay outside [0, 1)', () => {
    expect(() => minimumPhaseAttenuation(1000, 100, 0.01)).toThrow(/power of two/);
    expect(() => pulseSpectrum({ sampleRate: 100, n: 1024, cornerHz: 5, tStar: 0, delaySamples: 1, output: { kind: 'displacement' } })).toThrow(/delay must be in \[0, 1\)/);
  });
});
