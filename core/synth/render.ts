/**
 * Renders a station's channels for the scenario's whole span: background noise, then each event's
 * P and S pulses and their codas added in windows around the arrivals only, explosions' Rg waves,
 * then the faults that live in the samples (cultural noise, spikes, reversed polarity, dead channel,
 * clipping at the digitizer's full scale). Faults of the records (gaps, duplicated records, clock
 * offset) are applied when writing (files.ts).
 *
 * Coda (Aki & Chouet 1975, J. Geophys. Res. 80, 3322, single back-scattering): after each direct
 * wave, noise with the wave's own spectrum under the envelope
 *   E(τ) = rise(τ) · (T / (T + τ)) · exp(-π f τ / Qc(f)),   Qc(f) = q0 f^η,
 * τ the time after the arrival, T the travel time, f the wave's dominant frequency
 * 1 / (π t*) clamped to 1-8 Hz, rise(τ) = min(1, τ / 1 s)²; it is cut where it falls below a
 * quarter of the night's noise (at most 150 s). Its RMS starts at 0.1 of the P peak on the
 * vertical (0.4 of that on the horizontals) and 0.12 of the S peak on the horizontals (0.5 of that
 * on the vertical), so the direct waves stay the largest.
 */
import type { ChannelId } from '../model';
import type { Micros } from '../time';
import { componentOf, type Motion } from './geometry';
import { eventAtStation, hashString, packet, type EventAtStation, type WaveArrival } from './arrivals';
import { woodAndersonResponse } from './mlLaw';
import { channelNoise, whiteNoise } from './noise';
import { filteredNoise, nextPow2, pulseSpectrum, timeSeries } from './pulse';
import { instrumentResponse, responseScale, type Cx, type Instrument } from './response';
import type { ChannelSpec, EventSpec, Scenario, StationSpec } from './types';

export interface RenderOptions {
  /** Add background noise (default true). */
  readonly noise?: boolean;
  /** Apply the scenario's sample faults (default true). */
  readonly faults?: boolean;
}

export interface RenderedChannel {
  readonly id: ChannelId;
  readonly spec: ChannelSpec;
  /** Time of sample 0 (true time), µs. */
  readonly start: Micros;
  readonly sampleRate: number;
  /** Counts as the digitizer wrote them (after clipping). */
  readonly samples: Int32Array;
  /** Sample indices where the digitizer clipped (first 1000 at most). */
  readonly clippedAt: readonly number[];
}

export interface RenderedStation {
  readonly station: StationSpec;
  readonly channels: RenderedChannel[];
  /** Every event's geometry and arrivals at this station. */
  readonly events: EventAtStation[];
}

/** Rg (fundamental-mode Rayleigh wave of shallow sources) parameters: dominant 1.0 Hz, Q 60, dispersed. */
const RG_F0 = 1.0;
const RG_SIGMA = 0.35;
const RG_Q = 60;
const RG_ELLIPTICITY = 0.8; // horizontal / vertical
/** Rg phase velocity, km/s: 2.9 at low frequency falling to 2.2 at 2.5 Hz (normal dispersion). */
function rgPhaseVelocity(f: number): number {
  return 2.2 + 0.7 * Math.exp(-f / 0.8);
}
/** Rg windows start at distance / this speed (km/s), faster than any of its group velocities. */
const RG_FRONT_SPEED = 3.2;

/**
 * Rg spectrum (interleaved complex, length 2n) of the vertical (or, `radial`, the horizontal along
 * the path) displacement for a unit scale, sample 0 at distance / 3.2 km/s after the origin.
 */
function rgSpectrum(n: number, fs: number, distanceKm: number, radial: boolean, output: Instrument | 'woodAnderson'): Float64Array {
  const out = new Float64Array(2 * n);
  const t0 = distanceKm / RG_FRONT_SPEED;
  const scale = output === 'woodAnderson' ? 1 : responseScale(output);
  for (let k = 1; k <= n / 2; k++) {
    const f = (k * fs) / n;
    const c = rgPhaseVelocity(f);
    const amp = Math.exp(-0.5 * ((f - RG_F0) / RG_SIGMA) ** 2) * Math.exp((-Math.PI * f * distanceKm) / (c * RG_Q)) / Math.sqrt(Math.max(distanceKm, 1));
    const w = 2 * Math.PI * f;
    let ph = -w * (distanceKm / c - t0);
    if (radial) ph -= Math.PI / 2;
    let re = amp * Math.cos(ph) * (radial ? RG_ELLIPTICITY : 1);
    let im = amp * Math.sin(ph) * (radial ? RG_ELLIPTICITY : 1);
    let r: Cx;
    if (output === 'woodAnderson') r = woodAndersonResponse(f);
    else {
      r = instrumentResponse(output, f, scale);
      const times = output.inputUnits === 'm/s' ? 1 : 2;
      for (let t = 0; t < times; t++) r = { re: -r.im * w, im: r.re * w };
    }
    const rr = re * r.re - im * r.im;
    im = re * r.im + im * r.re;
    re = rr;
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  out[n + 1] = 0;
  for (let k = 1; k < n / 2; k++) {
    out[2 * (n - k)] = out[2 * k];
    out[2 * (n - k) + 1] = -out[2 * k + 1];
  }
  return out;
}

const RG_RATE = 50;
const RG_N = 4096;
/** Length of the Rg window, s: its slowest group arrives well within it up to ~60 km. */
function rgWindowSeconds(distanceKm: number): number {
  return distanceKm / 1.6 - distanceKm / RG_FRONT_SPEED + 20;
}

/** Wood-Anderson peak of the unit Rg radial component at `distanceKm`. */
export function rgWoodAndersonPeak(distanceKm: number): number {
  const x = timeSeries(rgSpectrum(RG_N, RG_RATE, distanceKm, true, 'woodAnderson'), RG_RATE);
  let m = 0;
  for (let i = 0; i < x.length; i++) m = Math.max(m, Math.abs(x[i]));
  return m;
}

/** Level factor of the scenario's evening-to-night curve at time t. */
export function noiseCurveAt(sc: Scenario, t: Micros): number {
  const c = sc.noiseCurve;
  if (c.length === 0) return 1;
  if (t <= c[0].time) return c[0].factor;
  for (let i = 1; i < c.length; i++) {
    if (t <= c[i].time) {
      const a = c[i - 1], b = c[i];
      return a.factor + ((b.factor - a.factor) * (t - a.time)) / (b.time - a.time);
    }
  }
  return c[c.length - 1].factor;
}

function isVertical(c: ChannelSpec): boolean {
  return Math.abs(c.dip) > 45;
}

/** Approximate RMS of a channel's noise in the quiet of the night, counts (for ending codas). */
function nightNoiseCounts(st: StationSpec, ch: ChannelSpec): number {
  const f = 5;
  const r = instrumentResponse(ch.instrument, f);
  let g = Math.hypot(r.re, r.im);
  if (ch.instrument.inputUnits === 'm/s**2') g *= 2 * Math.PI * f;
  return Math.max(st.noise.siteMs * g, selfNoise(ch.instrument));
}

/** Sensor and digitizer self-noise, counts RMS: an accelerometer's is large, a seismometer's is small. */
function selfNoise(inst: Instrument): number {
  return inst.inputUnits === 'm/s**2' ? 2e-5 * inst.sensorGain * inst.digitizerGain : 0;
}

/** Adds `gain · x[j]` at channel sample k0 + j, for j < useLength, tapering the last quarter. */
function addWindow(dst: Float64Array, k0: number, x: Float64Array, gain: number, useLength: number): void {
  if (gain === 0) return;
  const taper = Math.floor(useLength / 4);
  const jStart = Math.max(0, -k0);
  const jEnd = Math.min(useLength, dst.length - k0);
  const t0 = useLength - taper;
  for (let j = jStart; j < jEnd; j++) {
    let v = x[j] * gain;
    if (j >= t0) v *= 0.5 * (1 + Math.cos((Math.PI * (j - t0)) / taper));
    dst[k0 + j] += v;
  }
}

function coefficients(m: Motion, chans: readonly ChannelSpec[]): number[] {
  return chans.map((c) => componentOf(m, c.azimuth, c.dip));
}

function maxAbs(x: Float64Array, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(x[i]));
  return m;
}

/** Coda length, s: until the envelope times `level` falls below `floor` (2 s to 150 s). */
function codaSeconds(travelTime: number, fDom: number, qc: number, level: number, floor: number): number {
  let tau = 2;
  while (tau < 150) {
    const e = (travelTime / (travelTime + tau)) * Math.exp((-Math.PI * fDom * tau) / qc);
    if (e * level < floor) break;
    tau += 1;
  }
  return tau;
}

/** Adds one wave (pulse and coda) of one event to one sensor's channels. */
function addWave(
  sc: Scenario, st: StationSpec, chans: readonly ChannelSpec[], data: Float64Array[], start: Micros,
  w: WaveArrival, seed: number, nextArrival: WaveArrival | null,
): void {
  const fs = chans[0].sampleRate;
  const inst = chans[0].instrument;
  const x = ((w.time - start) * fs) / 1e6;
  const k0 = Math.floor(x);
  const delay = x - k0;
  const n = data[0].length;
  if (k0 >= n) return;
  // The direct pulse.
  const pulseN = nextPow2(Math.ceil(16 * fs));
  const pulse = timeSeries(pulseSpectrum({ sampleRate: fs, n: pulseN, cornerHz: w.cornerHz, tStar: w.tStar, delaySamples: delay, output: { kind: 'instrument', instrument: inst } }), fs);
  if (delay > 0) pulse[0] = 0;
  const coef = coefficients(w.motion, chans);
  const use = Math.floor(pulseN * 0.75);
  const train = new Float64Array(pulseN);
  packet(pulse, w.echoes, fs, train);
  for (let c = 0; c < chans.length; c++) addWindow(data[c], k0, train, coef[c], use);
  // The coda.
  const peak = maxAbs(pulse, use);
  const isP = w.wave === 'P';
  const ref = isP
    ? Math.max(...chans.map((c, i) => (isVertical(c) ? Math.abs(coef[i]) : 0)), 0) || Math.max(...coef.map(Math.abs))
    : Math.max(...chans.map((c, i) => (isVertical(c) ? 0 : Math.abs(coef[i]))), 0) || Math.max(...coef.map(Math.abs));
  const level = (isP ? 0.1 : 0.12) * peak * ref;
  const floor = 0.25 * Math.min(...chans.map((c) => nightNoiseCounts(st, c)));
  const fDom = Math.min(8, Math.max(1, 1 / (Math.PI * w.tStar)));
  const qc = sc.attenuation.codaQ0 * fDom ** sc.attenuation.codaEta;
  let seconds = codaSeconds(w.travelTime, fDom, qc, level, floor);
  if (isP && nextArrival) seconds = Math.max(seconds, (nextArrival.time - w.time) / 1e6 + 2);
  if (level < floor) return;
  const codaLen = Math.ceil(seconds * fs);
  const codaN = nextPow2(codaLen + 64);
  const env = new Float64Array(codaLen);
  for (let j = 0; j < codaLen; j++) {
    const tau = (j - delay) / fs;
    if (tau <= 0) continue;
    const rise = Math.min(1, tau) ** 2;
    env[j] = rise * (w.travelTime / (w.travelTime + tau)) * Math.exp((-Math.PI * fDom * tau) / qc);
  }
  const whites = chans.map((_, c) => {
    const white = new Float64Array(codaN);
    whiteNoise(white, (seed + Math.imul(c + 1, 0x9e3779b1)) >>> 0);
    return white;
  });
  const codas = filteredNoise(pulse, use, whites);
  for (let c = 0; c < chans.length; c++) {
    const coda = codas[c];
    const lc = level * (isVertical(chans[c]) === isP ? 1 : isP ? 0.4 : 0.5);
    for (let j = 0; j < codaLen; j++) coda[j] *= env[j];
    addWindow(data[c], k0, coda, lc, codaLen);
  }
}

/** Adds an explosion's Rg wave to one sensor's channels. */
function addRg(ea: EventAtStation, chans: readonly ChannelSpec[], data: Float64Array[], start: Micros): void {
  const fs = chans[0].sampleRate;
  const d = ea.epicentralKm;
  const t0 = ea.event.origin + Math.round((d / RG_FRONT_SPEED) * 1e6);
  const k0 = Math.round(((t0 - start) * fs) / 1e6);
  const len = Math.ceil(rgWindowSeconds(d) * fs);
  const n = nextPow2(Math.ceil(len * 1.5));
  const z = timeSeries(rgSpectrum(n, fs, d, false, chans[0].instrument), fs);
  const r = timeSeries(rgSpectrum(n, fs, d, true, chans[0].instrument), fs);
  // Causal start: a 1 s half-cosine ramp from the window's first sample.
  const ramp = Math.ceil(fs);
  for (let j = 0; j < ramp; j++) {
    const g = 0.5 * (1 - Math.cos((Math.PI * j) / ramp));
    z[j] *= g;
    r[j] *= g;
  }
  const az = ((ea.backAzimuthDeg + 180) * Math.PI) / 180;
  const radial = { up: 0, north: Math.cos(az), east: Math.sin(az) };
  for (let c = 0; c < chans.length; c++) {
    const ch = chans[c];
    addWindow(data[c], k0, z, ea.rgScale * componentOf({ up: 1, north: 0, east: 0 }, ch.azimuth, ch.dip), len);
    addWindow(data[c], k0, r, ea.rgScale * componentOf(radial, ch.azimuth, ch.dip), len);
  }
}

/** Channels grouped by sensor (location code). */
function sensors(st: StationSpec): ChannelSpec[][] {
  const groups = new Map<string, ChannelSpec[]>();
  for (const c of st.channels) {
    const g = groups.get(c.location) ?? [];
    g.push(c);
    groups.set(c.location, g);
  }
  return [...groups.values()];
}

/** Geometry and arrivals of every scenario event at `st` (no waveforms). */
export function stationEvents(sc: Scenario, st: StationSpec, events: readonly EventSpec[] = sc.events): EventAtStation[] {
  return events.map((ev) => eventAtStation(sc, ev, st, rgWoodAndersonPeak));
}

function keyOf(sc: Scenario, st: StationSpec, c: ChannelSpec): string {
  return `${sc.network.code}.${st.code}.${c.location}.${c.code}`;
}

/** Renders every channel of station `stationCode` over the scenario's span. */
export function renderStation(sc: Scenario, stationCode: string, opts: RenderOptions = {}): RenderedStation {
  const st = sc.stations.find((s) => s.code === stationCode);
  if (!st) throw new RangeError(`station must be one of ${sc.stations.map((s) => s.code).join(', ')}, got "${stationCode}"`);
  if (!(sc.end > sc.start)) throw new RangeError(`scenario end must be after its start, got ${sc.start} to ${sc.end}`);
  const withNoise = opts.noise ?? true;
  const withFaults = opts.faults ?? true;
  const events = stationEvents(sc, st);
  const out: RenderedChannel[] = [];
  for (const chans of sensors(st)) {
    const fs = chans[0].sampleRate;
    const n = Math.round(((sc.end - sc.start) * fs) / 1e6);
    const data: Float64Array[] = [];
    const seconds = Math.ceil(n / fs) + 1;
    const levels = new Float64Array(seconds);
    for (let s = 0; s < seconds; s++) levels[s] = 1 + (noiseCurveAt(sc, sc.start + s * 1e6) - 1) * st.noise.eveningWeight;
    for (const c of chans) {
      const key = keyOf(sc, st, c);
      data.push(withNoise
        ? channelNoise({
          seed: hashString(`${sc.seed}/${key}`), sampleRate: fs, siteMs: st.noise.siteMs, siteBandHz: [0.5, st.noise.siteTopHz],
          microseismMs: st.noise.microseismMs, levelPerSecond: levels, instrument: c.instrument, selfNoiseCounts: selfNoise(c.instrument),
        }, n)
        : new Float64Array(n));
    }
    for (const ea of events) {
      const seed = hashString(`${sc.seed}/${ea.event.id}/${st.code}/${chans[0].location}`);
      addWave(sc, st, chans, data, sc.start, ea.p, seed, ea.s);
      addWave(sc, st, chans, data, sc.start, ea.s, seed ^ 0x68e31da4, null);
      if (ea.event.type === 'explosion') addRg(ea, chans, data, sc.start);
    }
    for (let c = 0; c < chans.length; c++) {
      const spec = chans[c];
      const key = keyOf(sc, st, spec);
      const x = data[c];
      if (withFaults) applySampleFaults(sc, st, spec, key, x);
      const clip = spec.instrument.clipCounts;
      const samples = new Int32Array(n);
      const clippedAt: number[] = [];
      const dead = withFaults ? sc.faults.find((f) => f.kind === 'deadChannel' && f.channel === key) : undefined;
      if (dead && dead.kind === 'deadChannel') samples.fill(dead.value);
      else {
        quantize(x, clip, samples, clippedAt);
      }
      out.push({
        id: { network: sc.network.code, station: st.code, location: spec.location, channel: spec.code },
        spec, start: sc.start, sampleRate: fs, samples, clippedAt,
      });
    }
  }
  return { station: st, channels: out, events };
}

/** Rounds floating counts to integers, clipping at ±clip; notes the first 1000 clipped indices. */
function quantize(x: Float64Array, clip: number, samples: Int32Array, clippedAt: number[]): void {
  const n = x.length;
  for (let i = 0; i < n; i++) {
    const v = x[i];
    if (v >= clip || v <= -clip) {
      if (clippedAt.length < 1000) clippedAt.push(i);
      samples[i] = v > 0 ? clip : -clip;
    } else {
      // Round half away from zero; |v| < 2^31 here, so | 0 truncates exactly.
      samples[i] = v >= 0 ? (v + 0.5) | 0 : -((0.5 - v) | 0);
    }
  }
}

/** Cultural noise, spikes and reversed polarity, in place, on the floating counts of one channel. */
function applySampleFaults(sc: Scenario, st: StationSpec, spec: ChannelSpec, key: string, x: Float64Array): void {
  const fs = spec.sampleRate;
  for (const f of sc.faults) {
    if (f.kind === 'culturalBurst' && f.station === st.code) {
      const r = instrumentResponse(spec.instrument, f.toneHz);
      let g = Math.hypot(r.re, r.im) * f.velocityMs;
      if (spec.instrument.inputUnits === 'm/s**2') g *= 2 * Math.PI * f.toneHz;
      const i0 = Math.max(0, Math.round(((f.start - sc.start) * fs) / 1e6));
      const i1 = Math.min(x.length, Math.round(((f.end - sc.start) * fs) / 1e6));
      const ramp = 20 * fs;
      const white = new Float64Array(Math.max(0, i1 - i0));
      whiteNoise(white, hashString(`${sc.seed}/${key}/burst`));
      const phase = (hashString(key) % 628) / 100;
      // A machine: a tone and its second harmonic, slowly wandering in pitch, switching on and off
      // in 3-9 s bursts, with broadband rattle.
      for (let i = i0; i < i1; i++) {
        const t = (i - i0) / fs;
        const edge = Math.min(1, (i - i0) / ramp, (i1 - i) / ramp);
        const onOff = 0.5 + 0.5 * Math.sin((2 * Math.PI * t) / 11 + 0.7 * Math.sin((2 * Math.PI * t) / 37));
        const f0 = f.toneHz * (1 + 0.03 * Math.sin((2 * Math.PI * t) / 53));
        const tone = Math.sin(2 * Math.PI * f0 * t + phase) + 0.4 * Math.sin(4 * Math.PI * f0 * t);
        x[i] += g * edge * onOff * onOff * (tone + 0.5 * white[i - i0]);
      }
    } else if (f.kind === 'spike' && f.channel === key) {
      const i = Math.round(((f.time - sc.start) * fs) / 1e6);
      if (i >= 0 && i < x.length) x[i] += f.counts;
    }
  }
  if (sc.faults.some((f) => f.kind === 'reversedPolarity' && f.channel === key)) {
    for (let i = 0; i < x.length; i++) x[i] = -x[i];
  }
}
