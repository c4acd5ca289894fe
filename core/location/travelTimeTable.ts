/**
 * A precomputed first-arrival travel-time table on a (epicentral distance x source depth) grid,
 * read by bilinear interpolation: for the coarse grid search that starts Geiger's method, where
 * thousands of trial hypocentres need approximate times quickly.
 */
import { firstArrival, type Wave } from './travelTime';
import type { VelocityModel } from './velocityModel';

export interface TravelTimeTableGrid {
  /** Largest distance tabulated, km; beyond it the last slope is extended. */
  maxDistanceKm: number;
  /** Distance step, km. */
  distanceStepKm: number;
  /** Source depths tabulated, km below the datum, increasing; outside them the nearest is used. */
  depthsKm: readonly number[];
  /** Receiver elevation the table is for, km above the datum (default 0). */
  receiverElevKm?: number;
}

/**
 * The grid the location code's start uses at a distance scale of 400 km: 1 km steps to 400 km,
 * depths from 4 km above the datum to 60 km. startTable scales it to smaller networks.
 */
export const START_TABLE_GRID: TravelTimeTableGrid = Object.freeze({
  maxDistanceKm: 400,
  distanceStepKm: 1,
  depthsKm: Object.freeze([-4, -3, -2, -1.5, -1, -0.75, -0.5, -0.25, 0, 2, 4, 6, 8, 10, 13, 16, 20, 25, 30, 35, 40, 50, 60]),
});

/**
 * START_TABLE_GRID scaled to distances up to scaleKm: the distance step and the depths below the
 * datum shrink in proportion (a mine's network of a few hundred metres needs metres, not km); the
 * depths above the datum stay as they are (they follow the topography, not the network's size).
 */
export function startTableGrid(scaleKm: number): TravelTimeTableGrid {
  const f = scaleKm / START_TABLE_GRID.maxDistanceKm;
  const above = START_TABLE_GRID.depthsKm.filter((z) => z < 0);
  const below = START_TABLE_GRID.depthsKm.filter((z) => z >= 0).map((z) => z * f);
  return { maxDistanceKm: scaleKm, distanceStepKm: START_TABLE_GRID.distanceStepKm * f, depthsKm: [...above, ...below] };
}

export class TravelTimeTable {
  readonly wave: Wave;
  readonly distanceStepKm: number;
  readonly maxDistanceKm: number;
  readonly nDistances: number;
  readonly depthsKm: Float64Array;
  /** Times, s, row per depth: times[iz * nDistances + ix]. */
  readonly times: Float64Array;

  constructor(model: VelocityModel, wave: Wave, grid: TravelTimeTableGrid) {
    const { maxDistanceKm, distanceStepKm, depthsKm } = grid;
    if (!(distanceStepKm > 0 && distanceStepKm <= maxDistanceKm)) {
      throw new RangeError(`distanceStepKm must be in (0, maxDistanceKm = ${maxDistanceKm}], got ${distanceStepKm}`);
    }
    if (depthsKm.length < 1 || depthsKm.some((d, i) => !Number.isFinite(d) || (i > 0 && !(d > depthsKm[i - 1])))) {
      throw new RangeError(`depthsKm must be finite and increasing, got [${depthsKm.join(', ')}]`);
    }
    const nx = Math.round(maxDistanceKm / distanceStepKm) + 1;
    if (nx > 1e6 || nx * depthsKm.length > 1e7) throw new RangeError(`table of ${nx} x ${depthsKm.length} nodes is too large (at most 1e7)`);
    this.wave = wave;
    this.distanceStepKm = distanceStepKm;
    this.maxDistanceKm = (nx - 1) * distanceStepKm;
    this.nDistances = nx;
    this.depthsKm = Float64Array.from(depthsKm);
    this.times = new Float64Array(nx * depthsKm.length);
    const elev = grid.receiverElevKm ?? 0;
    for (let iz = 0; iz < depthsKm.length; iz++) {
      for (let ix = 0; ix < nx; ix++) this.times[iz * nx + ix] = firstArrival(model, wave, ix * distanceStepKm, depthsKm[iz], elev).time;
    }
  }

  /** Interpolated travel time, s, at a distance (km, >= 0) and source depth (km). No argument checks (inner loops). */
  time(distanceKm: number, depthKm: number): number {
    const nx = this.nDistances;
    const zs = this.depthsKm;
    const nz = zs.length;
    let iz = 0;
    let fz = 0;
    if (depthKm <= zs[0] || nz === 1) {
      iz = 0;
    } else if (depthKm >= zs[nz - 1]) {
      iz = nz - 1;
    } else {
      while (zs[iz + 1] < depthKm) iz++;
      fz = (depthKm - zs[iz]) / (zs[iz + 1] - zs[iz]);
    }
    const u = distanceKm / this.distanceStepKm;
    let ix = Math.floor(u);
    if (ix > nx - 2) ix = nx - 2;
    if (ix < 0) ix = 0;
    const fx = u - ix; // > 1 beyond the table: the last segment's slope extended
    const t = this.times;
    const r0 = iz * nx + ix;
    const a = t[r0] + fx * (t[r0 + 1] - t[r0]);
    if (fz === 0) return a;
    const r1 = r0 + nx;
    const b = t[r1] + fx * (t[r1 + 1] - t[r1]);
    return a + fz * (b - a);
  }
}

const cache = new WeakMap<VelocityModel, Map<string, TravelTimeTable>>();

/** Distance scales startTable builds tables for, km (each table is built once per model and kept). */
export const START_TABLE_SCALES_KM: readonly number[] = Object.freeze([1, 4, 16, 64, 200, 400, 1600]);

/**
 * The start table of a model and wave (receiver at the datum) for the smallest scale in
 * START_TABLE_SCALES_KM that reaches `distanceKm` (default 400 km), built once per model and kept.
 */
export function startTable(model: VelocityModel, wave: Wave, distanceKm = 400): TravelTimeTable {
  let scale = START_TABLE_SCALES_KM[START_TABLE_SCALES_KM.length - 1];
  for (const s of START_TABLE_SCALES_KM) {
    if (s >= distanceKm) {
      scale = s;
      break;
    }
  }
  let m = cache.get(model);
  if (!m) {
    m = new Map();
    cache.set(model, m);
  }
  const key = `${wave} ${scale}`;
  let t = m.get(key);
  if (!t) {
    t = new TravelTimeTable(model, wave, startTableGrid(scale));
    m.set(key, t);
  }
  return t;
}
