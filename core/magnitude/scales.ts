/**
 * Local-magnitude scales: ML = log10(A) + C(distance) + station correction, each with the
 * Wood-Anderson parameter set and amplitude units it was calibrated with.
 *
 * - IASPEI (2013) standard, eq. (1): ML = log10(A) + 1.11·log10(R) + 0.00189·R − 2.09, A the maximum
 *   trace amplitude in nm on a horizontal Wood-Anderson simulation of static magnification 1, R the
 *   hypocentral distance in km (typically < 1000 km); the −2.09 carries V = 2080 (IASPEI Working
 *   Group on Magnitudes, Summary of recommendations, 2013; text as published on the ISC's
 *   "IASPEI standard procedures for magnitude determination" page). Each horizontal component's
 *   amplitude is one datum (same text).
 * - Hutton & Boore (1987), Bull. Seismol. Soc. Am. 77(6), 2074-2094:
 *   −log A₀ = 1.110·log10(r/100) + 0.00189·(r − 100) + 3.0, A in mm on the Wood-Anderson record, r
 *   hypocentral km; paired here with V = 2080 (Uhrhammer & Collins 1990), with which it equals the
 *   IASPEI form to 0.002 magnitude units.
 * - Richter (1935), Bull. Seismol. Soc. Am. 25(1), 1-32, −log A₀ table as extended to 0-600 km in
 *   Richter (1958), Elementary Seismology, Table 22-1 (values from memory), A in mm on the standard
 *   Wood-Anderson (V = 2800, T₀ 0.8 s, h 0.8), epicentral distance; linear interpolation between
 *   entries (common practice). ML 3 is 1 mm at 100 km (the definition).
 * - User coefficients for a local calibration, the IASPEI eq. (2) form:
 *   ML = log10(A) + a·log10(R) + b·R + c, A in nm (magnification 1).
 */
import { WOOD_ANDERSON_2080, WOOD_ANDERSON_2800, type WoodAndersonStandard } from './woodAnderson';

export interface MagnitudeScale {
  /** Short name, e.g. 'IASPEI2013'. */
  readonly name: string;
  /** The publication. */
  readonly source: string;
  /** The Wood-Anderson parameter set the scale was calibrated with. */
  readonly standard: WoodAndersonStandard;
  /** Which distance the correction takes. */
  readonly distance: 'hypocentral' | 'epicentral';
  /** A in nm of ground-equivalent displacement (magnification 1), or mm of trace at the standard's magnification. */
  readonly amplitudeUnit: 'nm' | 'mm';
  /** Distance range the correction is defined on, km. */
  readonly minKm: number;
  readonly maxKm: number;
  /** The distance term added to log10(A), for a distance in range (not checked here: see distanceCorrection). */
  readonly correction: (km: number) => number;
}

/** The scale's distance term at `km`; RangeError outside the scale's range. */
export function distanceCorrection(scale: MagnitudeScale, km: number): number {
  if (!(km >= scale.minKm && km <= scale.maxKm)) {
    throw new RangeError(`${scale.name}: ${scale.distance} distance must be in [${scale.minKm}, ${scale.maxKm}] km, got ${km}`);
  }
  return scale.correction(km);
}

/** Converts a Wood-Anderson amplitude in ground-equivalent metres (magnification 1) to the scale's units. */
export function amplitudeInScaleUnits(scale: MagnitudeScale, groundEquivalentM: number): number {
  return scale.amplitudeUnit === 'nm' ? groundEquivalentM * 1e9 : groundEquivalentM * scale.standard.magnification * 1e3;
}

/** ML from a Wood-Anderson amplitude in ground-equivalent metres at `km`, plus `stationCorrection`. */
export function localMagnitudeOf(scale: MagnitudeScale, groundEquivalentM: number, km: number, stationCorrection = 0): number {
  if (!(groundEquivalentM > 0) || !Number.isFinite(groundEquivalentM)) throw new RangeError(`amplitude must be > 0 m, got ${groundEquivalentM}`);
  if (!Number.isFinite(stationCorrection)) throw new RangeError(`station correction must be finite, got ${stationCorrection}`);
  return Math.log10(amplitudeInScaleUnits(scale, groundEquivalentM)) + distanceCorrection(scale, km) + stationCorrection;
}

export const IASPEI_2013: MagnitudeScale = {
  name: 'IASPEI2013',
  source: 'IASPEI Working Group on Magnitudes (2013), standard ML, eq. (1)',
  standard: WOOD_ANDERSON_2080, distance: 'hypocentral', amplitudeUnit: 'nm', minKm: 1e-3, maxKm: 1000,
  correction: (r) => 1.11 * Math.log10(r) + 0.00189 * r - 2.09,
};

export const HUTTON_BOORE_1987: MagnitudeScale = {
  name: 'HB1987',
  source: 'Hutton & Boore (1987), Bull. Seismol. Soc. Am. 77(6), 2074-2094; V = 2080 after Uhrhammer & Collins (1990)',
  standard: WOOD_ANDERSON_2080, distance: 'hypocentral', amplitudeUnit: 'mm', minKm: 1e-3, maxKm: 1000,
  correction: (r) => 1.11 * Math.log10(r / 100) + 0.00189 * (r - 100) + 3.0,
};

/** Richter's −log A₀ (epicentral km → value), Richter (1958) Table 22-1, 0-600 km (from memory). */
export const RICHTER_TABLE: readonly (readonly [number, number])[] = [
  [0, 1.4], [5, 1.4], [10, 1.5], [15, 1.6], [20, 1.7], [25, 1.9], [30, 2.1], [35, 2.3], [40, 2.4], [45, 2.5],
  [50, 2.6], [55, 2.7], [60, 2.8], [65, 2.8], [70, 2.8], [75, 2.8], [80, 2.9], [85, 2.9], [90, 3.0], [95, 3.0],
  [100, 3.0], [110, 3.1], [120, 3.1], [130, 3.2], [140, 3.2], [150, 3.3], [160, 3.3], [170, 3.4], [180, 3.4],
  [190, 3.5], [200, 3.5], [210, 3.6], [220, 3.65], [230, 3.7], [240, 3.7], [250, 3.8], [260, 3.8], [270, 3.9],
  [280, 3.9], [290, 4.0], [300, 4.0], [310, 4.1], [320, 4.1], [330, 4.2], [340, 4.2], [350, 4.3], [360, 4.3],
  [370, 4.3], [380, 4.4], [390, 4.4], [400, 4.5], [410, 4.5], [420, 4.5], [430, 4.6], [440, 4.6], [450, 4.6],
  [460, 4.6], [470, 4.7], [480, 4.7], [490, 4.7], [500, 4.7], [510, 4.8], [520, 4.8], [530, 4.8], [540, 4.8],
  [550, 4.8], [560, 4.9], [570, 4.9], [580, 4.9], [590, 4.9], [600, 4.9],
];

/** Linear interpolation in RICHTER_TABLE (binary search; distance in [0, 600] km). */
export function richterMinusLogA0(km: number): number {
  const t = RICHTER_TABLE;
  let lo = 0, hi = t.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid][0] <= km) lo = mid; else hi = mid;
  }
  const [x0, y0] = t[lo], [x1, y1] = t[hi];
  return y0 + ((y1 - y0) * (km - x0)) / (x1 - x0);
}

export const RICHTER_1935: MagnitudeScale = {
  name: 'Richter1935',
  source: 'Richter (1935), Bull. Seismol. Soc. Am. 25(1), 1-32; table of Richter (1958), Elementary Seismology, Table 22-1; V = 2800 (Anderson & Wood 1925)',
  standard: WOOD_ANDERSON_2800, distance: 'epicentral', amplitudeUnit: 'mm', minKm: 0, maxKm: 600,
  correction: richterMinusLogA0,
};

export interface LocalCalibration {
  /** Name for reports. */
  name: string;
  /** Coefficients of ML = log10(A_nm) + a·log10(R) + b·R + c. */
  a: number;
  b: number;
  c: number;
  /** Default 'hypocentral'. */
  distance?: 'hypocentral' | 'epicentral';
  /** Wood-Anderson parameter set the calibration used; default WOOD_ANDERSON_2080. */
  standard?: WoodAndersonStandard;
  /** Valid range, km; default (0, 1000]. */
  minKm?: number;
  maxKm?: number;
}

/** A scale from user coefficients (IASPEI 2013 eq. (2) form), A in nm at magnification 1. */
export function calibratedScale(cal: LocalCalibration): MagnitudeScale {
  for (const k of ['a', 'b', 'c'] as const) {
    if (!Number.isFinite(cal[k])) throw new RangeError(`calibration coefficient ${k} must be finite, got ${cal[k]}`);
  }
  const minKm = cal.minKm ?? 1e-3, maxKm = cal.maxKm ?? 1000;
  if (!(minKm > 0 && maxKm > minKm)) throw new RangeError(`calibration range must satisfy 0 < minKm < maxKm, got ${minKm} to ${maxKm}`);
  const { a, b, c } = cal;
  return {
    name: cal.name, source: `local calibration: a ${a}, b ${b}, c ${c}`,
    standard: cal.standard ?? WOOD_ANDERSON_2080, distance: cal.distance ?? 'hypocentral', amplitudeUnit: 'nm', minKm, maxKm,
    correction: (r) => a * Math.log10(r) + b * r + c,
  };
}
