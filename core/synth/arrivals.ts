/**
 * Where, when and how strongly each event's P and S reach a station: travel times and ray angles
 * from the shared first-arrival code (core/location/travelTime), radiation from the double couple
 * (radiation.ts), ground motion from the ray geometry (geometry.ts), and the amplitude scale from
 * the scenario's local-magnitude law (mlLaw.ts).
 *
 * Amplitude calibration. The far-field displacement of P and S is proportional to F_P / α³ and
 * F_S / β³ (Aki & Richards 2002, eq. 4.32; α, β at the source). A common factor K is then chosen per
 * event and station so that the peak of the direct S wave simulated on a Wood-Anderson instrument
 * (mlLaw.ts), on the larger of the station's horizontal components (north and east when it has
 * none), equals the law's amplitude for the event's ML at that hypocentral distance, times the
 * station's amplitude term. P keeps its physical ratio to S. To keep S measurable everywhere (a real
 * crust scatters energy into S nodes) the S radiation's length sqrt(F_SV² + F_SH²) is raised to at
 * least 0.35, keeping its direction.
 *
 * Each direct wave arrives as a short packet: the pulse plus five later, weaker copies (multipathing
 * and near-receiver reverberation; delays 0.08-1.8 s, amplitudes 0.25-0.55 times exp(-delay / 1.2 s),
 * random signs, all drawn from the seed), so a wave looks like a wave train and not a single spike.
 * The copies come after the onset, so the first motion is the direct wave's; the Wood-Anderson
 * calibration is made on the whole packet.
 *
 * Explosions: isotropic P (F_P = 1, compressional first motion everywhere), weak S (F_SV, F_SH of
 * ±0.12 with signs drawn from the seed), and a strong low-frequency Rg wave (render.ts); the law is
 * then met by the Rg wave's Wood-Anderson peak on the horizontals, and the P wave's Wood-Anderson
 * peak on the vertical is set to 0.35 of it.
 */
import { firstArrival } from '../location/travelTime';
import type { VelocityModel } from '../location/velocityModel';
import { addSeconds, type Micros } from '../time';
import { componentOf, distanceAzimuth, rayMotion, type Motion } from './geometry';
import { woodAndersonAmplitudeNm } from './mlLaw';
import { synthesizePulse } from './pulse';
import { doubleCoupleRadiation, type Radiation } from './radiation';
import { Rng } from './random';
import { bruneCornerFrequency, momentFromMagnitude, P_TO_S_CORNER_RATIO } from './source';
import type { EventSpec, Scenario, StationSpec } from './types';

/**
 * Speeds of the weathered layer just under every station, km/s (common practice: a few hundred
 * metres of rock at 2-3 km/s for P). The travel-time model has no such layer, and its small delay is
 * left out of the times; but it bends every arriving ray towards the vertical (Snell's law with the
 * ray parameter p: sin j = p v), which is why P is strongest on the vertical and S on the
 * horizontals. Waves are projected onto the components with this incidence j, always from below.
 */
export const NEAR_SURFACE_VP = 2.5;
export const NEAR_SURFACE_VS = 1.44;

/** Incidence from the vertical at the station, degrees, for ray parameter `p` (s/km) in the weathered layer of speed `v`. */
export function surfaceIncidence(p: number, v: number): number {
  return (Math.asin(Math.min(1, Math.abs(p) * v)) * 180) / Math.PI;
}

/** Smallest S radiation length used (see the module comment). */
export const S_RADIATION_FLOOR = 0.35;
/** Explosions: |F_SV| = |F_SH| of the weak S. */
export const EXPLOSION_S_RADIATION = 0.12;
/** Explosions: the P wave's Wood-Anderson peak on the vertical relative to the law's amplitude. */
export const EXPLOSION_P_TO_LAW = 0.35;

export interface WaveArrival {
  readonly wave: 'P' | 'S';
  /** Phase name from the travel-time code: 'Pg', 'Pn', 'Sg', 'Sn', 'P1', ... */
  readonly phase: string;
  /** True arrival time, µs. */
  readonly time: Micros;
  /** Travel time, s. */
  readonly travelTime: number;
  readonly takeoffDeg: number;
  /** Incidence at the station from the vertical, through the weathered layer (see NEAR_SURFACE_VP), degrees. */
  readonly incidenceDeg: number;
  /** Source corner frequency, Hz. */
  readonly cornerHz: number;
  /** Path and site t*, s. */
  readonly tStar: number;
  /** Ground displacement of the wave's unit-area pulse (m·s): multiply by the pulse shape to get metres. */
  readonly motion: Motion;
  /** The later copies of the pulse in the wave's packet: delay after the onset (s) and relative amplitude. */
  readonly echoes: readonly Echo[];
}

export interface Echo {
  readonly delay: number;
  readonly amplitude: number;
}

/** The packet's copies for one wave, drawn from `rng`. */
export function drawEchoes(rng: Rng): Echo[] {
  const out: Echo[] = [];
  for (let i = 0; i < 5; i++) {
    const delay = rng.uniform(0.08, 1.8);
    const amplitude = rng.uniform(0.25, 0.55) * Math.exp(-delay / 1.2) * (rng.next() < 0.5 ? -1 : 1);
    out.push({ delay, amplitude });
  }
  return out.sort((a, b) => a.delay - b.delay);
}

/** Adds the packet of `pulse` (sampled at `fs`) into `out`: the pulse plus its echoes, each shifted by whole samples. */
export function packet(pulse: Float64Array, echoes: readonly Echo[], fs: number, out: Float64Array): void {
  const n = Math.min(pulse.length, out.length);
  for (let i = 0; i < n; i++) out[i] = pulse[i];
  for (const e of echoes) {
    const shift = Math.round(e.delay * fs);
    for (let i = shift; i < n; i++) out[i] += e.amplitude * pulse[i - shift];
  }
}

export interface EventAtStation {
  readonly event: EventSpec;
  readonly station: StationSpec;
  readonly epicentralKm: number;
  readonly hypocentralKm: number;
  /** Azimuth from the event to the station, degrees. */
  readonly azimuthDeg: number;
  /** Azimuth from the station to the event, degrees. */
  readonly backAzimuthDeg: number;
  /** Radiation coefficients used (S raised to the floor; explosion values as stated above). */
  readonly radiation: Radiation;
  readonly p: WaveArrival;
  readonly s: WaveArrival;
  /** The law's Wood-Anderson amplitude for this event at this station (with the station term), nm. */
  readonly lawAmplitudeNm: number;
  /** Explosions only: scale (m·s) of the Rg wave's unit pulse on the vertical. */
  readonly rgScale: number;
}

/** P and S speeds (km/s) of the layer holding `depthKm` (a depth on an interface belongs to the layer above). */
export function speedsAt(model: VelocityModel, depthKm: number): { vp: number; vs: number } {
  const layers = model.layers;
  let i = 0;
  while (i + 1 < layers.length && layers[i + 1].topKm < depthKm) i++;
  return { vp: layers[i].vp, vs: layers[i].vs };
}

/** The station's horizontal channels of its first sensor, or north and east when it has none. */
export function horizontalOrientations(station: StationSpec): { azimuth: number; dip: number }[] {
  const first = station.channels[0]?.location;
  const h = station.channels.filter((c) => c.location === first && Math.abs(c.dip) < 45);
  return h.length > 0 ? h.map((c) => ({ azimuth: c.azimuth, dip: c.dip })) : [{ azimuth: 0, dip: 0 }, { azimuth: 90, dip: 0 }];
}

/** Sample rate and FFT length used for the Wood-Anderson calibration pulses. */
const CAL_RATE = 200;
const CAL_N = 4096;

function peakAbs(x: Float64Array): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const a = Math.abs(x[i]);
    if (a > m) m = a;
  }
  return m;
}

/** Peak of the Wood-Anderson record of a unit-area pulse's packet with this corner and t*, m per m·s. */
function woodAndersonPeak(cornerHz: number, tStar: number, echoes: readonly Echo[]): number {
  const wa = synthesizePulse({ sampleRate: CAL_RATE, n: CAL_N, cornerHz, tStar, delaySamples: 0, output: { kind: 'woodAnderson' } });
  const p = new Float64Array(wa.length);
  packet(wa, echoes, CAL_RATE, p);
  return peakAbs(p);
}

function maxHorizontal(m: Motion, station: StationSpec): number {
  let best = 0;
  for (const o of horizontalOrientations(station)) best = Math.max(best, Math.abs(componentOf(m, o.azimuth, o.dip)));
  return best;
}

/** Rg wave: Wood-Anderson peak of its unit radial pulse (see rgSpectrum in render.ts), supplied by the renderer. */
export type RgWoodAndersonPeak = (epicentralKm: number) => number;

/**
 * Everything about one event at one station.
 * @param rgPeak for explosions: the Wood-Anderson peak of the unit Rg wave's radial component
 */
export function eventAtStation(sc: Scenario, ev: EventSpec, st: StationSpec, rgPeak: RgWoodAndersonPeak): EventAtStation {
  const da = distanceAzimuth(ev.latitude, ev.longitude, st.latitude, st.longitude);
  const elevKm = st.elevationM / 1000;
  const ttP = firstArrival(sc.model, 'P', da.distanceKm, ev.depthKm, elevKm);
  const ttS = firstArrival(sc.model, 'S', da.distanceKm, ev.depthKm, elevKm);
  const hypocentralKm = Math.hypot(da.distanceKm, ev.depthKm + elevKm);
  const { vp, vs } = speedsAt(sc.model, ev.depthKm);
  let radiation: Radiation;
  if (ev.mechanism) {
    const rp = doubleCoupleRadiation(ev.mechanism, ttP.takeoffDeg, da.azimuthDeg).p;
    const rs = doubleCoupleRadiation(ev.mechanism, ttS.takeoffDeg, da.azimuthDeg);
    let { sv, sh } = rs;
    const len = Math.hypot(sv, sh);
    if (len < S_RADIATION_FLOOR) {
      if (len === 0) sv = S_RADIATION_FLOOR;
      else {
        sv *= S_RADIATION_FLOOR / len;
        sh *= S_RADIATION_FLOOR / len;
      }
    }
    radiation = { p: rp, sv, sh };
  } else {
    // Signs of the weak S drawn per event and station, so they are fixed by the seed.
    const rng = new Rng(sc.seed, hashString(`${ev.id}/${st.code}`));
    radiation = { p: 1, sv: EXPLOSION_S_RADIATION * (rng.next() < 0.5 ? -1 : 1), sh: EXPLOSION_S_RADIATION * (rng.next() < 0.5 ? -1 : 1) };
  }
  const fcS = bruneCornerFrequency(momentFromMagnitude(ev.magnitude), sc.stressDropPa, vs * 1000);
  const fcP = P_TO_S_CORNER_RATIO * fcS;
  const tStarP = ttP.time / sc.attenuation.qP + st.kappaS;
  const tStarS = ttS.time / sc.attenuation.qS + st.kappaS;
  const echoRng = new Rng(sc.seed, hashString(`${ev.id}/${st.code}/echoes`));
  const echoesP = drawEchoes(echoRng);
  const echoesS = drawEchoes(echoRng);
  const lawAmplitudeNm = woodAndersonAmplitudeNm(ev.magnitude, Math.min(1000, hypocentralKm)) * 10 ** st.amplitudeTermLog10;
  const lawM = lawAmplitudeNm * 1e-9;

  const incP = surfaceIncidence(ttP.slownessH, NEAR_SURFACE_VP);
  const incS = surfaceIncidence(ttS.slownessH, NEAR_SURFACE_VS);
  const unitS = rayMotion(0, radiation.sv / vs ** 3, radiation.sh / vs ** 3, incS, da.backAzimuthDeg);
  const unitP = rayMotion(radiation.p / vp ** 3, 0, 0, incP, da.backAzimuthDeg);
  let k: number;
  let kP: number;
  let rgScale = 0;
  if (ev.mechanism) {
    k = lawM / (maxHorizontal(unitS, st) * woodAndersonPeak(fcS, tStarS, echoesS));
    kP = k;
  } else {
    const az = ((da.backAzimuthDeg + 180) * Math.PI) / 180;
    const radial = { up: 0, north: Math.cos(az), east: Math.sin(az) };
    rgScale = lawM / (maxHorizontal(radial, st) * rgPeak(da.distanceKm));
    kP = (EXPLOSION_P_TO_LAW * lawM) / (Math.abs(unitP.up) * woodAndersonPeak(fcP, tStarP, echoesP));
    // Weak S: the same displacement scale as P, so S/P follows the radiation ratio (0.12 / 1) × (α/β)³.
    k = kP;
  }
  const scale = (m: Motion, f: number): Motion => ({ up: m.up * f, north: m.north * f, east: m.east * f });
  return {
    event: ev, station: st, epicentralKm: da.distanceKm, hypocentralKm,
    azimuthDeg: da.azimuthDeg, backAzimuthDeg: da.backAzimuthDeg, radiation, lawAmplitudeNm, rgScale,
    p: {
      wave: 'P', phase: ttP.phase, time: addSeconds(ev.origin, ttP.time), travelTime: ttP.time,
      takeoffDeg: ttP.takeoffDeg, incidenceDeg: incP, cornerHz: fcP, tStar: tStarP, motion: scale(unitP, kP), echoes: echoesP,
    },
    s: {
      wave: 'S', phase: ttS.phase, time: addSeconds(ev.origin, ttS.time), travelTime: ttS.time,
      takeoffDeg: ttS.takeoffDeg, incidenceDeg: incS, cornerHz: fcS, tStar: tStarS, motion: scale(unitS, k), echoes: echoesS,
    },
  };
}

/** A 32-bit hash of a string (FNV-1a), for per-item seeds. */
export function hashString(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}
