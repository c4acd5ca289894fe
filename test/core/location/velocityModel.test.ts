import { describe, expect, it } from 'vitest';
import {
  DEFAULT_MODEL, VelocityModelError, checkVelocityModel, parseVelocityModel, velocityModelJson,
} from '../../../core/location/velocityModel';

const good = '{"name": "two layers", "layers": [{"topKm": 0, "vp": 5.5, "vs": 3.2}, {"topKm": 12.5, "vp": 6.3, "vs": 3.64}, {"topKm": 31, "vp": 7.9, "vs": 4.5}]}';

function errorOf(json: string): VelocityModelError {
  try {
    parseVelocityModel(json, 'net.model.json');
  } catch (e) {
    if (e instanceof VelocityModelError) return e;
    throw e;
  }
  throw new Error('expected a VelocityModelError');
}

describe('velocityModel', () => {
  it('parseVelocityModel reads the layers in km and km/s and ignores other keys', () => {
    const m = parseVelocityModel(good, 'net.model.json');
    expect(m.layers).toEqual([
      { topKm: 0, vp: 5.5, vs: 3.2 }, { topKm: 12.5, vp: 6.3, vs: 3.64 }, { topKm: 31, vp: 7.9, vs: 4.5 },
    ]);
    expect(Object.isFrozen(m.layers)).toBe(true);
    expect(Object.isFrozen(m.layers[1])).toBe(true);
  });

  it('velocityModelJson writes text that parseVelocityModel reads back unchanged', () => {
    const m = parseVelocityModel(good, 'a.json');
    expect(parseVelocityModel(velocityModelJson(m), 'b.json')).toEqual(m);
  });

  it('a single layer is a valid model (a half-space)', () => {
    expect(parseVelocityModel('{"layers":[{"topKm":0,"vp":6,"vs":3.5}]}', 'h.json').layers.length).toBe(1);
  });

  it('errors name the file and the layer index', () => {
    const e = errorOf('{"layers": [{"topKm": 0, "vp": 5.5, "vs": 3.2}, {"topKm": 10, "vp": 6, "vs": 6.5}]}');
    expect(e.fileName).toBe('net.model.json');
    expect(e.layerIndex).toBe(1);
    expect(e.message).toBe('net.model.json: layer 1: vs must be less than vp (6 km/s), got 6.5');
  });

  it('the first layer must start at the datum (topKm 0)', () => {
    const e = errorOf('{"layers": [{"topKm": 1, "vp": 5.5, "vs": 3.2}]}');
    expect([e.layerIndex, e.message]).toEqual([0, 'net.model.json: layer 0: topKm of the first layer must be 0 (the datum), got 1']);
  });

  it('layer tops must strictly increase', () => {
    for (const top of [5, 3]) {
      const e = errorOf(`{"layers": [{"topKm": 0, "vp": 5, "vs": 3}, {"topKm": 5, "vp": 6, "vs": 3.5}, {"topKm": ${top}, "vp": 7, "vs": 4}]}`);
      expect(e.layerIndex).toBe(2);
      expect(e.message).toContain(`topKm must be greater than the layer above's (5), got ${top}`);
    }
  });

  it('speeds must be positive numbers in range', () => {
    expect(errorOf('{"layers": [{"topKm": 0, "vp": -5, "vs": 3}]}').message).toContain('vp must be in [0.1, 20] km/s, got -5');
    expect(errorOf('{"layers": [{"topKm": 0, "vp": 5, "vs": 0}]}').message).toContain('vs must be in [0.1, 20] km/s, got 0');
    expect(errorOf('{"layers": [{"topKm": 0, "vp": "5", "vs": 3}]}').message).toContain('vp must be a finite number, got "5"');
    expect(errorOf('{"layers": [{"topKm": 0, "vs": 3}]}').message).toContain('vp must be a finite number, got undefined');
  });

  it('malformed files give a VelocityModelError without a layer index', () => {
    for (const text of ['{"layers": ', '[]', '{"layers": {}}', '{"layers": []}']) {
      const e = errorOf(text);
      expect(e.layerIndex).toBe(-1);
      expect(e.message.startsWith('net.model.json: ')).toBe(true);
    }
    expect(errorOf('{"layers": [3]}').layerIndex).toBe(0);
  });

  it('checkVelocityModel names the source given for a model built in code', () => {
    expect(() => checkVelocityModel([{ topKm: 0, vp: 5, vs: 5 }], 'scenario model')).toThrow('scenario model: layer 0: vs must be less than vp');
  });

  it('DEFAULT_MODEL is the IASP91 crust over a mantle half-space (Kennett & Engdahl 1991, from memory)', () => {
    expect(DEFAULT_MODEL.layers).toEqual([
      { topKm: 0, vp: 5.8, vs: 3.36 }, { topKm: 20, vp: 6.5, vs: 3.75 }, { topKm: 35, vp: 8.04, vs: 4.47 },
    ]);
    // Common practice: crustal Vp/Vs near 1.73 (sqrt 3, a Poisson solid).
    for (const l of DEFAULT_MODEL.layers) {
      expect(l.vp / l.vs).toBeGreaterThan(1.70);
      expect(l.vp / l.vs).toBeLessThan(1.80);
    }
  });
});
