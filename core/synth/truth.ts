/**
 * The truth file: every event (type, origin, magnitude, mechanism) and every arrival at every
 * station (phase, true time, time as tagged by the station's clock, first-motion polarity, SNR
 * measured on the written trace), plus the faults. Only tests and a compare-with-truth report read
 * it; the app never uses it to pick.
 *
 * SNR (the scenario's own definition): on the samples as written (counts), band-passed 1-20 Hz
 * (Butterworth, 4 poles each side, causal, core/dsp; the upper corner is lowered to 0.45 of the
 * sample rate when 20 Hz is above it), the RMS of the 1 s after the arrival over the RMS of the 5 s
 * before it. P is measured on the vertical of the station's first sensor; S on its horizontals
 * together (the square root of the summed mean squares), or on the vertical when it has none.
 *
 * Polarity: for P the direction of the ground's first motion on the vertical ('positive' = up), which
 * is the sign of the P radiation; for S the direction of the SH first motion on the transverse
 * component (positive = 90° clockwise from the direction away from the source). A channel with
 * reversed polarity records the opposite; such arrivals name the channel in `reversedChannels`.
 */
import { butterworth } from '../dsp/butterworth';
import { sosfilt } from '../dsp/sosfilt';
import { isoFromMicros, type Micros } from '../time';
import type { EventAtStation, WaveArrival } from './arrivals';
import { IASPEI_LAW_TEXT } from './lawText';
import type { RenderedChannel, RenderedStation } from './render';
import type { Scenario } from './types';

export type Polarity = 'positive' | 'negative';

export interface TruthArrival {
  readonly station: string;
  readonly wave: 'P' | 'S';
  readonly phase: string;
  /** True arrival time. */
  readonly time: string;
  readonly timeMicros: Micros;
  /** Time at which it appears in the station's (possibly wrong) time tags. */
  readonly recordedTime: string;
  readonly polarity: Polarity;
  /** Null when the arrival falls in a gap or on a dead channel. */
  readonly snr: number | null;
  readonly epicentralKm: number;
  readonly hypocentralKm: number;
  readonly azimuthDeg: number;
  readonly backAzimuthDeg: number;
  readonly takeoffDeg: number;
  readonly incidenceDeg: number;
  /** The radiation coefficient behind the polarity (F_P, or F_SH for S). */
  readonly radiation: number;
  /** Wood-Anderson peak the ML law gives at this station (S only), nm. */
  readonly lawAmplitudeNm?: number;
  readonly clipped: boolean;
  readonly inGap: boolean;
  readonly reversedChannels: readonly string[];
}

export interface TruthEvent {
  readonly id: string;
  readonly type: string;
  readonly note?: string;
  readonly origin: { readonly time: string; readonly timeMicros: Micros; readonly latitude: number; readonly longitude: number; readonly depthKm: number };
  readonly magnitude: { readonly value: number; readonly type: 'ML' };
  readonly mechanism: { readonly strike: number; readonly dip: number; readonly rake: number } | null;
  readonly arrivals: TruthArrival[];
}

export interface Truth {
  readonly caution: string;
  readonly scenario: Record<string, unknown>;
  readonly events: TruthEvent[];
  readonly faults: readonly Record<string, unknown>[];
}

const SNR_BAND: [number, number] = [1, 20];

function rmsOf(x: Float64Array, from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += x[i] * x[i];
  return Math.sqrt(s / Math.max(1, to - from));
}

/** Mean squares before (5 s) and after (1 s) sample position `at` of a channel, band-passed 1-20 Hz. */
function meanSquares(rc: RenderedChannel, at: number): { before: number; after: number } | null {
  const fs = rc.sampleRate;
  const pad = Math.round(30 * fs);
  const from = at - Math.round(5 * fs) - pad;
  const to = at + Math.round(fs);
  if (from < 0 || to > rc.samples.length) return null;
  const x = new Float64Array(to - from);
  for (let i = 0; i < x.length; i++) x[i] = rc.samples[from + i];
  const y = sosfilt(butterworth(4, [SNR_BAND[0], Math.min(SNR_BAND[1], 0.45 * fs)], 'bandpass', fs), x);
  const a = at - from;
  return { before: rmsOf(y, a - Math.round(5 * fs), a) ** 2, after: rmsOf(y, a, a + Math.round(fs)) ** 2 };
}

/** SNR of an arrival at time `t` on channels `chans` (mean squares summed over them). */
export function measureSnr(chans: readonly RenderedChannel[], t: Micros): number | null {
  let before = 0, after = 0;
  for (const rc of chans) {
    const at = Math.round(((t - rc.start) * rc.sampleRate) / 1e6);
    const m = meanSquares(rc, at);
    if (!m) return null;
    before += m.before;
    after += m.after;
  }
  if (before === 0) return null;
  return Math.sqrt(after / before);
}

function polarityOf(v: number): Polarity {
  return v >= 0 ? 'positive' : 'negative';
}

/** The truth's arrivals of one rendered station. */
export function stationTruth(sc: Scenario, rs: RenderedStation): Map<string, TruthArrival[]> {
  const st = rs.station;
  const firstLoc = st.channels[0].location;
  const first = rs.channels.filter((c) => c.id.location === firstLoc);
  const vertical = first.filter((c) => Math.abs(c.spec.dip) > 45);
  const horizontals = first.filter((c) => Math.abs(c.spec.dip) <= 45);
  const key = (c: RenderedChannel) => `${c.id.network}.${c.id.station}.${c.id.location}.${c.id.channel}`;
  const dead = new Set(sc.faults.flatMap((f) => (f.kind === 'deadChannel' ? [f.channel] : [])));
  const reversed = rs.channels.map(key).filter((k) => sc.faults.some((f) => f.kind === 'reversedPolarity' && f.channel === k));
  const gaps = sc.faults.filter((f) => f.kind === 'gap' && f.station === st.code);
  const clocks = sc.faults.filter((f) => f.kind === 'clockOffset' && f.station === st.code);
  const out = new Map<string, TruthArrival[]>();
  const one = (ea: EventAtStation, w: WaveArrival): TruthArrival => {
    const inGap = gaps.some((g) => g.kind === 'gap' && w.time >= g.start - 5e6 && w.time < g.end + 1e6);
    const clock = clocks.find((c) => c.kind === 'clockOffset' && w.time >= c.start && w.time < c.end);
    const offset = clock && clock.kind === 'clockOffset' ? clock.offsetMicros : 0;
    let chans = w.wave === 'P' || horizontals.length === 0 ? vertical : horizontals;
    chans = chans.filter((c) => !dead.has(key(c)));
    const snr = inGap || chans.length === 0 ? null : measureSnr(chans, w.time);
    const clipped = rs.channels.some((c) => {
      const a = Math.round(((w.time - c.start) * c.sampleRate) / 1e6);
      return c.clippedAt.some((i) => i >= a && i < a + 10 * c.sampleRate);
    });
    const radiation = w.wave === 'P' ? ea.radiation.p : ea.radiation.sh;
    const transverse = w.wave === 'S' ? radiation : 0;
    return {
      station: st.code, wave: w.wave, phase: w.phase,
      time: isoFromMicros(w.time), timeMicros: w.time, recordedTime: isoFromMicros(w.time + offset),
      polarity: polarityOf(w.wave === 'P' ? w.motion.up : transverse),
      snr: snr === null ? null : Math.round(snr * 100) / 100,
      epicentralKm: round3(ea.epicentralKm), hypocentralKm: round3(ea.hypocentralKm),
      azimuthDeg: round3(ea.azimuthDeg), backAzimuthDeg: round3(ea.backAzimuthDeg),
      takeoffDeg: round3(w.takeoffDeg), incidenceDeg: round3(w.incidenceDeg), radiation: round3(radiation),
      ...(w.wave === 'S' ? { lawAmplitudeNm: Math.round(ea.lawAmplitudeNm * 1000) / 1000 } : {}),
      clipped, inGap, reversedChannels: reversed,
    };
  };
  for (const ea of rs.events) out.set(ea.event.id, [one(ea, ea.p), one(ea, ea.s)]);
  return out;
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/** Assembles the truth file from every station's arrivals. */
export function scenarioTruth(sc: Scenario, perStation: readonly Map<string, TruthArrival[]>[]): Truth {
  const events: TruthEvent[] = sc.events.map((ev) => ({
    id: ev.id, type: ev.type, ...(ev.note ? { note: ev.note } : {}),
    origin: { time: isoFromMicros(ev.origin), timeMicros: ev.origin, latitude: ev.latitude, longitude: ev.longitude, depthKm: ev.depthKm },
    magnitude: { value: ev.magnitude, type: 'ML' as const },
    mechanism: ev.mechanism ? { ...ev.mechanism } : null,
    arrivals: perStation.flatMap((m) => m.get(ev.id) ?? []).sort((a, b) => a.timeMicros - b.timeMicros),
  }));
  const faults = sc.faults.map((f) => {
    const o: Record<string, unknown> = { ...f };
    for (const k of ['time', 'start', 'end'] as const) if (k in f) o[k] = isoFromMicros((f as unknown as Record<string, number>)[k]);
    return o;
  });
  return {
    caution: 'Invented data: a synthetic scenario for testing and demonstration. Nothing here describes a real place, network or earthquake.',
    scenario: {
      name: sc.name, seed: sc.seed, network: sc.network, start: isoFromMicros(sc.start), end: isoFromMicros(sc.end),
      depthDatum: 'depths in km below sea level (the velocity model datum); station elevations in m above it',
      magnitudeLaw: IASPEI_LAW_TEXT,
      snr: 'RMS of 1 s after over RMS of 5 s before the true arrival, 1-20 Hz Butterworth band-pass (4 poles each side, causal), on the written counts; P on the vertical, S on the horizontals together',
      attenuation: sc.attenuation, stressDropPa: sc.stressDropPa,
      noiseCurve: sc.noiseCurve.map((p) => ({ time: isoFromMicros(p.time), factor: p.factor })),
      stations: sc.stations.map((s) => ({ code: s.code, amplitudeTermLog10: s.amplitudeTermLog10, kappaS: s.kappaS, siteNoiseMs: s.noise.siteMs })),
    },
    events, faults,
  };
}
