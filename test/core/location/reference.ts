// Reference helpers shared by the location tests: a seeded random generator (mulberry32, a public
// domain generator by Tommy Ettinger), Gaussian deviates (Box-Muller) and Vincenty's geodesic.

export { rng } from '../../support/random';

/** Standard normal deviates from a uniform generator (Box-Muller transform). */
export function gaussian(uniform: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

/**
 * Vincenty's inverse formula on the WGS84 ellipsoid (T. Vincenty 1975, "Direct and inverse solutions
 * of geodesics on the ellipsoid with application of nested equations", Survey Review 23(176), 88-93;
 * transcribed from memory; projection.test.ts checks it against a published worked example). Returns km.
 */
export function vincentyKm(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const a = 6378137;
  const f = 1 / 298.257223563;
  const b = a * (1 - f);
  const r = Math.PI / 180;
  const L = (lon2 - lon1) * r;
  const U1 = Math.atan((1 - f) * Math.tan(lat1 * r));
  const U2 = Math.atan((1 - f) * Math.tan(lat2 * r));
  const sU1 = Math.sin(U1); const cU1 = Math.cos(U1);
  const sU2 = Math.sin(U2); const cU2 = Math.cos(U2);
  let lambda = L;
  let sinS = 0; let cosS = 0; let sigma = 0; let cos2a = 0; let cos2sm = 0;
  for (let i = 0; i < 200; i++) {
    const sl = Math.sin(lambda); const cl = Math.cos(lambda);
    sinS = Math.hypot(cU2 * sl, cU1 * sU2 - sU1 * cU2 * cl);
    if (sinS === 0) return 0;
    cosS = sU1 * sU2 + cU1 * cU2 * cl;
    sigma = Math.atan2(sinS, cosS);
    const sinA = cU1 * cU2 * sl / sinS;
    cos2a = 1 - sinA * sinA;
    cos2sm = cos2a === 0 ? 0 : cosS - 2 * sU1 * sU2 / cos2a;
    const C = f / 16 * cos2a * (4 + f * (4 - 3 * cos2a));
    const prev = lambda;
    lambda = L + (1 - C) * f * sinA * (sigma + C * sinS * (cos2sm + C * cosS * (-1 + 2 * cos2sm * cos2sm)));
    if (Math.abs(lambda - prev) < 1e-13) break;
  }
  const u2 = cos2a * (a * a - b * b) / (b * b);
  const A = 1 + u2 / 16384 * (4096 + u2 * (-768 + u2 * (320 - 175 * u2)));
  const B = u2 / 1024 * (256 + u2 * (-128 + u2 * (74 - 47 * u2)));
  const dS = B * sinS * (cos2sm + B / 4 * (cosS * (-1 + 2 * cos2sm * cos2sm) - B / 6 * cos2sm * (-3 + 4 * sinS * sinS) * (-3 + 4 * cos2sm * cos2sm)));
  return b * A * (sigma - dS) / 1000;
}

