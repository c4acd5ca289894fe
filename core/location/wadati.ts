/**
 * The Wadati diagram (Wadati 1933): at each station S-P time against P arrival time. With a constant
 * Vp/Vs along every path, tS - tP = (Vp/Vs - 1)(tP - t0), a straight line whose slope gives Vp/Vs
 * and whose zero crossing gives the origin time t0, independent of any velocity model or location.
 *
 * The line is fitted by ordinary least squares of S-P on P time (S-P carries both picks' errors, the
 * P time one; the classic diagram regresses this way). Standard errors are the usual OLS ones with
 * the residual variance estimated from the fit (n - 2 degrees of freedom); the origin time's error
 * follows from slope and intercept by first-order propagation including their covariance.
 */
import type { Micros } from '../time';

export interface WadatiPoint {
  stationKey: string;
  /** P and S pick times, integer microseconds since the epoch. */
  pTime: Micros;
  sTime: Micros;
}

export interface WadatiFit {
  vpVs: number;
  /** 1-sigma, from the fit's scatter. */
  vpVsError: number;
  originTime: Micros;
  originTimeErrorS: number;
  count: number;
  /** The diagram: P time after the origin, S-P, and the point's residual from the line, s. */
  points: { stationKey: string; pAfterOriginS: number; spS: number; residualS: number }[];
}

export type WadatiResult = { ok: true; value: WadatiFit } | { ok: false; code: 'too-few-stations' | 'degenerate'; message: string };

/** Fewest stations with both P and S for a fit with an error estimate. */
export const WADATI_MIN_STATIONS = 3;

/** Fits the Wadati line to stations with both a P and an S pick. */
export function wadati(points: readonly WadatiPoint[]): WadatiResult {
  const n = points.length;
  for (let i = 0; i < n; i++) {
    const p = points[i];
    if (!Number.isSafeInteger(p.pTime) || !Number.isSafeInteger(p.sTime)) {
      throw new RangeError(`point ${i} (${p.stationKey}): times must be integer microseconds, got P ${p.pTime}, S ${p.sTime}`);
    }
  }
  if (n < WADATI_MIN_STATIONS) {
    return { ok: false, code: 'too-few-stations', message: `${n} station${n === 1 ? '' : 's'} with both P and S; at least ${WADATI_MIN_STATIONS} are needed for Vp/Vs` };
  }
  let tRef = Infinity;
  for (const p of points) tRef = Math.min(tRef, p.pTime);
  const x = points.map((p) => (p.pTime - tRef) / 1e6);
  const y = points.map((p) => (p.sTime - p.pTime) / 1e6);
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  if (!(sxx > 0)) return { ok: false, code: 'degenerate', message: 'all P times are equal: S-P cannot be fitted against them' };
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  if (!(slope > 0)) {
    return { ok: false, code: 'degenerate', message: `S-P does not grow with P time (slope ${slope.toFixed(4)}): no Vp/Vs from these picks` };
  }
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (y[i] - intercept - slope * x[i]) ** 2;
  const s2 = ss / (n - 2);
  const varSlope = s2 / sxx;
  const varIntercept = s2 * (1 / n + (mx * mx) / sxx);
  const cov = -mx * s2 / sxx;
  // t0 = tRef - intercept / slope
  const t0 = -intercept / slope;
  const dA = intercept / (slope * slope); // d t0 / d slope
  const dB = -1 / slope; // d t0 / d intercept
  const varT0 = dA * dA * varSlope + dB * dB * varIntercept + 2 * dA * dB * cov;
  return {
    ok: true,
    value: {
      vpVs: 1 + slope,
      vpVsError: Math.sqrt(varSlope),
      originTime: tRef + Math.round(t0 * 1e6),
      originTimeErrorS: Math.sqrt(Math.max(0, varT0)),
      count: n,
      points: points.map((p, i) => ({ stationKey: p.stationKey, pAfterOriginS: x[i] - t0, spS: y[i], residualS: y[i] - intercept - slope * x[i] })),
    },
  };
}

/**
 * Hypocentral distance, km, from an S-P time: D = (tS - tP) / (1/Vs - 1/Vp) = (tS - tP) Vp / (Vp/Vs - 1).
 * For Vp = 6 km/s and Vp/Vs = 1.73 that is 8.2 km per second of S-P (the common-practice "8 km per second").
 */
export function spHypocentralKm(spS: number, vpKmS: number, vpVs: number): number {
  if (!(spS >= 0)) throw new RangeError(`S-P time must be >= 0 s, got ${spS}`);
  if (!(vpKmS > 0)) throw new RangeError(`vp must be > 0 km/s, got ${vpKmS}`);
  if (!(vpVs > 1)) throw new RangeError(`Vp/Vs must be > 1, got ${vpVs}`);
  return spS * vpKmS / (vpVs - 1);
}

/** Epicentral distance, km, from a hypocentral distance and the source depth h below the station: sqrt(D^2 - h^2), 0 when D < h. */
export function spEpicentralKm(hypocentralKm: number, depthKm: number): number {
  const e2 = hypocentralKm * hypocentralKm - depthKm * depthKm;
  return e2 > 0 ? Math.sqrt(e2) : 0;
}
