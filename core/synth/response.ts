/**
 * Instruments of the scenario as poles and zeros (Laplace transform in rad/s, the SEED/StationXML
 * "LAPLACE (RADIANS/SECOND)" convention) plus stage gains, and the complex response they give.
 *
 * A channel's response to ground motion in its input units (m/s for seismometers, m/s² for
 * accelerometers) is, at frequency f and s = i 2π f:
 *   counts per unit = A0 · Π(s - z) / Π(s - p) · sensorGain · digitizerGain
 * with A0 chosen so that |A0 · Π(s - z)/Π(s - p)| = 1 at the normalization frequency (SEED manual
 * v2.4, blockette 53 notes; StationXML `NormalizationFactor`). The overall sensitivity is then
 * sensorGain · digitizerGain at that frequency.
 */

export interface Cx {
  re: number;
  im: number;
}

/** A sensor plus digitizer, as written to StationXML. */
export interface Instrument {
  /** Short description written as the sensor's `Description`. */
  readonly description: string;
  /** Ground-motion units at the sensor input: 'm/s' or 'm/s**2'. */
  readonly inputUnits: 'm/s' | 'm/s**2';
  /** Poles, rad/s. */
  readonly poles: readonly Cx[];
  /** Zeros, rad/s. */
  readonly zeros: readonly Cx[];
  /** Normalization frequency, Hz. */
  readonly normalizationHz: number;
  /** Sensor gain, V per input unit, at the normalization frequency. */
  readonly sensorGain: number;
  /** Digitizer gain, counts per V. */
  readonly digitizerGain: number;
  /** Largest magnitude of a sample the digitizer can record, counts (it clips there). */
  readonly clipCounts: number;
}

/** Π(s - z) / Π(s - p) at s = i 2π f (without A0 or gains). */
export function polesZerosRatio(poles: readonly Cx[], zeros: readonly Cx[], frequencyHz: number): Cx {
  const w = 2 * Math.PI * frequencyHz;
  let re = 1, im = 0;
  for (const z of zeros) {
    const a = -z.re, b = w - z.im;
    const r = re * a - im * b;
    im = re * b + im * a;
    re = r;
  }
  for (const p of poles) {
    const a = -p.re, b = w - p.im;
    const d = a * a + b * b;
    const r = (re * a + im * b) / d;
    im = (im * a - re * b) / d;
    re = r;
  }
  return { re, im };
}

/** The normalization factor A0 making |A0 · Π(s - z)/Π(s - p)| = 1 at `frequencyHz`. */
export function normalizationFactor(poles: readonly Cx[], zeros: readonly Cx[], frequencyHz: number): number {
  if (!(frequencyHz >= 0)) throw new RangeError(`normalization frequency must be >= 0 Hz, got ${frequencyHz}`);
  const h = polesZerosRatio(poles, zeros, frequencyHz);
  return 1 / Math.hypot(h.re, h.im);
}

/** Overall sensitivity, counts per input unit at the normalization frequency. */
export function sensitivity(inst: Instrument): number {
  return inst.sensorGain * inst.digitizerGain;
}

/** A0 times the overall sensitivity: the factor in front of the poles-and-zeros ratio. */
export function responseScale(inst: Instrument): number {
  return normalizationFactor(inst.poles, inst.zeros, inst.normalizationHz) * sensitivity(inst);
}

/** Complex response in counts per input unit at `frequencyHz`; pass `scale` (responseScale) when calling it in a loop. */
export function instrumentResponse(inst: Instrument, frequencyHz: number, scale = responseScale(inst)): Cx {
  const h = polesZerosRatio(inst.poles, inst.zeros, frequencyHz);
  return { re: h.re * scale, im: h.im * scale };
}

/** Poles of a second-order system with natural frequency `f0` Hz and damping `h` (< 1), rad/s. */
export function oscillatorPoles(f0: number, h: number): Cx[] {
  const w0 = 2 * Math.PI * f0;
  const wd = w0 * Math.sqrt(1 - h * h);
  return [{ re: -h * w0, im: wd }, { re: -h * w0, im: -wd }];
}

/** 24-bit digitizer full scale, counts (±2^23). */
export const FULL_SCALE_24BIT = 8_388_607;
/** A 24-bit digitizer at 40 V peak-to-peak: 2^24 / 40 counts per volt. */
export const DIGITIZER_GAIN_40VPP = 2 ** 24 / 40;

/**
 * Typical instruments (values of the usual kind, invented for the scenario).
 * - Broadband seismometer: 120 s natural period, damping 0.707, a high-frequency pole pair at 80 Hz,
 *   1500 V/(m/s).
 * - Short-period geophone: 1 Hz, damping 0.707, 170 V/(m/s), normalized at 5 Hz.
 * - Force-balance accelerometer: flat to acceleration, pole pair at 150 Hz, 0.51 V/(m/s²) (about 5 V/g).
 */
export function broadbandSensor(digitizerGain = DIGITIZER_GAIN_40VPP, clipCounts = FULL_SCALE_24BIT): Instrument {
  return {
    description: 'broadband seismometer, 120 s, 1500 V/(m/s)', inputUnits: 'm/s',
    poles: [...oscillatorPoles(1 / 120, 0.707), ...oscillatorPoles(80, 0.707)],
    zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }],
    normalizationHz: 1, sensorGain: 1500, digitizerGain, clipCounts,
  };
}

export function shortPeriodSensor(): Instrument {
  return {
    description: 'short-period geophone, 1 Hz, 170 V/(m/s)', inputUnits: 'm/s',
    poles: oscillatorPoles(1, 0.707), zeros: [{ re: 0, im: 0 }, { re: 0, im: 0 }],
    normalizationHz: 5, sensorGain: 170, digitizerGain: DIGITIZER_GAIN_40VPP, clipCounts: FULL_SCALE_24BIT,
  };
}

export function accelerometerSensor(): Instrument {
  return {
    description: 'force-balance accelerometer, 0.51 V/(m/s**2)', inputUnits: 'm/s**2',
    poles: oscillatorPoles(150, 0.707), zeros: [],
    normalizationHz: 1, sensorGain: 0.51, digitizerGain: DIGITIZER_GAIN_40VPP, clipCounts: FULL_SCALE_24BIT,
  };
}
