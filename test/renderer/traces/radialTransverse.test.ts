import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { RadialTransverseRows, horizontalAzimuth, rotatePieces, rotateRow } from '../../../renderer/traces/radialTransverse';
import { makePiece, type ComponentTrace } from '../../../renderer/traces/rowData';
import type { SiteRow } from '../../../renderer/traces/traceView';
import type { SiteLocation } from '../../../core/location/fromReview';
import { rng } from '../../support/random';

// References: numpy 2.4 and scipy 1.17 (python3 of this machine), computed in this run. The R/T
// convention is the one of core/dsp/rotate.ts (R from the source towards the site, T 90° clockwise).

const R = rng(7);
const noise = (n: number) => Float32Array.from({ length: n }, () => R() - 0.5);
const N = noise(400);
const E = noise(400);

function python(script: string, input: unknown): unknown {
  return JSON.parse(execFileSync('python3', ['-c', script], { input: JSON.stringify(input) }).toString());
}

const comp = (key: string, pieces = [makePiece(0, 100, N)]): ComponentTrace => ({ key, label: key.split('.')[3], pieces });
const row = (h1: ComponentTrace, h2: ComponentTrace): SiteRow => ({
  key: 'XX.A', label: 'A', detail: '00.HH', components: [comp('XX.A.00.HHZ', [makePiece(0, 100, noise(400))]), h1, h2],
});

describe('rotatePieces', () => {
  it('pairs pieces on a common sample grid (offset start, a gap) and rotates them as numpy does', () => {
    // N: one piece from 0 s; E: two pieces starting 0.5 s (50 samples) and 2.5 s in, i.e. a gap
    const e1 = makePiece(0.5, 100, E.subarray(50, 200));
    const e2 = makePiece(2.5, 100, E.subarray(250, 400));
    const out = rotatePieces([makePiece(0, 100, N)], [e1, e2], 0, 90, 123.4);
    expect(out.r.map((p) => [p.t0, p.samples.length])).toEqual([[0.5, 150], [2.5, 150]]);
    const ref = python([
      'import json, sys, numpy as np',
      'd = json.load(sys.stdin); n = np.array(d["n"], dtype=np.float32).astype(float); e = np.array(d["e"], dtype=np.float32).astype(float)',
      'b = np.radians(123.4)',
      'r = -n * np.cos(b) - e * np.sin(b); t = n * np.sin(b) - e * np.cos(b)',
      'print(json.dumps({"r": [r[50:200].tolist(), r[250:400].tolist()], "t": [t[50:200].tolist(), t[250:400].tolist()]}))',
    ].join('\n'), { n: Array.from(N), e: Array.from(E) }) as { r: number[][]; t: number[][] };
    for (let k = 0; k < 2; k++) {
      out.r[k].samples.forEach((v, i) => expect(Math.abs(v - ref.r[k][i])).toBeLessThan(1e-6));
      out.t[k].samples.forEach((v, i) => expect(Math.abs(v - ref.t[k][i])).toBeLessThan(1e-6));
    }
  });

  it('leaves out pieces whose samples do not line up (start a third of a sample off, or another rate)', () => {
    expect(rotatePieces([makePiece(0, 100, N)], [makePiece(0.0033, 100, E)], 0, 90, 10).r).toEqual([]);
    expect(rotatePieces([makePiece(0, 100, N)], [makePiece(0, 50, E)], 0, 90, 10).r).toEqual([]);
    // a quarter sample or less is the same grid
    expect(rotatePieces([makePiece(0, 100, N)], [makePiece(0.002, 100, E)], 0, 90, 10).r.length).toBe(1);
  });

  it('rotating filtered horizontals equals filtering the rotated ones (scipy.signal.sosfilt, same Butterworth on both)', () => {
    const ref = python([
      'import json, sys, numpy as np',
      'from scipy.signal import butter, sosfilt',
      'd = json.load(sys.stdin); n = np.array(d["n"], dtype=np.float32).astype(float); e = np.array(d["e"], dtype=np.float32).astype(float)',
      'sos = butter(4, [2, 15], btype="bandpass", fs=100, output="sos")',
      'b = np.radians(250.0)',
      'r = -n * np.cos(b) - e * np.sin(b); t = n * np.sin(b) - e * np.cos(b)',
      'print(json.dumps({"fn": sosfilt(sos, n).tolist(), "fe": sosfilt(sos, e).tolist(), "fr": sosfilt(sos, r).tolist(), "ft": sosfilt(sos, t).tolist()}))',
    ].join('\n'), { n: Array.from(N), e: Array.from(E) }) as Record<string, number[]>;
    const out = rotatePieces([makePiece(0, 100, Float32Array.from(ref.fn))], [makePiece(0, 100, Float32Array.from(ref.fe))], 0, 90, 250);
    const peak = Math.max(...ref.fr.map(Math.abs));
    out.r[0].samples.forEach((v, i) => expect(Math.abs(v - ref.fr[i])).toBeLessThan(1e-6 * peak + 1e-7));
    out.t[0].samples.forEach((v, i) => expect(Math.abs(v - ref.ft[i])).toBeLessThan(1e-6 * peak + 1e-7));
  });
});

describe('rotateRow', () => {
  it('replaces N/E by R/T labelled HHR/HHT, keeps the channel keys (picks stay on real channels) and shows the back-azimuth', () => {
    const r = rotateRow(row(comp('XX.A.00.HHN'), comp('XX.A.00.HHE', [makePiece(0, 100, E)])), 90, (k) => horizontalAzimuth(k, null));
    if (typeof r === 'string') throw new Error(r);
    expect(r.components.map((c) => [c.key, c.label])).toEqual([['XX.A.00.HHZ', 'HHZ'], ['XX.A.00.HHN', 'HHR'], ['XX.A.00.HHE', 'HHT']]);
    expect(r.detail).toBe('00.HH \u00b7 baz 90\u00b0');
    // source due east: R = -E, T = N
    r.components[1].pieces[0].samples.forEach((v, i) => expect(v).toBeCloseTo(-E[i], 6));
    r.components[2].pieces[0].samples.forEach((v, i) => expect(v).toBeCloseTo(N[i], 6));
  });

  it('uses the metadata azimuths of channels 1/2 and says why when an orientation or a horizontal is missing', () => {
    const az = (k: string) => (k.endsWith('1') ? 20 : k.endsWith('2') ? 110 : undefined);
    const c = (a: number) => Math.cos((a * Math.PI) / 180);
    const s = (a: number) => Math.sin((a * Math.PI) / 180);
    const h1 = Float32Array.from(N, (n, i) => n * c(20) + E[i] * s(20));
    const h2 = Float32Array.from(N, (n, i) => n * c(110) + E[i] * s(110));
    const r = rotateRow(row(comp('XX.A.00.HH1', [makePiece(0, 100, h1)]), comp('XX.A.00.HH2', [makePiece(0, 100, h2)])), 90, az);
    if (typeof r === 'string') throw new Error(r);
    r.components[1].pieces[0].samples.forEach((v, i) => expect(v).toBeCloseTo(-E[i], 5));
    expect(rotateRow(row(comp('XX.A.00.HH1'), comp('XX.A.00.HH2')), 90, (k) => horizontalAzimuth(k, null))).toBe('XX.A: orientation of XX.A.00.HH1 unknown');
    const vertical: SiteRow = { key: 'XX.B', label: 'B', components: [comp('XX.B.00.HHZ')] };
    expect(rotateRow(vertical, 90, () => 0)).toBe('XX.B: 0 horizontals shown');
  });

  it('horizontalAzimuth: metadata first, else N 0 and E 90 (SEED orientation codes)', () => {
    expect(horizontalAzimuth('XX.A.00.HHN', 3.5)).toBe(3.5);
    expect(horizontalAzimuth('XX.A.00.HHN', null)).toBe(0);
    expect(horizontalAzimuth('XX.A.00.HHE', undefined)).toBe(90);
    expect(horizontalAzimuth('XX.A.00.HH1', null)).toBeUndefined();
  });
});

describe('RadialTransverseRows', () => {
  const sites = new Map<string, SiteLocation>([['XX.A', { latitude: 46, longitude: 8, elevation: 0 }]]);
  const make = () => new RadialTransverseRows(() => sites, (k) => horizontalAzimuth(k, null));
  const asRead = row(comp('XX.A.00.HHN'), comp('XX.A.00.HHE', [makePiece(0, 100, E)]));

  it('shows rows as read until it is on and an epicentre is known; then R/T with the back-azimuth to the epicentre', () => {
    const rt = make();
    expect(rt.shown(asRead)).toBe(asRead);
    rt.on = true;
    expect(rt.shown(asRead)).toBe(asRead);
    expect(rt.setEpicentre({ latDeg: 46, lonDeg: 8.1 })).toBe(true); // due east of the site
    expect(rt.backAzimuth('XX.A')).toBeCloseTo(90, 0);
    const [shown] = rt.reshow([asRead]);
    expect(shown.components[1].label).toBe('HHR');
    // the same rounded back-azimuth: the same rotated row, no new work
    expect(rt.setEpicentre({ latDeg: 46.00001, lonDeg: 8.1 })).toBe(false);
    expect(rt.reshow([shown])[0]).toBe(shown);
    // off again: as read
    rt.on = false;
    expect(rt.reshow([shown])[0]).toBe(asRead);
  });

  it('leaves sites without coordinates as read and names them', () => {
    const rt = make();
    rt.on = true;
    rt.setEpicentre({ latDeg: 46, lonDeg: 8.1 });
    const other = { ...asRead, key: 'XX.Z' };
    expect(rt.shown(other)).toBe(other);
    expect([...rt.skipped.values()]).toEqual(['XX.Z: no coordinates']);
  });
});
