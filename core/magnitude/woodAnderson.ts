/**
 * The Wood-Anderson torsion seismograph as poles and zeros, and its simulation from a channel's
 * records.
 *
 * The instrument is a damped oscillator writing displacement: for ground displacement in and trace
 * displacement out,
 *   H(s) = V · s² / (s² + 2hω₀s + ω₀²),  ω₀ = 2π/T₀,
 * zeros 0, 0 and poles −hω₀ ± iω₀√(1 − h²) in rad/s, V the static magnification (the gain well
 * above the natural frequency, where the trace follows the ground displacement times V).
 *
 * Two published parameter sets, each paired with the magnitude formulas calibrated on it (values
 * from memory):
 * - Anderson & Wood (1925), Bull. Seismol. Soc. Am. 15(1), 1-72: T₀ = 0.8 s, h = 0.8, V = 2800, the
 *   values Richter (1935), Bull. Seismol. Soc. Am. 25(1), 1-32, assumed for his −log A₀ table.
 * - Uhrhammer & Collins (1990), Bull. Seismol. Soc. Am. 80(3), 702-716: T₀ = 0.8 s, h = 0.7 and the
 *   measured V = 2080 (± 60); the IASPEI (2013) ML standard's constant −2.09 and the Hutton & Boore
 *   (1987) formula as applied to simulated records go with V = 2080.
 */
import type { SampleArray } from '../model';
import { removeResponse, type FrequencyResponse } from './removeResponse';
import { oscillatorPoles, type ChannelResponse } from './response';

export interface WoodAndersonStandard {
  /** Short name, e.g. 'UC1990'. */
  readonly name: string;
  /** Natural period T₀, s. */
  readonly periodS: number;
  /** Damping h, fraction of critical. */
  readonly damping: number;
  /** Static magnification V (trace displacement per ground displacement at high frequency). */
  readonly magnification: number;
  /** The publication the values come from. */
  readonly source: string;
}

/** T₀ 0.8 s, h 0.7, V 2080: Uhrhammer & Collins (1990), BSSA 80(3), 702-716 (from memory). */
export const WOOD_ANDERSON_2080: WoodAndersonStandard = {
  name: 'UC1990', periodS: 0.8, damping: 0.7, magnification: 2080,
  source: 'Uhrhammer & Collins (1990), Bull. Seismol. Soc. Am. 80(3), 702-716',
};

/** T₀ 0.8 s, h 0.8, V 2800: Anderson & Wood (1925), BSSA 15(1), 1-72, as used by Richter (1935) (from memory). */
export const WOOD_ANDERSON_2800: WoodAndersonStandard = {
  name: 'AW1925', periodS: 0.8, damping: 0.8, magnification: 2800,
  source: 'Anderson & Wood (1925), Bull. Seismol. Soc. Am. 15(1), 1-72; Richter (1935), Bull. Seismol. Soc. Am. 25(1), 1-32',
};

function checkStandard(std: WoodAndersonStandard): void {
  if (!(std.periodS > 0) || !(std.damping > 0 && std.damping < 1) || !(std.magnification > 0)) {
    throw new RangeError(`Wood-Anderson standard needs period > 0 s, damping in (0, 1), magnification > 0; got T0 ${std.periodS} s, h ${std.damping}, V ${std.magnification}`);
  }
}

/** Poles (rad/s) and zeros of the standard: −hω₀ ± iω₀√(1 − h²); zeros 0, 0. */
export function woodAndersonPolesZeros(std: WoodAndersonStandard): { poles: { re: number; im: number }[]; zeros: { re: number; im: number }[] } {
  checkStandard(std);
  return { poles: oscillatorPoles(std.periodS, std.damping), zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }] };
}

/**
 * The standard's response, displacement in to trace displacement out, scaled by `magnification`
 * (default the standard's V; pass 1 for the IASPEI "static magnification of 1" convention).
 */
export function woodAndersonResponse(std: WoodAndersonStandard, magnification = std.magnification): FrequencyResponse {
  checkStandard(std);
  if (!(magnification > 0) || !Number.isFinite(magnification)) throw new RangeError(`magnification must be > 0, got ${magnification}`);
  const w0 = (2 * Math.PI) / std.periodS;
  const w02 = w0 * w0, c = 2 * std.damping * w0;
  return {
    evaluate(frequencyHz: number, out: Float64Array | number[]): void {
      // V·s²/(s² + c·s + ω₀²) at s = iω: numerator −Vω², denominator (ω₀² − ω²) + i·c·ω.
      const w = 2 * Math.PI * frequencyHz;
      const nr = -magnification * w * w;
      const dr = w02 - w * w, di = c * w;
      const d = dr * dr + di * di;
      out[0] = (nr * dr) / d;
      out[1] = (-nr * di) / d;
    },
  };
}

export interface WoodAndersonOptions {
  /** Parameter set; default WOOD_ANDERSON_2080. */
  standard?: WoodAndersonStandard;
  /** Static magnification of the output; default 1 (ground-equivalent metres, the IASPEI convention). */
  magnification?: number;
  /** Cosine prefilter corners, Hz; default defaultWoodAndersonPreFilter(sampleRate). */
  preFilter?: readonly [number, number, number, number] | null;
  /** Water level, dB; default 60. */
  waterLevelDb?: number | null;
  /** Taper per end; default 0.05. */
  taperFraction?: number;
}

/**
 * Default prefilter for Wood-Anderson simulation at `sampleRate` Hz: [0.05, 0.1, 0.72·fN, 0.9·fN]
 * with fN the Nyquist frequency. The Wood-Anderson response falls as f² below 1.25 Hz, so the
 * 0.05-0.1 Hz flank only keeps very long-period noise out (common practice).
 */
export function defaultWoodAndersonPreFilter(sampleRate: number): [number, number, number, number] {
  const fn = sampleRate / 2;
  return [0.05, 0.1, 0.72 * fn, 0.9 * fn];
}

/**
 * A Wood-Anderson seismogram simulated from `samples` (counts) of a channel with `response`: ground
 * displacement through the standard's poles and zeros, in metres of trace amplitude at the chosen
 * magnification (default 1: metres of ground-equivalent Wood-Anderson displacement).
 */
export function simulateWoodAnderson(samples: SampleArray, sampleRate: number, response: ChannelResponse, opts: WoodAndersonOptions = {}): Float64Array {
  const std = opts.standard ?? WOOD_ANDERSON_2080;
  const sim = woodAndersonResponse(std, opts.magnification ?? 1);
  return removeResponse(samples, sampleRate, response, {
    output: 'displacement',
    preFilter: opts.preFilter === undefined ? defaultWoodAndersonPreFilter(sampleRate) : opts.preFilter,
    waterLevelDb: opts.waterLevelDb,
    taperFraction: opts.taperFraction,
    simulate: sim,
  });
}
