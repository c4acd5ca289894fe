import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { allArrivals, firstArrival, firstArrivalInto, type TravelTime, type Wave } from '../../../core/location/travelTime';
import { DEFAULT_MODEL, checkVelocityModel, type VelocityModel } from '../../../core/location/velocityModel';
import { rng } from './reference';

const model = (layers: [number, number, number][]): VelocityModel =>
  checkVelocityModel(layers.map(([topKm, vp, vs]) => ({ topKm, vp, vs })), 'test model');

// ---------------------------------------------------------------------------------------------
// An independent brute-force ray shooter, written for this test from Snell's law alone: it cuts the
// path between the two depths into constant-speed pieces, and for the direct wave bisects on the
// take-off angle until the ray lands at the receiver's distance (no ray-parameter algebra, no
// Newton); head waves are summed as path lengths of the critical legs plus the run along the
// refractor. First arrival = the fastest of all of these that exist.
// ---------------------------------------------------------------------------------------------
interface Piece { h: number; v: number }

function speedAt(m: VelocityModel, wave: Wave, z: number): number {
  let l = m.layers[0];
  for (const layer of m.layers) if (layer.topKm < z) l = layer;
  return wave === 'P' ? l.vp : l.vs;
}

/** Constant-speed pieces between depths from and to (either order), listed starting at `from`. */
function pieces(m: VelocityModel, wave: Wave, from: number, to: number): Piece[] {
  const a = Math.min(from, to);
  const b = Math.max(from, to);
  const cuts = [a, ...m.layers.map((l) => l.topKm).filter((t) => t > a && t < b), b];
  const out: Piece[] = [];
  for (let i = 0; i + 1 < cuts.length; i++) out.push({ h: cuts[i + 1] - cuts[i], v: speedAt(m, wave, 0.5 * (cuts[i] + cuts[i + 1])) });
  return from <= to ? out : out.reverse();
}

interface Shot { time: number; phase: string; p: number; takeoffDeg: number }

function shootDirect(m: VelocityModel, wave: Wave, x: number, zs: number, zr: number): Shot {
  const ps = pieces(m, wave, zs, zr);
  const v0 = speedAt(m, wave, zs);
  const vmax = Math.max(v0, ...ps.map((q) => q.v));
  const up = zs > zr;
  // The ray is shot by its angle phi in the fastest piece (Snell: sin(theta_i) = sin(phi) v_i / vmax);
  // cos(theta_i)^2 is taken as (1 - r^2) + r^2 cos(phi)^2 with r = v_i / vmax <= 1, which keeps full
  // precision for grazing rays (1 - sin^2 would cancel).
  const cosIn = (v: number, phi: number): number => {
    const r = v / vmax;
    const c = Math.cos(phi);
    return Math.sqrt((1 - r * r) + r * r * c * c);
  };
  const land = (phi: number): { X: number; T: number } => {
    let X = 0;
    let T = 0;
    for (const { h, v } of ps) {
      const s = Math.sin(phi) * v / vmax;
      const c = cosIn(v, phi);
      X += h * s / c;
      T += h / (v * c);
    }
    return { X, T };
  };
  let lo = 0;
  let hi = Math.PI / 2;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (land(mid).X < x) lo = mid; else hi = mid;
  }
  const phi = 0.5 * (lo + hi);
  const theta = Math.atan2(Math.sin(phi) * v0 / vmax, cosIn(v0, phi)) * 180 / Math.PI;
  return { time: land(phi).T, phase: wave + 'g', p: Math.sin(phi) / vmax, takeoffDeg: up ? 180 - theta : theta };
}

/** Every arrival the shooter finds (direct, and head waves past their critical distance), fastest first. */
function shootAll(m: VelocityModel, wave: Wave, x: number, zs: number, zr: number): Shot[] {
  const all: Shot[] = [shootDirect(m, wave, x, zs, zr)];
  const v0 = speedAt(m, wave, zs);
  const vr = speedAt(m, wave, zr);
  const n = m.layers.length;
  for (let k = 0; k < n; k++) {
    const vk = wave === 'P' ? m.layers[k].vp : m.layers[k].vs;
    // refractor below both ends runs along layer k's top; above both ends, along its base
    const below = k > 0 && m.layers[k].topKm >= Math.max(zs, zr);
    const above = k < n - 1 && m.layers[k + 1].topKm <= Math.min(zs, zr);
    if (!below && !above) continue;
    const z = below ? m.layers[k].topKm : m.layers[k + 1].topKm;
    const legs = [...pieces(m, wave, zs, z), ...pieces(m, wave, zr, z)];
    if (legs.some((l) => l.v >= vk) || v0 >= vk || vr >= vk) continue; // no critical angle: no head wave
    let d = 0;
    let t = 0;
    for (const { h, v } of legs) {
      const s = v / vk;
      const c = Math.sqrt(1 - s * s);
      d += h * s / c; // horizontal run of the leg at the critical angle
      t += h / (v * c); // its length over its speed
    }
    if (d > x) continue; // before the critical distance
    const ic = Math.asin(v0 / vk) * 180 / Math.PI;
    all.push({ time: t + (x - d) / vk, phase: below && k === n - 1 ? wave + 'n' : wave + k, p: 1 / vk, takeoffDeg: below ? ic : 180 - ic });
  }
  return all.sort((a, b) => a.time - b.time);
}

/** The fastest arrival, and how much later the runner-up is (to tell near-ties apart). */
function shootFirst(m: VelocityModel, wave: Wave, x: number, zs: number, zr: number): Shot & { margin: number } {
  const all = shootAll(m, wave, x, zs, zr);
  return { ...all[0], margin: all.length > 1 ? all[1].time - all[0].time : Infinity };
}

// ---------------------------------------------------------------------------------------------
// A second, fully independent reference: Fermat's principle on a grid. Every node of a 2-D
// (distance, depth) grid is joined to its neighbours in many directions; each link's time is its
// straight length integrated exactly through the layers it crosses; scipy's Dijkstra
// (scipy.sparse.csgraph.dijkstra, scipy 1.17) finds the fastest path. Every grid path is a real path,
// so the grid time is never below the true first arrival and exceeds it by the angular
// discretisation only.
// ---------------------------------------------------------------------------------------------
const DIJKSTRA_PY = `
import sys, json, numpy as np
from math import gcd
from scipy.sparse import coo_matrix
from scipy.sparse.csgraph import dijkstra
job = json.load(sys.stdin)
g, R = job['grid'], job['radius']
res = []
for case in job['cases']:
    tops = np.array(case['tops'], float); v = np.array(case['v'], float)
    nx = int(round(case['xmax'] / g)) + 1; nz = int(round((case['zmax'] - case['zmin']) / g)) + 1
    zrow = case['zmin'] + g * np.arange(nz)
    lo = np.concatenate(([-np.inf], tops[1:])); hi = np.concatenate((tops[1:], [np.inf]))
    ix, iz = np.meshgrid(np.arange(nx), np.arange(nz))
    ix = ix.ravel(); iz = iz.ravel()
    rows, cols, w = [], [], []
    for dx in range(0, R + 1):
        for dz in range(-R, R + 1):
            if (dx == 0 and dz <= 0) or gcd(dx, abs(dz)) != 1: continue
            ok = (ix + dx < nx) & (iz + dz >= 0) & (iz + dz < nz)
            a = iz[ok] * nx + ix[ok]; b = (iz[ok] + dz) * nx + ix[ok] + dx
            za = zrow[iz[ok]]; zb = zrow[iz[ok] + dz]
            L = g * np.hypot(dx, dz)
            if dz == 0:
                sp = np.zeros_like(za)
                for i in range(len(v)):
                    inside = (za > lo[i] - 1e-9) & (za < hi[i] + 1e-9)   # on an interface: the faster side
                    sp = np.where(inside, np.maximum(sp, v[i]), sp)
                t = L / sp
            else:
                z1 = np.minimum(za, zb); z2 = np.maximum(za, zb); s = np.zeros_like(za)
                for i in range(len(v)):
                    s += np.clip(np.minimum(z2, hi[i]) - np.maximum(z1, lo[i]), 0, None) / v[i]
                t = L / (z2 - z1) * s
            rows.append(a); cols.append(b); w.append(t)
    G = coo_matrix((np.concatenate(w), (np.concatenate(rows), np.concatenate(cols))), shape=(nx * nz, nx * nz)).tocsr()
    src = [int(round((zs - case['zmin']) / g)) * nx for zs in case['sources']]
    d = dijkstra(G, directed=False, indices=src)
    rz = int(round((case['receiverDepth'] - case['zmin']) / g))
    res.append([[float(d[j, rz * nx + int(round(x / g))]) for x in case['distances']] for j in range(len(src))])
print(json.dumps(res))
`;

interface GridCase { tops: number[]; v: number[]; zmin: number; zmax: number; xmax: number; sources: number[]; receiverDepth: number; distances: number[] }

function gridTimes(cases: GridCase[], grid: number, radius: number): number[][][] {
  return JSON.parse(execFileSync('python3', ['-c', DIJKSTRA_PY], { input: JSON.stringify({ grid, radius, cases }), maxBuffer: 1 << 26 }).toString());
}

const onePointFive: VelocityModel = model([[0, 6, 3.5], [30, 8, 4.6]]);

describe('travelTime', () => {
  // ---- textbook formulas -----------------------------------------------------------------------
  it('in a half-space the time is the straight distance over the speed, t = sqrt(x^2 + z^2) / v', () => {
    // Any textbook (e.g. Stein & Wysession 2003, section 3.2, from memory). Worked by hand: v = 6 km/s,
    // source 40 km deep, 30 km away: distance 50 km, t = 50 / 6 = 8.33333 s; the ray leaves upward at
    // asin(30/50) = 36.87 deg from the vertical (take-off 180 - 36.87 = 143.13 deg), so the ray
    // parameter is 0.6 / 6 = 0.1 s/km and dT/dz = cos / v = 0.8 / 6 = 0.133333 s/km.
    const half = model([[0, 6, 3.5]]);
    const a = firstArrival(half, 'P', 30, 40);
    expect(a.time).toBeCloseTo(50 / 6, 12);
    expect(a.phase).toBe('Pg');
    expect(a.takeoffDeg).toBeCloseTo(180 - Math.atan2(3, 4) * 180 / Math.PI, 10);
    expect(a.incidenceDeg).toBeCloseTo(36.8698976458, 9);
    expect(a.slownessH).toBeCloseTo(0.1, 12);
    expect(a.dTdDepth).toBeCloseTo(0.8 / 6, 12);
    // S uses vs: 50 / 3.5 s.
    expect(firstArrival(half, 'S', 30, 40).time).toBeCloseTo(50 / 3.5, 12);
    // Many random geometries, including near-vertical and near-horizontal rays.
    const r = rng(1);
    for (let i = 0; i < 500; i++) {
      const x = i % 50 === 0 ? 1e-7 : Math.pow(10, -3 + 6 * r());
      const z = Math.pow(10, -3 + 5 * r());
      expect(firstArrival(half, 'P', x, z).time).toBeCloseTo(Math.hypot(x, z) / 6, 9);
    }
  });

  it('a station above the datum sits in the top layer extended upward: half-space t = sqrt(x^2 + (z + elev)^2) / v', () => {
    // Worked by hand: v = 6, x = 30, z = 40, station 1 km up: sqrt(900 + 41^2) / 6 = sqrt(2581) / 6 = 8.467257 s.
    const half = model([[0, 6, 3.5]]);
    expect(firstArrival(half, 'P', 30, 40, 1).time).toBeCloseTo(8.467257197253693, 12);
    // A source above the datum (-2 km, inside a volcano) to a station 1 km up: 1 km vertical offset, the ray goes down.
    const v = firstArrival(half, 'P', 1, -2, 1);
    expect(v.time).toBeCloseTo(Math.SQRT2 / 6, 12);
    expect(v.takeoffDeg).toBeCloseTo(45, 10);
    expect(v.incidenceDeg).toBeCloseTo(135, 10);
    expect(v.dTdDepth).toBeCloseTo(-Math.SQRT1_2 / 6, 12);
  });

  it('one layer over a half-space: head wave t = x/v2 + 2h cos(ic)/v1, critical and crossover distances', () => {
    // Stein & Wysession 2003, section 3.2 (layer over a half-space; formulas from memory, page not
    // checked); the same in Lay & Wallace 1995, chapter 3. Worked by hand for h = 30 km, v1 = 6,
    // v2 = 8 km/s, source and receiver at the surface:
    //   sin ic = 6/8 = 0.75, cos ic = sqrt(0.4375) = 0.6614378, ic = 48.590 deg
    //   intercept time 2h cos(ic)/v1 = 60 * 0.6614378 / 6 = 6.614378 s
    //   critical distance 2h tan(ic) = 60 * 0.75 / 0.6614378 = 68.034 km
    //   crossover distance 2h sqrt((v2 + v1)/(v2 - v1)) = 60 sqrt(7) = 158.745 km, where both take 26.4575 s
    //   at 200 km: Pn = 200/8 + 6.614378 = 31.614378 s; at 100 km: Pg = 100/6 = 16.666667 s
    const m = onePointFive;
    const pn = firstArrival(m, 'P', 200, 0);
    expect(pn.phase).toBe('Pn');
    expect(pn.time).toBeCloseTo(31.614378277661476, 12);
    expect(pn.slownessH).toBe(1 / 8);
    expect(pn.takeoffDeg).toBeCloseTo(48.5903778907, 9);
    expect(pn.incidenceDeg).toBeCloseTo(48.5903778907, 9);
    expect(pn.dTdDepth).toBeCloseTo(-0.6614378277661477 / 6, 12);
    const pg = firstArrival(m, 'P', 100, 0);
    expect([pg.phase, pg.time, pg.takeoffDeg]).toEqual(['Pg', 100 / 6, 90]);
    const xco = 158.74507866387543;
    expect(firstArrival(m, 'P', xco - 1e-6, 0).phase).toBe('Pg');
    expect(firstArrival(m, 'P', xco + 1e-6, 0).phase).toBe('Pn');
    expect(firstArrival(m, 'P', xco, 0).time).toBeCloseTo(26.457513110645905, 9);
  });

  it('a head wave exists only beyond its critical distance', () => {
    // Same model, source 29.9 km deep (just above the refractor), receiver at the surface, x = 20 km.
    // Direct: sqrt(20^2 + 29.9^2) / 6 = 5.995392 s. The head-wave line x/v2 + (0.1 + 30) sqrt(1/36 - 1/64)
    // would give 5.818213 s, but its critical distance is (1/8) * 30.1 / sqrt(1/36 - 1/64) = 34.130 km > 20 km.
    const a = firstArrival(onePointFive, 'P', 20, 29.9);
    expect(a.phase).toBe('Pg');
    expect(a.time).toBeCloseTo(5.995391748853632, 12);
    const b = firstArrival(onePointFive, 'P', 60, 29.9); // direct sqrt(60^2 + 29.9^2) / 6 = 11.174 s is slower
    expect(b.phase).toBe('Pn');
    expect(b.time).toBeCloseTo(60 / 8 + 30.1 * Math.sqrt(1 / 36 - 1 / 64), 12);
  });

  it('several layers: head wave t = x/vn + sum 2 h_i cos(i_i)/v_i, named after the refracting layer', () => {
    // Stein & Wysession 2003, section 3.2 (multilayer refraction, from memory). Worked by hand:
    // h1 = 10 km at 5 km/s, h2 = 20 km at 6.5 km/s, half-space 8 km/s; surface source, x = 250 km:
    //   cos i1 = sqrt(1 - (5/8)^2) = 0.7806247, 2 h1 cos i1 / v1 = 3.1224990 s
    //   cos i2 = sqrt(1 - (6.5/8)^2) = 0.5829612, 2 h2 cos i2 / v2 = 3.5874535 s
    //   t = 250/8 + 3.1224990 + 3.5874535 = 37.9599525 s
    const m = model([[0, 5, 2.9], [10, 6.5, 3.75], [30, 8, 4.6]]);
    const a = firstArrival(m, 'P', 250, 0);
    expect(a.phase).toBe('Pn');
    expect(a.time).toBeCloseTo(37.95995248115644, 11);
    // Along the top of layer 1 (6.5 km/s) at 60 km: 60/6.5 + 2*10*sqrt(1/25 - 1/42.25) = 11.7869 s, first there.
    const b = firstArrival(m, 'P', 60, 0);
    expect(b.phase).toBe('P1');
    expect(b.time).toBeCloseTo(60 / 6.5 + 20 * Math.sqrt(1 / 25 - 1 / 42.25), 12);
    expect(firstArrival(m, 'S', 60, 0).phase).toBe('S1');
  });

  it('no head wave runs along the top of a low-velocity layer', () => {
    // 10 km at 6, a 10 km low-velocity layer at 4.5, half-space 7.5 km/s. Pn crosses both:
    // 2*10*sqrt(1/36 - 1/56.25) + 2*10*sqrt(1/20.25 - 1/56.25) = 2.0 + 3.5556 = 5.5556 s intercept.
    const m = model([[0, 6, 3.5], [10, 4.5, 2.6], [20, 7.5, 4.3]]);
    for (let x = 0; x <= 300; x += 2.5) {
      const a = firstArrival(m, 'P', x, 0);
      expect(a.phase).not.toBe('P1');
      if (a.phase === 'Pn') expect(a.time).toBeCloseTo(x / 7.5 + 5.555555555555555, 11);
      else expect(a.time).toBeCloseTo(x / 6, 11);
    }
    expect(firstArrival(m, 'P', 300, 0).phase).toBe('Pn');
    // A half-space slower than the top layer: only the direct wave, at every distance.
    const slowBelow = model([[0, 6, 3.5], [15, 5, 2.9]]);
    expect(firstArrival(slowBelow, 'P', 500, 0)).toMatchObject({ phase: 'Pg', time: 500 / 6 });
  });

  // ---- edge cases --------------------------------------------------------------------------------
  it('at epicentral distance 0 the ray is vertical and the time is the sum of h/v', () => {
    const m = model([[0, 5, 2.9], [10, 6.5, 3.75], [30, 8, 4.6]]);
    const a = firstArrival(m, 'P', 0, 25, 0.5);
    expect(a.time).toBeCloseTo(10.5 / 5 + 15 / 6.5, 12);
    expect([a.phase, a.takeoffDeg, a.incidenceDeg, a.slownessH]).toEqual(['Pg', 180, 0, 0]);
    expect(a.dTdDepth).toBeCloseTo(1 / 6.5, 12);
    // Source at the station: zero time.
    expect(firstArrival(m, 'P', 0, 0).time).toBe(0);
  });

  it('a source exactly on an interface takes the limit from above, continuous with depths just above and below', () => {
    const m = model([[0, 5, 2.9], [10, 6.5, 3.75], [30, 8, 4.6]]);
    for (const x of [0, 5, 20, 45, 80, 150, 300]) {
      for (const zi of [10, 30]) {
        const on = firstArrival(m, 'P', x, zi);
        const above = firstArrival(m, 'P', x, zi - 1e-9);
        const below = firstArrival(m, 'P', x, zi + 1e-9);
        expect(Math.abs(on.time - above.time)).toBeLessThan(1e-8);
        expect(Math.abs(on.time - below.time)).toBeLessThan(1e-8);
        expect(on.phase).toBe(above.phase);
        expect(on.takeoffDeg).toBeCloseTo(above.takeoffDeg, 4);
        expect(on.dTdDepth).toBeCloseTo(above.dTdDepth, 6);
      }
    }
    // A borehole receiver exactly on the base of a fast layer (6 km/s, 0-10 km) over a slow one (4 km/s),
    // source below at 20 km, x = 100 km. As the limit from above, the ray climbs the slow layer at the
    // critical angle and runs along the interface in the fast layer. By hand: r = 4/6, sqrt(1 - r^2) =
    // 0.745356; the climb covers 10 r / 0.745356 = 8.944272 km in 10 / (4 * 0.745356) = 3.354102 s,
    // then (100 - 8.944272) / 6 = 15.175955 s: 18.530057 s, the same as the head-wave formula
    // x/6 + 10 sqrt(1/16 - 1/36).
    const fastOverSlow = model([[0, 6, 3.5], [10, 4, 2.3]]);
    const onBase = firstArrival(fastOverSlow, 'P', 100, 20, -10);
    expect(onBase.time).toBeCloseTo(100 / 6 + 10 * Math.sqrt(1 / 16 - 1 / 36), 12);
    expect(onBase.time).toBeCloseTo(18.530057, 6);
    expect(onBase.time).toBeCloseTo(firstArrival(fastOverSlow, 'P', 100, 20, -10 + 1e-9).time, 7);
    // with the receiver 2 km below the interface it is the head wave along the fast layer's base, 'P0'
    const p0 = firstArrival(fastOverSlow, 'P', 100, 20, -12);
    expect(p0.phase).toBe('P0');
    expect(p0.time).toBeCloseTo(100 / 6 + 12 * Math.sqrt(1 / 16 - 1 / 36), 12);
    expect(p0.takeoffDeg).toBeCloseTo(180 - Math.asin(4 / 6) * 180 / Math.PI, 10);
    expect(p0.incidenceDeg).toBeCloseTo(180 - Math.asin(4 / 6) * 180 / Math.PI, 10);
    // Near the source (before the climb reaches the interface, 8.944 km) the ray is an ordinary direct one.
    expect(firstArrival(fastOverSlow, 'P', 5, 20, -10).time).toBeCloseTo(Math.hypot(5, 10) / 4, 6);
  });

  it('a receiver below the datum and a source above it are handled like any two depths', () => {
    const m = model([[0, 5, 2.9], [10, 6.5, 3.75], [30, 8, 4.6]]);
    const r = rng(7);
    for (let i = 0; i < 200; i++) {
      const x = 200 * r();
      const zs = -3 + 40 * r();
      const elev = -12 + 15 * r();
      const a = firstArrival(m, 'P', x, zs, elev);
      const s = shootFirst(m, 'P', x, zs, -elev);
      expect(Math.abs(a.time - s.time), `${x} ${zs} ${elev} ${a.phase} ${s.phase} ${a.time} ${s.time}`).toBeLessThan(1e-8);
      // reciprocity: swapping source and receiver depths gives the same time
      expect(Math.abs(firstArrival(m, 'P', x, -elev, -zs).time - a.time)).toBeLessThan(1e-9);
    }
  });

  // ---- the brute-force shooter over many random models -------------------------------------------
  it('agrees with a brute-force ray shoot within 1e-8 s over 3000 random models and geometries', () => {
    const r = rng(42);
    let heads = 0;
    let lvl = 0;
    const names = new Set<string>();
    for (let trial = 0; trial < 3000; trial++) {
      const n = 1 + Math.floor(r() * 5);
      const layers: [number, number, number][] = [];
      let top = 0;
      for (let i = 0; i < n; i++) {
        const vp = 3 + 6 * r();
        layers.push([top, vp, vp / (1.6 + 0.3 * r())]);
        top += 0.5 + 20 * r();
      }
      if (r() < 0.5) layers.sort((a, b) => a[1] - b[1]).forEach((l, i, all) => { l[0] = i === 0 ? 0 : all[i - 1][0] + 0.5 + 15 * r(); });
      const m = model(layers);
      const wave: Wave = r() < 0.5 ? 'P' : 'S';
      const x = r() < 0.05 ? 1e-6 * r() : 400 * r() * r();
      const zs = -2 + 50 * r();
      const zr = r() < 0.8 ? -2 * r() : 30 * r();
      const a = firstArrival(m, wave, x, zs, -zr);
      const s = shootFirst(m, wave, x, zs, zr);
      expect(Math.abs(a.time - s.time), `trial ${trial} ${JSON.stringify(layers)} ${wave} ${x} ${zs} ${zr} ${a.phase} ${s.phase} ${a.time} ${s.time}`).toBeLessThan(1e-8 * Math.max(1, s.time));
      expect(Math.abs(a.slownessH - s.p), `trial ${trial}`).toBeLessThan(1e-7);
      expect(Math.abs(a.takeoffDeg - s.takeoffDeg), `trial ${trial}`).toBeLessThan(1e-4);
      if (s.margin > 1e-7) expect(a.phase, `trial ${trial}`).toBe(s.phase); // else a near-tie: either name is right
      if (!a.phase.endsWith('g')) heads++;
      names.add(a.phase.slice(1) === '0' || (a.phase !== 'Pn' && a.phase !== 'Sn' && !a.phase.endsWith('g') && m.layers[Number(a.phase.slice(1)) + 1]?.topKm <= Math.min(zs, zr)) ? 'above' : a.phase.slice(1));
      if (layers.some((l, i) => i > 0 && l[1] < layers[i - 1][1])) lvl++;
    }
    // the random set really exercised head waves and low-velocity layers
    expect(heads).toBeGreaterThan(300);
    expect(lvl).toBeGreaterThan(300);
    // direct, along the half-space, along intermediate tops, and along the base of a layer above both ends
    expect([...names].sort()).toEqual(expect.arrayContaining(['1', '2', 'above', 'g', 'n']));
  });

  it('allArrivals lists the direct wave and every head wave past its critical distance, as the shooter finds them', () => {
    const r = rng(99);
    let later = 0;
    for (let trial = 0; trial < 1000; trial++) {
      const n = 2 + Math.floor(r() * 4);
      const layers: [number, number, number][] = [];
      let top = 0;
      for (let i = 0; i < n; i++) {
        const vp = 3 + 6 * r();
        layers.push([top, vp, vp / 1.75]);
        top += 0.5 + 15 * r();
      }
      const m = model(layers);
      const x = 300 * r();
      const zs = -1 + 40 * r();
      const zr = r() < 0.8 ? -r() : 25 * r();
      const ours = allArrivals(m, 'P', x, zs, -zr);
      const ref = shootAll(m, 'P', x, zs, zr);
      expect(ours.map((a) => a.phase).sort(), `trial ${trial}`).toEqual(ref.map((a) => a.phase).sort());
      for (const a of ours) {
        const b = ref.find((q) => q.phase === a.phase) as Shot;
        expect(Math.abs(a.time - b.time), `trial ${trial} ${a.phase}`).toBeLessThan(1e-8 * Math.max(1, b.time));
        expect(Math.abs(a.takeoffDeg - b.takeoffDeg), `trial ${trial} ${a.phase}`).toBeLessThan(1e-4);
      }
      expect(ours[0]).toEqual(firstArrival(m, 'P', x, zs, -zr));
      later += ours.length - 1;
    }
    expect(later).toBeGreaterThan(200); // later arrivals were really there to list (350 in this set)
    // the regional case: Pn first, Pg later
    const reg = allArrivals(onePointFive, 'P', 250, 10);
    expect(reg.map((a) => a.phase)).toEqual(['Pn', 'Pg']);
    expect(reg[1].time).toBeCloseTo(Math.hypot(250, 10) / 6, 9);
  });

  it('is never slower than the fastest path on a Fermat grid (scipy Dijkstra) and within 0.3 % of it', () => {
    const cases: GridCase[] = [];
    const models: VelocityModel[] = [];
    const specs: { layers: [number, number, number][]; zmin: number; receiverDepth: number; sources: number[] }[] = [
      { layers: [[0, 5, 2.9], [10, 6.5, 3.75], [25, 8, 4.6]], zmin: 0, receiverDepth: 0, sources: [0, 5, 17, 30] },
      { layers: [[0, 6, 3.5], [8, 4.5, 2.6], [16, 6.8, 3.9], [28, 7.6, 4.4]], zmin: 0, receiverDepth: 0, sources: [2, 12, 20] },
      { layers: [[0, 3.5, 2], [2, 5.8, 3.36], [20, 6.5, 3.75], [32, 8.1, 4.7]], zmin: -2, receiverDepth: -1.5, sources: [-1, 1, 10, 25] },
      { layers: [[0, 6.2, 3.6], [12, 5.2, 3], [22, 5.9, 3.4]], zmin: 0, receiverDepth: 4, sources: [0, 15, 30] },
      // a borehole receiver inside a low-velocity layer under a faster one: head wave along that layer's base
      { layers: [[0, 6.4, 3.7], [6, 4.8, 2.8], [25, 5.6, 3.2]], zmin: 0, receiverDepth: 14, sources: [10, 20, 35] },
    ];
    const distances = Array.from({ length: 31 }, (_, i) => i * 5);
    for (const s of specs) {
      models.push(model(s.layers));
      cases.push({ tops: s.layers.map((l) => l[0]), v: s.layers.map((l) => l[1]), zmin: s.zmin, zmax: 40, xmax: 150, sources: s.sources, receiverDepth: s.receiverDepth, distances });
    }
    const grid = gridTimes(cases, 0.5, 8);
    let worst = 0;
    cases.forEach((c, ci) => c.sources.forEach((zs, si) => distances.forEach((x, xi) => {
      const ours = firstArrival(models[ci], 'P', x, zs, -c.receiverDepth).time;
      const g = grid[ci][si][xi];
      expect(ours, `case ${ci} source ${zs} x ${x}`).toBeLessThanOrEqual(g + 1e-9);
      if (ours > 0) worst = Math.max(worst, (g - ours) / ours);
      else expect(g).toBe(0);
    })));
    console.log(`Fermat grid: at most ${(100 * worst).toFixed(3)} % slower than firstArrival`);
    expect(worst).toBeLessThan(0.003);
  }, 60_000);

  // ---- derivatives ---------------------------------------------------------------------------------
  it('slownessH and dTdDepth equal finite differences of the time', () => {
    const r = rng(3);
    const models = [DEFAULT_MODEL, onePointFive, model([[0, 6, 3.5], [8, 4.5, 2.6], [16, 6.8, 3.9], [28, 7.6, 4.4]]), model([[0, 3.5, 2], [2, 5.8, 3.36], [20, 6.5, 3.75], [32, 8.1, 4.7]])];
    let checked = 0;
    for (let i = 0; i < 2000; i++) {
      const m = models[i % models.length];
      const wave: Wave = i % 2 ? 'S' : 'P';
      const x = 0.01 + 300 * r() * r();
      const z = -1 + 40 * r();
      const e = 2 * r();
      const d = 1e-5;
      const a = firstArrival(m, wave, x, z, e);
      const xp = firstArrival(m, wave, x + d, z, e);
      const xm = firstArrival(m, wave, x - d, z, e);
      const zp = firstArrival(m, wave, x, z + d, e);
      const zm = firstArrival(m, wave, x, z - d, e);
      if (new Set([a.phase, xp.phase, xm.phase, zp.phase, zm.phase]).size !== 1) continue; // a phase change in between: kink
      if (m.layers.some((l) => Math.abs(l.topKm - z) < 2 * d)) continue;
      expect(Math.abs((xp.time - xm.time) / (2 * d) - a.slownessH)).toBeLessThan(1e-6);
      expect(Math.abs((zp.time - zm.time) / (2 * d) - a.dTdDepth)).toBeLessThan(1e-6);
      checked++;
    }
    expect(checked).toBeGreaterThan(1900);
  });

  it('at an interface dTdDepth is the one-sided derivative from above', () => {
    const m = model([[0, 5, 2.9], [10, 6.5, 3.75], [30, 8, 4.6]]);
    for (const x of [1, 20, 60, 200]) {
      const a = firstArrival(m, 'P', x, 10);
      const d = 1e-6;
      expect(Math.abs((a.time - firstArrival(m, 'P', x, 10 - d).time) / d - a.dTdDepth)).toBeLessThan(1e-5);
    }
  });

  // ---- arguments and speed -------------------------------------------------------------------------
  it('rejects bad arguments with errors naming the value and the allowed range', () => {
    expect(() => firstArrival(DEFAULT_MODEL, 'P', -1, 5)).toThrow(new RangeError('epicentralKm must be in [0, 20000] km, got -1'));
    expect(() => firstArrival(DEFAULT_MODEL, 'P', NaN, 5)).toThrow('epicentralKm must be in [0, 20000] km, got NaN');
    expect(() => firstArrival(DEFAULT_MODEL, 'X' as Wave, 1, 5)).toThrow(`wave must be 'P' or 'S', got "X"`);
    expect(() => firstArrival(DEFAULT_MODEL, 'P', 1, Infinity)).toThrow('sourceDepthKm must be in [-1000, 1000] km, got Infinity');
    expect(() => firstArrival(DEFAULT_MODEL, 'P', 1, 5, 2000)).toThrow('receiverElevKm must be in [-1000, 1000] km, got 2000');
    expect(() => firstArrival({ layers: [{ topKm: 0, vp: 3, vs: 4 }] }, 'P', 1, 5)).toThrow('velocity model: layer 0: vs must be less than vp');
  });

  it('is fast: well over 300 000 calls per second of CPU time on a 3-layer model', () => {
    const out: TravelTime = { time: 0, phase: '', takeoffDeg: 0, incidenceDeg: 0, slownessH: 0, dTdDepth: 0 };
    const run = (N: number): number => {
      let sum = 0;
      for (let i = 0; i < N; i++) sum += firstArrivalInto(out, DEFAULT_MODEL, i & 1 ? 'S' : 'P', (i % 300) + 0.5, (i % 41) * 0.73 - 1, 0.3).time;
      return sum;
    };
    run(100_000); // warm up the JIT
    const N = 300_000;
    // CPU time of this process, not wall time: the build machine's two cores are shared.
    const c0 = process.cpuUsage();
    const sum = run(N);
    const c = process.cpuUsage(c0);
    const perSec = N / ((c.user + c.system) / 1e6);
    console.log(`firstArrival: ${(perSec / 1e6).toFixed(2)} million calls per CPU second (${(1e6 / perSec).toFixed(2)} us per call)`);
    expect(sum).toBeGreaterThan(0);
    expect(perSec).toBeGreaterThan(300_000);
  });
});
