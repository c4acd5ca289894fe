/**
 * QuakeML 1.2 reader for what Daybreak uses: events, their picks (waveform id, time with
 * uncertainties, phase hint, onset, polarity, evaluation mode and status) and origins (time,
 * position, depth, arrivals), magnitudes with their station contributions, station magnitudes and
 * amplitudes. Other content is skipped. Errors name the file and the element.
 */
import { XMLValidator } from 'fast-xml-parser';
import { formatXmlParser } from '../xml';
import { microsFromIso } from '../time';
import type { EvaluationMode, EvaluationStatus, PickOnset, PickPolarity } from '../pick/types';
import type { ChannelId } from '../model';
import type {
  QmlAmplitude, QmlArrival, QmlDocument, QmlEvent, QmlMagnitude, QmlOrigin, QmlPick, QmlStationMagnitude,
} from './types';

export class QuakeMlError extends Error {
  constructor(readonly file: string, readonly where: string, readonly reason: string) {
    super(`${file}: ${where}: ${reason}`);
    this.name = 'QuakeMlError';
  }
}

const REPEATED = new Set(['event', 'pick', 'origin', 'arrival', 'comment', 'magnitude', 'amplitude', 'stationMagnitude', 'stationMagnitudeContribution']);
const parser = formatXmlParser(REPEATED);

type Node = Record<string, unknown>;

const ONSETS = ['impulsive', 'emergent', 'questionable'];
const POLARITIES = ['positive', 'negative', 'undecidable'];
const MODES = ['automatic', 'manual'];
const STATUSES = ['preliminary', 'confirmed', 'reviewed', 'final', 'rejected'];

function text(v: unknown): string | null {
  if (v === undefined || v === null) return null;
  if (typeof v === 'string') return v.trim();
  if (typeof v === 'object' && '#text' in (v as Node)) return String((v as Node)['#text']).trim();
  return null;
}

/** The last path segment of a resource identifier, which Daybreak uses as the local id. */
function localId(rid: string): string {
  const i = rid.lastIndexOf('/');
  return i >= 0 ? rid.slice(i + 1) : rid;
}

export function readQuakeMl(xml: string, file: string): QmlDocument {
  const valid = XMLValidator.validate(xml);
  if (valid !== true) throw new QuakeMlError(file, `line ${valid.err.line}`, valid.err.msg);
  const root = parser.parse(xml) as Node;
  const q = root.quakeml as Node | undefined;
  if (!q) throw new QuakeMlError(file, 'root', 'not a QuakeML document (no quakeml root element)');
  const ep = q.eventParameters as Node | undefined;
  if (!ep) return { events: [] };
  const events = ((ep.event as Node[] | undefined) ?? []).map((e, i) => readEvent(e, `event[${i + 1}]`, file));
  return { events };
}

function readEvent(e: Node, where: string, file: string): QmlEvent {
  const fail = (w: string, r: string): never => { throw new QuakeMlError(file, w, r); };
  const num = (v: unknown, w: string): number | null => {
    const t = text(v);
    if (t === null || t === '') return null;
    const x = Number(t);
    return Number.isFinite(x) ? x : fail(w, `not a number: "${t}"`);
  };
  const time = (v: unknown, w: string) => {
    const t = text((v as Node | undefined)?.value);
    if (!t) return fail(w, 'time has no value');
    try {
      return microsFromIso(t);
    } catch (err) {
      return fail(w, err instanceof Error ? err.message : String(err));
    }
  };
  const oneOf = <T>(v: unknown, allowed: string[], w: string): T | null => {
    const t = text(v);
    if (t === null) return null;
    return allowed.includes(t) ? (t as T) : fail(w, `"${t}" is not one of ${allowed.join(', ')}`);
  };
  const picks: QmlPick[] = ((e.pick as Node[] | undefined) ?? []).map((p, j) => {
    const w = `${where}/pick[${j + 1}]`;
    const wf = p.waveformID as Node | undefined;
    if (!wf) fail(w, 'pick has no waveformID');
    const t = p.time as Node | undefined;
    const unc = num(t?.uncertainty, `${w}/time/uncertainty`);
    return {
      id: localId(String(p['@_publicID'] ?? fail(w, 'pick has no publicID'))),
      waveformId: {
        network: String(wf!['@_networkCode'] ?? ''), station: String(wf!['@_stationCode'] ?? ''),
        location: String(wf!['@_locationCode'] ?? ''), channel: String(wf!['@_channelCode'] ?? ''),
      },
      time: time(t, `${w}/time`),
      lowerUncertainty: num(t?.lowerUncertainty, `${w}/time/lowerUncertainty`) ?? unc,
      upperUncertainty: num(t?.upperUncertainty, `${w}/time/upperUncertainty`) ?? unc,
      phaseHint: text(p.phaseHint) ?? '',
      onset: oneOf<PickOnset>(p.onset, ONSETS, `${w}/onset`),
      polarity: oneOf<PickPolarity>(p.polarity, POLARITIES, `${w}/polarity`),
      evaluationMode: oneOf<EvaluationMode>(p.evaluationMode, MODES, `${w}/evaluationMode`) ?? 'manual',
      evaluationStatus: oneOf<EvaluationStatus>(p.evaluationStatus, STATUSES, `${w}/evaluationStatus`) ?? 'preliminary',
      comment: text((p.comment as Node[] | undefined)?.[0]?.text) ?? undefined,
    };
  });
  const origins: QmlOrigin[] = ((e.origin as Node[] | undefined) ?? []).map((o, j) => {
    const w = `${where}/origin[${j + 1}]`;
    const arrivals: QmlArrival[] = ((o.arrival as Node[] | undefined) ?? []).map((a, k) => ({
      pickId: localId(text(a.pickID) ?? fail(`${w}/arrival[${k + 1}]`, 'arrival has no pickID')),
      phase: text(a.phase) ?? '',
      distanceDeg: num(a.distance, `${w}/arrival[${k + 1}]/distance`),
      azimuth: num(a.azimuth, `${w}/arrival[${k + 1}]/azimuth`),
      timeResidual: num(a.timeResidual, `${w}/arrival[${k + 1}]/timeResidual`),
      timeWeight: num(a.timeWeight, `${w}/arrival[${k + 1}]/timeWeight`),
    }));
    const ou = o.originUncertainty as Node | undefined;
    const major = num(ou?.maxHorizontalUncertainty, `${w}/originUncertainty`);
    const minor = num(ou?.minHorizontalUncertainty, `${w}/originUncertainty`);
    const az = num(ou?.azimuthMaxHorizontalUncertainty, `${w}/originUncertainty`);
    const ql = o.quality as Node | undefined;
    return {
      id: localId(String(o['@_publicID'] ?? fail(w, 'origin has no publicID'))),
      time: time(o.time, `${w}/time`),
      timeUncertainty: num((o.time as Node | undefined)?.uncertainty, `${w}/time/uncertainty`),
      latitude: num((o.latitude as Node | undefined)?.value, `${w}/latitude`) ?? fail(w, 'origin has no latitude'),
      longitude: num((o.longitude as Node | undefined)?.value, `${w}/longitude`) ?? fail(w, 'origin has no longitude'),
      depthM: num((o.depth as Node | undefined)?.value, `${w}/depth`) ?? 0,
      depthUncertaintyM: num((o.depth as Node | undefined)?.uncertainty, `${w}/depth/uncertainty`),
      depthType: (text(o.depthType) as QmlOrigin['depthType']) ?? null,
      ellipse: major !== null && minor !== null && az !== null ? { semiMajorM: major, semiMinorM: minor, azimuthMajor: az } : null,
      horizontalUncertaintyM: num(ou?.horizontalUncertainty, `${w}/originUncertainty/horizontalUncertainty`),
      quality: ql ? {
        usedPhaseCount: num(ql.usedPhaseCount, `${w}/quality`) ?? 0,
        usedStationCount: num(ql.usedStationCount, `${w}/quality`) ?? 0,
        standardError: num(ql.standardError, `${w}/quality`) ?? 0,
        azimuthalGap: num(ql.azimuthalGap, `${w}/quality`),
      } : null,
      arrivals,
      evaluationMode: oneOf<EvaluationMode>(o.evaluationMode, MODES, `${w}/evaluationMode`) ?? 'manual',
      evaluationStatus: oneOf<EvaluationStatus>(o.evaluationStatus, STATUSES, `${w}/evaluationStatus`) ?? 'preliminary',
    };
  });
  const waveform = (wf: Node | undefined): ChannelId | null => wf ? {
    network: String(wf['@_networkCode'] ?? ''), station: String(wf['@_stationCode'] ?? ''),
    location: String(wf['@_locationCode'] ?? ''), channel: String(wf['@_channelCode'] ?? ''),
  } : null;
  const ref = (v: unknown): string | null => { const t = text(v); return t ? localId(t) : null; };
  const method = (v: unknown): { methodId?: string } => { const t = ref(v); return t ? { methodId: t } : {}; };
  const magnitudes: QmlMagnitude[] = ((e.magnitude as Node[] | undefined) ?? []).map((m, j) => {
    const w = `${where}/magnitude[${j + 1}]`;
    const mag = m.mag as Node | undefined;
    return {
      id: localId(String(m['@_publicID'] ?? fail(w, 'magnitude has no publicID'))),
      mag: num(mag?.value, `${w}/mag`) ?? fail(w, 'magnitude has no mag value'),
      uncertainty: num(mag?.uncertainty, `${w}/mag/uncertainty`),
      type: text(m.type) ?? '',
      originId: ref(m.originID),
      ...method(m.methodID),
      stationCount: num(m.stationCount, `${w}/stationCount`),
      azimuthalGap: num(m.azimuthalGap, `${w}/azimuthalGap`),
      contributions: ((m.stationMagnitudeContribution as Node[] | undefined) ?? []).map((c, k) => ({
        stationMagnitudeId: ref(c.stationMagnitudeID) ?? fail(`${w}/stationMagnitudeContribution[${k + 1}]`, 'contribution has no stationMagnitudeID'),
        residual: num(c.residual, `${w}/stationMagnitudeContribution[${k + 1}]/residual`),
        weight: num(c.weight, `${w}/stationMagnitudeContribution[${k + 1}]/weight`),
      })),
      evaluationMode: oneOf<EvaluationMode>(m.evaluationMode, MODES, `${w}/evaluationMode`),
      evaluationStatus: oneOf<EvaluationStatus>(m.evaluationStatus, STATUSES, `${w}/evaluationStatus`),
      comment: text((m.comment as Node[] | undefined)?.[0]?.text) ?? undefined,
    };
  });
  const stationMagnitudes: QmlStationMagnitude[] = ((e.stationMagnitude as Node[] | undefined) ?? []).map((m, j) => {
    const w = `${where}/stationMagnitude[${j + 1}]`;
    return {
      id: localId(String(m['@_publicID'] ?? fail(w, 'station magnitude has no publicID'))),
      originId: ref(m.originID),
      mag: num((m.mag as Node | undefined)?.value, `${w}/mag`) ?? fail(w, 'station magnitude has no mag value'),
      type: text(m.type) ?? '',
      amplitudeId: ref(m.amplitudeID),
      ...method(m.methodID),
      waveformId: waveform(m.waveformID as Node | undefined),
    };
  });
  const UNITS = ['m', 's', 'm/s', 'm/(s*s)', 'm*s', 'dimensionless', 'other'];
  const amplitudes: QmlAmplitude[] = ((e.amplitude as Node[] | undefined) ?? []).map((a, j) => {
    const w = `${where}/amplitude[${j + 1}]`;
    const tw = a.timeWindow as Node | undefined;
    const twRef = text(tw?.reference);
    let reference = 0;
    if (twRef) {
      try { reference = microsFromIso(twRef); } catch (err) { fail(`${w}/timeWindow/reference`, err instanceof Error ? err.message : String(err)); }
    }
    return {
      id: localId(String(a['@_publicID'] ?? fail(w, 'amplitude has no publicID'))),
      value: num((a.genericAmplitude as Node | undefined)?.value, `${w}/genericAmplitude`) ?? fail(w, 'amplitude has no genericAmplitude value'),
      type: text(a.type) ?? '',
      unit: oneOf<QmlAmplitude['unit']>(a.unit, UNITS, `${w}/unit`) ?? 'other',
      periodS: num((a.period as Node | undefined)?.value, `${w}/period`),
      snr: num(a.snr, `${w}/snr`),
      timeWindow: tw && twRef ? {
        reference, beginS: num(tw.begin, `${w}/timeWindow/begin`) ?? 0, endS: num(tw.end, `${w}/timeWindow/end`) ?? 0,
      } : null,
      time: a.scalingTime ? time(a.scalingTime, `${w}/scalingTime`) : null,
      waveformId: waveform(a.waveformID as Node | undefined),
      pickId: ref(a.pickID),
      magnitudeHint: text(a.magnitudeHint),
      ...method(a.methodID),
      evaluationMode: oneOf<EvaluationMode>(a.evaluationMode, MODES, `${w}/evaluationMode`) ?? 'manual',
      evaluationStatus: oneOf<EvaluationStatus>(a.evaluationStatus, STATUSES, `${w}/evaluationStatus`) ?? 'preliminary',
    };
  });
  const preferred = text(e.preferredOriginID);
  const preferredMag = text(e.preferredMagnitudeID);
  return {
    id: localId(String(e['@_publicID'] ?? fail(where, 'event has no publicID'))),
    type: text(e.type),
    typeCertainty: (text(e.typeCertainty) as QmlEvent['typeCertainty']) ?? null,
    description: text((e.description as Node | undefined)?.text) ?? undefined,
    comment: text((e.comment as Node[] | undefined)?.[0]?.text) ?? undefined,
    picks,
    origins,
    preferredOriginId: preferred ? localId(preferred) : null,
    // Absent (not empty) when the file has none, like a document written without them.
    ...(magnitudes.length ? { magnitudes } : {}),
    ...(stationMagnitudes.length ? { stationMagnitudes } : {}),
    ...(amplitudes.length ? { amplitudes } : {}),
    ...(preferredMag ? { preferredMagnitudeId: localId(preferredMag) } : {}),
  };
}
