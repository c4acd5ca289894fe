/**
 * An event's local magnitude from its origin and its stations' horizontal traces, as QuakeML-ready
 * values: one Amplitude per horizontal measured, one StationMagnitude per datum of the network value
 * and the event's Magnitude (median of the data, with their spread and count).
 *
 * Per station: the S time is the station's S pick when given, otherwise predicted from the origin with
 * straight rays at average speeds (windowFromOrigin's defaults, 6.0 and 3.5 km/s); the amplitude
 * window runs from P (pick or predicted) to S + max(10 s, 2·(S − P)) (windowFromPicks). The noise
 * window, for the signal-to-noise ratio, is the `noiseSeconds` ending 1 s before P, when the trace
 * holds it clear of its tapered ends. Clipped traces (flagged or reaching full scale in the window)
 * give no magnitude (localMagnitude excludes them) and no amplitude in the output.
 *
 * Amplitude type: "IAML" when the scale uses the 2080 Wood-Anderson and the zero-to-peak measure (the
 * IASPEI 2013 name of the ML amplitude, from memory), otherwise "AML". Values are metres of
 * ground-equivalent Wood-Anderson displacement (static magnification removed), QuakeML unit "m".
 */
import { channelKey, stationKey, type ChannelId } from '../model';
import type { Micros } from '../time';
import type { EvaluationMode, EvaluationStatus } from '../pick/types';
import type { QmlAmplitude, QmlMagnitude, QmlOrigin, QmlStationMagnitude } from '../quakeml/types';
import { windowFromPicks, windowIndices, type AmplitudeMeasure, type TimeWindow } from './amplitude';
import { stationDistance, type EventPosition, type StationPosition } from './distance';
import {
  localMagnitude, measureWoodAndersonAmplitude, type HorizontalTrace, type NetworkMagnitude, type StationDistance, type WoodAndersonAmplitude,
} from './localMagnitude';
import { IASPEI_2013, type MagnitudeScale } from './scales';

/** The event's origin as the magnitude needs it. */
export interface MagnitudeOrigin extends EventPosition {
  /** Local id of the QuakeML origin (for originID), or null. */
  readonly id: string | null;
  /** Origin time, µs. */
  readonly time: Micros;
}

/** One station: where it is, its horizontals around the event and, when picked, its P and S. */
export interface MagnitudeStation {
  readonly position: StationPosition;
  /** Horizontal traces of one sensor (all of the same station), each one continuous run. */
  readonly traces: readonly HorizontalTrace[];
  /** P pick time, µs, or null. */
  readonly p?: Micros | null;
  /** S pick time, µs, or null (then S is predicted from the origin). */
  readonly s?: Micros | null;
  /** Local id of the S pick, for the amplitudes' pickID. */
  readonly sPickId?: string | null;
}

export interface EventMagnitudeOptions {
  /** Default IASPEI_2013. */
  scale?: MagnitudeScale;
  /**
   * How horizontals count (see localMagnitude); default 'max', the larger horizontal per station
   * (the generator's amplitude law is stated on it); 'each' is the IASPEI 2013 practice.
   */
  combine?: 'each' | 'max' | 'mean';
  measure?: AmplitudeMeasure;
  /** Average P and S speeds for predicted arrivals, km/s; defaults 6.0 and 3.5 (common practice). */
  vp?: number;
  vs?: number;
  /** Length of the noise window, s; default 5. */
  noiseSeconds?: number;
  minSnr?: number;
  stationCorrections?: Readonly<Record<string, number>>;
  /**
   * Analyst edits of amplitude picks, by channel key "NET.STA.LOC.CHA": a window replaces the
   * automatic one for that channel (a moved amplitude pick: e.g. ±0.25 s around the new time; the
   * amplitude becomes evaluationMode manual), null removes the channel from the magnitude.
   */
  amplitudeEdits?: ReadonlyMap<string, TimeWindow | null>;
  /** Prefix of the amplitude, station magnitude and magnitude ids; default "ml". */
  idPrefix?: string;
  evaluationMode?: EvaluationMode;
  evaluationStatus?: EvaluationStatus;
}

export interface EventMagnitude {
  /** The full computation: stations, channels, exclusions and the network value. */
  readonly network: NetworkMagnitude;
  readonly amplitudes: QmlAmplitude[];
  readonly stationMagnitudes: QmlStationMagnitude[];
  /** Null when no station gives a magnitude. */
  readonly magnitude: QmlMagnitude | null;
  /** Channels that could not be measured, and why (too short, window outside the trace, bad values). */
  readonly skipped: { key: string; why: string }[];
}

/** The magnitude's view of a QuakeML origin (depth from metres to km). */
export function magnitudeOrigin(o: QmlOrigin): MagnitudeOrigin {
  return { id: o.id, time: o.time, latitude: o.latitude, longitude: o.longitude, depthKm: o.depthM / 1000 };
}

const ID_SAFE = /[^\w.\-~]/g;

/** A station's distances, S time, amplitude window and noise window (see the file comment). */
export interface StationWindows {
  readonly distance: StationDistance;
  /** P (pick or predicted; null when not before S) and S (pick or predicted), µs. */
  readonly p: Micros | null;
  readonly s: Micros;
  readonly window: TimeWindow;
  readonly noise: TimeWindow;
}

/**
 * Where a station's amplitude is measured: S from its pick or predicted at `vs` over the hypocentral
 * distance, P likewise at `vp`; window from P to S + max(10 s, 2·(S − P)); noise the `noiseSeconds`
 * ending 1 s before P (or 2 s before S without P). Callers reading data for eventMagnitude use it to
 * know what to read (add a margin for the taper).
 */
export function stationWindows(
  origin: MagnitudeOrigin, st: { position: StationPosition; p?: Micros | null; s?: Micros | null },
  opts: { vp?: number; vs?: number; noiseSeconds?: number } = {},
): StationWindows {
  const vp = opts.vp ?? 6.0, vs = opts.vs ?? 3.5, noiseSeconds = opts.noiseSeconds ?? 5;
  const distance = stationDistance(origin, st.position);
  const pPred = origin.time + Math.round((distance.hypocentralKm / vp) * 1e6);
  const sPred = origin.time + Math.round((distance.hypocentralKm / vs) * 1e6);
  const s = st.s ?? sPred;
  const pCand = st.p ?? pPred;
  const p = pCand < s ? pCand : null;
  const window = windowFromPicks({ p, s });
  const noiseEnd = (p ?? s - 1e6) - 1e6;
  return { distance, p, s, window, noise: { start: noiseEnd - Math.round(noiseSeconds * 1e6), end: noiseEnd } };
}

/** Local magnitude of one event; see the file comment. */
export function eventMagnitude(origin: MagnitudeOrigin, stations: readonly MagnitudeStation[], opts: EventMagnitudeOptions = {}): EventMagnitude {
  if (!Number.isFinite(origin.time)) throw new RangeError(`origin time must be finite µs, got ${origin.time}`);
  const scale = opts.scale ?? IASPEI_2013;
  const measure = opts.measure ?? 'zeroToPeak';
  const vp = opts.vp ?? 6.0, vs = opts.vs ?? 3.5;
  if (!(vp > vs && vs > 0)) throw new RangeError(`speeds must satisfy vp > vs > 0 km/s, got vp ${vp}, vs ${vs}`);
  const noiseSeconds = opts.noiseSeconds ?? 5;
  if (!(noiseSeconds > 0)) throw new RangeError(`noiseSeconds must be > 0 s, got ${noiseSeconds}`);
  const prefix = (opts.idPrefix ?? 'ml').replace(ID_SAFE, '_');
  const mode = opts.evaluationMode ?? 'automatic', status = opts.evaluationStatus ?? 'preliminary';
  const methodId = `ml-${scale.name}-${scale.standard.name}`.replace(ID_SAFE, '_');

  const amps: WoodAndersonAmplitude[] = [];
  const distances = new Map<string, StationDistance>();
  const windows = new Map<string, { s: Micros; pickId: string | null; window: TimeWindow }>();
  const skipped: { key: string; why: string }[] = [];
  for (const st of stations) {
    if (st.traces.length === 0) continue;
    const sk = stationKey(st.traces[0].channel);
    for (const t of st.traces) {
      if (stationKey(t.channel) !== sk) throw new RangeError(`station ${sk} holds a trace of another station: ${channelKey(t.channel)}`);
    }
    const plan = stationWindows(origin, st, { vp, vs, noiseSeconds });
    distances.set(sk, plan.distance);
    const { s, window, noise } = plan;
    windows.set(sk, { s, pickId: st.s != null ? (st.sPickId ?? null) : null, window });
    for (const t of st.traces) {
      const key = channelKey(t.channel);
      const edit = opts.amplitudeEdits?.get(key);
      if (edit === null) { skipped.push({ key, why: 'removed by the analyst' }); continue; }
      const n = t.counts.length;
      const tapered = Math.floor(0.05 * (n - 1));
      const [a, b] = windowIndices(noise, t.start, t.sampleRate, n);
      const wantA = Math.ceil(((noise.start - t.start) * t.sampleRate) / 1e6 - 1e-9);
      const wantB = Math.floor(((noise.end - t.start) * t.sampleRate) / 1e6 + 1e-9) + 1;
      const noiseFits = a === wantA && b === wantB && a >= tapered && b <= n - tapered && b - a >= 2;
      try {
        const m = measureWoodAndersonAmplitude(t, edit ?? window, { scale, measure, noiseWindow: noiseFits ? noise : undefined });
        if (m) amps.push(m);
        else skipped.push({ key, why: 'the trace holds fewer than 2 samples of the window' });
      } catch (e) {
        if (!(e instanceof RangeError || e instanceof TypeError)) throw e;
        skipped.push({ key, why: e.message });
      }
    }
  }

  const network = localMagnitude(amps, distances, {
    scale, combine: opts.combine ?? 'max', minSnr: opts.minSnr, stationCorrections: opts.stationCorrections,
  });
  const type = scale.standard.magnification === 2080 && measure === 'zeroToPeak' ? 'IAML' : 'AML';
  const amplitudes: QmlAmplitude[] = [];
  const ampIdOf = new Map<WoodAndersonAmplitude, string>();
  const stationMagnitudes: QmlStationMagnitude[] = [];
  const ids = (key: string) => key.replace(ID_SAFE, '_');
  for (const stn of network.stations) {
    const win = windows.get(stn.station);
    for (const c of stn.channels) {
      if (c.magnitude === null) continue;
      const a = c.amplitude;
      const id = `${prefix}.amp.${ids(a.key)}`;
      ampIdOf.set(a, id);
      amplitudes.push({
        id, value: a.amplitudeM, type, unit: 'm', periodS: a.periodS, snr: a.snr,
        timeWindow: win ? windowAround(a.window, win.s) : null,
        time: a.time, waveformId: a.channel, pickId: win?.pickId ?? null, magnitudeHint: 'ML', methodId: `wa-${scale.standard.name}-${a.measure}`,
        evaluationMode: opts.amplitudeEdits?.has(a.key) ? 'manual' : mode, evaluationStatus: status,
      });
    }
    const used = stn.channels.filter((c) => c.magnitude !== null);
    if (used.length === 0) continue;
    const combine = opts.combine ?? 'max';
    if (combine === 'each') {
      for (const c of used) {
        stationMagnitudes.push({
          id: `${prefix}.sta.${ids(c.key)}`, originId: origin.id, mag: c.magnitude as number, type: 'ML',
          amplitudeId: ampIdOf.get(c.amplitude) ?? null, methodId, waveformId: c.amplitude.channel,
        });
      }
    } else {
      const from = combine === 'max' ? used.find((c) => c.magnitude === stn.magnitude) ?? null : null;
      const wf: ChannelId | null = from ? from.amplitude.channel : null;
      stationMagnitudes.push({
        id: `${prefix}.sta.${ids(stn.station)}`, originId: origin.id, mag: stn.magnitude as number, type: 'ML',
        amplitudeId: from ? (ampIdOf.get(from.amplitude) ?? null) : null, methodId, waveformId: wf,
      });
    }
  }
  let magnitude: QmlMagnitude | null = null;
  if (network.value !== null) {
    const v = network.value;
    magnitude = {
      id: `${prefix}.mag`, mag: v, uncertainty: network.std, type: 'ML', originId: origin.id, methodId,
      stationCount: network.stationCount, azimuthalGap: null,
      contributions: stationMagnitudes.map((m) => ({ stationMagnitudeId: m.id, residual: m.mag - v, weight: 1 })),
      evaluationMode: mode, evaluationStatus: status,
      comment: `median of ${network.count} ${combine(opts.combine ?? 'max')} (${scale.source}); uncertainty is their standard deviation${network.mad !== null ? `, median absolute deviation ${network.mad.toFixed(3)}` : ''}`,
    };
  }
  return { network, amplitudes, stationMagnitudes, magnitude, skipped };
}

/** QuakeML TimeWindow of `w`: referenced to S when it starts at or before S, else to its own start (begin and end ≥ 0). */
function windowAround(w: TimeWindow, s: Micros): { reference: Micros; beginS: number; endS: number } {
  const reference = w.start <= s && w.end >= s ? s : w.start;
  return { reference, beginS: (reference - w.start) / 1e6, endS: (w.end - reference) / 1e6 };
}

function combine(c: 'each' | 'max' | 'mean'): string {
  if (c === 'each') return 'horizontal-channel magnitudes';
  return c === 'max' ? 'station magnitudes from the larger horizontal' : 'station magnitudes (mean of the horizontals)';
}
