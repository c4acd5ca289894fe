/**
 * A flat 1-D layered velocity model: constant-speed layers over a half-space.
 *
 * The datum. Every depth in the model and every source depth is in km BELOW the model's reference
 * level (the datum, usually sea level); topKm of the first layer is 0, the datum itself. Station
 * elevations are in km ABOVE the datum. Above the datum the top layer is extended upward, so a
 * station at 1.2 km elevation sits 1.2 km up inside the top layer's speed and a source at -0.8 km
 * (a volcano's edifice) sits 0.8 km up inside it too; the travel-time code then treats source and
 * receiver as two points at two depths in one layered medium (see travelTime.ts).
 *
 * The model file is JSON: `{"layers": [{"topKm": 0, "vp": 5.5, "vs": 3.2}, ...]}` in km and km/s;
 * the last layer is the half-space. Other keys are ignored (room for a name or a note).
 */

/** One layer: its top in km below the datum, its P and S speeds in km/s. */
export interface VelocityLayer {
  readonly topKm: number;
  readonly vp: number;
  readonly vs: number;
}

/** Layers from the datum down; the last one is the half-space. Treated as immutable once used. */
export interface VelocityModel {
  readonly layers: readonly VelocityLayer[];
}

/** A model file that does not describe a valid model: carries the file name and the layer index. */
export class VelocityModelError extends Error {
  /** The file the model came from. */
  readonly fileName: string;
  /** Index of the offending layer, or -1 when the problem is not in one layer. */
  readonly layerIndex: number;
  constructor(fileName: string, layerIndex: number, message: string) {
    super(`${fileName}${layerIndex >= 0 ? `: layer ${layerIndex}` : ''}: ${message}`);
    this.name = 'VelocityModelError';
    this.fileName = fileName;
    this.layerIndex = layerIndex;
  }
}

/** Largest depth accepted for a layer top, km (well below any crust a local network sees). */
export const MAX_LAYER_TOP_KM = 1000;
/** Speeds accepted, km/s (air is 0.34, the fastest upper-mantle rocks near 9). */
export const MIN_SPEED_KM_S = 0.1;
export const MAX_SPEED_KM_S = 20;

/**
 * Checks a list of layers and returns a frozen model, or throws VelocityModelError naming the file
 * and the layer. Rules: at least one layer; the first top is 0 (the datum); tops strictly
 * increase; 0.1 <= vs < vp <= 20 km/s.
 */
export function checkVelocityModel(layers: readonly unknown[], fileName: string): VelocityModel {
  if (layers.length === 0) throw new VelocityModelError(fileName, -1, 'layers is empty; at least one layer (the half-space) is needed');
  const out: VelocityLayer[] = [];
  for (let i = 0; i < layers.length; i++) {
    const l = layers[i];
    if (typeof l !== 'object' || l === null || Array.isArray(l)) {
      throw new VelocityModelError(fileName, i, `must be an object {"topKm", "vp", "vs"}, got ${JSON.stringify(l)}`);
    }
    const rec = l as Record<string, unknown>;
    for (const key of ['topKm', 'vp', 'vs']) {
      const v = rec[key];
      if (typeof v !== 'number' || !Number.isFinite(v)) {
        throw new VelocityModelError(fileName, i, `${key} must be a finite number, got ${JSON.stringify(v)}`);
      }
    }
    const topKm = rec.topKm as number;
    const vp = rec.vp as number;
    const vs = rec.vs as number;
    if (i === 0 && topKm !== 0) throw new VelocityModelError(fileName, i, `topKm of the first layer must be 0 (the datum), got ${topKm}`);
    if (i > 0 && !(topKm > out[i - 1].topKm)) {
      throw new VelocityModelError(fileName, i, `topKm must be greater than the layer above's (${out[i - 1].topKm}), got ${topKm}`);
    }
    if (topKm > MAX_LAYER_TOP_KM) throw new VelocityModelError(fileName, i, `topKm must be at most ${MAX_LAYER_TOP_KM} km, got ${topKm}`);
    if (!(vp >= MIN_SPEED_KM_S && vp <= MAX_SPEED_KM_S)) {
      throw new VelocityModelError(fileName, i, `vp must be in [${MIN_SPEED_KM_S}, ${MAX_SPEED_KM_S}] km/s, got ${vp}`);
    }
    if (!(vs >= MIN_SPEED_KM_S && vs <= MAX_SPEED_KM_S)) {
      throw new VelocityModelError(fileName, i, `vs must be in [${MIN_SPEED_KM_S}, ${MAX_SPEED_KM_S}] km/s, got ${vs}`);
    }
    if (!(vs < vp)) throw new VelocityModelError(fileName, i, `vs must be less than vp (${vp} km/s), got ${vs}`);
    out.push(Object.freeze({ topKm, vp, vs }));
  }
  return Object.freeze({ layers: Object.freeze(out) });
}

/** Parses a model file's JSON text. Errors name the file and, where it applies, the layer index. */
export function parseVelocityModel(json: string, fileName: string): VelocityModel {
  if (typeof json !== 'string') throw new TypeError(`model text must be a string, got ${typeof json}`);
  let doc: unknown;
  try {
    doc = JSON.parse(json);
  } catch (e) {
    throw new VelocityModelError(fileName, -1, `not valid JSON (${(e as Error).message})`);
  }
  if (typeof doc !== 'object' || doc === null || !Array.isArray((doc as { layers?: unknown }).layers)) {
    throw new VelocityModelError(fileName, -1, 'expected an object with a "layers" array');
  }
  return checkVelocityModel((doc as { layers: unknown[] }).layers, fileName);
}

/** The model as model-file JSON text (parseVelocityModel reads it back unchanged). */
export function velocityModelJson(model: VelocityModel): string {
  return JSON.stringify({ layers: model.layers.map((l) => ({ topKm: l.topKm, vp: l.vp, vs: l.vs })) }, null, 2);
}

/**
 * The default model, used when no model file is given: the crust and uppermost mantle of the
 * IASP91 reference Earth model (Kennett & Engdahl 1991, Geophys. J. Int. 105, 429-465): an upper
 * crust of 20 km at vp 5.80 / vs 3.36 km/s, a lower crust of 15 km at 6.50 / 3.75 km/s, and the
 * mantle from the Moho at 35 km, here a half-space at the model's top-of-mantle 8.04 / 4.47 km/s.
 * Values from memory (not re-checked against the paper's table). It is a global average, a
 * generic starting point only: a network should give its own model.
 */
export const DEFAULT_MODEL: VelocityModel = checkVelocityModel([
  { topKm: 0, vp: 5.8, vs: 3.36 },
  { topKm: 20, vp: 6.5, vs: 3.75 },
  { topKm: 35, vp: 8.04, vs: 4.47 },
], 'default model (IASP91 crust)');
