import { describe, expect, it } from 'vitest';
import { doubleCoupleRadiation, type Mechanism } from '../../../core/synth/radiation';
import { Rng } from '../../../core/synth/random';

const D2R = Math.PI / 180;

/**
 * Second path: the moment tensor of a double couple (Aki & Richards 2002, Box 4.4, x north, y east,
 * z down; from memory) and the far-field projections F_P = γ·M·γ, F_SV = p̂·M·γ, F_SH = φ̂·M·γ
 * (A&R eq. 4.29-4.33 with the unit vectors of §4.5).
 */
function fromMomentTensor(m: Mechanism, takeoff: number, azimuth: number): { p: number; sv: number; sh: number } {
  const fs = m.strike * D2R, d = m.dip * D2R, l = m.rake * D2R;
  const mxx = -(Math.sin(d) * Math.cos(l) * Math.sin(2 * fs) + Math.sin(2 * d) * Math.sin(l) * Math.sin(fs) ** 2);
  const mxy = Math.sin(d) * Math.cos(l) * Math.cos(2 * fs) + 0.5 * Math.sin(2 * d) * Math.sin(l) * Math.sin(2 * fs);
  const mxz = -(Math.cos(d) * Math.cos(l) * Math.cos(fs) + Math.cos(2 * d) * Math.sin(l) * Math.sin(fs));
  const myy = Math.sin(d) * Math.cos(l) * Math.sin(2 * fs) - Math.sin(2 * d) * Math.sin(l) * Math.cos(fs) ** 2;
  const myz = -(Math.cos(d) * Math.cos(l) * Math.sin(fs) - Math.cos(2 * d) * Math.sin(l) * Math.cos(fs));
  const mzz = Math.sin(2 * d) * Math.sin(l);
  const M = [[mxx, mxy, mxz], [mxy, myy, myz], [mxz, myz, mzz]];
  const i = takeoff * D2R, f = azimuth * D2R;
  const g = [Math.sin(i) * Math.cos(f), Math.sin(i) * Math.sin(f), Math.cos(i)];
  const pv = [Math.cos(i) * Math.cos(f), Math.cos(i) * Math.sin(f), -Math.sin(i)];
  const ph = [-Math.sin(f), Math.cos(f), 0];
  const q = (a: number[], b: number[]) => a.reduce((s, ai, r) => s + ai * M[r].reduce((t, mrc, c) => t + mrc * b[c], 0), 0);
  return { p: q(g, g), sv: q(pv, g), sh: q(ph, g) };
}

describe('doubleCoupleRadiation (Aki & Richards 2002, eq. 4.89)', () => {
  it('a vertical strike-slip fault radiates P as sin²i sin 2(φ-φs): +1 at 45°, -1 at 135°, 0 along strike, on the horizontal ray', () => {
    const m = { strike: 30, dip: 90, rake: 0 };
    expect(doubleCoupleRadiation(m, 90, 75).p).toBeCloseTo(1, 12);
    expect(doubleCoupleRadiation(m, 90, 165).p).toBeCloseTo(-1, 12);
    expect(doubleCoupleRadiation(m, 90, 30).p).toBeCloseTo(0, 12);
    // SH = sin i cos 2(φ-φs): 1 along strike.
    expect(doubleCoupleRadiation(m, 90, 30).sh).toBeCloseTo(1, 12);
  });

  it('a 45°-dipping pure thrust sends its largest compression straight down (F_P = 1 at i = 0)', () => {
    expect(doubleCoupleRadiation({ strike: 0, dip: 45, rake: 90 }, 0, 123).p).toBeCloseTo(1, 12);
    // ... and a pure normal fault its largest dilatation.
    expect(doubleCoupleRadiation({ strike: 0, dip: 45, rake: -90 }, 0, 123).p).toBeCloseTo(-1, 12);
  });

  it('agrees with the moment-tensor projection for random mechanisms and rays to 1e-12', () => {
    const r = new Rng(3);
    for (let k = 0; k < 500; k++) {
      const m = { strike: r.uniform(0, 360), dip: r.uniform(0, 90), rake: r.uniform(-180, 180) };
      const i = r.uniform(0, 180), f = r.uniform(0, 360);
      const a = doubleCoupleRadiation(m, i, f), b = fromMomentTensor(m, i, f);
      expect(Math.abs(a.p - b.p)).toBeLessThan(1e-12);
      expect(Math.abs(a.sv - b.sv)).toBeLessThan(1e-12);
      expect(Math.abs(a.sh - b.sh)).toBeLessThan(1e-12);
    }
  });

  it('has a P radiation whose mean square over the sphere is 4/15 and an S one of 2/5 (A&R §4.5, energy ratios)', () => {
    const m = { strike: 12, dip: 63, rake: -41 };
    let sp = 0, ss = 0, w = 0;
    for (let i = 0.5; i < 180; i += 1) {
      for (let f = 0.5; f < 360; f += 1) {
        const r = doubleCoupleRadiation(m, i, f);
        const dw = Math.sin(i * D2R);
        sp += r.p * r.p * dw;
        ss += (r.sv * r.sv + r.sh * r.sh) * dw;
        w += dw;
      }
    }
    expect(sp / w).toBeCloseTo(4 / 15, 3);
    expect(ss / w).toBeCloseTo(2 / 5, 3);
  });

  it('rejects a dip outside 0-90 and a rake outside ±180', () => {
    expect(() => doubleCoupleRadiation({ strike: 0, dip: 95, rake: 0 }, 10, 10)).toThrow(/dip must be in \[0, 90\]/);
    expect(() => doubleCoupleRadiation({ strike: 0, dip: 45, rake: 200 }, 10, 10)).toThrow(RangeError);
  });
});
