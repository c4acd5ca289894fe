/**
 * A channel's instrument response evaluated from its StationXML stages, as a complex number in
 * counts per ground-motion unit at any frequency.
 *
 * Each stage contributes its filter times its `StageGain` value:
 * - PolesZeros, "LAPLACE (RADIANS/SECOND)": A0 · Π(s − z) / Π(s − p) with s = i·2π·f (poles and zeros
 *   in rad/s); "LAPLACE (HERTZ)": the same with s = i·f (poles and zeros in Hz). A0 is the
 *   `NormalizationFactor`, chosen by the file's author so that |A0 · Π(s − z)/Π(s − p)| = 1 at the
 *   `NormalizationFrequency` (SEED Reference Manual v2.4, blockette 53, fields 7-8 and the notes on
 *   the response; FDSN StationXML 1.2 documentation, `PolesZeros`). From memory: the manual's
 *   transfer-function type letters are A (rad/s) and B (Hz); we read the StationXML names.
 * - Coefficients, ANALOG: Σ bₖ sᵏ / Σ aₖ sᵏ with s as above; DIGITAL: Σ bₖ z⁻ᵏ / Σ aₖ z⁻ᵏ with
 *   z = exp(i·2π·f / fᵢₙ), fᵢₙ the stage's decimation input rate (SEED blockette 54).
 * - FIR: Σ hₖ z⁻ᵏ with the symmetric halves expanded (EVEN: h then h reversed; ODD: h then h
 *   reversed without its last, centre, coefficient) (SEED blockette 61).
 * - A stage with no filter is its gain alone.
 *
 * Digital stages (DIGITAL coefficients and FIR) contribute their gain only unless `digitalStages`
 * is 'shape': a digitizer's FIR filters are flat in the band used for local magnitudes and their
 * delay is corrected in the recorded times, so including their linear phase would shift the
 * trace (common practice). 'shape' gives the full product for comparisons.
 */
import type { ChannelMeta, ResponseStage, Sensitivity } from '../stationxml/types';

/** What the channel's input units measure. */
export type GroundMotion = 'displacement' | 'velocity' | 'acceleration';

/** Time-derivative order of each ground-motion kind (displacement 0, velocity 1, acceleration 2). */
export const MOTION_ORDER: Readonly<Record<GroundMotion, number>> = { displacement: 0, velocity: 1, acceleration: 2 };

const LENGTH_UNITS: Readonly<Record<string, number>> = { m: 1, cm: 1e-2, mm: 1e-3, um: 1e-6, nm: 1e-9 };

/**
 * Reads a StationXML ground-motion unit name, case-insensitive: a length (m, cm, mm, um, nm) alone
 * (displacement), per second ("m/s", "nm/s", "m/sec"; velocity) or per second squared ("m/s**2",
 * "m/s2", "m/s^2", "m/s/s", "m/sec**2"; acceleration). `metres` is the unit's length in metres.
 * Throws RangeError for any other unit (e.g. "V", "Pa", "g").
 */
export function parseGroundUnits(units: string): { motion: GroundMotion; metres: number } {
  const u = units.trim().toLowerCase().replace(/\s+/g, '');
  const m = /^([a-z]+)(\/(s|sec)(\*\*2|2|\^2|\/s|\/sec)?)?$/.exec(u);
  const metres = m ? LENGTH_UNITS[m[1]] : undefined;
  if (!m || metres === undefined) {
    throw new RangeError(`input units must be ground motion in a length unit (m, cm, mm, um, nm; alone, /s or /s**2), got "${units}"`);
  }
  const motion: GroundMotion = m[2] === undefined ? 'displacement' : m[4] === undefined ? 'velocity' : 'acceleration';
  return { motion, metres };
}

/** The ground-motion kind of a StationXML unit name (see parseGroundUnits). */
export function groundMotionOf(units: string): GroundMotion {
  return parseGroundUnits(units).motion;
}

export interface ResponseOptions {
  /** 'gain' (default): digital stages count by their gain only; 'shape': their filter too. */
  digitalStages?: 'gain' | 'shape';
  /**
   * When the channel has no stages, use its InstrumentSensitivity as a flat response (real, its
   * value at every frequency). Right only where the sensor is flat in its input units (e.g. a
   * broadband velocity sensor between its corners); default false (no stages is an error).
   */
  sensitivityOnly?: boolean;
}

/** One stage prepared for evaluation: flat arrays, no objects per call. */
interface PreparedStage {
  /** 0 analog poles/zeros, 1 analog polynomial ratio, 2 digital polynomial ratio in z⁻¹. */
  readonly type: 0 | 1 | 2;
  /** rad/s per Hz of the Laplace variable: 2π for rad/s types, 1 for Hz types. */
  readonly sPerHz: number;
  /** Zeros (type 0) or numerator coefficients (types 1, 2; imaginary parts 0), interleaved re, im. */
  readonly num: Float64Array;
  readonly den: Float64Array;
  /** Constant factor: A0 · gain (type 0) or gain (types 1, 2). */
  readonly scale: number;
  /** Digital input rate, Hz (type 2). */
  readonly rate: number;
}

/**
 * A channel's response ready to evaluate. `evaluate(f, out)` writes the complex response at `f` Hz
 * into out[0] (real) and out[1] (imaginary), allocating nothing, in counts per SI unit of the input
 * motion (m, m/s or m/s²; a file in nm/s is rescaled).
 */
export interface ChannelResponse {
  /** "NET.STA.LOC.CHA" or a label, for error messages. */
  readonly label: string;
  /** What the input units measure. */
  readonly input: GroundMotion;
  /** The input units as written. */
  readonly inputUnits: string;
  /** Length of the input units' length unit in metres (1 for m, 1e-9 for nm). */
  readonly metresPerUnit: number;
  /** Product of the stage gains (counts per input unit as written in the file), sign included. */
  readonly gainProduct: number;
  /** `InstrumentSensitivity`, when the file gave one. */
  readonly sensitivity: Sensitivity | null;
  evaluate(frequencyHz: number, out: Float64Array | number[]): void;
}

function interleave(list: readonly { re: number; im: number }[]): Float64Array {
  const a = new Float64Array(2 * list.length);
  for (let i = 0; i < list.length; i++) {
    a[2 * i] = list[i].re;
    a[2 * i + 1] = list[i].im;
  }
  return a;
}

function realCoefficients(list: readonly number[]): Float64Array {
  const a = new Float64Array(2 * list.length);
  for (let i = 0; i < list.length; i++) a[2 * i] = list[i];
  return a;
}

function expandFir(h: readonly number[], symmetry: 'NONE' | 'EVEN' | 'ODD'): number[] {
  if (symmetry === 'NONE') return [...h];
  const back = [...h].reverse();
  return symmetry === 'EVEN' ? [...h, ...back] : [...h, ...back.slice(1)];
}

function prepareStage(stage: ResponseStage, label: string, digital: 'gain' | 'shape'): PreparedStage | number {
  const gain = stage.gain ? stage.gain.value : 1;
  const f = stage.filter;
  const where = `${label} stage ${stage.number}`;
  if (!Number.isFinite(gain) || gain === 0) throw new RangeError(`${where}: gain must be finite and non-zero, got ${gain}`);
  if (f === null) return gain;
  switch (f.kind) {
    case 'polesZeros': {
      if (f.transferFunction === 'DIGITAL (Z-TRANSFORM)') {
        if (digital === 'gain') return gain;
        throw new RangeError(`${where}: DIGITAL (Z-TRANSFORM) poles and zeros are not evaluated; allowed with digitalStages 'gain'`);
      }
      if (!Number.isFinite(f.normalizationFactor)) throw new RangeError(`${where}: normalization factor must be finite, got ${f.normalizationFactor}`);
      return {
        type: 0, sPerHz: f.transferFunction === 'LAPLACE (HERTZ)' ? 1 : 2 * Math.PI,
        num: interleave(f.zeros), den: interleave(f.poles), scale: f.normalizationFactor * gain, rate: 0,
      };
    }
    case 'coefficients': {
      if (f.transferFunction === 'DIGITAL') {
        if (digital === 'gain') return gain;
        const rate = stage.decimation?.inputSampleRate ?? 0;
        if (!(rate > 0)) throw new RangeError(`${where}: a digital stage needs a decimation input rate > 0 Hz, got ${rate}`);
        return { type: 2, sPerHz: 0, num: realCoefficients(f.numerator), den: realCoefficients(f.denominator.length ? f.denominator : [1]), scale: gain, rate };
      }
      return {
        type: 1, sPerHz: f.transferFunction === 'ANALOG (HERTZ)' ? 1 : 2 * Math.PI,
        num: realCoefficients(f.numerator), den: realCoefficients(f.denominator.length ? f.denominator : [1]), scale: gain, rate: 0,
      };
    }
    case 'fir': {
      if (digital === 'gain') return gain;
      const rate = stage.decimation?.inputSampleRate ?? 0;
      if (!(rate > 0)) throw new RangeError(`${where}: a FIR stage needs a decimation input rate > 0 Hz, got ${rate}`);
      return { type: 2, sPerHz: 0, num: realCoefficients(expandFir(f.coefficients, f.symmetry)), den: realCoefficients([1]), scale: gain, rate };
    }
    default:
      throw new RangeError(`${where}: ${f.kind} stages are not evaluated; allowed: polesZeros, coefficients, fir, gain only`);
  }
}

/** Π (x − rₖ) for interleaved complex roots r at complex x = (xr, xi); result into acc[0..1]. */
function rootProduct(roots: Float64Array, xr: number, xi: number, acc: Float64Array): void {
  let re = 1, im = 0;
  for (let k = 0; k < roots.length; k += 2) {
    const a = xr - roots[k], b = xi - roots[k + 1];
    const r = re * a - im * b;
    im = re * b + im * a;
    re = r;
  }
  acc[0] = re;
  acc[1] = im;
}

/** Σ cₖ xᵏ (Horner) for interleaved coefficients c at complex x; result into acc[0..1]. */
function polynomial(c: Float64Array, xr: number, xi: number, acc: Float64Array): void {
  let re = 0, im = 0;
  for (let k = c.length - 2; k >= 0; k -= 2) {
    const r = re * xr - im * xi + c[k];
    im = re * xi + im * xr + c[k + 1];
    re = r;
  }
  acc[0] = re;
  acc[1] = im;
}

/**
 * Prepares `meta`'s response for evaluation. Throws RangeError when the channel has no stages, when
 * its input units are not ground motion in metres, or when a stage cannot be evaluated.
 */
export function channelResponse(meta: ChannelMeta, opts: ResponseOptions = {}): ChannelResponse {
  const label = `${meta.id.network}.${meta.id.station}.${meta.id.location}.${meta.id.channel}`;
  const digital = opts.digitalStages ?? 'gain';
  if (digital !== 'gain' && digital !== 'shape') throw new RangeError(`digitalStages must be 'gain' or 'shape', got ${String(digital)}`);
  if (meta.stages.length === 0) {
    const sens = meta.sensitivity;
    if (!opts.sensitivityOnly || !sens) {
      throw new RangeError(`${label}: the channel has no response stages (need at least one${sens ? ', or sensitivityOnly' : ''})`);
    }
    const { motion, metres } = parseGroundUnits(sens.inputUnits);
    const flat = sens.value / metres;
    return {
      label, input: motion, inputUnits: sens.inputUnits, metresPerUnit: metres, gainProduct: sens.value, sensitivity: sens,
      evaluate(_f: number, out: Float64Array | number[]): void {
        out[0] = flat;
        out[1] = 0;
      },
    };
  }
  const inputUnits = meta.stages[0].inputUnits ?? meta.sensitivity?.inputUnits ?? '';
  const { motion: input, metres } = parseGroundUnits(inputUnits);
  // Counts per unit → counts per metre-based SI unit (e.g. per nm/s → per m/s: divide by 1e-9).
  let constant = 1 / metres;
  let gainProduct = 1;
  const prepared: PreparedStage[] = [];
  for (const st of meta.stages) {
    gainProduct *= st.gain ? st.gain.value : 1;
    const p = prepareStage(st, label, digital);
    if (typeof p === 'number') constant *= p;
    else prepared.push(p);
  }
  const a = new Float64Array(2);
  const b = new Float64Array(2);
  return {
    label, input, inputUnits, metresPerUnit: metres, gainProduct, sensitivity: meta.sensitivity ?? null,
    evaluate(frequencyHz: number, out: Float64Array | number[]): void {
      let re = constant, im = 0;
      for (let i = 0; i < prepared.length; i++) {
        const p = prepared[i];
        if (p.type === 2) {
          // z⁻¹ = exp(−iω/fs): evaluate the polynomials in z⁻¹.
          const w = (2 * Math.PI * frequencyHz) / p.rate;
          const zr = Math.cos(w), zi = -Math.sin(w);
          polynomial(p.num, zr, zi, a);
          polynomial(p.den, zr, zi, b);
        } else if (p.type === 1) {
          const s = p.sPerHz === 1 ? frequencyHz : 2 * Math.PI * frequencyHz;
          polynomial(p.num, 0, s, a);
          polynomial(p.den, 0, s, b);
        } else {
          const s = p.sPerHz === 1 ? frequencyHz : 2 * Math.PI * frequencyHz;
          rootProduct(p.num, 0, s, a);
          rootProduct(p.den, 0, s, b);
        }
        // h = scale · a / b
        const d = b[0] * b[0] + b[1] * b[1];
        const hr = (p.scale * (a[0] * b[0] + a[1] * b[1])) / d;
        const hi = (p.scale * (a[1] * b[0] - a[0] * b[1])) / d;
        const r = re * hr - im * hi;
        im = re * hi + im * hr;
        re = r;
      }
      out[0] = re;
      out[1] = im;
    },
  };
}

/** Complex response of `meta` at `frequencyHz`, counts per input unit, as {re, im} (convenience; use channelResponse in loops). */
export function responseAt(meta: ChannelMeta, frequencyHz: number, opts: ResponseOptions = {}): { re: number; im: number } {
  if (!(frequencyHz >= 0) || !Number.isFinite(frequencyHz)) throw new RangeError(`frequency must be a finite number >= 0 Hz, got ${frequencyHz}`);
  const out = new Float64Array(2);
  channelResponse(meta, opts).evaluate(frequencyHz, out);
  return { re: out[0], im: out[1] };
}

/**
 * How the stages agree with the stated `InstrumentSensitivity`: the modulus of the evaluated
 * response at the sensitivity's frequency (counts per input unit as written), the product of stage gains, and their ratios to the
 * stated value (1 when consistent). Null when the file gives no sensitivity.
 */
export function sensitivityCheck(meta: ChannelMeta, opts: ResponseOptions = {}): {
  stated: number; frequency: number; evaluated: number; gainProduct: number; evaluatedRatio: number; gainRatio: number;
} | null {
  const s = meta.sensitivity;
  if (!s) return null;
  const r = channelResponse(meta, opts);
  const out = new Float64Array(2);
  r.evaluate(s.frequency, out);
  const evaluated = Math.hypot(out[0], out[1]) * r.metresPerUnit;
  return {
    stated: s.value, frequency: s.frequency, evaluated, gainProduct: r.gainProduct,
    evaluatedRatio: evaluated / Math.abs(s.value), gainRatio: Math.abs(r.gainProduct / s.value),
  };
}

/**
 * Poles of a damped oscillator (seismometer or Wood-Anderson torsion pendulum) with natural period
 * `periodS` seconds and damping `damping` (fraction of critical, 0 < h < 1), rad/s:
 * −h·ω₀ ± i·ω₀·√(1 − h²), ω₀ = 2π / T₀ (e.g. Aki & Richards 2002, Quantitative Seismology, 2nd ed.,
 * §10.2, the pendulum seismometer; from memory).
 */
export function oscillatorPoles(periodS: number, damping: number): { re: number; im: number }[] {
  if (!(periodS > 0) || !Number.isFinite(periodS)) throw new RangeError(`natural period must be > 0 s, got ${periodS}`);
  if (!(damping > 0 && damping < 1)) throw new RangeError(`damping must be in (0, 1), got ${damping}`);
  const w0 = (2 * Math.PI) / periodS;
  const wd = w0 * Math.sqrt(1 - damping * damping);
  return [{ re: -damping * w0, im: wd }, { re: -damping * w0, im: -wd }];
}

/**
 * The normalization factor A0 of a poles-and-zeros stage: 1 / |Π(s − z)/Π(s − p)| at the
 * normalization frequency `fnHz`, with s = i·2π·fn (rad/s) or s = i·fn (Hz) (SEED Reference Manual
 * v2.4, blockette 53; StationXML `NormalizationFactor`).
 */
export function normalizationFactorOf(
  poles: readonly { re: number; im: number }[], zeros: readonly { re: number; im: number }[], fnHz: number,
  transferFunction: 'LAPLACE (RADIANS/SECOND)' | 'LAPLACE (HERTZ)' = 'LAPLACE (RADIANS/SECOND)',
): number {
  if (!(fnHz >= 0) || !Number.isFinite(fnHz)) throw new RangeError(`normalization frequency must be a finite number >= 0 Hz, got ${fnHz}`);
  const s = transferFunction === 'LAPLACE (HERTZ)' ? fnHz : 2 * Math.PI * fnHz;
  const a = new Float64Array(2), b = new Float64Array(2);
  rootProduct(interleave(zeros), 0, s, a);
  rootProduct(interleave(poles), 0, s, b);
  const m = Math.hypot(a[0], a[1]) / Math.hypot(b[0], b[1]);
  if (!(m > 0) || !Number.isFinite(m)) throw new RangeError(`poles and zeros have no finite non-zero response at ${fnHz} Hz (a pole or zero lies there)`);
  return 1 / m;
}
