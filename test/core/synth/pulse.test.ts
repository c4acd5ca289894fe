import { describe, expect, it } from 'vitest';
import { attenuationAt, CONSTANT_Q_TOP_HZ, filteredNoise, minimumPhaseAttenuation, pulseSpectrum, synthesizePulse, timeSeries } from '../../../core/synth/pulse';
import { broadbandSensor, responseScale, shortPeriodSensor } from '../../../core/synth/response';
import { whiteNoise } from '../../../core/synth/noise';
import { python } from './python';

describe('pulse', () => {
  it('the attenuation operator has amplitude exp(-π f t*) up to 100 Hz at 40, 100 and 200 Hz sampling (numpy 2.4, to 1e-12)', () => {
    const cases = [[40, 1024, 0.04], [100, 4096, 0.25], [200, 4096, 0.1]] as const;
    const ref = python<number[][]>(`
out = []
for fs, n, ts in inp:
    f = np.fft.rfftfreq(n, 1/fs)
    out.append(np.exp(-np.pi*f*ts).tolist())
print(json.dumps(out))`, cases);
    cases.forEach(([fs, n, ts], c) => {
      const h = minimumPhaseAttenuation(n, fs, ts);
      for (let k = 0; k < n / 2; k++) expect(Math.abs(Math.hypot(h[2 * k], h[2 * k + 1]) - ref[c][k])).toBeLessThan(1e-12);
    });
  });

  it('its phase is the minimum phase of its log amplitude: the Hilbert transform of -π t* min(|f|, 100 Hz), by scipy 1.17 quad (Cauchy principal value), to 1e-6 rad', () => {
    const ts = 0.1;
    const fs = [0.3, 1, 2, 5, 8, 20, 45, 80, 99.5, 100, 140, 400];
    // φ(f) = -H[ln|A|](f) = t* PV∫ Λ(u) / (u - f) du with Λ(u) = max(0, f_top - |u|) (the constant part
    // of ln|A| has no Hilbert transform); quad's 'cauchy' weight is PV∫ g(u) / (u - c) du.
    const ref = python<number[]>(`
from scipy.integrate import quad
top, ts = inp['top'], inp['ts']
tri = lambda u: max(0.0, top - abs(u))
out = []
for f in inp['f']:
    if f < top:
        v = quad(tri, -top, top, weight='cauchy', wvar=f, epsabs=1e-12, epsrel=1e-12, limit=400)[0]
    else:
        v = quad(lambda u: tri(u) / (u - f), -top, top, epsabs=1e-12, epsrel=1e-12, limit=400, points=[0.0])[0]
    out.append(ts * v)
print(json.dumps(out))`, { top: CONSTANT_Q_TOP_HZ, ts, f: fs });
    const c = { re: 0, im: 0 };
    fs.forEach((f, i) => {
      attenuationAt(f, ts, CONSTANT_Q_TOP_HZ, c);
      expect(Math.abs(Math.atan2(c.im, c.re) - Math.atan2(Math.sin(ref[i]), Math.cos(ref[i])))).toBeLessThan(1e-6);
    });
  });

  it('the operator at a negative frequency is the conjugate of that at the positive one (a real impulse response)', () => {
    const pos = { re: 0, im: 0 }, neg = { re: 0, im: 0 };
    for (const f of [0.5, 7, 99, 100, 150]) {
      attenuationAt(f, 0.1, CONSTANT_Q_TOP_HZ, pos);
      attenuationAt(-f, 0.1, CONSTANT_Q_TOP_HZ, neg);
      expect(neg.re).toBeCloseTo(pos.re, 15);
      expect(neg.im).toBeCloseTo(-pos.im, 15);
    }
  });

  it('the attenuation operator is causal: its impulse response at 200 Hz holds less than 1e-9 of its energy at negative times', () => {
    // A long transform: the response's slow tail (1/t², from the cusp of exp(-π |f| t*) at 0 Hz) wraps round.
    const n = 65536, fs = 200;
    for (const ts of [0.05, 0.1, 0.25]) {
      const x = timeSeries(minimumPhaseAttenuation(n, fs, ts), fs);
      let neg = 0, all = 0;
      for (let i = 0; i < n; i++) {
        all += x[i] * x[i];
        if (i >= n / 2) neg += x[i] * x[i];
      }
      expect(neg / all).toBeLessThan(1e-9);
    }
  });

  it('the attenuation operator disperses like a constant-Q medium: the phase delay at 2 Hz exceeds that at 8 Hz by (t*/π) ln 4 (Aki & Richards 2002 eq. 5.81, from memory) within 0.5 %, at 40, 100 and 200 Hz sampling', () => {
    const ts = 0.1, n = 16384;
    for (const fs of [40, 100, 200]) {
      const h = minimumPhaseAttenuation(n, fs, ts);
      // Unwrapped phase, bin by bin from 0 Hz.
      const kMax = Math.round((8 * n) / fs);
      const phase = new Float64Array(kMax + 1);
      for (let k = 1; k <= kMax; k++) {
        let d = Math.atan2(h[2 * k + 1], h[2 * k]) - Math.atan2(h[2 * k - 1], h[2 * k - 2]);
        while (d > Math.PI) d -= 2 * Math.PI;
        while (d < -Math.PI) d += 2 * Math.PI;
        phase[k] = phase[k - 1] + d;
      }
      const k2 = Math.round((2 * n) / fs), k8 = kMax;
      const f2 = (k2 * fs) / n, f8 = (k8 * fs) / n;
      const delay = (k: number, f: number) => -phase[k] / (2 * Math.PI * f);
      const expected = (ts / Math.PI) * Math.log(f8 / f2);
      expect(Math.abs((delay(k2, f2) - delay(k8, f8)) / expected - 1)).toBeLessThan(0.005);
    }
  });

  it('the same ground motion looks the same at 100 and 200 Hz: a regional S pulse (t* = 0.25 s) rendered at 200 Hz, every other sample, equals the one at 100 Hz to 1e-6 of its peak', () => {
    const spec = { cornerHz: 2, tStar: 0.25, delaySamples: 0, output: { kind: 'instrument' as const, instrument: broadbandSensor() } };
    const x100 = synthesizePulse({ ...spec, sampleRate: 100, n: 2048 });
    const x200 = synthesizePulse({ ...spec, sampleRate: 200, n: 4096 });
    let peak = 0, err = 0;
    for (let i = 0; i < 1024; i++) {
      peak = Math.max(peak, Math.abs(x100[i]));
      err = Math.max(err, Math.abs(x100[i] - x200[2 * i]));
    }
    expect(err / peak).toBeLessThan(1e-6);
    // And it reaches 1 % of its peak at the same time (within a 100 Hz sample).
    const onset = (x: Float64Array, fs: number) => {
      let i = 0;
      while (Math.abs(x[i]) < 0.01 * peak) i++;
      return i / fs;
    };
    expect(Math.abs(onset(x100, 100) - onset(x200, 200))).toBeLessThanOrEqual(0.01);
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

  it('rejects an FFT length that is not a power of two, a constant-Q band without a top and a delay outside [0, 1)', () => {
    expect(() => minimumPhaseAttenuation(1000, 100, 0.01)).toThrow(/power of two/);
    expect(() => minimumPhaseAttenuation(1024, 100, 0.01, 0)).toThrow(/constant-Q band .* got 0/);
    expect(() => pulseSpectrum({ sampleRate: 100, n: 1024, cornerHz: 5, tStar: 0, delaySamples: 1, output: { kind: 'displacement' } })).toThrow(/delay must be in \[0, 1\)/);
  });
});
