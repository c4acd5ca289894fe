import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { rotateToNorthEast, rotateToRadialTransverse } from '../../../core/dsp/rotate';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff, testSignal } from './signals';

// References: numpy.linalg.solve of the projection equations h = N·cos(az) + E·sin(az) (numpy 2.4, in
// python3), with azimuth measured clockwise from north as the SEED Reference Manual v2.4 (blockette
// 52, field 14) and FDSN StationXML (Channel Azimuth) define it — cited from memory.

const north = testSignal(500, 31, 0);
const east = testSignal(500, 32, 0);
const project = (az: number) => Float64Array.from(north, (n, i) => n * Math.cos((az * Math.PI) / 180) + east[i] * Math.sin((az * Math.PI) / 180));
const h20 = project(20);
const h110 = project(110);
const h10 = project(10);
const h95 = project(95);
const [ref1, ref2] = scipyReference([
  { op: 'solve_ne', h1: h20, h2: h110, az1: 20, az2: 110 },
  { op: 'solve_ne', h1: h10, h2: h95, az1: 10, az2: 95 },
]) as number[][][];

describe('rotate', () => {
  it('rotates channels 1/2 at 20° and 110° to north/east as numpy.linalg.solve does, and recovers the ground motion', () => {
    const { north: n, east: e } = rotateToNorthEast(h20, h110, 20, 110);
    expect(relDiff(n, ref1[0])).toBeLessThan(1e-13);
    expect(relDiff(e, ref1[1])).toBeLessThan(1e-13);
    expect(relDiff(n, north)).toBeLessThan(1e-13);
    expect(relDiff(e, east)).toBeLessThan(1e-13);
  });

  it('handles horizontals that are not at right angles (10° and 95°)', () => {
    const { north: n, east: e } = rotateToNorthEast(h10, h95, 10, 95);
    expect(relDiff(n, ref2[0])).toBeLessThan(1e-13);
    expect(relDiff(e, ref2[1])).toBeLessThan(1e-13);
  });

  it('leaves N/E channels (0°, 90°) unchanged and swaps E/N given in that order', () => {
    const a = rotateToNorthEast(north, east, 0, 90);
    expect(relDiff(a.north, north)).toBeLessThan(1e-15);
    const b = rotateToNorthEast(east, north, 90, 0);
    expect(relDiff(b.north, north)).toBeLessThan(1e-15);
    expect(relDiff(b.east, east)).toBeLessThan(1e-15);
  });

  it('radial points away from the source: a source due east (back-azimuth 90°) makes radial = -east and transverse = north', () => {
    const { radial, transverse } = rotateToRadialTransverse(north, east, 90);
    radial.forEach((r, i) => expect(r).toBeCloseTo(-east[i], 12));
    transverse.forEach((t, i) => expect(t).toBeCloseTo(north[i], 12));
    // Motion along the propagation direction (source at back-azimuth 30°, wave travelling towards 210°) is all radial.
    const along = rotateToRadialTransverse(Float64Array.of(Math.cos((210 * Math.PI) / 180)), Float64Array.of(Math.sin((210 * Math.PI) / 180)), 30);
    expect(along.radial[0]).toBeCloseTo(1, 14);
    expect(along.transverse[0]).toBeCloseTo(0, 14);
  });

  it('radial and transverse agree with numpy projections on the unit vectors towards azimuths baz + 180° and baz + 270°, with R x T pointing down', () => {
    // Convention (Aki & Richards, Quantitative Seismology, 2nd ed. 2002, chapter 4: x north, y east,
    // z down, SH positive along phi-hat, the direction of increasing azimuth; from memory, page not
    // checked): radial is the horizontal direction of propagation, from the source towards the
    // station (azimuth baz + 180°); transverse is radial turned 90° clockwise seen from above
    // (azimuth baz + 270°), so (R, T, down) is right-handed. numpy 2.4 (python3) projects N/E onto
    // those unit vectors and checks the handedness with numpy.cross.
    const bazs = [0, 30, 90, 135.5, 200, 271, 359];
    const py = execFileSync('python3', ['-c', [
      'import json, sys, numpy as np',
      'd = json.load(sys.stdin); ne = np.array([d["n"], d["e"]])',
      'out = []',
      'for baz in d["baz"]:',
      '    u = lambda az: np.array([np.cos(np.radians(az)), np.sin(np.radians(az))])',
      '    r, t = u(baz + 180), u(baz + 270)',
      '    c = np.cross(np.array([r[0], r[1], 0.0]), np.array([t[0], t[1], 0.0]))',  // (N, E, down) is right-handed
      '    out.append({"r": (r @ ne).tolist(), "t": (t @ ne).tolist(), "down": float(c[2])})',
      'print(json.dumps(out))',
    ].join('\n')], { input: JSON.stringify({ n: Array.from(north), e: Array.from(east), baz: bazs }) }).toString();
    const ref = JSON.parse(py) as { r: number[]; t: number[]; down: number }[];
    bazs.forEach((baz, k) => {
      const { radial, transverse } = rotateToRadialTransverse(north, east, baz);
      expect(relDiff(radial, ref[k].r), `baz ${baz}`).toBeLessThan(1e-13);
      expect(relDiff(transverse, ref[k].t), `baz ${baz}`).toBeLessThan(1e-13);
      expect(ref[k].down).toBeCloseTo(1, 14);
    });
    // from channels 1/2 at 20° and 110° through north/east: the same radial and transverse
    const ne = rotateToNorthEast(h20, h110, 20, 110);
    const a = rotateToRadialTransverse(ne.north, ne.east, 135.5);
    expect(relDiff(a.radial, ref[3].r)).toBeLessThan(1e-12);
    expect(relDiff(a.transverse, ref[3].t)).toBeLessThan(1e-12);
  });

  it('refuses nearly parallel axes, unequal lengths and non-finite angles', () => {
    expect(() => rotateToNorthEast(h20, h110, 20, 22)).toThrow(/20° and 22° are too close to parallel/);
    expect(() => rotateToNorthEast(h20, h110.subarray(1), 20, 110)).toThrow(/same length, got 500 and 499/);
    expect(() => rotateToRadialTransverse(north, east, Number.NaN)).toThrow(/back-azimuth must be a finite number/);
  });
});
