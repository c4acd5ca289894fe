/**
 * The local-magnitude law the scenario's amplitudes follow.
 *
 * IASPEI standard form (IASPEI Working Group on Magnitudes, "Summary of magnitude working group
 * recommendations on standard procedures for determining earthquake magnitudes from digital data",
 * 2013), with the coefficients of Hutton & Boore (1987, Bull. Seismol. Soc. Am. 77, 2074):
 *
 *   ML = log10(A) + 1.11 log10(R) + 0.00189 R - 2.09
 *
 * A: peak (zero-to-peak) amplitude in nm of the horizontal ground displacement as recorded by a
 * Wood-Anderson seismograph simulated with static magnification 1 (the -2.09 constant carries the
 * Wood-Anderson magnification 2080 of Uhrhammer & Collins 1990, Bull. Seismol. Soc. Am. 80, 702);
 * R: hypocentral distance in km (valid to about 1000 km).
 *
 * The simulated Wood-Anderson instrument: natural period 0.8 s, damping 0.7 (Uhrhammer & Collins
 * 1990), displacement in, displacement out, gain 1 at high frequency.
 */
import { oscillatorPoles, polesZerosRatio, type Cx } from './response';

/** Wood-Anderson static magnification paired with this law (Uhrhammer & Collins 1990). */
export const WOOD_ANDERSON_GAIN = 2080;
/** Wood-Anderson natural period, s, and damping, as used by the generator. */
export const WOOD_ANDERSON_PERIOD_S = 0.8;
export const WOOD_ANDERSON_DAMPING = 0.7;

const WA_POLES = oscillatorPoles(1 / WOOD_ANDERSON_PERIOD_S, WOOD_ANDERSON_DAMPING);
const WA_ZEROS = [{ re: 0, im: 0 }, { re: 0, im: 0 }];

function checkDistance(hypocentralKm: number): void {
  if (!(hypocentralKm > 0 && hypocentralKm <= 1000)) {
    throw new RangeError(`hypocentral distance must be in (0, 1000] km, got ${hypocentralKm}`);
  }
}

/** -log10 A0(R) of the law: the term added to log10 A (nm). */
export function distanceTerm(hypocentralKm: number): number {
  checkDistance(hypocentralKm);
  return 1.11 * Math.log10(hypocentralKm) + 0.00189 * hypocentralKm - 2.09;
}

/** ML from a Wood-Anderson (magnification 1) peak amplitude in nm at hypocentral distance R km. */
export function localMagnitude(amplitudeNm: number, hypocentralKm: number): number {
  if (!(amplitudeNm > 0)) throw new RangeError(`amplitude must be > 0 nm, got ${amplitudeNm}`);
  return Math.log10(amplitudeNm) + distanceTerm(hypocentralKm);
}

/** The Wood-Anderson (magnification 1) peak amplitude in nm that the law gives for ML at R km. */
export function woodAndersonAmplitudeNm(ml: number, hypocentralKm: number): number {
  if (!Number.isFinite(ml)) throw new RangeError(`magnitude must be finite, got ${ml}`);
  return 10 ** (ml - distanceTerm(hypocentralKm));
}

/** Complex Wood-Anderson response (displacement to displacement, magnification 1) at `frequencyHz`. */
export function woodAndersonResponse(frequencyHz: number): Cx {
  return polesZerosRatio(WA_POLES, WA_ZEROS, frequencyHz);
}
