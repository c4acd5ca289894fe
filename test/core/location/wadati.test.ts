import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { firstArrival } from '../../../core/location/travelTime';
import { checkVelocityModel } from '../../../core/location/velocityModel';
import { spEpicentralKm, spHypocentralKm, wadati, type WadatiPoint } from '../../../core/location/wadati';
import { gaussian, rng } from './reference';

const T0 = 1_764_633_600_000_000;

describe('wadati', () => {
  it('recovers Vp/Vs and the origin time exactly when Vp/Vs is the same in every layer', () => {
    // With one Vp/Vs everywhere P and S follow the same paths and tS - t0 = (Vp/Vs)(tP - t0) exactly
    // (Wadati 1933's premise). Model: three layers, Vp/Vs 1.75 throughout.
    const k = 1.75;
    const model = checkVelocityModel([[0, 5.2], [6, 6.1], [25, 7.9]].map(([topKm, vp]) => ({ topKm, vp, vs: vp / k })), 'wadati test');
    const pts: WadatiPoint[] = [5, 12, 25, 40, 61, 90, 130].map((x, i) => ({
      stationKey: `S${i}`,
      pTime: T0 + Math.round(firstArrival(model, 'P', x, 9).time * 1e6),
      sTime: T0 + Math.round(firstArrival(model, 'S', x, 9).time * 1e6),
    }));
    const r = wadati(pts);
    if (!r.ok) throw new Error(r.message);
    expect(r.value.vpVs).toBeCloseTo(1.75, 5);
    expect(Math.abs(r.value.originTime - T0)).toBeLessThanOrEqual(5);
    expect(r.value.vpVsError).toBeLessThan(1e-5);
    expect(r.value.count).toBe(7);
    for (const p of r.value.points) expect(Math.abs(p.residualS)).toBeLessThan(2e-6);
  });

  it('the fit, its standard errors and the origin time agree with scipy.stats.linregress', () => {
    const r = rng(77);
    const g = gaussian(r);
    const pts: WadatiPoint[] = Array.from({ length: 11 }, (_, i) => {
      const tp = 1 + 2.5 * i + r();
      return { stationKey: `S${i}`, pTime: T0 + Math.round((tp + 0.05 * g()) * 1e6), sTime: T0 + Math.round((1.74 * tp + 0.1 * g()) * 1e6) };
    });
    const res = wadati(pts);
    if (!res.ok) throw new Error(res.message);
    // Reference: scipy.stats.linregress (scipy 1.17) of S-P on P time (seconds after the first P), this run.
    const tRef = Math.min(...pts.map((p) => p.pTime));
    const x = pts.map((p) => (p.pTime - tRef) / 1e6);
    const y = pts.map((p) => (p.sTime - p.pTime) / 1e6);
    const py = execFileSync('python3', ['-c', `
import json, sys
from scipy.stats import linregress
d = json.load(sys.stdin)
r = linregress(d['x'], d['y'])
print(json.dumps([float(r.slope), float(r.intercept), float(r.stderr), float(r.intercept_stderr)]))`], { input: JSON.stringify({ x, y }) }).toString();
    const [slope, intercept, stderr] = JSON.parse(py) as number[];
    expect(res.value.vpVs).toBeCloseTo(1 + slope, 12);
    expect(res.value.vpVsError).toBeCloseTo(stderr, 12);
    expect(Math.abs(res.value.originTime - (tRef - Math.round(intercept / slope * 1e6)))).toBeLessThanOrEqual(1);
    expect(res.value.vpVs).toBeGreaterThan(1.6);
    expect(res.value.vpVs).toBeLessThan(1.9);
  });

  it('the origin-time error matches the scatter of estimates over repeated noisy trials', () => {
    // First-order propagation through t0 = -intercept/slope, checked by Monte Carlo: the reported
    // error and the standard deviation of 400 estimates agree within 15 %.
    const r = rng(5);
    const g = gaussian(r);
    const tp = [2, 4, 5.5, 7, 9, 12, 15, 19];
    const est: number[] = [];
    let reported = 0;
    for (let k = 0; k < 400; k++) {
      const res = wadati(tp.map((t, i) => ({ stationKey: `S${i}`, pTime: T0 + Math.round(t * 1e6), sTime: T0 + Math.round((1.73 * t + 0.08 * g()) * 1e6) })));
      if (!res.ok) throw new Error(res.message);
      est.push((res.value.originTime - T0) / 1e6);
      reported += res.value.originTimeErrorS ** 2 / 400;
    }
    const mean = est.reduce((a, b) => a + b, 0) / est.length;
    const sd = Math.sqrt(est.reduce((a, b) => a + (b - mean) ** 2, 0) / (est.length - 1));
    expect(Math.abs(Math.sqrt(reported) / sd - 1)).toBeLessThan(0.15);
    expect(Math.abs(mean)).toBeLessThan(3 * sd / Math.sqrt(400) + 0.01);
  });

  it('S-P of 1 s is 8.2 km for Vp 6 km/s and Vp/Vs 1.73 (common practice: about 8 km per second)', () => {
    expect(spHypocentralKm(1, 6, 1.73)).toBeCloseTo(8.219, 3);
    expect(spHypocentralKm(3, 6, 1.73)).toBeCloseTo(3 * 6 / 0.73, 12);
    // epicentral: 3-4-5 triangle
    expect(spEpicentralKm(5, 3)).toBeCloseTo(4, 12);
    expect(spEpicentralKm(2, 3)).toBe(0);
    expect(() => spHypocentralKm(1, 6, 1)).toThrow('Vp/Vs must be > 1, got 1');
    expect(() => spHypocentralKm(-1, 6, 1.7)).toThrow('S-P time must be >= 0 s, got -1');
  });

  it('too few stations or a degenerate diagram give a message instead of a number', () => {
    const p = (i: number, tp: number, sp: number): WadatiPoint => ({ stationKey: `S${i}`, pTime: T0 + tp * 1e6, sTime: T0 + (tp + sp) * 1e6 });
    expect(wadati([p(0, 1, 1), p(1, 2, 2)])).toEqual({ ok: false, code: 'too-few-stations', message: '2 stations with both P and S; at least 3 are needed for Vp/Vs' });
    expect(wadati([p(0, 1, 1), p(1, 1, 2), p(2, 1, 3)])).toMatchObject({ ok: false, code: 'degenerate' });
    const down = wadati([p(0, 1, 3), p(1, 2, 2), p(2, 3, 1)]);
    expect(down).toEqual({ ok: false, code: 'degenerate', message: 'S-P does not grow with P time (slope -1.0000): no Vp/Vs from these picks' });
    expect(() => wadati([{ stationKey: 'X', pTime: 1.5, sTime: 2 }])).toThrow('point 0 (X): times must be integer microseconds, got P 1.5, S 2');
  });
});
