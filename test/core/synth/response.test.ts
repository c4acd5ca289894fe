import { describe, expect, it } from 'vitest';
import {
  accelerometerSensor, broadbandSensor, instrumentResponse, normalizationFactor, oscillatorPoles, polesZerosRatio, sensitivity, shortPeriodSensor,
} from '../../../core/synth/response';
import { python } from './python';

describe('response', () => {
  it('polesZerosRatio agrees with scipy.signal.freqs_zpk for each scenario instrument to 1e-12 (relative)', () => {
    const insts = [broadbandSensor(), shortPeriodSensor(), accelerometerSensor()];
    const freqs = [0.005, 0.05, 0.2, 1, 3.3, 10, 40, 90];
    const ref = python<number[][][]>(`
out = []
for inst in inp['insts']:
    z = [complex(a['re'], a['im']) for a in inst['zeros']]
    p = [complex(a['re'], a['im']) for a in inst['poles']]
    w, h = scipy.signal.freqs_zpk(z, p, 1.0, worN=2*np.pi*np.array(inp['f']))
    out.append([[float(v.real), float(v.imag)] for v in h])
print(json.dumps(out))`, { insts, f: freqs });
    insts.forEach((inst, k) => freqs.forEach((f, j) => {
      const h = polesZerosRatio(inst.poles, inst.zeros, f);
      const mag = Math.hypot(ref[k][j][0], ref[k][j][1]);
      expect(Math.hypot(h.re - ref[k][j][0], h.im - ref[k][j][1]) / mag).toBeLessThan(1e-12);
    }));
  });

  it('normalizationFactor makes |A0·H| = 1 at the normalization frequency (SEED manual v2.4, blockette 53 A0)', () => {
    for (const inst of [broadbandSensor(), shortPeriodSensor(), accelerometerSensor()]) {
      const r = instrumentResponse(inst, inst.normalizationHz);
      expect(Math.hypot(r.re, r.im) / sensitivity(inst)).toBeCloseTo(1, 12);
    }
  });

  it('a velocity geophone (natural frequency f0, damping h) has gain 1/(2h) at f0 relative to its high-frequency gain, phase +90° there (textbook oscillator)', () => {
    const inst = shortPeriodSensor();
    const hi = polesZerosRatio(inst.poles, inst.zeros, 1000);
    const at = polesZerosRatio(inst.poles, inst.zeros, 1);
    expect(Math.hypot(at.re, at.im) / Math.hypot(hi.re, hi.im)).toBeCloseTo(1 / (2 * 0.707), 5);
    expect(Math.atan2(at.im, at.re)).toBeCloseTo(Math.PI / 2, 9);
  });

  it('oscillatorPoles have modulus 2π f0 and -Re/|p| = h', () => {
    const [p] = oscillatorPoles(1 / 120, 0.707);
    expect(Math.hypot(p.re, p.im)).toBeCloseTo(2 * Math.PI / 120, 12);
    expect(-p.re / Math.hypot(p.re, p.im)).toBeCloseTo(0.707, 12);
  });

  it('the broadband is flat to velocity (within 1 %) from 0.05 to 20 Hz', () => {
    const inst = broadbandSensor();
    for (const f of [0.05, 0.5, 5, 20]) {
      const r = instrumentResponse(inst, f);
      expect(Math.abs(Math.hypot(r.re, r.im) / sensitivity(inst) - 1)).toBeLessThan(0.01);
    }
  });

  it('normalizationFactor rejects a negative frequency', () => {
    expect(() => normalizationFactor([], [], -1)).toThrow(RangeError);
  });
});
