/**
 * QuakeML 1.2 writer (namespace http://quakeml.org/xmlns/bed/1.2, root q:quakeml in
 * http://quakeml.org/xmlns/quakeml/1.2). Resource identifiers are `smi:AUTHORITY/KIND/ID` (QuakeML
 * resource identifier syntax). Element order inside pick and origin follows the BED schema's
 * sequences as used by established writers (e.g. the real event files under
 * ../shared/data/real-microseismic/events). Every document carries the preliminary-results caution
 * as a comment of eventParameters. Inside an event: preferredOriginID, preferredMagnitudeID, type,
 * description, comment, creationInfo, origins, magnitudes, station magnitudes, picks, amplitudes (the
 * order of the real files). Amplitude and Magnitude children follow the order of the real files'
 * amplitudes and magnitudes (period, snr, waveformID, scalingTime and magnitudeHint, which they lack,
 * placed as in the QuakeML 1.2 BED schema, from memory); StationMagnitude's children (the real files
 * have none) follow the BED schema from memory: originID, mag, type, amplitudeID, methodID, waveformID.
 */
import { CAUTION } from '../caution';
import { isoFromMicros, type Micros } from '../time';
import type { ChannelId } from '../model';
import type { QmlAmplitude, QmlDocument, QmlEvent, QmlMagnitude, QmlOrigin, QmlPick, QmlStationMagnitude } from './types';

export const QUAKEML_BED_NS = 'http://quakeml.org/xmlns/bed/1.2';
export const QUAKEML_NS = 'http://quakeml.org/xmlns/quakeml/1.2';

export interface QuakeMlWriteOptions {
  /** Authority part of resource identifiers, e.g. "daybreak.local" (letters, digits, .-_~). */
  authority: string;
  agencyId: string;
  author: string;
  creationTime: Micros;
  /** Name and version of the writing program, for creationInfo/version. */
  version?: string;
}

export function xmlEscape(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

const ID_PART = /^[\w.\-~*'()+=,;:@!$/#?]+$/;

export function writeQuakeMl(doc: QmlDocument, opts: QuakeMlWriteOptions): string {
  if (!/^[\w.\-~]{1,200}$/.test(opts.authority)) throw new RangeError(`authority must be 1-200 of letters, digits and .-_~, got "${opts.authority}"`);
  const rid = (kind: string, id: string) => {
    if (!ID_PART.test(id)) throw new RangeError(`identifier "${id}" has characters a QuakeML resource identifier cannot hold`);
    return `smi:${opts.authority}/${kind}/${id}`;
  };
  const out: string[] = [];
  const line = (depth: number, text: string) => out.push(`${'  '.repeat(depth)}${text}`);
  const leaf = (depth: number, name: string, value: string | number) => line(depth, `<${name}>${xmlEscape(String(value))}</${name}>`);
  const creation = (depth: number) => {
    line(depth, '<creationInfo>');
    leaf(depth + 1, 'agencyID', opts.agencyId);
    leaf(depth + 1, 'author', opts.author);
    leaf(depth + 1, 'creationTime', isoFromMicros(opts.creationTime));
    if (opts.version) leaf(depth + 1, 'version', opts.version);
    line(depth, '</creationInfo>');
  };
  const num = (x: number) => {
    if (!Number.isFinite(x)) throw new RangeError(`a QuakeML number must be finite, got ${x}`);
    return String(x);
  };

  const waveform = (d: number, w: ChannelId) =>
    line(d, `<waveformID networkCode="${xmlEscape(w.network)}" stationCode="${xmlEscape(w.station)}" locationCode="${xmlEscape(w.location)}" channelCode="${xmlEscape(w.channel)}"/>`);
  const quantity = (d: number, name: string, value: number, uncertainty: number | null = null) => {
    line(d, `<${name}>`);
    leaf(d + 1, 'value', num(value));
    if (uncertainty !== null) leaf(d + 1, 'uncertainty', num(uncertainty));
    line(d, `</${name}>`);
  };
  const commentXml = (d: number, text: string | undefined) => {
    if (text) { line(d, '<comment>'); leaf(d + 1, 'text', text); line(d, '</comment>'); }
  };

  const pickXml = (p: QmlPick, d: number) => {
    line(d, `<pick publicID="${xmlEscape(rid('pick', p.id))}">`);
    line(d + 1, '<time>');
    leaf(d + 2, 'value', isoFromMicros(p.time));
    if (p.lowerUncertainty !== null) leaf(d + 2, 'lowerUncertainty', num(p.lowerUncertainty));
    if (p.upperUncertainty !== null) leaf(d + 2, 'upperUncertainty', num(p.upperUncertainty));
    line(d + 1, '</time>');
    waveform(d + 1, p.waveformId);
    if (p.onset) leaf(d + 1, 'onset', p.onset);
    leaf(d + 1, 'phaseHint', p.phaseHint);
    if (p.polarity) leaf(d + 1, 'polarity', p.polarity);
    leaf(d + 1, 'evaluationMode', p.evaluationMode);
    leaf(d + 1, 'evaluationStatus', p.evaluationStatus);
    if (p.comment) { line(d + 1, '<comment>'); leaf(d + 2, 'text', p.comment); line(d + 1, '</comment>'); }
    creation(d + 1);
    line(d, '</pick>');
  };

  const originXml = (o: QmlOrigin, d: number) => {
    line(d, `<origin publicID="${xmlEscape(rid('origin', o.id))}">`);
    line(d + 1, '<time>');
    leaf(d + 2, 'value', isoFromMicros(o.time));
    if (o.timeUncertainty !== null) leaf(d + 2, 'uncertainty', num(o.timeUncertainty));
    line(d + 1, '</time>');
    line(d + 1, '<latitude>'); leaf(d + 2, 'value', num(o.latitude)); line(d + 1, '</latitude>');
    line(d + 1, '<longitude>'); leaf(d + 2, 'value', num(o.longitude)); line(d + 1, '</longitude>');
    line(d + 1, '<depth>');
    leaf(d + 2, 'value', num(o.depthM));
    if (o.depthUncertaintyM !== null) leaf(d + 2, 'uncertainty', num(o.depthUncertaintyM));
    line(d + 1, '</depth>');
    if (o.depthType) leaf(d + 1, 'depthType', o.depthType);
    if (o.methodId) leaf(d + 1, 'methodID', rid('method', o.methodId));
    if (o.earthModelId) leaf(d + 1, 'earthModelID', rid('earthmodel', o.earthModelId));
    if (o.quality) {
      line(d + 1, '<quality>');
      leaf(d + 2, 'usedPhaseCount', o.quality.usedPhaseCount);
      leaf(d + 2, 'usedStationCount', o.quality.usedStationCount);
      leaf(d + 2, 'standardError', num(o.quality.standardError));
      if (o.quality.azimuthalGap !== null) leaf(d + 2, 'azimuthalGap', num(o.quality.azimuthalGap));
      line(d + 1, '</quality>');
    }
    if (o.horizontalUncertaintyM !== null || o.ellipse) {
      line(d + 1, '<originUncertainty>');
      if (o.horizontalUncertaintyM !== null) leaf(d + 2, 'horizontalUncertainty', num(o.horizontalUncertaintyM));
      if (o.ellipse) {
        leaf(d + 2, 'maxHorizontalUncertainty', num(o.ellipse.semiMajorM));
        leaf(d + 2, 'minHorizontalUncertainty', num(o.ellipse.semiMinorM));
        leaf(d + 2, 'azimuthMaxHorizontalUncertainty', num(o.ellipse.azimuthMajor));
      }
      leaf(d + 2, 'preferredDescription', o.ellipse ? 'uncertainty ellipse' : 'horizontal uncertainty');
      leaf(d + 2, 'confidenceLevel', 68);
      line(d + 1, '</originUncertainty>');
    }
    leaf(d + 1, 'evaluationMode', o.evaluationMode);
    leaf(d + 1, 'evaluationStatus', o.evaluationStatus);
    commentXml(d + 1, o.comment); // after evaluationStatus, before creationInfo, as in the real event files
    creation(d + 1);
    o.arrivals.forEach((a, i) => {
      line(d + 1, `<arrival publicID="${xmlEscape(rid('arrival', `${o.id}-${i + 1}`))}">`);
      leaf(d + 2, 'pickID', rid('pick', a.pickId));
      leaf(d + 2, 'phase', a.phase);
      if (a.azimuth !== null) leaf(d + 2, 'azimuth', num(a.azimuth));
      if (a.distanceDeg !== null) leaf(d + 2, 'distance', num(a.distanceDeg));
      if (a.timeResidual !== null) leaf(d + 2, 'timeResidual', num(a.timeResidual));
      if (a.timeWeight !== null) leaf(d + 2, 'timeWeight', num(a.timeWeight));
      line(d + 1, '</arrival>');
    });
    line(d, '</origin>');
  };

  const amplitudeXml = (a: QmlAmplitude, d: number) => {
    line(d, `<amplitude publicID="${xmlEscape(rid('amplitude', a.id))}">`);
    quantity(d + 1, 'genericAmplitude', a.value);
    leaf(d + 1, 'type', a.type);
    leaf(d + 1, 'unit', a.unit);
    if (a.methodId) leaf(d + 1, 'methodID', rid('method', a.methodId));
    if (a.periodS !== null) quantity(d + 1, 'period', a.periodS);
    if (a.snr !== null) leaf(d + 1, 'snr', num(a.snr));
    if (a.timeWindow) {
      line(d + 1, '<timeWindow>');
      leaf(d + 2, 'reference', isoFromMicros(a.timeWindow.reference));
      leaf(d + 2, 'begin', num(a.timeWindow.beginS));
      leaf(d + 2, 'end', num(a.timeWindow.endS));
      line(d + 1, '</timeWindow>');
    }
    if (a.pickId) leaf(d + 1, 'pickID', rid('pick', a.pickId));
    if (a.waveformId) waveform(d + 1, a.waveformId);
    if (a.time !== null) { line(d + 1, '<scalingTime>'); leaf(d + 2, 'value', isoFromMicros(a.time)); line(d + 1, '</scalingTime>'); }
    if (a.magnitudeHint) leaf(d + 1, 'magnitudeHint', a.magnitudeHint);
    leaf(d + 1, 'evaluationMode', a.evaluationMode);
    leaf(d + 1, 'evaluationStatus', a.evaluationStatus);
    creation(d + 1);
    line(d, '</amplitude>');
  };

  const stationMagnitudeXml = (m: QmlStationMagnitude, d: number) => {
    line(d, `<stationMagnitude publicID="${xmlEscape(rid('stationMagnitude', m.id))}">`);
    if (m.originId) leaf(d + 1, 'originID', rid('origin', m.originId));
    quantity(d + 1, 'mag', m.mag);
    leaf(d + 1, 'type', m.type);
    if (m.amplitudeId) leaf(d + 1, 'amplitudeID', rid('amplitude', m.amplitudeId));
    if (m.methodId) leaf(d + 1, 'methodID', rid('method', m.methodId));
    if (m.waveformId) waveform(d + 1, m.waveformId);
    creation(d + 1);
    line(d, '</stationMagnitude>');
  };

  const magnitudeXml = (m: QmlMagnitude, d: number) => {
    line(d, `<magnitude publicID="${xmlEscape(rid('magnitude', m.id))}">`);
    quantity(d + 1, 'mag', m.mag, m.uncertainty);
    leaf(d + 1, 'type', m.type);
    if (m.originId) leaf(d + 1, 'originID', rid('origin', m.originId));
    if (m.methodId) leaf(d + 1, 'methodID', rid('method', m.methodId));
    if (m.stationCount !== null) leaf(d + 1, 'stationCount', m.stationCount);
    if (m.azimuthalGap !== null) leaf(d + 1, 'azimuthalGap', num(m.azimuthalGap));
    if (m.evaluationMode) leaf(d + 1, 'evaluationMode', m.evaluationMode);
    if (m.evaluationStatus) leaf(d + 1, 'evaluationStatus', m.evaluationStatus);
    for (const c of m.contributions) {
      line(d + 1, '<stationMagnitudeContribution>');
      leaf(d + 2, 'stationMagnitudeID', rid('stationMagnitude', c.stationMagnitudeId));
      if (c.weight !== null) leaf(d + 2, 'weight', num(c.weight));
      if (c.residual !== null) leaf(d + 2, 'residual', num(c.residual));
      line(d + 1, '</stationMagnitudeContribution>');
    }
    commentXml(d + 1, m.comment);
    creation(d + 1);
    line(d, '</magnitude>');
  };

  const eventXml = (e: QmlEvent, d: number) => {
    line(d, `<event publicID="${xmlEscape(rid('event', e.id))}">`);
    if (e.preferredOriginId) leaf(d + 1, 'preferredOriginID', rid('origin', e.preferredOriginId));
    if (e.preferredMagnitudeId) leaf(d + 1, 'preferredMagnitudeID', rid('magnitude', e.preferredMagnitudeId));
    if (e.type) leaf(d + 1, 'type', e.type);
    if (e.type && e.typeCertainty) leaf(d + 1, 'typeCertainty', e.typeCertainty);
    if (e.description) { line(d + 1, '<description>'); leaf(d + 2, 'text', e.description); line(d + 1, '</description>'); }
    if (e.comment) { line(d + 1, '<comment>'); leaf(d + 2, 'text', e.comment); line(d + 1, '</comment>'); }
    creation(d + 1);
    for (const o of e.origins) originXml(o, d + 1);
    for (const m of e.magnitudes ?? []) magnitudeXml(m, d + 1);
    for (const m of e.stationMagnitudes ?? []) stationMagnitudeXml(m, d + 1);
    for (const p of e.picks) pickXml(p, d + 1);
    for (const a of e.amplitudes ?? []) amplitudeXml(a, d + 1);
    line(d, '</event>');
  };

  out.push('<?xml version="1.0" encoding="UTF-8"?>');
  out.push(`<q:quakeml xmlns:q="${QUAKEML_NS}" xmlns="${QUAKEML_BED_NS}">`);
  line(1, `<eventParameters publicID="${xmlEscape(rid('eventParameters', `${isoFromMicros(opts.creationTime).replace(/[-:.]/g, '')}`))}">`);
  line(2, '<comment>');
  leaf(3, 'text', CAUTION);
  line(2, '</comment>');
  creation(2);
  for (const e of doc.events) eventXml(e, 2);
  line(1, '</eventParameters>');
  out.push('</q:quakeml>');
  return `${out.join('\n')}\n`;
}
