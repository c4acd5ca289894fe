/**
 * First-arrival travel times of P and S in a flat layered model (velocityModel.ts), with the ray's
 * angles and the derivatives the location code needs.
 *
 * Geometry and the datum. The source is at sourceDepthKm below the datum (negative: above it), the
 * receiver at receiverElevKm above it, i.e. at depth -receiverElevKm. Above the datum the top layer
 * is extended upward, so both are simply two points at two depths in one layered medium and every
 * formula below holds unchanged for stations on hills and sources in volcanoes. (An extended top
 * layer rather than a separate "station correction": the path through the station's height then
 * bends with the ray, and the derivatives stay consistent with the times.)
 *
 * Arrivals considered (the classic flat-layer set; Stein & Wysession 2003, section 3.2; Lay &
 * Wallace 1995, chapter 3):
 * - the direct wave, named 'Pg' / 'Sg' whatever layer the source is in: the ray between the two
 *   depths obeying Snell's law, found by solving X(p) = epicentral distance for the ray parameter
 *   (safeguarded Newton, see solveDirect);
 * - a head wave along the top of every layer m deeper than both ends that is faster than every layer
 *   between the ends and it (a layer slower than one above it has no critical angle, so no head wave
 *   runs along its top: low-velocity layers are handled by this rule). It exists from its critical
 *   distance on, and its time is x/v_m plus the intercept sum over the legs, h_i sqrt(1/v_i^2 -
 *   1/v_m^2). Named 'Pn' / 'Sn' along the top of the half-space (the last layer) and 'P1', 'S1',
 *   'P2', ... along the top of intermediate layer 1, 2, ... (layer indices count from 0 at the datum);
 * - by the same rule a head wave along the base of a layer m above both ends, when it is faster than
 *   every layer from it down to the deeper end (this needs a receiver below the datum, in a borehole
 *   under a faster layer); named 'P' + m / 'S' + m as well (so 'P0' runs along the base of the top layer).
 * The fastest of these is returned. Reflections are never first (a wide-angle reflection is always
 * later than the direct or the head wave it tends to), and a flat model has no turning rays.
 *
 * Depths exactly on an interface belong to the layer ABOVE it: every time, angle and derivative at
 * such a depth is the limit as the point approaches the interface from above (so a derivative there
 * is the one-sided one from above). The same holds for a receiver below the datum.
 */
import type { VelocityModel } from './velocityModel';
import { checkVelocityModel } from './velocityModel';

export type Wave = 'P' | 'S';

export interface TravelTime {
  /** Travel time, seconds. */
  time: number;
  /** 'Pg'/'Sg' direct; 'Pn'/'Sn' head wave along the half-space's top; 'P1'/'S1', ... head wave in layer 1, ... (see above). */
  phase: string;
  /** Angle of the ray at the source from the downward vertical, degrees (0 down, 90 horizontal, >90 upward). */
  takeoffDeg: number;
  /** Angle of the ray at the receiver from the vertical, degrees (0 arriving straight up from below, >90 from above). */
  incidenceDeg: number;
  /** dT/d(epicentral distance) = horizontal slowness = ray parameter, s/km. */
  slownessH: number;
  /** dT/d(source depth), s/km (negative when deepening the source shortens the path). */
  dTdDepth: number;
}

/** A model prepared for fast evaluation: tops and speeds as typed arrays. */
interface Compiled {
  readonly n: number;
  /** Layer tops, km below the datum. */
  readonly tops: Float64Array;
  readonly vp: Float64Array;
  readonly vs: Float64Array;
  /** Head-wave names by layer index: 'P0', 'P1', ..., 'Pn' for the half-space (no string building per call). */
  readonly headP: readonly string[];
  readonly headS: readonly string[];
}

const compiledModels = new WeakMap<VelocityModel, Compiled>();

function compile(model: VelocityModel): Compiled {
  let c = compiledModels.get(model);
  if (c) return c;
  if (typeof model !== 'object' || model === null || !Array.isArray(model.layers)) {
    throw new TypeError('model must be a VelocityModel {layers: [...]}');
  }
  checkVelocityModel(model.layers, 'velocity model');
  const n = model.layers.length;
  const names = (w: Wave): string[] => Array.from({ length: n }, (_, m) => (m === n - 1 ? w + 'n' : w + m));
  c = { n, tops: new Float64Array(n), vp: new Float64Array(n), vs: new Float64Array(n), headP: names('P'), headS: names('S') };
  for (let i = 0; i < n; i++) {
    c.tops[i] = model.layers[i].topKm;
    c.vp[i] = model.layers[i].vp;
    c.vs[i] = model.layers[i].vs;
  }
  compiledModels.set(model, c);
  if (n > scratchH.length) {
    scratchH = new Float64Array(n);
    scratchR = new Float64Array(n);
    scratchQ = new Float64Array(n);
  }
  return c;
}

// Scratch, sized to the largest model seen: thickness of each layer on the path, speed ratio to
// the fastest layer on the path, and 1 - ratio^2.
let scratchH = new Float64Array(16);
let scratchR = new Float64Array(16);
let scratchQ = new Float64Array(16);

/** Index of the layer holding depth z (km); a depth on an interface belongs to the layer above. */
function layerOf(tops: Float64Array, n: number, z: number): number {
  let k = 0;
  while (k + 1 < n && tops[k + 1] < z) k++;
  return k;
}

const RAD = 180 / Math.PI;

/**
 * The fastest arrival of the given wave.
 * @param model layered model
 * @param wave 'P' or 'S'
 * @param epicentralKm horizontal distance source-receiver, km (>= 0)
 * @param sourceDepthKm source depth below the datum, km (negative = above the datum)
 * @param receiverElevKm receiver elevation above the datum, km (default 0; negative = below the datum)
 */
export function firstArrival(model: VelocityModel, wave: Wave, epicentralKm: number, sourceDepthKm: number, receiverElevKm = 0): TravelTime {
  return scan(blankArrival(), null, model, wave, epicentralKm, sourceDepthKm, receiverElevKm);
}

/** Largest |depth| or elevation accepted, km. */
export const MAX_DEPTH_KM = 1000;
/** Largest epicentral distance accepted, km (a flat model means little beyond a few hundred). */
export const MAX_DISTANCE_KM = 20000;

function checkArgs(wave: Wave, epicentralKm: number, sourceDepthKm: number, receiverElevKm: number): void {
  if (wave !== 'P' && wave !== 'S') throw new RangeError(`wave must be 'P' or 'S', got ${JSON.stringify(wave)}`);
  if (!(epicentralKm >= 0 && epicentralKm <= MAX_DISTANCE_KM)) {
    throw new RangeError(`epicentralKm must be in [0, ${MAX_DISTANCE_KM}] km, got ${epicentralKm}`);
  }
  if (!(Math.abs(sourceDepthKm) <= MAX_DEPTH_KM)) {
    throw new RangeError(`sourceDepthKm must be in [-${MAX_DEPTH_KM}, ${MAX_DEPTH_KM}] km, got ${sourceDepthKm}`);
  }
  if (!(Math.abs(receiverElevKm) <= MAX_DEPTH_KM)) {
    throw new RangeError(`receiverElevKm must be in [-${MAX_DEPTH_KM}, ${MAX_DEPTH_KM}] km, got ${receiverElevKm}`);
  }
}

/** As firstArrival, writing into `out` (no allocation; for loops that call it many times). Returns `out`. */
export function firstArrivalInto(out: TravelTime, model: VelocityModel, wave: Wave, epicentralKm: number, sourceDepthKm: number, receiverElevKm = 0): TravelTime {
  return scan(out, null, model, wave, epicentralKm, sourceDepthKm, receiverElevKm);
}

/**
 * Every arrival of the set described at the top that exists at this distance: the direct wave and
 * each head wave past its critical distance, fastest first (the first is firstArrival's). For
 * records that show later phases too (a regional event's Pg after Pn).
 */
export function allArrivals(model: VelocityModel, wave: Wave, epicentralKm: number, sourceDepthKm: number, receiverElevKm = 0): TravelTime[] {
  const list: TravelTime[] = [];
  scan(blankArrival(), list, model, wave, epicentralKm, sourceDepthKm, receiverElevKm);
  return list.sort((a, b) => a.time - b.time);
}

function blankArrival(): TravelTime {
  return { time: 0, phase: '', takeoffDeg: 0, incidenceDeg: 0, slownessH: 0, dTdDepth: 0 };
}

/** Writes the first arrival into `out`; when `list` is given, also pushes every arrival that exists onto it. */
function scan(out: TravelTime, list: TravelTime[] | null, model: VelocityModel, wave: Wave, epicentralKm: number, sourceDepthKm: number, receiverElevKm: number): TravelTime {
  const c = compile(model);
  checkArgs(wave, epicentralKm, sourceDepthKm, receiverElevKm);
  const v = wave === 'P' ? c.vp : c.vs;
  const heads = wave === 'P' ? c.headP : c.headS;
  const { n, tops } = c;
  const x = epicentralKm;
  const zs = sourceDepthKm;
  const zr = -receiverElevKm;
  const ks = layerOf(tops, n, zs);
  const kr = layerOf(tops, n, zr);
  const vsrc = v[ks];
  const vrcv = v[kr];

  // ---- direct wave
  solveDirect(c, v, x, zs, zr, ks, kr);
  let time = dTime;
  let p = dP;
  let cosS = dCosSrc; // cos of the ray's angle to the vertical at the source
  let cosR = dCosRcv;
  let phase: string = wave === 'P' ? 'Pg' : 'Sg';
  if (list) list.push(fillRay(blankArrival(), time, phase, p, 0, cosS, cosR, x, zs, zr, vsrc, vrcv));

  // ---- head waves along the tops of layers below both ends, and along the bases of layers above
  // both ends (only possible for a receiver below the datum under a faster layer)
  const kTop = ks < kr ? ks : kr;
  const kBot = ks < kr ? kr : ks;
  let vPath = 0;
  for (let i = kTop; i <= kBot; i++) if (v[i] > vPath) vPath = v[i];
  let headDir = 0; // 0 direct, 1 head wave below both ends, -1 above both ends
  let vFaster = vPath;
  for (let m = kBot + 1; m < n; m++) {
    const vm = v[m];
    if (vm > vFaster) {
      const t = headTime(tops, v, n, m, 1, x, zs, zr, kTop);
      if (list && t < Infinity) list.push(headRay(t, heads[m], vm, 1, x, zs, zr, vsrc, vrcv));
      if (t < time) {
        time = t;
        p = 1 / vm;
        phase = heads[m];
        headDir = 1;
      }
      vFaster = vm;
    }
  }
  vFaster = vPath;
  for (let m = kTop - 1; m >= 0; m--) {
    const vm = v[m];
    if (vm > vFaster) {
      const t = headTime(tops, v, n, m, -1, x, zs, zr, kBot);
      if (list && t < Infinity) list.push(headRay(t, heads[m], vm, -1, x, zs, zr, vsrc, vrcv));
      if (t < time) {
        time = t;
        p = 1 / vm;
        phase = heads[m];
        headDir = -1;
      }
      vFaster = vm;
    }
  }
  if (headDir !== 0) {
    cosS = Math.sqrt(1 - vsrc * vsrc * p * p);
    cosR = Math.sqrt(1 - vrcv * vrcv * p * p);
  }
  return fillRay(out, time, phase, p, headDir, cosS, cosR, x, zs, zr, vsrc, vrcv);
}

/** A head wave's arrival as a new object (for allArrivals). */
function headRay(t: number, phase: string, vm: number, dir: number, x: number, zs: number, zr: number, vsrc: number, vrcv: number): TravelTime {
  const p = 1 / vm;
  return fillRay(blankArrival(), t, phase, p, dir, Math.sqrt(1 - vsrc * vsrc * p * p), Math.sqrt(1 - vrcv * vrcv * p * p), x, zs, zr, vsrc, vrcv);
}

/**
 * Writes an arrival's time, name, ray parameter, angles and depth derivative. headDir: 0 direct, 1
 * head wave below both ends, -1 above; cosS, cosR: cosines of the ray's angle to the vertical at the
 * source and the receiver. A head wave goes toward its refractor; the direct wave goes up when the
 * source is the deeper end.
 */
function fillRay(out: TravelTime, time: number, phase: string, p: number, headDir: number, cosS: number, cosR: number,
  x: number, zs: number, zr: number, vsrc: number, vrcv: number): TravelTime {
  const head = headDir !== 0;
  const sinS = p * vsrc;
  const sinR = p * vrcv;
  const up = head ? headDir < 0 : zs > zr;
  const angS = Math.atan2(sinS, cosS) * RAD;
  const angR = Math.atan2(sinR, cosR) * RAD;
  out.time = time;
  out.phase = phase;
  out.slownessH = p;
  if (up) {
    out.takeoffDeg = 180 - angS;
    out.incidenceDeg = headDir < 0 ? 180 - angR : angR;
    out.dTdDepth = cosS / vsrc;
  } else if (!head && zs === zr) {
    // Both ends at one depth: the ray runs horizontally (or, at x = 0, the limit from above: down).
    out.takeoffDeg = x > 0 ? 90 : 0;
    out.incidenceDeg = x > 0 ? 90 : 180;
    out.dTdDepth = x > 0 ? 0 : -1 / vsrc;
  } else {
    out.takeoffDeg = angS;
    out.incidenceDeg = headDir > 0 ? angR : 180 - angR;
    out.dTdDepth = -cosS / vsrc;
  }
  return out;
}

/**
 * Time of the head wave running in layer m, or Infinity before its critical distance. dir = 1: along
 * the top of m, below both ends (legs go down through layers kEnd..m-1, kEnd the shallower end's
 * layer); dir = -1: along the base of m, above both ends (legs go up through m+1..kEnd, kEnd the
 * deeper end's layer). Time = x/v_m + sum h_i sqrt(1/v_i^2 - 1/v_m^2) over both legs, from the
 * critical distance sum h_i tan(i_i) on (Stein & Wysession 2003, section 3.2).
 */
function headTime(tops: Float64Array, v: Float64Array, n: number, m: number, dir: number, x: number, zs: number, zr: number, kEnd: number): number {
  const pm = 1 / v[m];
  const pm2 = pm * pm;
  let tau = 0;
  let xc = 0;
  const iFrom = dir > 0 ? kEnd : m + 1;
  const iTo = dir > 0 ? m - 1 : kEnd;
  for (let i = iFrom; i <= iTo; i++) {
    const top = i === 0 ? -Infinity : tops[i];
    const bottom = i === n - 1 ? Infinity : tops[i + 1];
    // Thickness of layer i on the source's leg plus on the receiver's leg.
    let hs: number;
    let hr: number;
    if (dir > 0) {
      hs = bottom - (zs > top ? zs : top);
      hr = bottom - (zr > top ? zr : top);
    } else {
      hs = (zs < bottom ? zs : bottom) - top;
      hr = (zr < bottom ? zr : bottom) - top;
    }
    const h = (hs > 0 ? hs : 0) + (hr > 0 ? hr : 0);
    if (h > 0) {
      const eta = Math.sqrt(1 / (v[i] * v[i]) - pm2);
      tau += h * eta;
      xc += h / eta;
    }
  }
  return x >= xc * pm ? x * pm + tau : Infinity;
}

// Results of solveDirect (module-level so the hot path allocates nothing).
let dTime = 0;
let dP = 0;
let dCosSrc = 1;
let dCosRcv = 1;

/**
 * The direct ray between depths zs and zr at epicentral distance x. Sets dTime, dP and the cosines
 * of the ray's angle to the vertical at the source and at the receiver.
 *
 * With the layers between the two depths of thickness h_i and speed v_i, and vmax the fastest of
 * them, the ray is parameterised by t = tan of its angle in the fastest layer (s = sin of that angle
 * = p vmax, r_i = v_i / vmax):
 *   X(t) = hmax t + sum_{others} h_i r_i s / c_i,   c_i = sqrt(1 - r_i^2 s^2) = sqrt((1 - r_i^2) + r_i^2 / (1 + t^2)),
 *   T(t) = hmax sqrt(1 + t^2) / vmax + sum_{others} h_i / (v_i c_i).
 * X grows about linearly in t for near-horizontal rays (unlike X(p), which has a pole), the last
 * form of c_i avoids cancellation there, and X(t) = x lies in [x / H, x / hmax] (H = total
 * thickness), so Newton's method safeguarded by bisection in that bracket converges in a few steps.
 * When the fastest layer has zero thickness (a point exactly at the bottom of a fast layer above a
 * slower one), X is bounded; past the bound the ray runs horizontally along that interface at vmax.
 * After convergence the time is corrected to first order, T + p (x - X), which leaves an error
 * second order in the residual distance.
 */
function solveDirect(c: Compiled, v: Float64Array, x: number, zs: number, zr: number, ks: number, kr: number): void {
  const { tops } = c;
  const zTop = zs < zr ? zs : zr;
  const zBot = zs < zr ? zr : zs;
  const kTop = ks < kr ? ks : kr;
  const kBot = ks < kr ? kr : ks;
  const h = scratchH;
  const r = scratchR;
  const q = scratchQ;
  let vmax = 0;
  for (let i = kTop; i <= kBot; i++) if (v[i] > vmax) vmax = v[i];
  let H = 0;
  let hmax = 0;
  let t0 = 0; // vertical time
  for (let i = kTop; i <= kBot; i++) {
    const top = i === kTop ? zTop : tops[i];
    const bottom = i === kBot ? zBot : tops[i + 1];
    const hi = bottom - top;
    h[i] = hi > 0 ? hi : 0;
    r[i] = v[i] / vmax;
    q[i] = (vmax - v[i]) * (vmax + v[i]) / (vmax * vmax);
    H += h[i];
    if (v[i] === vmax) hmax += h[i];
    t0 += h[i] / v[i];
  }
  if (x === 0 || H === 0) {
    if (x === 0) {
      dTime = t0; dP = 0; dCosSrc = 1; dCosRcv = 1;
    } else {
      dTime = x / vmax; dP = 1 / vmax; dCosSrc = 0; dCosRcv = 0;
    }
    return;
  }
  if (hmax > 0) {
    let lo = x / H;
    let hi = x / hmax;
    let t = lo;
    const tol = 1e-12 * (x + H);
    let X = 0;
    for (let iter = 0; iter < 100; iter++) {
      const u = 1 / (1 + t * t); // cos^2 in the fastest layer
      const s = t * Math.sqrt(u);
      const ds = u * Math.sqrt(u);
      X = hmax * t;
      let dX = hmax;
      for (let i = kTop; i <= kBot; i++) {
        if (v[i] === vmax || h[i] === 0) continue;
        const ri = r[i];
        const ci = Math.sqrt(q[i] + ri * ri * u);
        X += h[i] * ri * s / ci;
        dX += h[i] * ri / (ci * ci * ci) * ds;
      }
      const g = X - x;
      if (Math.abs(g) <= tol) break;
      if (g < 0) lo = t; else hi = t;
      let tn = t - g / dX;
      if (!(tn > lo && tn < hi)) tn = 0.5 * (lo + hi);
      if (tn === t) break;
      t = tn;
    }
    const u = 1 / (1 + t * t);
    const s = t * Math.sqrt(u);
    let T = hmax / (vmax * Math.sqrt(u));
    for (let i = kTop; i <= kBot; i++) {
      if (v[i] === vmax || h[i] === 0) continue;
      T += h[i] / (v[i] * Math.sqrt(q[i] + r[i] * r[i] * u));
    }
    const p = s / vmax;
    dTime = T + p * (x - X);
    dP = p;
    dCosSrc = Math.sqrt(q[ks] + r[ks] * r[ks] * u);
    dCosRcv = Math.sqrt(q[kr] + r[kr] * r[kr] * u);
    return;
  }
  // The fastest layer on the path has zero thickness: X(s) = sum h_i r_i s / sqrt(1 - r_i^2 s^2),
  // all r_i < 1 where h_i > 0, increasing and convex on [0, 1].
  let Xinf = 0;
  let Tinf = 0;
  for (let i = kTop; i <= kBot; i++) {
    if (h[i] === 0) continue;
    const sq = Math.sqrt(q[i]);
    Xinf += h[i] * r[i] / sq;
    Tinf += h[i] / (v[i] * sq);
  }
  if (x >= Xinf) {
    dTime = Tinf + (x - Xinf) / vmax;
    dP = 1 / vmax;
    dCosSrc = Math.sqrt(q[ks]);
    dCosRcv = Math.sqrt(q[kr]);
    return;
  }
  let lo = 0;
  let hi = 1;
  let s = x / Xinf;
  const tol = 1e-12 * (x + H);
  let X = 0;
  for (let iter = 0; iter < 100; iter++) {
    X = 0;
    let dX = 0;
    for (let i = kTop; i <= kBot; i++) {
      if (h[i] === 0) continue;
      const ri = r[i];
      const ci = Math.sqrt(1 - ri * ri * s * s);
      X += h[i] * ri * s / ci;
      dX += h[i] * ri / (ci * ci * ci);
    }
    const g = X - x;
    if (Math.abs(g) <= tol) break;
    if (g < 0) lo = s; else hi = s;
    let sn = s - g / dX;
    if (!(sn > lo && sn < hi)) sn = 0.5 * (lo + hi);
    if (sn === s) break;
    s = sn;
  }
  let T = 0;
  for (let i = kTop; i <= kBot; i++) {
    if (h[i] === 0) continue;
    T += h[i] / (v[i] * Math.sqrt(1 - r[i] * r[i] * s * s));
  }
  const p = s / vmax;
  dTime = T + p * (x - X);
  dP = p;
  dCosSrc = Math.sqrt(1 - r[ks] * r[ks] * s * s);
  dCosRcv = Math.sqrt(1 - r[kr] * r[kr] * s * s);
}
