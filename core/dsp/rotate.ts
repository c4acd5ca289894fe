/**
 * Horizontal components to north/east, and north/east to radial/transverse. Angles in degrees.
 * Conventions of the SEED Reference Manual v2.4 and FDSN StationXML: a channel's azimuth is the
 * direction of its positive axis, clockwise from north (north 0, east 90); horizontals have dip 0.
 */
import type { SampleArray } from '../model';
import { checkSamples } from './checkSamples';

const RAD = Math.PI / 180;

/** Smallest |sin| of the angle between two horizontals accepted for rotation (they must not be parallel: 5.7° apart at least). */
export const MIN_SIN_BETWEEN_AXES = 0.1;

function checkAngle(name: string, deg: number): void {
  if (typeof deg !== 'number' || !Number.isFinite(deg)) throw new RangeError(`${name} must be a finite number of degrees, got ${deg}`);
}

function checkPair(a: SampleArray, b: SampleArray, names: string): void {
  checkSamples(a);
  checkSamples(b);
  if (a.length !== b.length) throw new RangeError(`${names} must have the same length, got ${a.length} and ${b.length}`);
}

/**
 * North and east ground motion from two horizontal channels h1, h2 whose positive axes point to
 * azimuths az1, az2 (degrees clockwise from north), e.g. channels 1/2 at 20° and 110°. The channels
 * need not be orthogonal: each records the projection of (N, E) on its axis,
 * h = N·cos(az) + E·sin(az), and the 2×2 system is solved per sample. Throws when the axes are
 * (nearly) parallel.
 */
export function rotateToNorthEast(h1: SampleArray, h2: SampleArray, az1: number, az2: number): { north: Float64Array; east: Float64Array } {
  checkPair(h1, h2, 'the two horizontals');
  checkAngle('azimuth 1', az1);
  checkAngle('azimuth 2', az2);
  const c1 = Math.cos(az1 * RAD), s1 = Math.sin(az1 * RAD);
  const c2 = Math.cos(az2 * RAD), s2 = Math.sin(az2 * RAD);
  const det = c1 * s2 - s1 * c2; // sin(az2 − az1)
  if (!(Math.abs(det) >= MIN_SIN_BETWEEN_AXES)) {
    throw new RangeError(`horizontal azimuths ${az1}° and ${az2}° are too close to parallel to rotate (|sin(az2 − az1)| = ${Math.abs(det).toFixed(3)}, need at least ${MIN_SIN_BETWEEN_AXES})`);
  }
  // Inverse of [[c1, s1], [c2, s2]].
  const nn1 = s2 / det, nn2 = -s1 / det, ee1 = -c2 / det, ee2 = c1 / det;
  const n = h1.length;
  const north = new Float64Array(n);
  const east = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = h1[i], b = h2[i];
    north[i] = nn1 * a + nn2 * b;
    east[i] = ee1 * a + ee2 * b;
  }
  return { north, east };
}

/**
 * Radial and transverse motion from north and east, given the back-azimuth (degrees clockwise from
 * north, the direction from the station towards the source). Radial is positive away from the
 * source (azimuth back-azimuth + 180°), transverse is radial turned 90° clockwise seen from above
 * (azimuth back-azimuth + 270°): R = −N·cos(baz) − E·sin(baz), T = N·sin(baz) − E·cos(baz).
 * So (R, T, down) is right-handed and T is the direction of increasing azimuth about the source, as
 * SH is taken positive in Aki & Richards, Quantitative Seismology, 2nd ed. 2002, chapter 4 (x north,
 * y east, z down; from memory, page not checked). The test checks it with numpy projections.
 */
export function rotateToRadialTransverse(north: SampleArray, east: SampleArray, backAzimuth: number): { radial: Float64Array; transverse: Float64Array } {
  checkPair(north, east, 'north and east');
  checkAngle('back-azimuth', backAzimuth);
  const c = Math.cos(backAzimuth * RAD), s = Math.sin(backAzimuth * RAD);
  const n = north.length;
  const radial = new Float64Array(n);
  const transverse = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = north[i], b = east[i];
    radial[i] = -c * a - s * b;
    transverse[i] = s * a - c * b;
  }
  return { radial, transverse };
}
