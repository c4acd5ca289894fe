/**
 * Earthquake location by Geiger's method (Geiger 1910/1912): iterative linearised least squares for
 * origin time, epicentre and depth, started from a coarse grid search.
 *
 * - Coordinates: the local azimuthal equidistant projection of projection.ts, centred on the mean
 *   position of the stations used; depths below the model datum (velocityModel.ts).
 * - Data: P and S pick times, each weighted by 1 / sigma^2 with sigma its stated 1-sigma timing
 *   uncertainty; picks whose time tag is questionable get sigma x QUESTIONABLE_FACTOR (or are left
 *   out, as the caller chooses); picks marked not used only get a residual.
 * - Starts: grid search over a box around the stations (grown for events outside the network) and
 *   a set of depths, with times from a precomputed table scaled to the box (travelTimeTable.ts;
 *   station elevation added as a vertical path through the top layer), origin time the weighted
 *   median of the observed-minus-computed times and misfit the weighted L1 norm, so one wild pick
 *   cannot steer the start. The best nodes at the three best-fitting depths are each refined and
 *   iterated from; the converged solution with the lowest misfit wins (first-arrival misfits have
 *   kinks where the first phase changes and at interfaces, which can hold one local search).
 * - Iteration: the weighted Jacobian G (rows [1, dT/de, dT/dn, dT/dz] / sigma) is decomposed by SVD
 *   (ml-matrix) and the step is the damped solution sum_j v_j s_j / (s_j^2 + lambda^2) (u_j . r);
 *   lambda is adapted Levenberg-Marquardt fashion (by the ratio of the actual to the predicted
 *   decrease of the misfit; a step that does not lower it is retried with more damping). Damping
 *   only shortens steps: the converged point,
 *   where G^T r = 0, is the undamped least-squares solution. Depth is kept within [min, max].
 *   Converged when a step moves the hypocentre less than 1 mm and the origin time less than 1 us, when
 *   no step lowers the misfit, or when five steps in a row lower it by under 1e-9 of itself.
 * - Errors: the a-priori covariance C0 = (G^T W G)^-1 = V S^-2 V^T from the pick uncertainties as
 *   stated, widened when the residuals say those uncertainties were too small: C = f C0 with the
 *   a-posteriori variance factor (reduced chi-square) f = chi2 / (N - M) = sum (r_i / sigma_i)^2 /
 *   (N - M), applied when it exceeds 1 (so one bad pick that leaves a residual of a second widens
 *   the ellipse; errors are never made smaller than the stated uncertainties give). The factor is
 *   the estimate of the unit-weight variance of weighted least squares (Press, Teukolsky,
 *   Vetterling & Flannery, Numerical Recipes, 2nd ed. 1992, section 15.1: with the model assumed
 *   to fit, sigma^2 is estimated from the misfit as sum (y_i - y(x_i))^2 / (N - M); Bevington &
 *   Robinson, Data Reduction and Error Analysis for the Physical Sciences, 3rd ed. 2003, on the
 *   reduced chi-square; both from memory, no page checked). scipy.optimize.curve_fit with
 *   absolute_sigma=False applies the same factor without the floor (the test compares with it). Using it only when above 1 is common practice in earthquake location (a-priori errors
 *   as a floor). With no degrees of freedom (N = M) there is no estimate and C = C0.
 *   `varianceFactor`, `errorsScaled` and `errorScale` report what was done. Standard errors are
 *   sqrt(diag C); the 68 % epicentral ellipse has semi-axes ELLIPSE_68_SCALE = 1.515 times the
 *   square roots of the eigenvalues of C's east-north block (two degrees of freedom, see below);
 *   the depth error is 1 sigma (68.3 % for one parameter).
 */
import { SingularValueDecomposition, Matrix } from 'ml-matrix';
import type { Micros } from '../time';
import { firstArrivalInto, type TravelTime, type Wave } from './travelTime';
import { startTable, type TravelTimeTable } from './travelTimeTable';
import { DEFAULT_MODEL, type VelocityModel } from './velocityModel';
import { fromLocalKm, kmToDegrees, localProjection, toLocalKm } from './projection';

/**
 * Scale from the 1-sigma axes of a 2-D normal's covariance ellipse to its 68.27 % region:
 * sqrt(chi-square quantile for 2 degrees of freedom at 0.6827) = sqrt(-2 ln(1 - 0.6827)) = 1.5152
 * (chi-square with 2 dof has CDF 1 - exp(-x/2); Press et al., Numerical Recipes, 2nd ed. 1992,
 * section 15.6, table of delta-chi-square: 2.30 for 68.3 % and 2 parameters; from memory).
 */
export const ELLIPSE_68_CONFIDENCE = 0.6827;
export const ELLIPSE_68_SCALE = Math.sqrt(-2 * Math.log(1 - ELLIPSE_68_CONFIDENCE));

/** Multiplier of the uncertainty of a pick whose time tag is questionable (common practice: a few times). */
export const QUESTIONABLE_FACTOR = 3;
/** Fewest used phases that give a location (four unknowns). */
export const MIN_PHASES = 4;

export interface LocationStation {
  /** The key picks name the station by (e.g. "NET.STA"). */
  key: string;
  latDeg: number;
  lonDeg: number;
  /** Elevation above the model datum, km. */
  elevKm: number;
}

export interface LocationPick {
  stationKey: string;
  wave: Wave;
  /** Pick time, integer microseconds since the epoch. */
  time: Micros;
  /** 1-sigma timing uncertainty, s (> 0). */
  uncertaintyS: number;
  /** false: left out of the solution, only its residual is reported. Default true. */
  use?: boolean;
  /** The time tag is questionable (clock flags): down-weighted or left out, see GeigerOptions. */
  timingQuestionable?: boolean;
}

export interface GeigerOptions {
  /** Default DEFAULT_MODEL. */
  model?: VelocityModel;
  /** Hold the depth at this value (km below the datum): "operator assigned" depth. */
  fixedDepthKm?: number;
  /** What to do with picks whose timing is questionable. Default 'downweight' (sigma x QUESTIONABLE_FACTOR). */
  questionableTiming?: 'downweight' | 'exclude';
  /** Default 50. */
  maxIterations?: number;
  /** Shallowest depth allowed, km (default: the highest used station's elevation, as a negative depth). */
  minDepthKm?: number;
  /** Deepest depth allowed, km (default 100). */
  maxDepthKm?: number;
  /**
   * 'a-posteriori' (default): the covariance is multiplied by the variance factor chi2 / dof when
   * that exceeds 1; 'a-priori': the pick uncertainties as stated, never rescaled.
   */
  errors?: 'a-posteriori' | 'a-priori';
}

export interface ErrorEllipse {
  /** Semi-axes, km, at `confidence`. */
  semiMajorKm: number;
  semiMinorKm: number;
  /** Azimuth of the major axis, degrees clockwise from north, in [0, 180). */
  majorAzimuthDeg: number;
  /** 0.6827. */
  confidence: number;
}

export interface ArrivalResidual {
  /** Index of the pick in the input. */
  pickIndex: number;
  stationKey: string;
  wave: Wave;
  /** The computed first arrival's name ('Pg', 'Pn', 'S1', ...). */
  phase: string;
  used: boolean;
  /** Observed minus computed time, s. */
  residualS: number;
  /** Relative weight in the solution, 0 to 1 (1 for the best-timed used picks, 0 when not used). */
  weight: number;
  /** Epicentral distance, km and degrees of arc. */
  distanceKm: number;
  distanceDeg: number;
  /** From the epicentre to the station, degrees clockwise from north. */
  azimuthDeg: number;
  takeoffDeg: number;
}

export interface Hypocentre {
  originTime: Micros;
  latDeg: number;
  lonDeg: number;
  /** km below the datum. */
  depthKm: number;
  depthFixed: boolean;
  /** RMS of the used picks' residuals, s. */
  rmsS: number;
  /** Sum of squared residuals over sigma^2, and its degrees of freedom (used phases - unknowns). */
  chi2: number;
  dof: number;
  /** A-posteriori variance factor (reduced chi-square) chi2 / dof; NaN when dof is 0. */
  varianceFactor: number;
  /** Whether the covariance was multiplied by varianceFactor (it exceeded 1 and errors were 'a-posteriori'). */
  errorsScaled: boolean;
  /**
   * What the standard errors and the ellipse axes were multiplied by: sqrt(varianceFactor) when
   * errorsScaled, else 1. Dividing by it gives the a-priori errors.
   */
  errorScale: number;
  /** 1-sigma errors (after any scaling): origin time s; east, north and depth km (depth NaN when fixed). */
  originTimeErrorS: number;
  eastErrorKm: number;
  northErrorKm: number;
  depthErrorKm: number;
  ellipse: ErrorEllipse;
  /** Largest azimuth range without a used station, degrees. */
  gapDeg: number;
  phaseCount: number;
  stationCount: number;
  /** Geiger iterations, summed over the starts tried. */
  iterations: number;
  /** One per input pick, in input order. */
  arrivals: ArrivalResidual[];
  /** Covariance (after any scaling) of [origin time s, east km, north km, depth km] (3 x 3 without depth when fixed), row-major. */
  covariance: number[][];
}

export type LocateFailure = 'too-few-phases' | 'did-not-converge' | 'ill-conditioned';
export type LocateResult = { ok: true; value: Hypocentre } | { ok: false; code: LocateFailure; message: string };

const RAD = Math.PI / 180;

/** Locates an event from its picks. Bad arguments throw; an event that cannot be located returns {ok: false}. */
export function locate(stations: readonly LocationStation[], picks: readonly LocationPick[], options: GeigerOptions = {}): LocateResult {
  const model = options.model ?? DEFAULT_MODEL;
  const maxIterations = options.maxIterations ?? 50;
  if (!(Number.isInteger(maxIterations) && maxIterations >= 1 && maxIterations <= 1000)) {
    throw new RangeError(`maxIterations must be an integer in [1, 1000], got ${maxIterations}`);
  }
  const errorMode = options.errors ?? 'a-posteriori';
  if (errorMode !== 'a-posteriori' && errorMode !== 'a-priori') throw new RangeError(`errors must be 'a-posteriori' or 'a-priori', got ${JSON.stringify(options.errors)}`);
  const fixed = options.fixedDepthKm !== undefined;
  if (fixed && !(Math.abs(options.fixedDepthKm as number) <= 1000)) {
    throw new RangeError(`fixedDepthKm must be in [-1000, 1000] km, got ${options.fixedDepthKm}`);
  }
  const byKey = new Map<string, LocationStation>();
  for (const s of stations) {
    if (!(s.latDeg >= -90 && s.latDeg <= 90 && s.lonDeg >= -180 && s.lonDeg <= 360 && Math.abs(s.elevKm) <= 10)) {
      throw new RangeError(`station ${s.key}: latitude in [-90, 90], longitude in [-180, 360] degrees and elevation in [-10, 10] km required, got (${s.latDeg}, ${s.lonDeg}, ${s.elevKm})`);
    }
    byKey.set(s.key, s);
  }
  const exclude = options.questionableTiming === 'exclude';
  const n = picks.length;
  const used: boolean[] = [];
  const sigma = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = picks[i];
    if (!byKey.has(p.stationKey)) throw new RangeError(`pick ${i}: station "${p.stationKey}" is not among the stations given`);
    if (p.wave !== 'P' && p.wave !== 'S') throw new RangeError(`pick ${i}: wave must be 'P' or 'S', got ${JSON.stringify(p.wave)}`);
    if (!Number.isSafeInteger(p.time)) throw new RangeError(`pick ${i}: time must be integer microseconds, got ${p.time}`);
    if (!(p.uncertaintyS > 0 && p.uncertaintyS <= 100)) throw new RangeError(`pick ${i}: uncertaintyS must be in (0, 100] s, got ${p.uncertaintyS}`);
    sigma[i] = p.uncertaintyS * (p.timingQuestionable ? QUESTIONABLE_FACTOR : 1);
    used.push(p.use !== false && !(exclude && p.timingQuestionable));
  }
  const idx = used.flatMap((u, i) => (u ? [i] : []));
  const m = idx.length;
  if (m < MIN_PHASES) {
    return { ok: false, code: 'too-few-phases', message: `${m} usable phase${m === 1 ? '' : 's'}; at least ${MIN_PHASES} are needed to locate (origin time, latitude, longitude, depth)` };
  }

  // Local frame: origin at the mean position of the used stations.
  const usedStations = [...new Set(idx.map((i) => picks[i].stationKey))].map((k) => byKey.get(k) as LocationStation);
  const lon0 = usedStations[0].lonDeg;
  const wrap = (lon: number): number => lon0 + ((((lon - lon0) % 360) + 540) % 360) - 180;
  const proj = localProjection(
    usedStations.reduce((a, s) => a + s.latDeg, 0) / usedStations.length,
    wrap(usedStations.reduce((a, s) => a + wrap(s.lonDeg), 0) / usedStations.length),
  );
  const se = new Float64Array(n);
  const sn = new Float64Array(n);
  const sz = new Float64Array(n); // station elevation, km
  const xy = [0, 0];
  for (let i = 0; i < n; i++) {
    const s = byKey.get(picks[i].stationKey) as LocationStation;
    toLocalKm(proj, s.latDeg, wrap(s.lonDeg), xy);
    se[i] = xy[0];
    sn[i] = xy[1];
    sz[i] = s.elevKm;
  }
  let tRef = Infinity;
  for (const i of idx) tRef = Math.min(tRef, picks[i].time);
  const obs = new Float64Array(n);
  for (let i = 0; i < n; i++) obs[i] = (picks[i].time - tRef) / 1e6;
  const maxElev = Math.max(...usedStations.map((s) => s.elevKm));
  const minDepth = options.minDepthKm ?? -maxElev;
  const maxDepth = options.maxDepthKm ?? 100;
  if (!(minDepth < maxDepth)) throw new RangeError(`minDepthKm (${minDepth}) must be below maxDepthKm (${maxDepth})`);
  const zFixed = fixed ? (options.fixedDepthKm as number) : NaN;

  // ---- starts: grid search (the best node at each of up to three depths)
  const starts = gridStarts(model, idx, picks, se, sn, sz, obs, sigma, fixed ? [zFixed] : null, minDepth, maxDepth);

  // ---- Geiger iterations (Levenberg-Marquardt damped SVD steps) from each start; the lowest misfit wins
  const np = fixed ? 3 : 4;
  const tt: TravelTime = { time: 0, phase: '', takeoffDeg: 0, incidenceDeg: 0, slownessH: 0, dTdDepth: 0 };
  const J = new Matrix(m, np);
  const rw = new Float64Array(m);
  const evaluate = (p: number[], jac: boolean): number => {
    let chi2 = 0;
    for (let k = 0; k < m; k++) {
      const i = idx[k];
      const de = p[1] - se[i];
      const dn = p[2] - sn[i];
      const d = Math.sqrt(de * de + dn * dn);
      firstArrivalInto(tt, model, picks[i].wave, d, p[3], sz[i]);
      const r = (obs[i] - p[0] - tt.time) / sigma[i];
      rw[k] = r;
      chi2 += r * r;
      if (jac) {
        const w = 1 / sigma[i];
        J.set(k, 0, w);
        J.set(k, 1, d > 0 ? w * tt.slownessH * de / d : 0);
        J.set(k, 2, d > 0 ? w * tt.slownessH * dn / d : 0);
        if (!fixed) J.set(k, 3, w * tt.dTdDepth);
      }
    }
    return chi2;
  };
  const limitKm = 2000;
  const trial = [0, 0, 0, 0];
  const ur = new Float64Array(np);
  /** Iterates from a start; returns the end point, its misfit, and whether it converged or ran off. */
  const iterate = (start: Start): { par: number[]; chi2: number; converged: boolean; ranOff: boolean; iterations: number } => {
    const par = [start.t0, start.e, start.n, fixed ? zFixed : start.z];
    let chi2 = evaluate(par, true);
    let mu = 1e-3;
    let converged = false;
    let stalls = 0;
    let iterations = 0;
    for (; iterations < maxIterations && !converged; iterations++) {
      const svd = new SingularValueDecomposition(J, { autoTranspose: true });
      const s = svd.diagonal;
      const U = svd.leftSingularVectors;
      const V = svd.rightSingularVectors;
      const smax = s[0];
      for (let j = 0; j < np; j++) {
        let a = 0;
        for (let k = 0; k < m; k++) a += U.get(k, j) * rw[k];
        ur[j] = a;
      }
      let accepted = false;
      while (!accepted) {
        const lam2 = mu * smax * smax;
        // misfit decrease the linearised problem predicts for this step: sum ur_j^2 (1 - (lam2 / (s_j^2 + lam2))^2)
        let predicted = 0;
        for (let q = 0; q < 4; q++) trial[q] = par[q];
        for (let j = 0; j < np; j++) {
          const f = lam2 / (s[j] * s[j] + lam2);
          predicted += ur[j] * ur[j] * (1 - f * f);
        }
        for (let q = 0; q < np; q++) {
          let d = 0;
          for (let j = 0; j < np; j++) d += V.get(q, j) * (s[j] / (s[j] * s[j] + lam2)) * ur[j];
          trial[q] += d;
        }
        if (!fixed) trial[3] = Math.min(maxDepth, Math.max(minDepth, trial[3]));
        const stepT = Math.abs(trial[0] - par[0]);
        const stepPos = Math.max(Math.abs(trial[1] - par[1]), Math.abs(trial[2] - par[2]), Math.abs(trial[3] - par[3]));
        if (!(Math.hypot(trial[1], trial[2]) < limitKm) || !Number.isFinite(trial[0])) {
          return { par, chi2, converged: false, ranOff: true, iterations: iterations + 1 };
        }
        const c2 = evaluate(trial, false);
        if (c2 <= chi2) {
          // Gain ratio (actual over predicted decrease) steers the damping (Levenberg-Marquardt, as in
          // Madsen, Nielsen & Tingleff 2004, Methods for non-linear least squares problems, section 3.2; from memory).
          const rho = predicted > 0 ? (chi2 - c2) / predicted : 1;
          if (rho > 0.75) mu = Math.max(mu / 3, 1e-15);
          else if (rho < 0.25) mu *= 2;
          const gain = chi2 - c2;
          for (let q = 0; q < 4; q++) par[q] = trial[q];
          chi2 = c2;
          accepted = true;
          if (stepPos < 1e-6 && stepT < 1e-6) converged = true;
          // Creeping: five steps in a row that each lower the misfit by under 1e-9 of itself.
          stalls = gain <= 1e-9 * chi2 ? stalls + 1 : 0;
          if (stalls >= 5) converged = true;
        } else {
          mu *= 10;
          if (mu > 1e15) {
            // No step lowers the misfit any more: a minimum to machine precision.
            converged = true;
            break;
          }
        }
      }
      chi2 = evaluate(par, true);
    }
    return { par, chi2, converged, ranOff: false, iterations };
  };
  let best: ReturnType<typeof iterate> | null = null;
  let firstFailure: ReturnType<typeof iterate> | null = null;
  let iterations = 0;
  for (const st of starts) {
    const r = iterate(st);
    iterations += r.iterations;
    if (r.converged && (best === null || r.chi2 < best.chi2)) best = r;
    if (!r.converged && firstFailure === null) firstFailure = r;
  }
  if (best === null) {
    const f = firstFailure as ReturnType<typeof iterate>;
    evaluate(f.par, false);
    let sumR2 = 0;
    for (let k = 0; k < m; k++) sumR2 += (rw[k] * sigma[idx[k]]) ** 2;
    if (f.ranOff) {
      return { ok: false, code: 'did-not-converge', message: `the solution ran off beyond ${limitKm} km from the network after ${f.iterations} iterations` };
    }
    return {
      ok: false, code: 'did-not-converge',
      message: `no convergence in ${maxIterations} iterations (still moving ${Math.hypot(f.par[1], f.par[2]).toFixed(2)} km from the network's centre, depth ${f.par[3].toFixed(2)} km, RMS ${Math.sqrt(sumR2 / m).toFixed(3)} s)`,
    };
  }
  const par = best.par;
  const chi2 = evaluate(par, true); // also leaves J at the solution

  // ---- errors from the undamped SVD at the solution
  const svd = new SingularValueDecomposition(J, { autoTranspose: true });
  const s = svd.diagonal;
  const V = svd.rightSingularVectors;
  if (!(s[np - 1] > 1e-10 * s[0])) {
    return { ok: false, code: 'ill-conditioned', message: `the stations and phases do not constrain all ${np} unknowns (singular values ${s.map((x) => x.toPrecision(3)).join(', ')})` };
  }
  // a-posteriori variance factor: the reduced chi-square of the weighted residuals
  const dof = m - np;
  const varianceFactor = dof > 0 ? chi2 / dof : NaN;
  const errorsScaled = errorMode === 'a-posteriori' && varianceFactor > 1;
  const appliedFactor = errorsScaled ? varianceFactor : 1;
  const cov: number[][] = [];
  for (let a = 0; a < np; a++) {
    cov.push([]);
    for (let b = 0; b < np; b++) {
      let c = 0;
      for (let j = 0; j < np; j++) c += V.get(a, j) * V.get(b, j) / (s[j] * s[j]);
      cov[a].push(appliedFactor * c);
    }
  }
  const ee = cov[1][1];
  const nn = cov[2][2];
  const en = cov[1][2];
  const half = 0.5 * (ee + nn);
  const rad = Math.hypot(0.5 * (ee - nn), en);
  const l1 = half + rad;
  const l2 = Math.max(0, half - rad);
  // major axis direction: angle from east = 0.5 atan2(2 en, ee - nn); azimuth from north = 90 - that
  let az = 90 - 0.5 * Math.atan2(2 * en, ee - nn) / RAD;
  az = ((az % 180) + 180) % 180;

  // ---- residuals of every pick, distances, azimuths, gap
  const ll = fromLocalKm(proj, par[1], par[2], [0, 0]);
  const lat = ll[0];
  const lon = ll[1];
  let sMin = Infinity;
  for (const i of idx) sMin = Math.min(sMin, sigma[i]);
  const arrivals: ArrivalResidual[] = [];
  let sumR2 = 0;
  const azUsed: number[] = [];
  const seenStation = new Set<string>();
  for (let i = 0; i < n; i++) {
    const st = byKey.get(picks[i].stationKey) as LocationStation;
    const d = Math.hypot(par[1] - se[i], par[2] - sn[i]);
    firstArrivalInto(tt, model, picks[i].wave, d, par[3], sz[i]);
    const res = obs[i] - par[0] - tt.time;
    const azimuth = azimuthDeg(lat, lon, st.latDeg, st.lonDeg);
    if (used[i]) {
      sumR2 += res * res;
      if (!seenStation.has(st.key)) {
        seenStation.add(st.key);
        azUsed.push(azimuth);
      }
    }
    arrivals.push({
      pickIndex: i, stationKey: st.key, wave: picks[i].wave, phase: tt.phase, used: used[i], residualS: res,
      weight: used[i] ? (sMin / sigma[i]) ** 2 : 0, distanceKm: d, distanceDeg: kmToDegrees(d), azimuthDeg: azimuth,
      takeoffDeg: tt.takeoffDeg,
    });
  }
  return {
    ok: true,
    value: {
      originTime: tRef + Math.round(par[0] * 1e6),
      latDeg: lat,
      lonDeg: lon,
      depthKm: par[3],
      depthFixed: fixed,
      rmsS: Math.sqrt(sumR2 / m),
      chi2,
      dof,
      varianceFactor,
      errorsScaled,
      errorScale: Math.sqrt(appliedFactor),
      originTimeErrorS: Math.sqrt(cov[0][0]),
      eastErrorKm: Math.sqrt(ee),
      northErrorKm: Math.sqrt(nn),
      depthErrorKm: fixed ? NaN : Math.sqrt(cov[3][3]),
      ellipse: { semiMajorKm: ELLIPSE_68_SCALE * Math.sqrt(l1), semiMinorKm: ELLIPSE_68_SCALE * Math.sqrt(l2), majorAzimuthDeg: az, confidence: ELLIPSE_68_CONFIDENCE },
      gapDeg: azimuthalGapDeg(azUsed),
      phaseCount: m,
      stationCount: seenStation.size,
      iterations,
      arrivals,
      covariance: cov,
    },
  };
}

/** Azimuth from point 1 to point 2 on the sphere, degrees clockwise from north in [0, 360). */
export function azimuthDeg(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const p1 = lat1 * RAD;
  const p2 = lat2 * RAD;
  const dl = (lon2 - lon1) * RAD;
  const a = Math.atan2(Math.sin(dl) * Math.cos(p2), Math.cos(p1) * Math.sin(p2) - Math.sin(p1) * Math.cos(p2) * Math.cos(dl)) / RAD;
  return (a + 360) % 360;
}

/** Largest angle between azimuths adjacent around the circle, degrees (360 for fewer than two). */
export function azimuthalGapDeg(azimuths: readonly number[]): number {
  if (azimuths.length < 2) return 360;
  const a = [...azimuths].map((x) => ((x % 360) + 360) % 360).sort((x, y) => x - y);
  let gap = 360 - a[a.length - 1] + a[0];
  for (let i = 1; i < a.length; i++) gap = Math.max(gap, a[i] - a[i - 1]);
  return gap;
}

interface Start { t0: number; e: number; n: number; z: number; misfit: number }

/** The used phases laid out flat for the grid search's inner loop. */
interface GridContext {
  m: number;
  /** Station east, north (km), observed time (s), weight 1/sigma, elevation delay (s), P (1) or S (0). */
  e: Float64Array; n: Float64Array; obs: Float64Array; w: Float64Array; delay: Float64Array; isP: Uint8Array;
  tabP: TravelTimeTable; tabS: TravelTimeTable;
  /** Scratch: observed minus computed times and their order. */
  d: Float64Array; order: Int32Array;
}

/**
 * Coarse grid search. The box is the stations' box with a margin of half its size (at least 2 km);
 * the depths are the start table's within [minDepth, maxDepth] (or the fixed depth). Stage 1: 13 x 13
 * epicentres at every third depth; when the best lies on the box's edge the box is tripled and
 * searched again (at most three times: events outside the network). Stage 2, for each of the three
 * depths whose best node fits best: 7 x 7 at a third of that spacing around that node, at that depth
 * and the tabulated depths either side. Several starts, because first-arrival misfits have kinks (where the first phase changes,
 * and at interfaces) that can hold a local search in a false minimum. The table's distance scale
 * follows the box (so a mine's network gets metre steps). Station elevations are allowed for as a
 * vertical path through the top layer.
 */
function gridStarts(model: VelocityModel, idx: number[], picks: readonly LocationPick[], se: Float64Array, sn: Float64Array, sz: Float64Array,
  obs: Float64Array, sigma: Float64Array, depths: number[] | null, minDepth: number, maxDepth: number): Start[] {
  const m = idx.length;
  let e0 = Infinity;
  let e1 = -Infinity;
  let n0 = Infinity;
  let n1 = -Infinity;
  for (const i of idx) {
    e0 = Math.min(e0, se[i]); e1 = Math.max(e1, se[i]);
    n0 = Math.min(n0, sn[i]); n1 = Math.max(n1, sn[i]);
  }
  const ce = 0.5 * (e0 + e1);
  const cn = 0.5 * (n0 + n1);
  let half = 0.5 * Math.max(e1 - e0, n1 - n0) + Math.max(2, 0.5 * Math.max(e1 - e0, n1 - n0));
  let perDepth: Start[] = [];
  let c: GridContext | null = null;
  let all: number[] = [];
  for (let round = 0; round < 4; round++) {
    // the farthest a station can be from a node: the box's diagonal
    const reach = 2 * Math.SQRT2 * half;
    const tabP = startTable(model, 'P', reach);
    const tabS = startTable(model, 'S', reach);
    c = {
      m, e: new Float64Array(m), n: new Float64Array(m), obs: new Float64Array(m), w: new Float64Array(m), delay: new Float64Array(m),
      isP: new Uint8Array(m), tabP, tabS, d: new Float64Array(m), order: new Int32Array(m),
    };
    for (let k = 0; k < m; k++) {
      const i = idx[k];
      const isP = picks[i].wave === 'P';
      c.e[k] = se[i];
      c.n[k] = sn[i];
      c.obs[k] = obs[i];
      c.w[k] = 1 / sigma[i];
      c.isP[k] = isP ? 1 : 0;
      c.delay[k] = sz[i] / (isP ? model.layers[0].vp : model.layers[0].vs);
    }
    all = depths ?? [...tabP.depthsKm].filter((z) => z >= minDepth && z <= maxDepth);
    if (all.length === 0) all.push(Math.max(minDepth, Math.min(maxDepth, 0)));
    const coarse = all.length <= 3 ? all : all.filter((_, i) => i % 3 === 1);
    perDepth = searchGrid(c, ce - half, ce + half, cn - half, cn + half, 13, coarse).sort((x, y) => x.misfit - y.misfit);
    const best = perDepth[0];
    const onEdge = Math.abs(Math.abs(best.e - ce) - half) < 1e-9 * half || Math.abs(Math.abs(best.n - cn) - half) < 1e-9 * half;
    if (!onEdge) break;
    half *= 3;
  }
  const h = (2 * half) / 12;
  const starts: Start[] = [];
  for (const cand of perDepth.slice(0, 3)) {
    const k = all.indexOf(cand.z);
    const near = all.filter((_, i) => Math.abs(i - k) <= 1);
    const refined = searchGrid(c as GridContext, cand.e - h, cand.e + h, cand.n - h, cand.n + h, 7, near).sort((x, y) => x.misfit - y.misfit)[0];
    if (!starts.some((x) => x.e === refined.e && x.n === refined.n && x.z === refined.z)) starts.push(refined);
  }
  return starts;
}

/** The best node at each depth of an N x N x depths grid by weighted L1 misfit, origin time the weighted median. */
function searchGrid(c: GridContext, e0: number, e1: number, n0: number, n1: number, N: number, zs: readonly number[]): Start[] {
  const { m, e: se, n: sn, obs, w, delay, isP, tabP, tabS, d, order } = c;
  const nx = tabP.nDistances;
  const step = tabP.distanceStepKm;
  const tp = tabP.times;
  const ts = tabS.times;
  let wsum = 0;
  for (let k = 0; k < m; k++) wsum += w[k];
  const out: Start[] = [];
  for (const z of zs) {
    let best: Start = { t0: 0, e: 0.5 * (e0 + e1), n: 0.5 * (n0 + n1), z, misfit: Infinity };
    // the depth rows bracketing z and the weight of the lower one (same layout in both tables)
    const dz = tabP.depthsKm;
    let iz = 0;
    while (iz + 1 < dz.length && dz[iz + 1] <= z) iz++;
    const fz = iz + 1 < dz.length ? Math.max(0, (z - dz[iz]) / (dz[iz + 1] - dz[iz])) : 0;
    const r0 = iz * nx;
    const r1 = iz + 1 < dz.length ? r0 + nx : r0;
    for (let a = 0; a < N; a++) {
      const e = e0 + (e1 - e0) * a / (N - 1);
      for (let b = 0; b < N; b++) {
        const nn = n0 + (n1 - n0) * b / (N - 1);
        for (let k = 0; k < m; k++) {
          const de = e - se[k];
          const dn = nn - sn[k];
          const u = Math.sqrt(de * de + dn * dn) / step; // (Math.hypot is several times slower)
          let ix = Math.floor(u);
          if (ix > nx - 2) ix = nx - 2;
          const fx = u - ix;
          const t = isP[k] ? tp : ts;
          const ta = t[r0 + ix] + fx * (t[r0 + ix + 1] - t[r0 + ix]);
          const tb = t[r1 + ix] + fx * (t[r1 + ix + 1] - t[r1 + ix]);
          const dk = obs[k] - (ta + fz * (tb - ta) + delay[k]);
          d[k] = dk;
          // insertion sort of the indices by d
          let j = k;
          while (j > 0 && d[order[j - 1]] > dk) { order[j] = order[j - 1]; j--; }
          order[j] = k;
        }
        let acc = 0;
        let t0 = d[order[m - 1]];
        for (let j = 0; j < m; j++) {
          acc += w[order[j]];
          if (acc >= 0.5 * wsum) { t0 = d[order[j]]; break; }
        }
        let misfit = 0;
        for (let k = 0; k < m; k++) misfit += w[k] * Math.abs(d[k] - t0);
        if (misfit < best.misfit) best = { t0, e, n: nn, z, misfit };
      }
    }
    out.push(best);
  }
  return out;
}
