/**
 * QuakeML 1.2 reader for what Daybreak uses: events, their picks (waveform id, time with
 * uncertainties, phase hint, onset, polarity, evaluation mode and status) and origins (time,
 * position, depth, arrivals). Other content is skipped. Errors name the file and the element.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { microsFromIso } from '../time';
import type { EvaluationMode, EvaluationStatus, PickOnset, PickPolarity } from '../pick/types';
import type { QmlArrival, QmlDocument, QmlEvent, QmlOrigin, QmlPick } from './types';

export class QuakeMlError extends Error {
  constructor(readonly file: string, readonly where: string, readonly reason: string) {
    super(`${file}: ${where}: ${reason}`);
    this.name = 'QuakeMlError';
  }
}

const REPEATED = new Set(['event', 'pick', 'origin', 'arrival', 'comment', 'magnitude', 'amplitude', 'stationMagnitude']);
const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: '@_',
  removeNSPrefix: true,
  parseTagValue: false,
  parseAttributeValue: false,
  ignoreDeclaration: true,
  isArray: (name) => REPEATED.has(name),
});

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
  const preferred = text(e.preferredOriginID);
  return {
    id: localId(String(e['@_publicID'] ?? fail(where, 'event has no publicID'))),
    type: text(e.type),
    typeCertainty: (text(e.typeCertainty) as QmlEvent['typeCertainty']) ?? null,
    description: text((e.description as Node | undefined)?.text) ?? undefined,
    picks,
    origins,
    preferredOriginId: preferred ? localId(preferred) : null,
  };
}
